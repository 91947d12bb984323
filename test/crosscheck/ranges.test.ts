/**
 * The range switch (issue 19) against ngspice: each position of both wirings exported as its own netlist
 * (`gainwright report --spice --range=N`) and run unmodified with `ngspice -b`. Compared: the zero (operating
 * point, 1 mV), the scale (DC sweep slope, 0.1 %) and the −3 dB bandwidth (2 %), as in the main cross-check;
 * and, with one pole, the zero's shift between positions against the report's (1 mV).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { analyse } from '../../src/analysis/report.js';
import { positionNetlist } from '../../src/present/ranges.js';
import { designFrom } from '../helpers.js';

const hasNgspice = spawnSync('sh', ['-c', 'command -v ngspice'], { stdio: 'ignore' }).status === 0;
if (!hasNgspice && process.env.CI === 'true') throw new Error('ngspice is required under CI=true (apt-get install -y ngspice)');

type Table = { rows: number[][] };
const readTable = (path: string): Table => ({ rows: readFileSync(path, 'utf8').trim().split('\n').slice(1).map((l) => l.trim().split(/\s+/).map(Number)) });
function interp(t: Table, x: number): number {
  const r = t.rows;
  for (let i = 1; i < r.length; i++) if (r[i]![0]! >= x) { const w = (x - r[i - 1]![0]!) / (r[i]![0]! - r[i - 1]![0]! || 1); return r[i - 1]![1]! + w * (r[i]![1]! - r[i - 1]![1]!); }
  return r[r.length - 1]![1]!;
}

function run(net: string): string {
  const dir = mkdtempSync(join(tmpdir(), 'gw-range-'));
  writeFileSync(join(dir, 'position.cir'), net);
  const out = spawnSync('ngspice', ['-b', 'position.cir'], { cwd: dir, encoding: 'utf8', timeout: 60_000 });
  const errs = `${out.stdout}\n${out.stderr}`.split('\n').filter((l) => /error|aborted|singular|timestep too small/i.test(l));
  if (errs.length) throw new Error(`ngspice reported: ${errs.slice(0, 5).join(' | ')}`);
  return dir;
}

// Both wirings of the two-range bench clamp (a scenario of our own), and a three-range CT on an inverting stage.
const CASES: Array<[string, () => ReturnType<typeof designFrom>]> = [
  ['two-range clamp, two poles', () => designFrom('two-range-clamp', (x) => { x.target.rangeSwitch = 'two-pole'; })],
  ['two-range clamp, one pole', () => designFrom('two-range-clamp', (x) => { x.target.rangeSwitch = 'single-pole'; })],
  ['three-range CT, inverting, one pole', () => designFrom('appliance-ct', (x) => { x.target.topology = 'inverting'; x.target.ranges = [{ scale: -0.03, range: [-30, 30] }, { scale: -0.06, range: [-15, 15] }]; x.target.rangeSwitch = 'single-pole'; })],
  ['three-range CT, inverting, two poles', () => designFrom('appliance-ct', (x) => { x.target.topology = 'inverting'; x.target.ranges = [{ scale: -0.03, range: [-30, 30] }, { scale: -0.06, range: [-15, 15] }]; x.target.rangeSwitch = 'two-pole'; })],
];

const worst: Record<string, number> = {};
const record = (k: string, v: number) => { worst[k] = Math.max(worst[k] ?? 0, v); };

describe.skipIf(!hasNgspice)('range switch positions against ngspice', () => {
  afterAll(() => console.log(`range switch, largest disagreements: ${Object.entries(worst).map(([k, v]) => `${k} ${v.toPrecision(2)}`).join('; ')}`));
  it.each(CASES)('%s', (name, make) => {
    const r = analyse(make(), { spreadTrials: 0 });
    if (!r.ranges?.ok) throw new Error(`${name}: no switch`);
    const sw = r.ranges.value;
    expect(sw.positions.every((p) => p.report?.circuit)).toBe(true);
    const zeros: number[] = [];
    for (const p of sw.positions) {
      const rep = p.report!;
      const net = positionNetlist(r, p.index + 1, { date: '2026-12-02' })!;
      const dir = run(net);
      const op = readFileSync(join(dir, 'gainwright-op.txt'), 'utf8').trim().split('\n')[1]!.trim().split(/\s+/).map(Number);
      const zero = op[op.length - 1]!;
      zeros.push(zero);
      record('zero (V)', Math.abs(zero - rep.dc!.out[0]));
      expect(Math.abs(zero - rep.dc!.out[0]), `${name} position ${p.index + 1} zero`).toBeLessThan(1e-3);
      if (rep.front.passesDc) {
        const t = readTable(join(dir, 'gainwright-dc.txt'));
        const sig = rep.circuit!.circuit.elements[rep.circuit!.signalIndex]!;
        const src = (x: number) => (sig.dc0 ?? 0) + (sig.dc1 ?? 0) * x;
        const h = (p.range[1] - p.range[0]) / 100;
        const slope = (interp(t, src(h)) - interp(t, src(-h))) / (2 * h);
        record('scale (relative)', Math.abs(slope / rep.dc!.out[1] - 1));
        expect(Math.abs(slope / rep.dc!.out[1] - 1), `${name} position ${p.index + 1} scale`).toBeLessThan(1e-3);
      }
      // −3 dB bandwidth from the AC sweep: the passband magnitude's 1/√2 crossing above its peak.
      const ac = readTable(join(dir, 'gainwright-ac.txt'));
      let peak = 0, at = 0;
      ac.rows.forEach((row, i) => { if (row[1]! > peak) { peak = row[1]!; at = i; } });
      let bw = NaN;
      for (let i = at; i + 1 < ac.rows.length; i++) {
        const [fa, ma] = ac.rows[i]!, [fb, mb] = ac.rows[i + 1]!;
        if (mb! < peak / Math.SQRT2) { const w = (Math.log(peak / Math.SQRT2) - Math.log(ma!)) / (Math.log(mb!) - Math.log(ma!)); bw = Math.exp(Math.log(fa!) + w * (Math.log(fb!) - Math.log(fa!))); break; }
      }
      record('bandwidth (relative)', Math.abs(bw / rep.speed!.smallSignal - 1));
      expect(Math.abs(bw / rep.speed!.smallSignal - 1), `${name} position ${p.index + 1} bandwidth`).toBeLessThan(0.02);
    }
    // The zero's move between positions, simulated, against the report's.
    sw.positions.forEach((p, i) => record('zero shift (V)', Math.abs((zeros[i]! - zeros[0]!) - p.zeroShift)));
    sw.positions.forEach((p, i) => expect(Math.abs((zeros[i]! - zeros[0]!) - p.zeroShift), `${name} shift ${i + 1}`).toBeLessThan(1e-3));
    if (sw.wiring === 'two-pole') for (const z of zeros) expect(Math.abs(z - zeros[0]!)).toBeLessThan(1e-3);
    else expect(Math.max(...zeros.map((z) => Math.abs(z - zeros[0]!)))).toBeGreaterThan(1e-2);
  });
});
