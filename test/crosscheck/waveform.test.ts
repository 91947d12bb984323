/**
 * The waveform cross-checked against ngspice's `.tran` (Debian package `ngspice`, run with `ngspice -b` on the
 * netlist `gainwright report --spice` exports, unmodified). The exported op-amp carries the same slew limit
 * and output swing as the report's large-signal model, so slew-limited and clipped cases are compared too.
 * Tolerances: the output within 1 % of its span at every sample; rise and settling times within 2 %;
 * overshoot and droop (fractions of the edge) within 0.02.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { analyse } from '../../src/analysis/report.js';
import { spiceNetlist } from '../../src/present/spice.js';
import { edgeFigures, interpolate, squareDroop, stepOverRange, waveformPlan } from '../../src/analysis/waveform.js';
import { CROSSCHECK_DESIGNS } from './designs.js';
import type { Design, MeasurandWaveform } from '../../src/model/design.js';
import { designFrom } from '../helpers.js';

const hasNgspice = spawnSync('sh', ['-c', 'command -v ngspice'], { stdio: 'ignore' }).status === 0;
if (!hasNgspice && process.env.CI === 'true') throw new Error('ngspice is required under CI=true (apt-get install -y ngspice)');

const withWave = (id: string, w: Partial<MeasurandWaveform> & { shape: MeasurandWaveform['shape'] }, patch: (d: any) => void = () => {}): Design =>
  designFrom(id, (d) => { patch(d); d.analysis = { waveform: { low: -20, high: 20, ...w } }; });

// Scenarios of our own invention, patched from the demos.
const CASES: Array<[string, Design]> = [
  ['voltage sensor, non-inverting, step over the range (slew-limited)', withWave('generic-sensor', { shape: 'step' })],
  ['voltage sensor, non-inverting, small step (linear)', withWave('generic-sensor', { shape: 'step', low: 0, high: 1 })],
  ['voltage sensor, inverting, 2 kHz square', withWave('generic-sensor', { shape: 'square', frequency: 2000, duty: 0.5 }, (d) => { d.target.scale = -0.1; })],
  ['voltage sensor, sine driven past the range (clipping and recovery)', withWave('generic-sensor', { shape: 'sine', low: -60, high: 60, frequency: 2000 })],
  ['current transformer, inverting, RC output filter, 200 Hz square', withWave('appliance-ct', { shape: 'square', low: -5, high: 5, frequency: 200, duty: 0.5 })],
  ['current transformer, inverting, RC output filter, 50 Hz converter-like triangle', withWave('appliance-ct', { shape: 'triangle', low: -3, high: 8, frequency: 50, duty: 0.3 })],
  ['Hall clamp, RC output filter, 5 kHz triangle', withWave('bench-clamp', { shape: 'triangle', low: -10, high: 15, frequency: 5000, duty: 0.8 }, (d) => { d.sensor.turns = 3; d.target.zero = 2.5; d.target.range = [-10, 10]; d.output.filter = { resistance: 1000, capacitance: 10e-9 }; })],
  // A closed-loop Hall sensor in front of the stage (issue #20): the loop's elements in the time-domain solve.
  ['closed-loop Hall clamp, step over the range', withWave('closed-loop-clamp', { shape: 'step', low: -20, high: 20 })],
  // A square wave through it, slow enough that the warm-up takes long steps between its edges.
  ['closed-loop Hall clamp, 500 Hz square', withWave('closed-loop-clamp', { shape: 'square', frequency: 500, duty: 0.5 })],
  ['closed-loop Hall clamp, 2 kHz square', withWave('closed-loop-clamp', { shape: 'square', frequency: 2000, duty: 0.5 })],
  // The stages added later, untouched by the time-domain code: a step over each one's range.
  ...[/^summing non/, /^summing inv/, /^difference/].flatMap((re) => CROSSCHECK_DESIGNS.filter(([n]) => re.test(n)).slice(0, re.source.includes('difference') ? 2 : 1)).map(([n, d]): [string, Design] => [`${n}, step over the range`, { ...d, analysis: { ...d.analysis, waveform: stepOverRange(d) } }]),
];

function runTran(net: string): { t: number[]; v: number[] } {
  const dir = mkdtempSync(join(tmpdir(), 'gw-tran-'));
  writeFileSync(join(dir, 'design.cir'), net);
  const run = spawnSync('ngspice', ['-b', 'design.cir'], { cwd: dir, encoding: 'utf8', timeout: 120_000 });
  const errs = `${run.stdout}\n${run.stderr}`.split('\n').filter((l) => /error|aborted|singular|timestep too small/i.test(l));
  if (errs.length) throw new Error(`ngspice reported: ${errs.slice(0, 5).join(' | ')}`);
  const rows = readFileSync(join(dir, 'gainwright-tran.txt'), 'utf8').trim().split('\n').slice(1).map((l) => l.trim().split(/\s+/).map(Number));
  return { t: rows.map((r) => r[0]!), v: rows.map((r) => r[1]!) };
}

const worst: Record<string, { value: number; design: string }> = {};
function record(figure: string, design: string, value: number) {
  if (!worst[figure] || value > worst[figure]!.value) worst[figure] = { value, design };
}

describe.skipIf(!hasNgspice)('waveform against ngspice .tran', () => {
  afterAll(() => {
    console.log('largest waveform disagreements:');
    for (const [k, v] of Object.entries(worst)) console.log(`  ${k}: ${v.value.toPrecision(3)} (${v.design})`);
  });

  it('covers both topologies, a current transformer and an output filter', () => {
    const reps = CASES.map(([, d]) => analyse(d, { spreadTrials: 0 }));
    const topologies = new Set(reps.map((r) => r.stage?.ideal.topology));
    expect(topologies.has('non-inverting') && topologies.has('inverting')).toBe(true);
    expect(reps.some((r) => r.design.sensor.type === 'current-transformer')).toBe(true);
    expect(reps.some((r) => r.design.output.filter?.capacitance)).toBe(true);
    expect(reps.some((r) => r.waveform?.slewLimited)).toBe(true);
    expect(reps.some((r) => r.waveform?.clipped)).toBe(true);
  });

  it.each(CASES)('%s', (name, design) => {
    const r = analyse(design, { spreadTrials: 0 });
    const w = r.waveform!;
    expect(w, name).not.toBeNull();
    const plan = waveformPlan(r.waveformSpec!, r.speed!, r.dc!, r.design);
    const net = spiceNetlist(r, { date: '2026-12-01' })!;
    expect(net).toMatch(/^tran /m);
    const sp = runTran(net);
    // SPICE time 0 is the solve's start t0.
    const ts = sp.t.map((t) => t + plan.t0);
    let lo = Infinity, hi = -Infinity;
    for (const v of w.output) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
    const span = hi - lo;
    let worst = 0;
    for (let k = 0; k < w.t.length; k++) worst = Math.max(worst, Math.abs(interpolate(ts, sp.v, w.t[k]!) - w.output[k]!));
    record('output, fraction of its span', name, worst / span);
    expect(worst / span, `worst ${worst} V of a ${span} V span`).toBeLessThan(0.01);
    const spec = r.waveformSpec!;
    if (spec.shape === 'step' || spec.shape === 'square') {
      const end = spec.shape === 'step' ? plan.t1 : (spec.duty / spec.frequency) * (1 - 1e-9);
      const f = edgeFigures(ts, sp.v, 0, end);
      record('rise time (relative)', name, Math.abs(f.riseTime! / w.riseTime! - 1));
      expect(Math.abs(f.riseTime! / w.riseTime! - 1), 'rise time').toBeLessThan(0.02);
      record('overshoot (fraction of the edge)', name, Math.abs(f.overshoot! - w.overshoot!));
      expect(Math.abs(f.overshoot! - w.overshoot!), 'overshoot').toBeLessThan(0.02);
      expect(w.settlingTime, 'settles in view').not.toBeNull();
      record('settling time (relative)', name, Math.abs(f.settlingTime! / w.settlingTime! - 1));
      expect(Math.abs(f.settlingTime! / w.settlingTime! - 1), 'settling time').toBeLessThan(0.02);
      if (spec.shape === 'square' && !r.front.passesDc) {
        const dr = Math.abs(squareDroop(ts, sp.v, 1 / spec.frequency, spec.duty, r.dc!.out[0]) - w.droop!);
        record('droop (fraction)', name, dr);
        expect(dr, 'droop').toBeLessThan(0.02);
      }
    }
  });
});
