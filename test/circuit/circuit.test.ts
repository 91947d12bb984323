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
    // Hand derivation (nodal analysis, Kirchhoff's current law; e.g. Nilsson & Riedel, Electric Circuits, the node-voltage
    // method, from memory). In this demo the rail feeds only the reference top arm Rt, which meets the feedback arm Rf and the
    // bottom arm Rb at the − input (node n); the + input sits at the sensor's quiescent output Vp (no bias current at the
    // nominal point, so no drop in the source resistance). The op-amp is a gain A = 10^(dB/20) behind its output resistance
    // Ro into the load RL at node o. KCL:
    //   node n: (V+ − Vn)/Rt + (Vo − Vn)/Rf = Vn/Rb
    //   node o: (A·(Vp − Vn) − Vo)/Ro = Vo/RL + (Vo − Vn)/Rf
    // Two linear equations in Vn, Vo, solved by Cramer's rule; the rail current is then (V+ − Vn)/Rt, by Ohm's law.
    // (With an ideal op-amp Vn = Vp exactly and the current is (V+ − Vp)/Rt; the finite gain moves it by about 1e-5.)
    const top = r.stage!.parts.filter((p) => p.role === 'reference-top');
    const bot = r.stage!.parts.filter((p) => p.role === 'reference-bottom');
    const fb = r.stage!.parts.filter((p) => p.role === 'feedback');
    const arm = (ps: typeof top) => (ps.length === 2 && ps[0]!.arrangement === 'parallel' ? (ps[0]!.ohms * ps[1]!.ohms) / (ps[0]!.ohms + ps[1]!.ohms) : ps.reduce((s, p) => s + p.ohms, 0));
    const d = r.design;
    expect(d.supply.referenceRail).toBe('positive');
    expect(d.sensor.type).toBe('voltage-output');
    const vRail = d.supply.positive, vp = (d.sensor as { quiescent: number }).quiescent;
    const rt = arm(top), rb = arm(bot), rf = arm(fb), ro = d.opamp.outputResistance, rl = d.output.load.resistance;
    const a = 10 ** (d.opamp.openLoopGainDb / 20);
    // a11·Vn + a12·Vo = b1 ; a21·Vn + a22·Vo = b2
    const a11 = 1 / rt + 1 / rf + 1 / rb, a12 = -1 / rf, b1 = vRail / rt;
    const a21 = a / ro - 1 / rf, a22 = 1 / ro + 1 / rl + 1 / rf, b2 = (a * vp) / ro;
    const vn = (b1 * a22 - a12 * b2) / (a11 * a22 - a12 * a21);
    const i = (vRail - vn) / rt;
    expect(Math.abs(part.current / i - 1)).toBeLessThan(1e-9);
    // The ideal-op-amp figure differs from it only by the finite-gain error (Vo/A over V+ − Vp, about 7e-6 here).
    expect(Math.abs(part.current / ((vRail - vp) / rt) - 1)).toBeLessThan(1e-4);
  });
});
