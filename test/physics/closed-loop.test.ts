/**
 * The closed-loop (zero-flux) Hall sensor against outside sources: Ampère's law round the core (the zero-flux
 * balance N_p·I_p = N_s·I_s), Ohm's law with copper's resistivity from IEC 60028, the open-loop transfer of a
 * simple integrator loop derived by hand and its phase margin as defined in Franklin, Powell & Emami-Naeini,
 * Feedback Control of Dynamic Systems (the Bode phase margin; §6.4, section number from memory), the current
 * transformer's corner (the CT model already in the project: Kusko & Thompson's equivalent circuit), and the
 * circuit solver (modified nodal analysis) on the same parts.
 */
import { describe, expect, it } from 'vitest';
import { demoDesign } from '../../src/model/demos.js';
import { validateDesign, type ClosedLoopHallSensor, type Design } from '../../src/model/design.js';
import { MU0 } from '../../src/model/constants.js';
import {
  closedLoopFigures, closedLoopParts, closedLoopTransferAt, heldRange, loopFigures, loopGainAt, loopGainMagnitudeAt, proposeTurns,
  suggestCompensation, supplyCurrentAt, turnsTrade, windingResistanceOf, COPPER_RESISTIVITY, awgDiameter,
} from '../../src/physics/closed-loop.js';
import { sensorFront } from '../../src/physics/sensors.js';
import { circuitLoopGainAt, circuitTransferAt, closedLoopCircuit } from '../../src/circuit/closed-loop.js';

const demo = () => demoDesign('closed-loop-clamp');
function patched(patch: (d: any) => void): Design {
  const doc = structuredClone(demo()) as any;
  patch(doc);
  const v = validateDesign(doc);
  if (!v.ok) throw new Error(JSON.stringify(v.problems));
  return v.design;
}
const specOf = (d: Design) => d.sensor as ClosedLoopHallSensor;
const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe('closed-loop Hall sensor: closed forms', () => {
  it('windingResistanceOf(1000, 0.25 mm, 36 mm) is 12.64 Ω: 0.3512 Ω/m of 0.25 mm copper (IEC 60028, 1/58 Ω·mm²/m)', () => {
    // IEC 60028: annealed copper 0.017241 Ω·mm²/m at 20 °C; 0.25 mm → 0.049087 mm² → 0.35123 Ω/m (derived).
    expect(COPPER_RESISTIVITY).toBeCloseTo(0.017241e-6, 10);
    expect(windingResistanceOf(1000, 0.25e-3, 0.036)).toBeCloseTo(0.35123 * 36, 2);
  });

  it('awgDiameter: AWG 30 is 0.2546 mm and AWG 24 0.5106 mm (ASTM B258: 0.127 mm × 92^((36 − n)/39))', () => {
    // Published gauge tables (e.g. Wikipedia "American wire gauge"): AWG 30 0.255 mm, AWG 24 0.511 mm, AWG 36 0.127 mm.
    expect(awgDiameter(30)).toBeCloseTo(0.2546e-3, 7);
    expect(awgDiameter(24)).toBeCloseTo(0.5106e-3, 7);
    expect(awgDiameter(36)).toBeCloseTo(0.127e-3, 12);
    // A winding given by its gauge: 1000 turns of AWG 30 at 36 mm a turn, 12.20 Ω (IEC 60028 copper).
    const d = patched((x) => { x.sensor.wire = { gauge: 30, turnLength: 0.036 }; });
    expect(closedLoopParts(specOf(d), d.supply).windingResistance).toBeCloseTo((0.017241 * 36) / (Math.PI * 0.25463 ** 2 / 4), 1);
  });

  it('sensitivity is (N_p/N_s)·R_M (Ampère: N_p·I_p = N_s·I_s at zero flux), less 1/(1+T0)', () => {
    const d = demo();
    const f = closedLoopFigures(specOf(d), d.supply, 25);
    expect(f.idealSensitivity).toBeCloseTo(82 / 1000, 12);
    expect(rel(f.sensitivity, 0.082 * f.loop.dcLoopGain / (1 + f.loop.dcLoopGain))).toBeLessThan(1e-12);
    // T0 = A0·r/R: 10^5 × 20.3695 V/A / 95.645 Ω (derived from the parts).
    expect(f.loop.dcLoopGain).toBeCloseTo(1e5 * f.parts.hallPerAmp / f.parts.loopResistance, 6);
    // Two turns of the primary double it; twice the compensation turns halve it.
    const f2 = closedLoopFigures({ ...specOf(d), primaryTurns: 2 }, d.supply, 10);
    expect(rel(f2.idealSensitivity, 0.164)).toBeLessThan(1e-12);
    expect(rel(closedLoopFigures({ ...specOf(d), compensationTurns: 2000 }, d.supply, 10).idealSensitivity, 0.041)).toBeLessThan(1e-12);
  });

  it('the gap field per ampere-turn is μ0/(g + l_e/μr) with fringing neglected (Umans, Fitzgerald & Kingsley §1.1)', () => {
    const d = patched((x) => { delete x.sensor.core.width; delete x.sensor.core.depth; });
    const p = closedLoopParts(specOf(d), d.supply);
    expect(rel(p.gapPerAmpTurn, MU0 / (1.5e-3 + 0.06 / 2000))).toBeLessThan(1e-12);
    // A_L = μ0·A/(g + l/μr) and L = A_L·N² (the gapped-core inductance).
    expect(rel(p.inductance, (MU0 * 64e-6 / (1.5e-3 + 0.06 / 2000)) * 1000 ** 2)).toBeLessThan(1e-12);
  });

  it('largest held current: (rail − swing − drop − V_ref)/(R_o + R_w + R_M)·N_s/N_p, capped by the current limit', () => {
    const d = demo();
    const s = specOf(d);
    const p = closedLoopParts(s, d.supply);
    const h = heldRange(s, p, d.supply);
    // ±5 V, swing 1 V, drop 0.7 V, reference 0: 3.3 V over 1 + 12.6446 + 82 Ω, × 1000 (derived).
    const rw = windingResistanceOf(1000, 0.25e-3, 0.036);
    expect(h.high).toBeCloseTo((3.3 / (1 + rw + 82)) * 1000, 9);
    expect(h.low).toBeCloseTo(-h.high, 9);
    expect(h.high).toBeGreaterThan(34.4);
    expect(h.limitHigh).toBe('swing');
    // A 20 mA driver: the current limit holds 20 A.
    const h2 = heldRange({ ...s, driver: { ...s.driver, currentLimit: 0.02 } }, p, d.supply);
    expect(h2.high).toBeCloseTo(20, 12);
    expect(h2.limitHigh).toBe('current');
    // On 9 V single with the reference at 4.5 V: (9 − 1.7 − 4.5)/95.64 each way.
    const d9 = patched((x) => { x.supply = { positive: 9, negative: 0 }; delete x.sensor.reference; });
    const h9 = heldRange(specOf(d9), closedLoopParts(specOf(d9), d9.supply), d9.supply);
    expect(h9.high).toBeCloseTo((2.8 / (1 + rw + 82)) * 1000, 9);
    expect(h9.low).toBeCloseTo(-h9.high, 9);
  });

  it('past the held current the core saturates at N_p·I_p = N_s·I_s,max + B_sat/(μ0/(g + l_e/μr)) (Ampère)', () => {
    const d = patched((x) => { delete x.sensor.core.width; delete x.sensor.core.depth; });
    const s = specOf(d);
    const h = heldRange(s, closedLoopParts(s, d.supply), d.supply);
    // 0.35 T at 0.821331 mT per ampere-turn = 426.14 A-turns beyond the held 34.5 (REFERENCES: 1.2566 mT/A-turn for 1 mm).
    expect(h.saturationHigh - h.high).toBeCloseTo(0.35 / (MU0 / (1.5e-3 + 3e-5)), 6);
    expect(h.saturationHigh - h.high).toBeCloseTo(426.14, 1);
  });

  it('supply current at primary I: quiescent + |I|·N_p/N_s; at 25 A on the demo 6 + 2 + 25 mA', () => {
    const s = specOf(demo());
    expect(supplyCurrentAt(s, 0)).toBeCloseTo(8e-3, 15);
    expect(supplyCurrentAt(s, 25)).toBeCloseTo(33e-3, 15);
    expect(supplyCurrentAt(s, -25)).toBeCloseTo(33e-3, 15);
    // A 9 V alkaline cell, about 565 mAh (Wikipedia "Nine-volt battery", citing IEC 60086-2): 70.6 h idle, 17.1 h at 25 A.
    expect(0.565 / supplyCurrentAt(s, 0)).toBeCloseTo(70.6, 1);
    expect(0.565 / supplyCurrentAt(s, 25)).toBeCloseTo(17.1, 1);
  });
});

describe('closed-loop Hall sensor: the loop', () => {
  // A simple integrator: R_z = 0, a near-ideal driver (200 dB, 100 GHz), no Hall pole, no Hall resistance.
  const integrator = () => patched((x) => {
    x.sensor.compensation = { inputResistance: 10e3, capacitance: 220e-12, zeroResistance: 0 };
    x.sensor.driver = { ...x.sensor.driver, openLoopGainDb: 200, gbw: 1e11 };
    x.sensor.bandwidth = 1e9; x.sensor.sourceResistance = 0;
  });

  it('loop gain of a simple integrator equals the hand-derived T(jω) = r/(jωτ_i·(R + jωL)) (Franklin, Powell & Emami-Naeini)', () => {
    const d = integrator();
    const p = closedLoopParts(specOf(d), d.supply);
    const tau = 10e3 * 220e-12;
    for (const f of [1, 30, 1e3, 1e4, 1e5]) {
      const w = 2 * Math.PI * f;
      // r/(jωτ(R + jωL)) = r/(−ω²τL + jωτR)
      const den = [-w * w * tau * p.inductance, w * tau * p.loopResistance];
      const m = p.hallPerAmp / Math.hypot(den[0]!, den[1]!);
      const ph = -Math.atan2(den[1]!, den[0]!);
      const [re, im] = loopGainAt(p, f);
      expect(rel(Math.hypot(re, im), m), `|T| at ${f} Hz`).toBeLessThan(1e-6);
      // The driver's 200 dB is not infinite: at 1 Hz it leaves 7e-6 rad of the integrator's leak.
      expect(Math.abs(Math.atan2(im, re) - ph), `arg T at ${f} Hz`).toBeLessThan(1e-4);
    }
  });

  it('|T| written out in real numbers (for the crossover search) equals |loopGainAt| at every frequency, for the integrator and the demo', () => {
    for (const d of [integrator(), demoDesign('closed-loop-clamp')]) {
      const p = closedLoopParts(specOf(d), d.supply);
      for (let k = 0; k <= 130; k++) {
        const f = 1e-3 * 10 ** (k / 10);
        const [re, im] = loopGainAt(p, f);
        expect(rel(loopGainMagnitudeAt(p, f), Math.hypot(re, im)), `|T| at ${f} Hz`).toBeLessThan(1e-12);
      }
    }
  });

  it('its crossover and phase margin match the closed forms: ω_c² = (−R² + √(R⁴ + 4L²(r/τ)²))/(2L²), PM = 90° − atan(ω_c·L/R)', () => {
    const d = integrator();
    const p = closedLoopParts(specOf(d), d.supply);
    const tau = 10e3 * 220e-12, L = p.inductance, R = p.loopResistance, k = p.hallPerAmp / tau;
    const wc = Math.sqrt((-R * R + Math.sqrt(R ** 4 + 4 * L * L * k * k)) / (2 * L * L));
    const lf = loopFigures(p);
    expect(rel(lf.crossover!, wc / (2 * Math.PI))).toBeLessThan(1e-6);
    expect(lf.phaseMargin!).toBeCloseTo(90 - (Math.atan((wc * L) / R) * 180) / Math.PI, 4);
    // About 6.6°: too little, and the report says so as a failure (below 30°, ours).
    expect(lf.phaseMargin!).toBeLessThan(10);
    expect(closedLoopFigures(specOf(d), d.supply, 25).findings.find((x) => x.code === 'closed-loop-margin')?.level).toBe('fail');
  });

  it('a pure integrator leaves a notch where the Hall and transformer paths cancel, at ω0 = √(r/(L·τ_i)) (derived)', () => {
    const d = integrator();
    const p = closedLoopParts(specOf(d), d.supply);
    const f0 = Math.sqrt(p.hallPerAmp / (p.inductance * 10e3 * 220e-12)) / (2 * Math.PI);
    const t = closedLoopTransferAt(p, f0).total;
    expect(Math.hypot(...t)).toBeLessThan(1e-4);
    expect(Math.hypot(...closedLoopTransferAt(p, f0 / 100).total)).toBeGreaterThan(0.99);
  });

  it('with a zero on the winding corner the dip is 1/(1 + T_p), T_p = (R_z/R_i)·r/R (derived)', () => {
    const d = integrator();
    const p0 = closedLoopParts(specOf(d), d.supply);
    const rz = 1e6, tp = (rz / 10e3) * p0.hallPerAmp / p0.loopResistance;
    const p = { ...p0, zeroResistance: rz, capacitance: p0.inductance / p0.loopResistance / rz };
    const lf = loopFigures(p);
    expect(lf.flatness).toBeLessThan(0);
    expect(rel(-lf.flatness, 1 / (1 + tp))).toBeLessThan(0.01);
    // The loop is then an integrator through the crossover: PM near 90°, crossover near T_p·R/(2πL).
    expect(lf.phaseMargin!).toBeGreaterThan(85);
    expect(rel(lf.crossover!, (tp * p.loopResistance) / (2 * Math.PI * p.inductance))).toBeLessThan(0.02);
  });

  it('the transformer path\'s corner R/(2πL) equals the current-transformer model\'s low corner on the same winding', () => {
    const d = demo();
    const s = specOf(d);
    const p = closedLoopParts(s, d.supply);
    const ct = sensorFront({ type: 'current-transformer', measurand: 'A', secondaryTurns: 1000, primaryTurns: 1, burden: 82 + 1, burdenPower: 0.25, inductanceFactor: p.inductanceFactor, windingResistance: p.windingResistance, quiescent: 0, sourceResistance: 0, noiseDensity: 0, bandwidth: 1e9, sensitivityTolerance: 0, quiescentTolerance: 0, sensitivityDrift: 0, quiescentDrift: 0, supplyCurrent: 0, outputDrive: 0 }, { ...d, target: { ...d.target, signal: 'ac-rms' } });
    expect(rel(loopFigures(p).windingCorner, ct.lowCorner)).toBeLessThan(1e-12);
    // And (REFERENCES, derived) 2 µH/turn², 1000 turns, 100 + 20 Ω: 9.55 Hz.
    expect(loopFigures({ ...p, inductanceFactor: 2e-6, inductance: 2, loopResistance: 120 }).windingCorner).toBeCloseTo(9.549, 3);
  });

  it('the circuit solver (MNA, broken loop) gives the same loop gain and the same closed-loop transfer', () => {
    const d = demo();
    const s = specOf(d);
    const p = closedLoopParts(s, d.supply);
    const open = closedLoopCircuit(s, p, true), closed = closedLoopCircuit(s, p);
    const ideal = closedLoopFigures(s, d.supply, 25).idealSensitivity;
    for (const f of [0.1, 10, 207, 1e3, 8e3, 13e3, 1e5, 1e6]) {
      const a = loopGainAt(p, f), b = circuitLoopGainAt(open, f);
      expect(Math.hypot(a[0] - b[0], a[1] - b[1]) / Math.hypot(...a), `T at ${f} Hz`).toBeLessThan(1e-9);
      const t = closedLoopTransferAt(p, f).total, c = circuitTransferAt(closed, f);
      expect(Math.hypot(t[0] * ideal - c[0], t[1] * ideal - c[1]) / ideal, `transfer at ${f} Hz`).toBeLessThan(1e-9);
    }
  });

  it('suggestCompensation keeps about 60° of margin and flattens a pure integrator\'s notch to a small dip', () => {
    const d = integrator();
    const p = closedLoopParts(specOf(d), d.supply);
    const sug = suggestCompensation({ ...p, hallBandwidth: 100e3 });
    const withIt = { ...p, hallBandwidth: 100e3, inputResistance: sug.inputResistance, zeroResistance: sug.zeroResistance, capacitance: sug.capacitance };
    const lf = loopFigures(withIt);
    expect(lf.phaseMargin!).toBeGreaterThan(50);
    expect(lf.phaseMargin!).toBeLessThan(70);
    expect(Math.abs(lf.flatness)).toBeLessThan(0.02);
    // E24 resistors and an E6 capacitor (IEC 60063).
    expect([1, 1.5, 2.2, 3.3, 4.7, 6.8].some((m) => Math.abs(sug.capacitance / 10 ** Math.floor(Math.log10(sug.capacitance)) - m) < 1e-9)).toBe(true);
  });

  it('the demo holds at least 20 A on ±5 V with a phase margin of at least 45°', () => {
    const d = demo();
    const f = closedLoopFigures(specOf(d), d.supply, 25);
    expect(Math.min(f.held.high, -f.held.low)).toBeGreaterThanOrEqual(20);
    expect(d.supply.positive).toBe(5);
    expect(f.loop.phaseMargin!).toBeGreaterThan(45);
    expect(f.findings.filter((x) => x.level === 'fail')).toEqual([]);
  });
});

describe('closed-loop Hall sensor: the turns trade', () => {
  it('more turns: less supply current, more inductance, a lower winding corner', () => {
    const d = demo();
    const t = turnsTrade(specOf(d), d.supply, 25);
    for (let i = 1; i < t.length; i++) {
      expect(t[i]!.supplyCurrent).toBeLessThan(t[i - 1]!.supplyCurrent);
      expect(t[i]!.inductance).toBeGreaterThan(t[i - 1]!.inductance);
      expect(t[i]!.windingCorner).toBeLessThan(t[i - 1]!.windingCorner);
    }
    // 100 turns cannot carry 25 A × 1.2 within ±5 V through a measurable R_M and a 0.1 A driver: 0.3 A.
    expect(t[0]!.fits).toBe(false);
    const pick = proposeTurns(t)!;
    expect(pick.fits).toBe(true);
    expect(pick.maxCurrent).toBeGreaterThanOrEqual(25);
    // The fewest turns within twice the least supply current (our rule): here 1500 (24.7 mA against 13.0 mA at 5000).
    const least = Math.min(...t.filter((o) => o.fits).map((o) => o.supplyCurrent));
    expect(pick.supplyCurrent).toBeLessThanOrEqual(2 * least);
    expect(t.filter((o) => o.fits && o.turns < pick.turns).every((o) => o.supplyCurrent > 2 * least)).toBe(true);
  });
});
