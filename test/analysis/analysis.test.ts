import { describe, expect, it } from 'vitest';
import { analyse } from '../../src/analysis/report.js';
import { crossingBracket } from '../../src/analysis/analysis.js';
import { reportJson } from '../../src/present/json.js';
import { DEMOS } from '../../src/model/demos.js';
import { designFrom, nonFinitePaths, shuntOnSplitSupply } from '../helpers.js';
import { verdictsOf } from '../../src/present/verdicts.js';
import { calibrationSteps } from '../../src/present/calibration.js';
import { sayFinding } from '../../src/present/finding-words.js';

const design = designFrom;

const allFinite = nonFinitePaths;

describe('transfer and clipping', () => {
  // Demo scenario of our own: 9 V single supply, op-amp output stops 1.5 V below the + rail. With 100 mV/A
  // around 4.5 V the output reaches 7.5 V at (7.5 − 4.5)/0.1 = 30 A: the report must show that clip point,
  // within a tolerance ±0.05 A (toBeCloseTo(·, 1)): the solver builds the scale within 0.1 % (0.03 A at 30 A), and the op-amp's
  // 50 Ω output resistance drops about 2 mV (≈ 40 µA into the feedback arm and load; Ohm's law) at the clip, 0.02 A at 100 mV/A.
  it('on 9 V with a 1.5 V output drop, the probe clips at +30 A and allows −44.5 A … +30 A', () => {
    const r = analyse(design('generic-sensor'), { spreadTrials: 0 });
    expect(r.clip!.firstHigh).toBe('opamp-output');
    expect(r.clip!.measurandHigh).toBeCloseTo(30, 1);
    expect(r.clip!.outputHigh).toBeCloseTo(7.5, 2);
    // Low side: 0.05 V above the negative rail → (0.05 − 4.5)/0.1 = −44.5 A (same ±0.05 A budget as above).
    expect(r.clip!.measurandLow).toBeCloseTo(-44.5, 1);
    // Headroom at +20 A: 7.5 − 6.5 = 1.0 V.
    expect(r.clip!.headroom.high).toBeCloseTo(1.0, 2);
  });
  it('a range beyond the clip point gives negative headroom and a fail finding', () => {
    const r = analyse(design('generic-sensor', (x) => { x.target.range = [-20, 40]; }), { spreadTrials: 0 });
    expect(r.clip!.headroom.high).toBeLessThan(0);
    expect(r.warnings.map((w) => w.code)).toContain('clips-in-range-high');
    expect(verdictsOf(r)[0]!.level).toBe('fail');
  });
  it('an AC range given in rms is checked at its √2 peak, and the report says so', () => {
    const r = analyse(design('generic-sensor', (x) => { x.target.signal = 'ac-rms'; x.target.range = [-20, 20]; }), { spreadTrials: 0 });
    expect(r.clip!.rangePeak[1]).toBeCloseTo(20 * Math.SQRT2, 12);
    expect(r.warnings.map((w) => w.code)).toContain('ac-peak');
  });
  it('an input range that stops short of the + rail is caught (opamp-input)', () => {
    const r = analyse(design('generic-sensor', (x) => { x.opamp.inputHigh = 6.2; x.target.topology = 'non-inverting'; }), { spreadTrials: 0 });
    // Inputs follow the sensor up to 2.75 V; the input range ends at 9 − 6.2 = 2.8 V → clips at (2.8 − 2.5)/0.0125 = 24 A.
    expect(r.clip!.limits.find((l) => l.cause === 'opamp-input')!.high).toBeCloseTo(24, 1);
  });
  it('the sensor\'s own output limit clips first when it is nearer', () => {
    const r = analyse(design('generic-sensor', (x) => { x.sensor.outputMax = 2.7; }), { spreadTrials: 0 });
    expect(r.clip!.firstHigh).toBe('sensor');
    expect(r.clip!.measurandHigh).toBeCloseTo(16, 6);
  });
});

describe('speed', () => {
  // −3 dB ≈ GBW / noise gain (Sedra & Smith, Microelectronic Circuits, frequency response of closed-loop
  // amplifiers, from memory): 1 MHz / 8 = 125 kHz, with no sensor pole and no filter.
  it('bandwidth of a gain-8 stage on a 1 MHz part is about 125 kHz', () => {
    const r = analyse(design('generic-sensor', (x) => { delete x.sensor.bandwidth; x.output = { filter: null, load: { resistance: 1e6, capacitance: 0 } }; }), { spreadTrials: 0 });
    expect(r.speed!.smallSignal / 125e3).toBeCloseTo(1, 2);
    // Rise time ln 9/(2π·BW) ≈ 0.35/BW.
    expect(r.speed!.riseTime * r.speed!.smallSignal).toBeCloseTo(Math.log(9) / (2 * Math.PI), 9);
  });
  // Textbook full-power bandwidth SR/(2π·Vp) (e.g. Sedra & Smith, on slew rate; from memory):
  // 2 V/µs at 12 V peak → 2e6/(2π·12) = 26.5 kHz. GBW 10 MHz keeps the small-signal bandwidth above it.
  it('full-power bandwidth SR/(2π·Vp): 2 V/µs at 12 V peak is 26.5 kHz', () => {
    const r = analyse(design('generic-sensor', (x) => {
      x.supply = { positive: 15, negative: -15 };
      x.opamp.gbw = 10e6; x.opamp.slewRate = 2e6; x.opamp.inputLow = 1; x.opamp.inputHigh = 1; x.opamp.outputLow = 1; x.opamp.outputHigh = 1;
      x.target.scale = 0.6; x.target.zero = 0; x.target.range = [-20, 20]; x.sensor.quiescent = 0;
      x.sensor.outputMin = -10; x.sensor.outputMax = 10;
    }), { spreadTrials: 0 });
    expect(r.speed!.peakSwing).toBeCloseTo(12, 1);
    expect(r.speed!.fullPower / 26.5e3).toBeCloseTo(1, 2);
  });
  it('a GBW of 1 Hz gives a full-power bandwidth no higher than the small-signal one (issue 14)', () => {
    const r = analyse(design('generic-sensor', (x) => { x.opamp.gbw = 1; }), { spreadTrials: 0 });
    expect(r.speed!.smallSignal).toBeLessThan(1);
    expect(r.speed!.fullPower).toBeLessThanOrEqual(r.speed!.smallSignal);
  });
  it('warns when the wanted bandwidth cannot be had', () => {
    const r = analyse(design('generic-sensor', (x) => { x.target.bandwidth = 500e3; }), { spreadTrials: 0 });
    expect(r.warnings.map((w) => w.code)).toContain('bandwidth-short');
  });
});

describe('noise and errors', () => {
  it('referred noise is output noise divided by the scale', () => {
    const r = analyse(design('generic-sensor'), { spreadTrials: 0 });
    expect(r.noise!.referredRms).toBeCloseTo(r.noise!.rms / Math.abs(r.speed!.passband), 12);
    // The sensor's 400 nV/√Hz × gain 8 dominates at 1 kHz: 3.2 µV/√Hz (plus a little from the rest).
    expect(r.noise!.densityAt1kHz / (400e-9 * 8)).toBeGreaterThan(1);
    expect(r.noise!.densityAt1kHz / (400e-9 * 8)).toBeLessThan(1.02);
  });
  // Sivakumar, Linear Integrated Circuits, ex. 5.1 form: output offset = Vos × noise gain.
  it('the offset term is Vos × noise gain / scale', () => {
    const r = analyse(design('generic-sensor', (x) => { x.opamp.biasCurrent = 0; }), { spreadTrials: 0 });
    const t = r.errors!.terms.find((x) => x.name === 'op-amp offset voltage')!;
    expect(t.value).toBeCloseTo((3e-3 * r.stage!.gain) / 0.1, 2);
  });
  it('trimming removes the static terms and leaves drift', () => {
    const r = analyse(design('generic-sensor'), { spreadTrials: 0 });
    expect(r.errors!.afterTrim).toBeLessThan(r.errors!.worstCase);
    expect(r.errors!.afterTrim).toBeGreaterThan(0);
  });
});

describe('rails in the error budget, at both range ends', () => {
  // A ratiometric sensor and a reference divider both fed from the regulated rail: every source in the
  // linear stage scales by (1 + ε) with the rail, so by superposition the output does too: Δv(x) = ε·(z + s·x).
  // Bench clamp, 2 % regulator, z = 4.5 V, s = 0.1 V/A: at +20 A 0.02·6.5/0.1 = 1.30 A, at −20 A 0.02·2.5/0.1 = 0.50 A.
  it('the regulated-rail term tracks the ratiometric sensor: 1.30 A at +20 A, 0.50 A at −20 A', () => {
    const r = analyse(design('bench-clamp'), { spreadTrials: 0 });
    const t = r.errors!.terms.find((x) => x.name.startsWith('regulated rail tolerance'))!;
    const z = r.dc!.out[0], sc = r.dc!.out[1];
    expect(t.high).toBeCloseTo((0.02 * (z + sc * 20)) / sc, 2);
    expect(t.low).toBeCloseTo((0.02 * Math.abs(z - sc * 20)) / sc, 2);
    expect(t.high).toBeCloseTo(1.3, 2);
    expect(t.low).toBeCloseTo(0.5, 2);
    // Its drift (100 ppm/K over ±15 K, ε = 1.5e-3) is the same shape and remains after calibration.
    const d = r.errors!.terms.find((x) => x.name.startsWith('regulated rail drift'))!;
    expect(d.high).toBeCloseTo((1.5e-3 * (z + sc * 20)) / sc, 3);
    expect(d.removedBy).toBe('none');
  });
  // Non-inverting stage, reference at the foot of the ground leg (superposition; Franco, summing and
  // difference amplifiers, from memory): v = G·V_s − (G−1)·V_ref with V_ref = G·V_q − z over (G−1) taken from the 9 V rail, so
  // a 1 % rail moves the zero by (G·V_q − z)·0.01 = (8·2.5 − 4.5)·0.01 = 0.155 V = 1.55 A at 0.1 V/A.
  it('a 1 % bench rail moves the generic demo\'s zero by (G·Vq − z)·1 % = 1.55 A', () => {
    const r = analyse(design('generic-sensor'), { spreadTrials: 0 });
    const t = r.errors!.terms.find((x) => x.name.startsWith('supply rail tolerance'))!;
    const g = r.stage!.gain, z = r.dc!.out[0], sc = r.dc!.out[1];
    expect(t.high).toBeCloseTo(((g * 2.5 - z) * 0.01) / sc, 2);
    expect(t.high).toBeCloseTo(1.55, 2);
    expect(t.low).toBeCloseTo(t.high, 9); // the sensor is not ratiometric: a pure zero shift
  });
  // PSRR (its definition: the input offset moves by ΔV_supply/PSRR; Franco, op-amp DC limitations, from memory): 60 dB and
  // a 1 % change of the 9 V span move V_os by 90 µV, times the noise gain 8 at the output: 0.72 mV = 7.2 mA.
  it('the op-amp\'s supply rejection turns the rail tolerance into an offset: NG·ΔV/PSRR', () => {
    const r = analyse(design('generic-sensor', (x) => { x.opamp.psrrDb = 60; }), { spreadTrials: 0 });
    const t = r.errors!.terms.find((x) => x.name.startsWith('op-amp supply rejection'))!;
    expect(t.high).toBeCloseTo((r.stage!.gain * 0.09 * 1e-3) / r.dc!.out[1], 4);
  });
  it('existing files without the new fields get the defaults (1 % rail, 80 dB, 100 ppm/K trimmers, 0.5 % + 3 mV meter)', () => {
    const d = design('generic-sensor', (x) => { delete x.calibration; });
    expect(d.supply.tolerance).toBe(0.01);
    expect(d.opamp.psrrDb).toBe(80);
    expect(d.target.trimmerTempco).toBe(100e-6);
    expect(d.calibration).toEqual({ meterRelative: 0.005, meterDigits: 0.003 });
    const b = design('bench-clamp');
    expect(b.supply.regulated!.dropout).toBe(0.3);
    expect(b.supply.regulated!.drift).toBe(100e-6);
  });
});

describe('after calibration', () => {
  // A meter reading is uncertain by ±(r·reading + digits) (common practice: 0.5 % + 3 counts of 1 mV).
  // Zero: one reading of z. Span: the difference of two readings (at zero and at x_cal = half the range end),
  // ±(r·|s·x_cal| + 2·digits), against an applied measurand read to ±r; the errors add (worst case, GUM
  // §5.1 with full correlation taken as the bound). Bench clamp: z 4.5 V, s 0.1 V/A, x_cal 10 A.
  it('carries the calibration meter: zero (r·z + d)/s and span |x|·(r + (r·s·x_cal + 2d)/(s·x_cal))', () => {
    // The file default meter (0.5 % + 3 mV), not the demo's 4½-digit one.
    const r = analyse(design('bench-clamp', (x) => { delete x.calibration; }), { spreadTrials: 0 });
    const z = r.dc!.out[0], sc = r.dc!.out[1];
    const zeroT = r.errors!.terms.find((x) => x.name === 'calibration meter, zero reading')!;
    const spanT = r.errors!.terms.find((x) => x.name === 'calibration meter, span from two readings')!;
    expect(zeroT.high).toBeCloseTo((0.005 * z + 0.003) / sc, 6);
    const rel = 0.005 + (0.005 * sc * 10 + 2 * 0.003) / (sc * 10);
    expect(spanT.high).toBeCloseTo(20 * rel, 6);
    expect(spanT.low).toBeCloseTo(20 * rel, 6);
    // They exist only after calibration; the static terms (rail tolerance) do not.
    const after = r.errors!.terms.filter((t) => t.calibration || t.removedBy === 'none').reduce((x, t) => x + t.high, 0);
    expect(r.errors!.afterTrimHigh).toBeCloseTo(after, 9);
    const before = r.errors!.terms.filter((t) => !t.calibration).reduce((x, t) => x + t.value, 0);
    expect(r.errors!.worstCase).toBeCloseTo(before, 9);
    // The steps tell the user to judge the span by that difference.
    expect(calibrationSteps(r).some((c) => /difference of two readings/.test(c.text) && /do not interact/.test(c.text))).toBe(true);
  });
  // The trimmers' tempco scales each whole track: the rheostat in the feedback arm moves the gain, the
  // potentiometer's ratio holds and only its Thevenin resistance moves. Closed form of the bench clamp
  // (non-inverting, reference at the foot of the ground leg; superposition, ideal op-amp):
  // v(x) = [G·(V_q + S·x) − (G−1)·V_th]·R_L/(R_L + R_out), G = 1 + R_f/(R_g + R_th).
  it('trimmer tempco: each trimmer\'s whole track moved by 100 ppm/K × 15 K, from the closed form', () => {
    const r = analyse(design('bench-clamp'), { spreadTrials: 0 });
    const part = (role: string) => r.stage!.parts.find((p) => p.role === role)!;
    const rv1 = part('gain-trim'), rv2 = part('zero-trim');
    const S = r.front.sensitivity;
    const out = (k1: number, k2: number, x: number) => {
      const rt = part('reference-top').ohms + (1 - rv2.setting!) * rv2.ohms * k2, rb = part('reference-bottom').ohms + rv2.setting! * rv2.ohms * k2;
      const vth = (5 * rb) / (rt + rb), rth = (rt * rb) / (rt + rb);
      const g = 1 + (part('feedback').ohms + rv1.setting! * rv1.ohms * k1) / (part('ground-leg').ohms + rth);
      return (g * (2.5 + S * x) - (g - 1) * vth) * (1e6 / (1e6 + part('output-series').ohms));
    };
    const k = 1 + 100e-6 * 15;
    const at = (x: number) => (Math.abs(out(k, 1, x) - out(1, 1, x)) + Math.abs(out(1, k, x) - out(1, 1, x))) / r.dc!.out[1];
    const t = r.errors!.terms.find((x) => x.name.startsWith('trimmer tempco'))!;
    expect(t.high / at(20)).toBeCloseTo(1, 2);
    expect(t.low / at(-20)).toBeCloseTo(1, 2);
  });
});

describe('tolerance spread', () => {
  // First-order propagation: for G = 1 + Rf/Rg, ∂lnG/∂lnRf = −∂lnG/∂lnRg = (G−1)/G; a uniform ±t part has
  // σ = t/√3, so σ_G/G = (G−1)/G · t/√3 · √2 (any metrology text, GUM §5.1.2).
  it('Monte Carlo standard deviation of the scale matches first-order propagation', () => {
    const d = design('generic-sensor', (x) => {
      x.target.trim = { gain: false, zero: false };
      x.target.arrangements = ['single'];
      // A gain single E96 parts land exactly (1 + 20 kΩ/2.87 kΩ), a sensor centred on 0 V on ±15 V and a zero
      // at 0 V: the reference is ground itself, tied with no divider.
      const g = 1 + 20000 / 2870;
      x.sensor = { ...x.sensor, sensitivity: 0.1 / g, quiescent: 0 } as typeof x.sensor;
      x.target.zero = 0;
      x.supply.positive = 15; x.supply.negative = -15; x.target.range = [-5, 5]; x.target.scale = 0.1;
    });
    const r = analyse(d, { spreadTrials: 4000 });
    expect(r.stage!.network.reference.kind).toBe('rail');
    const g = r.stage!.gain;
    const sigma = ((g - 1) / g) * (0.01 / Math.sqrt(3)) * Math.SQRT2 * Math.abs(r.dc!.out[1]);
    expect(r.spread!.scaleStd / sigma).toBeGreaterThan(0.94);
    expect(r.spread!.scaleStd / sigma).toBeLessThan(1.06);
    expect(Math.abs(r.spread!.scaleMean - r.dc!.out[1])).toBeLessThan((4 * sigma) / Math.sqrt(4000));
  });
  // GUM (JCGM 100:2008) §5.1.2 law of propagation: σ_z² = Σ (∂z/∂x_i)²·u(x_i)², u = t/√3 for a part uniform
  // within ±t (§4.3.7). The zero comes from the non-inverting stage with its reference at the foot of the
  // ground leg, by superposition (Franco, Design with Operational Amplifiers, summing amplifiers, from memory; ideal
  // op-amp): z = [G·V_q − (G−1)·V_th]·R_L/(R_L + R_out), G = 1 + R_f/(R_g + R_th), the divider's Thevenin
  // V_th, R_th from its top and bottom with the potentiometer's halves (1−s)·P and s·P. The potentiometer's
  // ±20 % scales P as a whole, so s holds.
  it('Monte Carlo σ of the bench clamp\'s zero matches first-order propagation with the pot track moving as one', () => {
    const r = analyse(design('bench-clamp'), { spreadTrials: 6000 });
    const part = (role: string) => { const ps = r.stage!.parts.filter((p) => p.role === role); expect(ps.length).toBe(1); return ps[0]!; };
    const rv1 = part('gain-trim'), rv2 = part('zero-trim');
    const x0: Record<string, number> = {
      R1: part('feedback').ohms, R2: part('ground-leg').ohms, R3: part('reference-top').ohms, R4: part('reference-bottom').ohms,
      R5: part('output-series').ohms, RV1: rv1.ohms, RV2: rv2.ohms, VQ: 2.5,
    };
    const s1 = rv1.setting!, s2 = rv2.setting!;
    const zero = (x: Record<string, number>) => {
      const rt = x.R3! + (1 - s2) * x.RV2!, rb = x.R4! + s2 * x.RV2!;
      const vth = (5 * rb) / (rt + rb), rth = (rt * rb) / (rt + rb);
      const g = 1 + (x.R1! + s1 * x.RV1!) / (x.R2! + rth);
      return (g * x.VQ! - (g - 1) * vth) * (1e6 / (1e6 + x.R5!));
    };
    const u: Record<string, number> = { R1: 0.01, R2: 0.01, R3: 0.01, R4: 0.01, R5: 0.01, RV1: 0.2, RV2: 0.2 };
    let variance = 0;
    for (const k of Object.keys(x0)) {
      const half = k === 'VQ' ? 0.02 : u[k]! * x0[k]!; // the sensor zero: ±20 mV
      const h = half * 1e-4;
      const c = (zero({ ...x0, [k]: x0[k]! + h }) - zero({ ...x0, [k]: x0[k]! - h })) / (2 * h);
      variance += (c * half / Math.sqrt(3)) ** 2;
    }
    const sigma = Math.sqrt(variance);
    expect(r.spread!.zeroStd / sigma).toBeGreaterThan(0.96);
    expect(r.spread!.zeroStd / sigma).toBeLessThan(1.04);
  });
  it('is repeatable with the same seed', () => {
    const a = analyse(design('generic-sensor'), { spreadTrials: 300 });
    const b = analyse(design('generic-sensor'), { spreadTrials: 300 });
    expect(a.spread!.scaleStd).toBe(b.spread!.scaleStd);
  });
});

describe('battery and instrument', () => {
  it('the bench clamp sweep shows the high-side clip falling as the battery sags, zero held by the regulator', () => {
    const r = analyse(design('bench-clamp'), { spreadTrials: 0 });
    expect(r.battery.length).toBe(9);
    expect(r.battery[0]!.measurandHigh).toBeGreaterThan(r.battery[4]!.measurandHigh);
    expect(Math.abs(r.battery[3]!.zeroShift)).toBeLessThan(1e-6);
    expect(r.supply!.batteryLife).toBeGreaterThan(10);
    // Battery life = capacity / current (565 mAh = 2034 C).
    expect(r.supply!.batteryLife! * r.supply!.current * 3600).toBeCloseTo(2034, 6);
  });
  // Op-amp output swing (its definition: outputLow above the − rail, outputHigh below the + rail) with the
  // bench clamp's 100 mV/A around 4.5 V: the low side clips at (0.05 − 4.5)/0.1 = −44.5 A on any battery
  // voltage, 2.5 − 0.05 = 2.45 V below the −20 A output; at 6.00 V the high side stops at 6.0 − 1.5 = 4.5 V,
  // the zero itself, 6.5 − 4.5 = 2.0 V short of the +20 A output.
  it('at end of life (6.00 V) with the zero on the edge, each side\'s limit is still computed', () => {
    const r = analyse(design('bench-clamp'), { spreadTrials: 0 });
    const eol = r.battery[r.battery.length - 1]!;
    expect(eol.voltage).toBe(6);
    expect(eol.measurandLow).toBeCloseTo(-44.5, 1);
    expect(eol.headroomLow).toBeCloseTo(2.45, 2);
    expect(eol.headroomHigh).toBeCloseTo(-2.0, 2);
    expect(eol.measurandHigh).toBeLessThan(0.1);
  });
  // The output reaches the swing limit where V_bat − outputHigh = V_out(+20 A) = 4.5 + 0.1·20 = 6.5 V, so at
  // V_bat = 8.0 V exactly (not at a sweep point). Time t = Q/I for the charge drawn (definition of capacity),
  // with the voltage falling linearly in charge from fresh to end of life (our stated approximation):
  // t = (Q/I)·(9.6 − 8.0)/(9.6 − 6.0).
  it('solves the battery voltage where clipping starts (8.0 V) and the hours to it', () => {
    const r = analyse(design('bench-clamp'), { spreadTrials: 0 });
    const bc = r.batteryClip!;
    expect(bc.voltage!).toBeCloseTo(8.0, 2);
    const hoursToEnd = 2034 / r.supply!.current / 3600;
    expect(bc.hoursToEnd!).toBeCloseTo(hoursToEnd, 9);
    expect(bc.hoursToClip! / (hoursToEnd * (9.6 - bc.voltage!) / 3.6)).toBeCloseTo(1, 9);
    expect(sayFinding(r.warnings.find((w) => w.code === 'battery-clips')!)).toMatch(/8\.00 V/);
    expect(verdictsOf(r).find((v) => v.title.startsWith('Battery life'))!.detail).toMatch(/clips inside the range after about/);
  });
  // A regulator with 1.7 V dropout (common practice for a small non-LDO linear part, from memory) leaves
  // regulation below 5 + 1.7 = 6.7 V; at 6.0 V its output is 4.3 V. The sensor and the reference both hang
  // from it, so the linear stage's output scales with it (superposition: every source ×4.3/5): scale
  // 0.1·4.3/5 = 86 mV/A and zero 4.5·4.3/5 = 3.87 V.
  it('a ratiometric sensor on a regulator in dropout changes its scale, and the report says so', () => {
    const r = analyse(design('bench-clamp', (x) => { x.supply.regulated.dropout = 1.7; }), { spreadTrials: 0 });
    const eol = r.battery[r.battery.length - 1]!;
    expect(eol.regulated).toBe(false);
    expect(eol.scale / (r.dc!.out[1] * 4.3 / 5)).toBeCloseTo(1, 4);
    expect(eol.zeroShift).toBeCloseTo(r.dc!.out[0] * (4.3 / 5 - 1), 3);
    expect(r.battery[0]!.regulated).toBe(true);
    expect(r.warnings.map((w) => w.code)).toContain('battery-scale-shift');
  });
  it('a reference taken from the battery moves the zero as it sags', () => {
    const r = analyse(design('generic-sensor', (x) => { x.supply.battery = { fresh: 9.6, endOfLife: 7, capacity: 2034 }; }), { spreadTrials: 0 });
    expect(Math.abs(r.battery[r.battery.length - 1]!.zeroShift)).toBeGreaterThan(0.1);
    expect(r.warnings.map((w) => w.code)).toContain('battery-zero-shift');
  });
  it('with a 100 Ω output resistor a 50 Ω input sees a third of the scale', () => {
    const r = analyse(design('bench-clamp'), { spreadTrials: 0 });
    expect(r.drive!.scaleAt50 / r.drive!.scaleAt1M).toBeCloseTo(50 / 150, 3);
    expect(r.drive!.probeRatio).toBe(10);
  });
});

describe('probe-ratio advice (a probe ratio k displays k × the input volts: common practice)', () => {
  // Bench clamp: 100 mV/A, so k = 1/0.1 = 10 makes one displayed volt one ampere; its 4.5 V zero then shows
  // as 4.5 × 10 = 45 A with nothing measured, so the advice must say how to null it.
  it('with a 4.5 V zero the 10× advice says the zero shows as 45 A and how to null it', () => {
    const r = analyse(design('bench-clamp'), { spreadTrials: 0 });
    expect(r.drive!.probeRatio).toBe(10);
    expect(r.drive!.probeOffset).toBeCloseTo(4.5, 3);
    expect(r.drive!.probeOffsetShown).toBeCloseTo(45, 2);
    expect(r.drive!.probeInvert).toBe(false);
    const w = r.warnings.find((x) => x.code === 'probe-ratio')!;
    expect(sayFinding(w)).toMatch(/45\.0 A/);
    expect(sayFinding(w)).toMatch(/offset/);
    expect(sayFinding(w)).not.toMatch(/reads A directly/);
    expect(calibrationSteps(r).some((c) => c.text === sayFinding(w))).toBe(true);
  });
  // 0.5 V/A around 0 V: k = 2 reads amperes directly, no offset to null.
  it('with the zero at 0 V the ratio alone reads the measurand directly', () => {
    const r = analyse(design('generic-sensor', shuntOnSplitSupply), { spreadTrials: 0 });
    expect(r.drive!.probeRatio).toBe(2);
    expect(Math.abs(r.drive!.probeOffsetShown)).toBeLessThan(1e-3);
    expect(sayFinding(r.warnings.find((x) => x.code === 'probe-ratio')!)).toMatch(/reads A directly/);
  });
  it('a negative scale asks for the channel to be inverted', () => {
    const r = analyse(design('generic-sensor', (x) => { shuntOnSplitSupply(x); x.target.scale = -0.5; }), { spreadTrials: 0 });
    expect(r.drive!.probeRatio).toBe(2);
    expect(r.drive!.probeInvert).toBe(true);
    expect(sayFinding(r.warnings.find((x) => x.code === 'probe-ratio')!)).toMatch(/invert/);
  });
});

describe('every demo reports finite numbers', () => {
  it.each(DEMOS.map((d) => d.id))('%s', (id) => {
    const r = analyse(design(id), { spreadTrials: 200 });
    const j = reportJson(r);
    expect(allFinite(j)).toEqual([]);
    expect(j.parts).not.toEqual([]);
    expect(calibrationSteps(r).length).toBeGreaterThan(4);
  });
});

describe('sensor output drive', () => {
  it('an inverting input network that draws more than the sensor can drive is a failure', () => {
    // Inverting: the sensor drives (Vs − Vp)/(Rin + Rs); with a 1 µA drive limit that is exceeded.
    const r = analyse(design('generic-sensor', (x) => { x.target.scale = -0.1; x.sensor.outputDrive = 1e-6; }), { spreadTrials: 0 });
    expect(r.warnings.map((w) => w.code)).toContain('sensor-drive');
  });
  it('a non-inverting stage draws only bias current from the sensor', () => {
    const r = analyse(design('generic-sensor', (x) => { x.sensor.outputDrive = 1e-6; }), { spreadTrials: 0 });
    expect(r.warnings.map((w) => w.code)).not.toContain('sensor-drive');
  });
});

describe('a shunt design reaches the full report', () => {
  it('with parts, limits, calibration and the low-side note', () => {
    const r = analyse(design('generic-sensor', shuntOnSplitSupply), { spreadTrials: 100 });
    expect(r.stage!.parts.length).toBeGreaterThan(1);
    expect(r.clip!.limits.map((l) => l.cause)).toContain('burden');
    expect(calibrationSteps(r).some((c) => c.text.startsWith('Span'))).toBe(true);
    expect(r.warnings.map((w) => w.code)).toContain('low-side-only');
    // Scale 0.5 V/A from 10 mV/A: gain 50 (the shunt's 10 mΩ is its own source resistance).
    expect(r.dc!.out[1]).toBeCloseTo(0.5, 3);
  });
});

describe('verdict thresholds (our own: noise p-p within 1 % of the range end passes, error after calibration within 1 %)', () => {
  it('a noisy sensor turns the noise line to caution or fail', () => {
    const quiet = analyse(design('generic-sensor'), { spreadTrials: 0 });
    const noisy = analyse(design('generic-sensor', (x) => { x.sensor.noiseDensity = 20e-6; }), { spreadTrials: 0 });
    const line = (r: typeof quiet) => verdictsOf(r).find((v) => v.title.startsWith('Noise'))!;
    expect(line(quiet).level).toBe('pass');
    expect(line(noisy).level).not.toBe('pass');
  });
  it('large drift after calibration is flagged', () => {
    const r = analyse(design('generic-sensor', (x) => { x.opamp.offsetDrift = 1e-3; }), { spreadTrials: 0 });
    expect(verdictsOf(r).find((v) => v.title.startsWith('Error'))!.level).toBe('fail');
  });
});

describe('bias current at the output (Sivakumar, Linear Integrated Circuits, ch. 5 form)', () => {
  // With the + input driven from a stiff source, the − input's bias current flows through the feedback
  // resistance only: output error I_b·R_f (the form of Sivakumar ex. 5.1, where I_os·R_2 = 150 nA × 500 kΩ = 75 mV).
  it('is I_b × R_f, in measurand units divided by the scale', () => {
    const r = analyse(design('generic-sensor', (x) => { x.sensor.sourceResistance = 0; x.opamp.offsetVoltage = 0; x.opamp.biasCurrent = 150e-9; }), { spreadTrials: 0 });
    const net = r.stage!.network;
    const rf = net.feedback!.ohms + net.gainTrim!.ohms * net.gainTrim!.setting;
    const term = r.errors!.terms.find((t) => t.name === 'op-amp bias current')!;
    expect(term.value * Math.abs(r.dc!.out[1]) / (150e-9 * rf)).toBeCloseTo(1, 3);
  });
});

describe('current transformer at mains frequency', () => {
  // A single high-pass corner f_c reads 1/√(1 + (f_c/f)²) of the passband at f (first-order high-pass,
  // any circuits text): a 9.55 Hz corner reads 1.8 % low at 50 Hz.
  it('reports how far below the passband it reads at 50 Hz', () => {
    const r = analyse(design('appliance-ct', (x) => { x.sensor.burden = 100; x.sensor.secondaryTurns = 1000; x.sensor.inductanceFactor = 2e-6; x.sensor.windingResistance = 20; x.target.scale = -0.1; x.target.range = [-5, 5]; x.output = { filter: null, load: { resistance: 1e6, capacitance: 0 } }; }), { spreadTrials: 0 });
    const w = r.warnings.find((x) => x.code === 'ac-low-frequency')!;
    const fc = r.speed!.lowCorner;
    const expected = 1 - 1 / Math.sqrt(1 + (fc / 50) ** 2);
    const shown = Number(/reading is ([\d.]+) %/.exec(sayFinding(w))![1]) / 100;
    expect(shown).toBeCloseTo(expected, 3);
    expect(w.level).toBe(expected > 0.01 ? 'caution' : 'info');
  });
});

describe('crossingBracket: where a headroom crosses zero (false position and bisection; Press et al., Numerical Recipes, §9.2–9.3, from memory)', () => {
  const counted = (g: (x: number) => number) => { const f = (x: number) => { f.calls++; return g(x); }; f.calls = 0; return f; };
  it('a straight headroom v − 8.0 crosses at 8.0 V: found within the tolerance in two solves', () => {
    const g = counted((v) => v - 8);
    const x = crossingBracket(6, g(6), 9.6, g(9.6), 1e-6, g);
    expect(Math.abs(x - 8)).toBeLessThanOrEqual(0.5e-6);
    expect(g.calls).toBeLessThanOrEqual(4); // two for the ends given, two probes
  });
  it('a bent headroom (cubic about 7.3) and one with a kink (two straight pieces) still land within the tolerance', () => {
    const cubic = (v: number) => (v - 7.3) ** 3;
    expect(Math.abs(crossingBracket(6, cubic(6), 9.6, cubic(9.6), 1e-6, cubic) - 7.3)).toBeLessThanOrEqual(1e-6);
    // Two straight pieces meeting at 8.5 V: 0.01·(v − 7.9) above it, 2·(v − 8.497) below it (continuous at 8.5).
    const kink = (v: number) => (v >= 8.5 ? 0.01 * (v - 7.9) : 2 * (v - 8.497));
    expect(Math.abs(crossingBracket(6, kink(6), 9.6, kink(9.6), 1e-6, kink) - 8.497)).toBeLessThanOrEqual(1e-6);
  });
  it('no figure at one end (a step that could not be solved reads −Infinity): it bisects instead', () => {
    const g = (v: number) => (v < 7 ? -Infinity : v - 7.25);
    expect(Math.abs(crossingBracket(6, -Infinity, 9.6, g(9.6), 1e-6, g) - 7.25)).toBeLessThanOrEqual(1e-6);
  });
});
