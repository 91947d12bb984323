/**
 * Every figure cross-checked against ngspice, an independent general-purpose simulator (Debian package
 * `ngspice`), on the netlist `gainwright report --spice` exports, run unmodified with `ngspice -b`.
 * Tolerances: gain 0.1 %, bandwidth 2 %, noise density 3 %, integrated noise 3 %, clip levels 10 mV,
 * DC points 1 mV. ngspice's Boltzmann constant is an older CODATA value, ~3.5e-7 relative off the exact one.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { analyse, type Report } from '../../src/analysis/report.js';
import { spiceNetlist } from '../../src/present/spice.js';
import { transferAt } from '../../src/analysis/analysis.js';
import { CROSSCHECK_DESIGNS } from './designs.js';
import { TOPOLOGIES } from '../../src/model/design.js';

const hasNgspice = spawnSync('sh', ['-c', 'command -v ngspice'], { stdio: 'ignore' }).status === 0;
if (!hasNgspice && process.env.CI === 'true') throw new Error('ngspice is required under CI=true (apt-get install -y ngspice)');

type Table = { cols: string[]; rows: number[][] };
function readTable(path: string): Table {
  const lines = readFileSync(path, 'utf8').trim().split('\n');
  const cols = lines[0]!.trim().split(/\s+/);
  return { cols, rows: lines.slice(1).map((l) => l.trim().split(/\s+/).map(Number)) };
}
/** Linear interpolation of column `c` at x in column 0 (x ascending). */
function interp(t: Table, x: number, c = 1, logx = false): number {
  const r = t.rows;
  for (let i = 1; i < r.length; i++) {
    if (r[i]![0]! >= x) {
      const [x0, x1] = logx ? [Math.log(r[i - 1]![0]!), Math.log(r[i]![0]!)] : [r[i - 1]![0]!, r[i]![0]!];
      const xx = logx ? Math.log(x) : x;
      const w = (xx - x0) / (x1 - x0 || 1);
      return r[i - 1]![c]! + w * (r[i]![c]! - r[i - 1]![c]!);
    }
  }
  return r[r.length - 1]![c]!;
}

/** Frequency where |H| (column 1, log-interpolated) crosses `level`, walking rows from `from` by `step` (±1). */
function crossingIn(t: Table, from: number, step: 1 | -1, level: number): number {
  for (let i = from; i + step >= 0 && i + step < t.rows.length; i += step) {
    const [fa, ma] = t.rows[i]!, [fb, mb] = t.rows[i + step]!;
    if (mb! < level) {
      const w = (Math.log(level) - Math.log(ma!)) / (Math.log(mb!) - Math.log(ma!));
      return Math.exp(Math.log(fa!) + w * (Math.log(fb!) - Math.log(fa!)));
    }
  }
  return NaN;
}

const worst: Record<string, { value: number; design: string }> = {};
function record(figure: string, design: string, value: number) {
  if (!worst[figure] || value > worst[figure]!.value) worst[figure] = { value, design };
}

function runSpice(r: Report): string {
  const dir = mkdtempSync(join(tmpdir(), 'gw-spice-'));
  const net = spiceNetlist(r, { date: '2026-12-01' });
  if (!net) throw new Error('no netlist');
  writeFileSync(join(dir, 'design.cir'), net);
  const run = spawnSync('ngspice', ['-b', 'design.cir'], { cwd: dir, encoding: 'utf8', timeout: 60_000 });
  const log = `${run.stdout}\n${run.stderr}`;
  // ngspice -b exits 0 even after errors: scan what it printed.
  const errs = log.split('\n').filter((l) => /error|aborted|singular|timestep too small/i.test(l));
  if (errs.length) throw new Error(`ngspice reported: ${errs.slice(0, 5).join(' | ')}`);
  return dir;
}

describe.skipIf(!hasNgspice)('cross-check against ngspice', () => {
  afterAll(() => {
    const out = join(tmpdir(), 'gainwright-crosscheck.json');
    writeFileSync(out, JSON.stringify(worst, null, 2));
    console.log(`largest disagreements (also in ${out}):`);
    for (const [k, v] of Object.entries(worst)) console.log(`  ${k}: ${v.value.toPrecision(3)} (${v.design})`);
  });

  it('has at least 18 designs covering every stage (two of each new one), every sensor type, single and split supplies', () => {
    const reps = CROSSCHECK_DESIGNS.map(([, d]) => analyse(d, { spreadTrials: 0 }));
    expect(reps.length).toBeGreaterThanOrEqual(18);
    for (const t of ['summing-non-inverting', 'summing-inverting', 'difference']) expect(reps.filter((r) => r.stage?.ideal.topology === t).length, t).toBeGreaterThanOrEqual(2);
    expect(new Set(reps.map((r) => r.stage?.ideal.topology))).toEqual(new Set(TOPOLOGIES));
    expect(new Set(reps.map((r) => r.design.sensor.type)).size).toBe(5);
    expect(reps.some((r) => r.design.supply.negative < 0)).toBe(true);
    expect(reps.some((r) => r.design.supply.negative === 0)).toBe(true);
    expect(reps.some((r) => r.stage?.network.reference.trim)).toBe(true);
    expect(reps.some((r) => r.stage?.network.reference.kind === 'divider' && !r.stage.network.reference.trim)).toBe(true);
    expect(reps.some((r) => r.design.output.filter?.capacitance)).toBe(true);
  });

  it.each(CROSSCHECK_DESIGNS)('%s', (name, design) => {
    const r = analyse(design, { spreadTrials: 0 });
    expect(r.circuit, 'design must solve').not.toBeNull();
    const dir = runSpice(r);
    const dc = r.dc!, clip = r.clip!, sp = r.speed!, nz = r.noise!;
    // Operating point at zero measurand.
    const op = readTable(join(dir, 'gainwright-op.txt'));
    const opOut = op.rows[0]![op.cols.length - 1]!;
    record('zero (V)', name, Math.abs(opOut - dc.out[0]));
    expect(Math.abs(opOut - dc.out[0])).toBeLessThan(1e-3);

    if (r.front.passesDc) {
      const t = readTable(join(dir, 'gainwright-dc.txt'));
      const sig = r.circuit!.circuit.elements[r.circuit!.signalIndex]!;
      const src = (x: number) => (sig.dc0 ?? 0) + (sig.dc1 ?? 0) * x;
      // DC transfer at 5 points across the range (clipped where the report says it clips).
      const [a, b] = clip.rangePeak;
      for (let k = 0; k < 5; k++) {
        const x = a + ((b - a) * k) / 4;
        const xc = Math.min(Math.max(x, clip.measurandLow), clip.measurandHigh);
        const want = dc.out[0] + dc.out[1] * xc;
        const got = interp(t, src(x));
        record('DC point (V)', name, Math.abs(got - want));
        expect(Math.abs(got - want), `x = ${x}`).toBeLessThan(1e-3);
      }
      // Small-signal gain from the sweep's slope about zero.
      const h = (b - a) / 100;
      const slope = (interp(t, src(h)) - interp(t, src(-h))) / (2 * h);
      record('gain (relative)', name, Math.abs(slope / dc.out[1] - 1));
      expect(Math.abs(slope / dc.out[1] - 1)).toBeLessThan(1e-3);
      // Clip levels and where clipping starts, for the output swing (what the netlist models).
      const x0 = r.transfer!.x[0]!, x1 = r.transfer!.x[r.transfer!.x.length - 1]!;
      const ends: Array<[number, number, string | null]> = [[x0, clip.measurandLow, clip.firstLow], [x1, clip.measurandHigh, clip.firstHigh]];
      for (const [xe, xclip, cause] of ends) {
        if (cause !== 'opamp-output' || !(Math.abs(xclip) < Math.abs(xe))) continue;
        const want = dc.out[0] + dc.out[1] * xclip;
        const got = interp(t, src(xe));
        record('clip level (V)', name, Math.abs(got - want));
        expect(Math.abs(got - want)).toBeLessThan(10e-3);
        // First sweep point (going outward from zero) that leaves the linear line by more than 2 mV.
        const steps = 2000;
        let found = NaN;
        for (let i = 0; i <= steps; i++) {
          const x = (xe * i) / steps;
          if (Math.abs(interp(t, src(x)) - (dc.out[0] + dc.out[1] * x)) > 2e-3) { found = x; break; }
        }
        const tol = Math.abs(x1 - x0) / 400 * 2 + 2e-3 / Math.abs(dc.out[1]);
        record('clip measurand (relative)', name, Math.abs(found - xclip) / Math.abs(xclip));
        expect(Math.abs(found - xclip)).toBeLessThan(tol);
      }
    }
    // AC: passband gain and the −3 dB corner.
    const ac = readTable(join(dir, 'gainwright-ac.txt'));
    const fRef = r.front.passesDc ? ac.rows[0]![0]! : Math.sqrt(sp.lowCorner * sp.smallSignal);
    const mine = Math.hypot(...transferAt(r.circuit!, fRef));
    const theirs = interp(ac, fRef, 1, true);
    record('AC gain (relative)', name, Math.abs(theirs / mine - 1));
    expect(Math.abs(theirs / mine - 1)).toBeLessThan(1e-3);
    const ref = r.front.passesDc ? ac.rows[0]![1]! : Math.max(...ac.rows.map((row) => row[1]!));
    const start = Math.max(ac.rows.findIndex((row) => row[0]! >= fRef) - 1, 0);
    const corner = crossingIn(ac, start, 1, ref / Math.SQRT2);
    record('bandwidth (relative)', name, Math.abs(corner / sp.smallSignal - 1));
    expect(Math.abs(corner / sp.smallSignal - 1)).toBeLessThan(0.02);
    if (!r.front.passesDc) {
      // The low corner of an AC-coupled chain, going down from the peak.
      const low = crossingIn(ac, ac.rows.findIndex((row) => row[1] === ref), -1, ref / Math.SQRT2);
      record('low corner (relative)', name, Math.abs(low / sp.lowCorner - 1));
      expect(Math.abs(low / sp.lowCorner - 1)).toBeLessThan(0.02);
    }
    // Noise: density at 1 kHz and integrated rms over the report's band.
    const ns = readTable(join(dir, 'gainwright-noise.txt'));
    if (nz.band[0] <= 1000 && nz.band[1] >= 1000) {
      const d1k = interp(ns, 1000, 1, true);
      record('noise density (relative)', name, Math.abs(d1k / nz.densityAt1kHz - 1));
      expect(Math.abs(d1k / nz.densityAt1kHz - 1)).toBeLessThan(0.03);
    }
    // At the band's low end (1 Hz by default) the op-amp's 1/f noise dominates where it has a corner: both
    // the report's density²·(1 + f_c/f) and ngspice's resistor flicker noise must agree there too.
    const fLow = nz.spectrum.freqs[0]!;
    const dLow = interp(ns, fLow, 1, true);
    record('noise density at the band\'s low end (relative)', name, Math.abs(dLow / nz.spectrum.total[0]! - 1));
    expect(Math.abs(dLow / nz.spectrum.total[0]! - 1)).toBeLessThan(0.03);
    let p = 0;
    for (let i = 1; i < ns.rows.length; i++) {
      const [f0, e0] = ns.rows[i - 1]!, [f1, e1] = ns.rows[i]!;
      // Trapezoid in ln f on S·f.
      p += 0.5 * (e0! ** 2 * f0! + e1! ** 2 * f1!) * Math.log(f1! / f0!);
    }
    record('integrated noise (relative)', name, Math.abs(Math.sqrt(p) / nz.rms - 1));
    expect(Math.abs(Math.sqrt(p) / nz.rms - 1)).toBeLessThan(0.03);
    expect(existsSync(join(dir, 'design.cir'))).toBe(true);
  });
});
