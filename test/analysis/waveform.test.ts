import { describe, expect, it } from 'vitest';
import { analyse } from '../../src/analysis/report.js';
import { blockLimits, edgeFigures, measurandAt, squareDroop, stepOverRange } from '../../src/analysis/waveform.js';
import { validateDesign } from '../../src/model/design.js';
import { DEMOS } from '../../src/model/demos.js';
import { designFrom, shuntOnSplitSupply } from '../helpers.js';

/** A shunt on ±5 V with no sensor pole, no output filter and no load capacitance: a single-pole closed loop. */
const singlePole = (patch: (d: any) => void = () => {}) => designFrom('generic-sensor', (d) => {
  shuntOnSplitSupply(d);
  d.target.zero = 0.5;
  d.output = { filter: null, load: { resistance: 1e6, capacitance: 0 } };
  d.opamp.outputResistance = 0;
  patch(d);
});

describe('measurandAt', () => {
  const sq = { shape: 'square' as const, low: -1, high: 3, frequency: 1000, duty: 0.25 };
  it('a step is low before 0 and high from 0 (and low just before 0)', () => {
    const st = { shape: 'step' as const, low: 1, high: 5, frequency: 0, duty: 0.5 };
    expect([measurandAt(st, -1e-9), measurandAt(st, 0), measurandAt(st, 0, true), measurandAt(st, 1)]).toEqual([1, 5, 1, 5]);
  });
  it('a square is high for duty·T from each period start', () => {
    expect([measurandAt(sq, 0), measurandAt(sq, 0.2e-3), measurandAt(sq, 0.3e-3), measurandAt(sq, 0.99e-3), measurandAt(sq, 1e-3, true)]).toEqual([3, 3, -1, -1, -1]);
  });
  it('a triangle rises over duty·T and falls over the rest', () => {
    const tri = { ...sq, shape: 'triangle' as const };
    expect(measurandAt(tri, 0)).toBeCloseTo(-1, 12);
    expect(measurandAt(tri, 0.125e-3)).toBeCloseTo(1, 12);
    expect(measurandAt(tri, 0.25e-3)).toBeCloseTo(3, 12);
    expect(measurandAt(tri, 0.625e-3)).toBeCloseTo(1, 12);
  });
});

describe('edgeFigures and squareDroop on known traces', () => {
  it('a sampled single-pole step gives ln 9·τ rise, no overshoot and ln 100·τ settling (first-order step response, Sedra & Smith, Microelectronic Circuits, STC circuits)', () => {
    const tau = 1e-6, n = 20001;
    const t = Float64Array.from({ length: n }, (_, i) => (i / (n - 1)) * 20 * tau);
    const v = t.map((x) => 1 - Math.exp(-x / tau));
    const f = edgeFigures(t, v, 0, t[n - 1]!);
    expect(f.riseTime! / (Math.log(9) * tau)).toBeCloseTo(1, 4);
    expect(f.overshoot).toBeLessThan(1e-6);
    // Within 1 % of the settled value (1 − e⁻²⁰) once e^(−t/τ) < 0.01·(1 − e⁻²⁰).
    expect(f.settlingTime! / (Math.log(100) * tau)).toBeCloseTo(1, 3);
  });
  it('a first-order high-pass square response droops by 1 − exp(−t_half/τ) (RC high-pass tilt, Millman & Halkias, Integrated Electronics)', () => {
    const T = 1e-3, tau = 0.5e-3, n = 4001;
    const t = Float64Array.from({ length: n }, (_, i) => (i / (n - 1)) * T);
    // Steady state about 0: V1 just after the edge, decaying; V1 = A/(1 + e^(−T/2τ)) for a step of A.
    const x = Math.exp(-T / 2 / tau), v1 = 1 / (1 + x);
    const v = t.map((s) => (s < T / 2 ? v1 * Math.exp(-s / tau) : -v1 * Math.exp(-(s - T / 2) / tau)));
    expect(squareDroop(t, v, T, 0.5, 0)).toBeCloseTo(1 - x, 4);
  });
});

describe('waveform in the report', () => {
  it('is absent unless the design names one or the caller asks for the default step', () => {
    const d = singlePole();
    expect(analyse(d, { spreadTrials: 0 }).waveform).toBeNull();
    const r = analyse(d, { spreadTrials: 0, defaultWaveform: true });
    expect(r.waveformSpec).toEqual(stepOverRange(d));
    expect(r.waveform!.t.length).toBe(2000);
  });

  it('single-pole closed loop: a small step rises in ln 9/(2π f−3dB) (Sedra & Smith, Microelectronic Circuits, single-time-constant step response: t_r = 2.2τ)', () => {
    const d = singlePole((x) => { x.analysis = { waveform: { shape: 'step', low: 0, high: 0.05 } }; });
    const r = analyse(d, { spreadTrials: 0 });
    const w = r.waveform!;
    expect(w.slewLimited).toBe(false);
    expect(w.clipped).toBe(false);
    const want = Math.log(9) / (2 * Math.PI * r.speed!.smallSignal);
    expect(Math.abs(w.riseTime! / want - 1)).toBeLessThan(0.01);
    expect(w.overshoot!).toBeLessThan(0.001);
    // 1 % settling of a single pole: ln 100 · τ.
    expect(Math.abs(w.settlingTime! / (Math.log(100) / (2 * Math.PI * r.speed!.smallSignal)) - 1)).toBeLessThan(0.02);
    // The output settles on the DC transfer.
    expect(w.output[w.output.length - 1]).toBeCloseTo(w.ideal[w.ideal.length - 1]!, 4);
  });

  it('a large step is slew-limited: 10–90 % in 0.8·ΔV/SR (Franco, Design with Operational Amplifiers, slew-rate limiting, from memory)', () => {
    const d = singlePole((x) => { x.opamp.slewRate = 1e4; x.analysis = { waveform: { shape: 'step', low: -2, high: 2 } }; });
    const r = analyse(d, { spreadTrials: 0 });
    const w = r.waveform!;
    expect(w.slewLimited).toBe(true);
    // Slewing ends once the loop's error falls below SR·τ (Franco, from memory): here 0.08 V of a 2 V edge, past the 90 % point.
    const dv = w.output[w.output.length - 1]! - w.output[0]!;
    const want = (0.8 * Math.abs(dv)) / 1e4;
    expect(Math.abs(w.riseTime! / want - 1)).toBeLessThan(0.02);
  });

  it('current transformer: a square wave\'s flat top decays as exp(−t·R/L_m) (first-order RL high-pass, Hughes Electrical and Electronic Technology, RL transients)', () => {
    const d = designFrom('appliance-ct', (x) => {
      x.supply = { positive: 5, negative: -5 };
      x.target = { ...x.target, scale: 0.2, zero: 0.5, topology: 'non-inverting' };
      x.output = { filter: null, load: { resistance: 1e6, capacitance: 15e-12 } };
    });
    const s = d.sensor as any;
    const lm = s.inductanceFactor * s.secondaryTurns ** 2, rr = s.burden + s.windingResistance;
    const tauL = lm / rr;
    const f = 1 / (2 * tauL); // half-period = τ_L: droop 1 − e⁻¹
    const r = analyse({ ...d, analysis: { ...d.analysis, waveform: { shape: 'square', low: -2, high: 2, frequency: f, duty: 0.5 } } }, { spreadTrials: 0 });
    const w = r.waveform!;
    expect(Math.abs(w.droop! / (1 - Math.exp(-1)) - 1)).toBeLessThan(0.02);
    // The log of the flat top above the zero falls with slope −R/L_m.
    const z = r.dc!.out[0];
    const T = 1 / f;
    const at = (tt: number) => { const k = Math.round((tt / (2 * T)) * (w.t.length - 1)); return w.output[k]! - z; };
    const slope = (Math.log(Math.abs(at(0.45 * T))) - Math.log(Math.abs(at(0.1 * T)))) / (0.35 * T);
    expect(Math.abs(slope / (-rr / lm) - 1)).toBeLessThan(0.01);
  });

  it('a sine driven past the range is flat at the DC clip level within 10 mV', () => {
    const d = designFrom('generic-sensor', (x) => { x.analysis = { waveform: { shape: 'sine', low: -60, high: 60, frequency: 50 } }; });
    const r = analyse(d, { spreadTrials: 0 });
    const w = r.waveform!, c = r.clip!;
    expect(w.clipped).toBe(true);
    let flat = 0;
    const span = c.outputHigh - c.outputLow;
    for (let k = 0; k < w.t.length; k++) {
      if (w.ideal[k]! > c.outputHigh + 0.05 * span) { flat++; expect(Math.abs(w.output[k]! - c.outputHigh)).toBeLessThan(0.01); }
      if (w.ideal[k]! < c.outputLow - 0.05 * span) { flat++; expect(Math.abs(w.output[k]! - c.outputLow)).toBeLessThan(0.01); }
    }
    expect(flat).toBeGreaterThan(100);
  });

  it('a sine inside the range follows the ideal and is neither clipped nor slew-limited', () => {
    const d = designFrom('generic-sensor', (x) => { x.analysis = { waveform: { shape: 'sine', low: -15, high: 15, frequency: 50 } }; });
    const w = analyse(d, { spreadTrials: 0 }).waveform!;
    expect(w.clipped).toBe(false);
    expect(w.slewLimited).toBe(false);
    let worst = 0;
    for (let k = 0; k < w.t.length; k++) worst = Math.max(worst, Math.abs(w.output[k]! - w.ideal[k]!));
    // 50 Hz against a ~100 kHz chain: within a few mV of the DC transfer.
    expect(worst).toBeLessThan(0.01);
    expect(w.riseTime).toBeNull();
  });

  it('every demo gets a finite waveform for its default step', () => {
    for (const demo of DEMOS) {
      const v = validateDesign(structuredClone(demo.document));
      if (!v.ok) throw new Error('demo invalid');
      const w = analyse(v.design, { spreadTrials: 0, defaultWaveform: true }).waveform!;
      expect(w, demo.id).not.toBeNull();
      for (const a of [w.t, w.measurand, w.output, w.ideal]) expect(a.every(Number.isFinite), demo.id).toBe(true);
    }
  });
});

describe('a square wave that the warm-up steps through coarsely', () => {
  // A periodic wave is run for warm-up periods before the recorded window with long steps between its edges.
  // Where the op-amp slews to a corner inside such a step, the solve must restart there (as at an edge) and not
  // carry the slope across it: otherwise it cycles up and down on what is a plateau (common practice for
  // multistep integrators at a discontinuity in the derivative; Hairer & Wanner, Solving ODEs II, §III.5, from
  // memory). Our scenario: the closed-loop demo with a ±20 A square at 500 and 200 Hz.
  it.each([500, 200])('%s Hz through the closed-loop demo: each period starts on the same low plateau, the previous period ended on', (f) => {
    const d = designFrom('closed-loop-clamp', (x) => { x.analysis = { waveform: { shape: 'square', low: -20, high: 20, frequency: f, duty: 0.5 } }; });
    const w = analyse(d, { spreadTrials: 0 }).waveform!;
    let lo = Infinity, hi = -Infinity;
    for (const v of w.output) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
    const T = 1 / f;
    // The sample at t = 0 is the output just before the rising edge; the sample just before t = 2T the same
    // plateau one period later (the slow tail of the winding moves it by far less than 1 % of the span).
    const before = w.output[0]!;
    const k = w.t.findIndex((t) => t >= 2 * T - 1e-9 * T) - 1;
    expect(Math.abs(before - w.output[k]!) / (hi - lo)).toBeLessThan(0.01);
    // And the span is the edge the stage makes: nothing below the low plateau or above the high one by more than 5 %.
    expect((hi - lo) / Math.abs(d.target.scale * 40)).toBeLessThan(1.05);
  });
});

describe('waveform at the edges of the inputs', () => {
  const cases: Array<[string, object, (d: any) => void]> = [
    ['a 1 V/s slew rate (a ramp far longer than τ)', { shape: 'step', low: -20, high: 20 }, (d) => { d.opamp.slewRate = 1; }],
    ['a 1 GHz square into a ~100 kHz chain', { shape: 'square', low: -20, high: 20, frequency: 1e9, duty: 0.5 }, () => {}],
    ['a 1 µHz sine', { shape: 'sine', low: -20, high: 20, frequency: 1e-6 }, () => {}],
    ['a falling step far past both clip levels', { shape: 'step', low: 1e6, high: -1e6 }, () => {}],
    ['a triangle with a 0.1 % rise', { shape: 'triangle', low: 0, high: 20, frequency: 1e4, duty: 0.001 }, () => {}],
  ];
  it.each(cases)('%s gives finite samples and figures, or an absent reason', (_, w, patch) => {
    const d = designFrom('generic-sensor', (x) => { patch(x); x.analysis = { waveform: w }; });
    const r = analyse(d, { spreadTrials: 0 });
    if (!r.waveform) { expect(r.absent.waveform).toMatch(/did not finish/); return; }
    for (const a of [r.waveform.t, r.waveform.output, r.waveform.ideal, r.waveform.measurand]) expect(a.every(Number.isFinite)).toBe(true);
    for (const x of [r.waveform.riseTime, r.waveform.overshoot, r.waveform.settlingTime, r.waveform.droop]) expect(x === null || Number.isFinite(x)).toBe(true);
  });
});

describe('the blocks the time-domain solve limits', () => {
  it('the op-amp by its swing and slew rate; a closed-loop sensor\'s driver within its voltage room: ±5 V rails less 1 V swing and 0.7 V drop about a 0 V reference is ±3.3 V (the demo, by hand)', () => {
    const r = analyse(designFrom('closed-loop-clamp'), { spreadTrials: 0 });
    const limits = blockLimits(r.design, r.circuit!);
    expect(limits).toHaveLength(2);
    expect(limits[0]!.index).toBe(r.circuit!.opampIndex);
    expect(limits[0]!.slew).toBe(r.design.opamp.slewRate);
    const drv = limits[1]!;
    expect(r.circuit!.circuit.elements[drv.index]!.role).toBe('driver');
    expect(drv.low).toBeCloseTo(-3.3, 12);
    expect(drv.high).toBeCloseTo(3.3, 12);
    expect(drv.slew).toBe(Infinity);
    // An open-loop sensor has only the op-amp.
    expect(blockLimits(designFrom('bench-clamp'), analyse(designFrom('bench-clamp'), { spreadTrials: 0 }).circuit!)).toHaveLength(1);
  });
});
