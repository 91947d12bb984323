import { describe, expect, it } from 'vitest';
import { compile, type Element } from '../../src/circuit/mna.js';
import { transient, type TransientPlan } from '../../src/circuit/transient.js';
import { interpolate } from '../../src/circuit/transient.js';

// A unit step source into R = 1 kΩ and C = 1 µF (τ = 1 ms): v_C = 1 − e^(−t/τ) (first-order RC step
// response, e.g. Hayt, Kemmerly & Durbin, Engineering Circuit Analysis, the driven RC circuit).
const rc: Element[] = [
  { kind: 'V', name: 'V1', a: 1, b: 0, value: 0, dc0: 0, dc1: 1 },
  { kind: 'R', name: 'R1', a: 1, b: 2, value: 1000 },
  { kind: 'C', name: 'C1', a: 2, b: 0, value: 1e-6 },
];
const plan = (h: number, extra: Partial<TransientPlan> = {}): TransientPlan => ({
  measurand: (t, left) => ((left ? t > 0 : t >= 0) ? 1 : 0), t0: -1e-3, t1: 5e-3, breakpoints: [0],
  hMin: h, hFine: h, hMax: h, hMaxWarm: h, fineFor: 0, recordFrom: -1e-3, nodes: [2], limits: [], ...extra,
});

describe('transient (BDF2)', () => {
  it('an RC low-pass step reaches 1 − 1/e at t = τ', () => {
    const c = compile(['0', 'in', 'out'], rc);
    const tr = transient(c, plan(1e-6))!;
    expect(interpolate(tr.t, tr.v[0]!, 1e-3)).toBeCloseTo(1 - Math.exp(-1), 5);
    expect(interpolate(tr.t, tr.v[0]!, -0.5e-3)).toBe(0);
  });

  it('its error falls about fourfold when the step halves (second order)', () => {
    const c = compile(['0', 'in', 'out'], rc);
    const err = (h: number) => { const tr = transient(c, plan(h))!; return Math.abs(interpolate(tr.t, tr.v[0]!, 2e-3) - (1 - Math.exp(-2))); };
    const ratio = err(2e-5) / err(1e-5);
    expect(ratio).toBeGreaterThan(3.5);
    expect(ratio).toBeLessThan(4.5);
  });

  it('an inductor in series with R carries i = (1 − e^(−tR/L))/R after a unit step (RL step response, same text)', () => {
    const els: Element[] = [
      { kind: 'V', name: 'V1', a: 1, b: 0, value: 0, dc0: 0, dc1: 1 },
      { kind: 'R', name: 'R1', a: 1, b: 2, value: 10 },
      { kind: 'L', name: 'L1', a: 2, b: 0, value: 10e-3 },
    ];
    const c = compile(['0', 'in', 'mid'], els);
    const tr = transient(c, plan(1e-7, { t1: 3e-3 }))!;
    // v(mid) = e^(−t/τ), τ = L/R = 1 ms.
    expect(interpolate(tr.t, tr.v[0]!, 1e-3)).toBeCloseTo(Math.exp(-1), 4);
  });

  it('a limited gain block slews at SR and holds at its limit (mode bits 1 and 2)', () => {
    // Unity follower: E with A0 = 1e5 and a 10 Hz pole driving its own − input; SR = 1 V/µs, output 0…0.5 V.
    const els: Element[] = [
      { kind: 'V', name: 'V1', a: 1, b: 0, value: 0, dc0: 0, dc1: 1 },
      { kind: 'E', name: 'EOA', a: 2, b: 0, value: 1e5, pole: 10, cp: 1, cn: 2 },
      { kind: 'R', name: 'RL', a: 2, b: 0, value: 1e4 },
    ];
    const c = compile(['0', 'in', 'out'], els);
    const tr = transient(c, plan(1e-9, { t1: 2e-6, t0: -1e-7, recordFrom: -1e-7, limits: [{ index: 1, low: 0, high: 0.5, slew: 1e6 }] }))!;
    expect(interpolate(tr.t, tr.v[0]!, 0.2e-6)).toBeCloseTo(0.2, 3);
    expect(interpolate(tr.t, tr.v[0]!, 1.5e-6)).toBe(0.5);
    expect(Array.from(tr.mode).some((m) => m & 1)).toBe(true);
    expect(Array.from(tr.mode).some((m) => m & 2)).toBe(true);
  });
});
