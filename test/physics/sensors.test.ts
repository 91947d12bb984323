import { describe, expect, it } from 'vitest';
import { atSensorSupply, gapAreaRatio, gapFieldPerAmp, gappedCorePerAmp, sensorFront } from '../../src/physics/sensors.js';
import { analyse } from '../../src/analysis/report.js';
import { MU0 } from '../../src/model/constants.js';
import { designFrom } from '../helpers.js';

const design = designFrom;

describe('magnetic circuit with an air gap (Ampère\'s law; Umans, Fitzgerald & Kingsley 7th ed. §1.1)', () => {
  it('pins μ0 to CODATA 2022 (1.25663706127e-6 N/A²)', () => {
    expect(MU0 / 1.25663706127e-6).toBeCloseTo(1, 9);
  });
  // Derived: a 1 mm gap alone gives 1.2566 mT per ampere-turn.
  it('a 1 mm gap with an ideal core gives 1.2566 mT per ampere-turn', () => {
    expect(gapFieldPerAmp(1, 1e-3, 0, 1)).toBeCloseTo(1.2566e-3, 7);
  });
  // Derived: l_e 50 mm, μr 2000, 1 mm gap, 100 A-turns → 122.60 mT.
  it('with l_e 50 mm and μr 2000, 100 ampere-turns give 122.60 mT', () => {
    expect(100 * gapFieldPerAmp(1, 1e-3, 0.05, 2000)).toBeCloseTo(0.12260, 5);
  });
  // Umans Example 1.1 (numbers from memory, reproduced by derivation): g 0.050 cm, l_c 30 cm, N 500, μr 70 000:
  // B = 1.0 T needs i = 0.80 A.
  it('Example 1.1: 1.0 T in a 0.5 mm gap with N = 500 needs about 0.80 A', () => {
    const i = 1.0 / gapFieldPerAmp(500, 0.05e-2, 0.30, 70000);
    expect(i).toBeCloseTo(0.80, 2);
  });
  it('turns raise the sensitivity and lower the saturation currents in proportion', () => {
    const one = sensorFront(design('bench-clamp').sensor, design('bench-clamp'));
    const d3 = design('bench-clamp', (x) => { x.sensor.turns = 3; });
    const three = sensorFront(d3.sensor, d3);
    expect(three.sensitivity / one.sensitivity).toBeCloseTo(3, 12);
    const core = (f: typeof one) => f.limits.find((l) => l.kind === 'core')!.high;
    const hall = (f: typeof one) => f.limits.find((l) => l.kind === 'sensor')!.high;
    expect(core(one) / core(three)).toBeCloseTo(3, 12);
    expect(hall(one) / hall(three)).toBeCloseTo(3, 12);
  });
  it('reports the gap sensitivity and the Earth-field equivalent', () => {
    const d = design('bench-clamp');
    const f = sensorFront(d.sensor, d);
    const fig = (k: string) => f.figures.find((x) => x.key === k)!.value;
    // 1.5 mm → 1.6 mm with l/μr = 0.03 mm: ratio 1.53/1.63 − 1 = −6.13 %.
    expect(fig('gapSensitivity')).toBeCloseTo(1.53 / 1.63 - 1, 9);
    // 50 µT (common practice) over 0.8213 mT/A = 60.9 mA.
    expect(fig('earthField')).toBeCloseTo(50e-6 / gapFieldPerAmp(1, 1.5e-3, 0.06, 2000), 12);
  });
});

describe('gap fringing: effective gap area, same for the sensor field and the core flux', () => {
  // Umans, Fitzgerald & Kingsley's Electric Machinery (7th ed., ch. 1; from memory): fringing is accounted
  // for by adding the gap length to each of the two dimensions of the cross-section: 10 mm × 10 mm with a
  // 1 mm gap → 11 mm × 11 mm, A_g/A_c = 1.21.
  it('gapAreaRatio adds the gap to each side: 10 × 10 mm with 1 mm → 1.21', () => {
    expect(gapAreaRatio({ gap: 1e-3, width: 0.01, depth: 0.01, fringing: 1 })).toBeCloseTo(1.21, 12);
    expect(gapAreaRatio({ gap: 1e-3, fringing: 1.3 })).toBe(1.3);
  });
  // Magnetic circuit (Umans §1.1): R_c = l_c/(μ0·μr·A_c), R_g = g/(μ0·A_g), Φ = N·I/(R_c + R_g);
  // B_core = Φ/A_c, B_gap = Φ/A_g. Numbers: A_c = 100 mm², A_g = 121 mm², l_c 60 mm, μr 2000, g 1 mm, N 1.
  it('core and gap flux density per ampere follow the two-reluctance circuit', () => {
    const Ac = 1e-4, Ag = 1.21e-4;
    const Rc = 0.06 / (MU0 * 2000 * Ac), Rg = 1e-3 / (MU0 * Ag);
    const phi = 1 / (Rc + Rg);
    const b = gappedCorePerAmp(1, 1e-3, 0.06, 2000, 1.21);
    expect(b.core / (phi / Ac)).toBeCloseTo(1, 12);
    expect(b.gap / (phi / Ag)).toBeCloseTo(1, 12);
    // Without fringing both reduce to B = μ0·N·I/(g + l/μr).
    const plain = gappedCorePerAmp(1, 1e-3, 0.06, 2000, 1);
    expect(plain.core).toBeCloseTo(gapFieldPerAmp(1, 1e-3, 0.06, 2000), 15);
    expect(plain.gap).toBe(plain.core);
  });
  it('the bench clamp with its core cross-section given saturates earlier: I_sat = B_sat·A_c·(R_c + R_g)/N', () => {
    const d = design('bench-clamp', (x) => { x.sensor.core.width = 0.008; x.sensor.core.depth = 0.005; });
    const f = sensorFront(d.sensor, d);
    const Ac = 0.008 * 0.005, Ag = (0.008 + 1.5e-3) * (0.005 + 1.5e-3);
    const Rc = 0.06 / (MU0 * 2000 * Ac), Rg = 1.5e-3 / (MU0 * Ag);
    const iSat = (0.35 * Ac * (Rc + Rg)) / 1;
    expect(f.limits.find((l) => l.kind === 'core')!.high / iSat).toBeCloseTo(1, 12);
    // The sensor reads the gap's mean flux density Φ/A_g: sensitivity k_H·Φ/(A_g·I).
    expect(f.sensitivity / (25 / (Ag * (Rc + Rg)))).toBeCloseTo(1, 12);
    const plain = sensorFront(design('bench-clamp').sensor, design('bench-clamp'));
    expect(f.limits.find((l) => l.kind === 'core')!.high).toBeLessThan(plain.limits.find((l) => l.kind === 'core')!.high);
    expect(f.warnings.map((w) => w.code)).toContain('fringing-model');
    expect(f.figures.find((x) => x.key === 'gapAreaExcess')!.value).toBeCloseTo(Ag / Ac - 1, 12);
  });
  it('a fringing factor alone is the same effective area: the core limit falls by it too', () => {
    const d = design('bench-clamp', (x) => { x.sensor.core.fringing = 1.2; });
    const f = sensorFront(d.sensor, d);
    const Ac = 1, Ag = 1.2;
    const Rc = 0.06 / (MU0 * 2000 * Ac), Rg = 1.5e-3 / (MU0 * Ag);
    expect(f.limits.find((l) => l.kind === 'core')!.high / (0.35 * Ac * (Rc + Rg))).toBeCloseTo(1, 12);
  });
  it('one dimension alone is taken as a square section', () => {
    expect(gapAreaRatio({ gap: 1e-3, width: 0.01, fringing: 1 })).toBeCloseTo(1.21, 12);
  });
});

describe('current transformer (Kusko & Thompson ch. 14: V = I_p·R_B/N)', () => {
  // Derived: N 1000, R_B 100 Ω, 10 A → 1.00 V; A_L 2 µH, R_w 20 Ω → L_m 2 H, corner (R_B + R_w)/(2π·L_m) = 9.55 Hz.
  it('N 1000, burden 100 Ω: 0.1 V/A; A_L 2 µH gives 2 H and a 9.55 Hz corner', () => {
    const d = design('appliance-ct', (x) => { x.sensor.secondaryTurns = 1000; x.sensor.burden = 100; x.sensor.inductanceFactor = 2e-6; x.sensor.windingResistance = 20; });
    const f = sensorFront(d.sensor, d);
    expect(f.sensitivity * 10).toBeCloseTo(1.0, 12);
    expect(f.figures.find((x) => x.key === 'magnetisingInductance')!.value).toBeCloseTo(2, 12);
    expect(f.lowCorner).toBeCloseTo(9.55, 2);
    expect(f.passesDc).toBe(false);
    expect(f.cautions.join(' ')).toMatch(/open/);
  });
  it('a DC target on a current transformer is an error, not a silent zero', () => {
    const d = design('appliance-ct', (x) => { x.target.signal = 'dc'; });
    expect(sensorFront(d.sensor, d).warnings.map((w) => w.code)).toContain('ct-no-dc');
  });
  it('burden power over its rating is a failure', () => {
    const d = design('appliance-ct', (x) => { x.sensor.burdenPower = 1e-4; });
    expect(sensorFront(d.sensor, d).warnings.map((w) => w.code)).toContain('burden-power');
  });
});

describe('shunt (Ohm\'s law V = I·R, power I²·R)', () => {
  const shunt = (patch: (d: any) => void = () => {}) => design('generic-sensor', (x) => {
    x.sensor = { type: 'shunt', measurand: 'A', resistance: 0.01, powerRating: 1 };
    patch(x);
  });
  it('10 mΩ at 5 A: 10 mV/A, 50 mV burden, 0.25 W', () => {
    const d = shunt((x) => { x.target.range = [-5, 5]; });
    const f = sensorFront(d.sensor, d);
    expect(f.sensitivity).toBe(0.01);
    expect(f.figures.find((x) => x.key === 'burdenVoltage')!.value).toBeCloseTo(0.05, 12);
    expect(f.figures.find((x) => x.key === 'shuntPower')!.value).toBeCloseTo(0.25, 12);
    // Rated current √(P/R) = 10 A.
    expect(f.limits[0]!.high).toBeCloseTo(10, 12);
  });
  // Joule's law with the rms current, P = I_rms²·R: 10 mΩ at 8 A rms dissipates 0.64 W (not (8√2)²·R = 1.28 W).
  // A 1 W rating allows √(1/0.01) = 10 A rms, whose sine peak is 14.14 A: the clip limit is in peaks.
  it('an AC shunt at 8 A rms dissipates I²rms·R = 0.64 W and clips at the rating\'s peak 10√2 A', () => {
    const d = shunt((x) => { x.target.range = [-8, 8]; x.target.signal = 'ac-rms'; });
    const f = sensorFront(d.sensor, d);
    expect(f.figures.find((x) => x.key === 'shuntPower')!.value).toBeCloseTo(0.64, 12);
    expect(f.limits[0]!.high).toBeCloseTo(10 * Math.SQRT2, 12);
    expect(f.warnings.map((w) => w.code)).not.toContain('shunt-power');
  });
  it('warns past the power rating and that a high-side shunt is not covered', () => {
    const d = shunt((x) => { x.target.range = [-20, 20]; });
    const codes = sensorFront(d.sensor, d).warnings.map((w) => w.code);
    expect(codes).toContain('shunt-power');
    expect(codes).toContain('low-side-only');
  });
});

describe('ratiometric sensors', () => {
  it('a sensor specified at 5 V but fed from a 9 V rail has 9/5 of its zero and sensitivity (ratiometric)', () => {
    const d = design('generic-sensor', (x) => { x.sensor.ratiometricSupply = 5; x.sensor.outputMax = 8.5; x.target.scale = 0.1; x.target.zero = 4.5; });
    const r = analyse(d, { spreadTrials: 0 });
    expect(r.front.quiescent).toBeCloseTo(2.5 * 9 / 5, 12);
    expect(r.front.sensitivity).toBeCloseTo(0.0125 * 9 / 5, 12);
    // The battery sweep scales again from the rail it is fed at, not twice.
    const swept = atSensorSupply(r.front, 9);
    expect(swept.quiescent).toBeCloseTo(r.front.quiescent, 12);
  });
});
