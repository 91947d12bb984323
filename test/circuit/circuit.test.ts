import { describe, expect, it } from 'vitest';
import { buildCircuit } from '../../src/circuit/build.js';
import { analyse } from '../../src/analysis/report.js';
import { designFrom } from '../helpers.js';

describe('buildCircuit', () => {
  it('has one element per fixed part at its value, trimmer halves summing to the trimmer, and the load', () => {
    const r = analyse(designFrom('generic-sensor'), { spreadTrials: 0 });
    const c = buildCircuit(r.design, r.stage!, r.front).circuit;
    for (const p of r.stage!.parts.filter((x) => x.kind === 'resistor')) expect(c.elements.find((e) => e.name === p.ref)?.value).toBe(p.ohms);
    const zt = r.stage!.parts.find((p) => p.role === 'zero-trim')!;
    const halves = c.elements.filter((e) => e.name === `${zt.ref}A` || e.name === `${zt.ref}B`).map((e) => e.value);
    expect(halves.reduce((a, b) => a + b, 0)).toBeCloseTo(zt.ohms, 9);
    expect(c.elements.find((e) => e.name === 'RLOAD')!.value).toBe(1e6);
  });
  it('the DC operating point obeys Ohm\'s law in the divider: its current equals the rail current it reports', () => {
    const r = analyse(designFrom('generic-sensor', (x) => { x.target.trim = { gain: false, zero: false }; }), { spreadTrials: 0 });
    const part = r.supply!.parts.find((p) => p.name.startsWith('reference divider'))!;
    // Divider current ≈ V+ / (Rtop + Rbottom) when the feedback network's share is small.
    const top = r.stage!.parts.filter((p) => p.role === 'reference-top');
    const bot = r.stage!.parts.filter((p) => p.role === 'reference-bottom');
    const arm = (ps: typeof top) => (ps.length === 2 && ps[0]!.arrangement === 'parallel' ? (ps[0]!.ohms * ps[1]!.ohms) / (ps[0]!.ohms + ps[1]!.ohms) : ps.reduce((s, p) => s + p.ohms, 0));
    const i = 9 / (arm(top) + arm(bot));
    expect(part.current / i).toBeGreaterThan(0.8);
    expect(part.current / i).toBeLessThan(1.2);
  });
});
