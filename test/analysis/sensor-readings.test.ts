import { describe, expect, it } from 'vitest';
import { analyse } from '../../src/analysis/report.js';
import { fitReadings } from '../../src/analysis/fit.js';
import { sensorFromReadings } from '../../src/analysis/sensor-readings.js';
import { studentQuantile } from '../../src/analysis/distributions.js';
import { gapFieldPerAmp } from '../../src/physics/sensors.js';
import { MU0 } from '../../src/model/constants.js';
import { mulberry32 } from '../../src/model/random.js';
import type { Reading } from '../../src/model/readings.js';
import { designFrom } from '../helpers.js';
import { sayFinding } from '../../src/present/finding-words.js';

const gauss = (rand: () => number) => Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());

/** Invented readings of a line with 1 mV rms noise at the given measurand values. */
function readingsOf(slope: number, zero: number, xs: number[], seed = 3, noise = 1e-3): Reading[] {
  const rand = mulberry32(seed);
  return xs.map((x) => [x, zero + slope * x + noise * gauss(rand)]);
}

describe('a voltage-output sensor from readings', () => {
  // Our own scenario: the generic demo's module measured at 13.1 mV/A around 2.46 V instead of its
  // stated 12.5 mV/A around 2.5 V.
  const pts = readingsOf(0.0131, 2.46, [-20, -15, -10, -5, 0, 5, 10, 15, 20]);
  const d = designFrom('generic-sensor', (x) => { x.sensor.readings = { use: true, points: pts }; });
  it('sensorFromReadings puts the fit\'s slope and intercept in place of the stated figures', () => {
    const { design, readings } = sensorFromReadings(d);
    const fit = fitReadings(pts).line!;
    expect(readings!.applied).toBe(true);
    const s = design.sensor as { sensitivity: number; quiescent: number };
    expect(s.sensitivity).toBe(fit.slope);
    expect(s.quiescent).toBe(fit.intercept);
  });
  it('the tolerances are the fit\'s standard errors times Student\'s t(0.975, n − 2)', () => {
    const { design } = sensorFromReadings(d);
    const fit = fitReadings(pts).line!;
    const k = studentQuantile(0.975, pts.length - 2);
    // t(0.975, 7) = 2.365 (NIST/SEMATECH e-Handbook §1.3.6.7.2).
    expect(k).toBeCloseTo(2.365, 3);
    expect(design.sensor.sensitivityTolerance).toBeCloseTo((k * fit.slopeStdError) / fit.slope, 12);
    expect(design.sensor.quiescentTolerance).toBeCloseTo(k * fit.interceptStdError, 12);
  });
  it('the report\'s front and the solved gain follow the measured sensitivity', () => {
    const r = analyse(d, { spreadTrials: 0 });
    expect(r.front.sensitivity).toBeCloseTo(fitReadings(pts).line!.slope, 12);
    // Scale 0.1 V/A from about 13.1 mV/A: a gain near 7.63.
    expect(r.stage!.gain).toBeCloseTo(0.1 / r.front.sensitivity, 1);
    expect(r.readings?.applied).toBe(true);
  });
  it('the same readings with use = false leave the stated figures in force', () => {
    const off = designFrom('generic-sensor', (x) => { x.sensor.readings = { use: false, points: pts }; });
    expect(analyse(off, { spreadTrials: 0 }).front.sensitivity).toBe(0.0125);
  });
  it('two readings give a fail finding that says what is missing, and the stated figures stay', () => {
    const two = designFrom('generic-sensor', (x) => { x.sensor.readings = { use: true, points: [[0, 2.5], [10, 2.63]] }; });
    const r = analyse(two, { spreadTrials: 0 });
    const w = r.warnings.find((x) => x.code === 'readings-too-few')!;
    expect(w.level).toBe('fail');
    expect(sayFinding(w)).toMatch(/2 usable points; a fit needs at least 3 \(1 more/);
    expect(r.front.sensitivity).toBe(0.0125);
  });
  it('readings that leave the line above +12 A put a sensor limit there', () => {
    const xs = [-20, -16, -12, -8, -4, 0, 4, 8, 12, 16, 20, 24];
    const rand = mulberry32(9);
    const bent: Reading[] = xs.map((x) => [x, 2.5 + 0.0125 * Math.min(x, 12 + 0.3 * (x - 12)) + 0.5e-3 * gauss(rand)]);
    const r = analyse(designFrom('generic-sensor', (x) => { x.sensor.readings = { use: true, points: bent }; }), { spreadTrials: 0 });
    expect(r.readings!.linearHigh).toBe(12);
    expect(r.clip!.measurandHigh).toBeCloseTo(12, 6);
    expect(r.clip!.firstHigh).toBe('sensor');
  });
  it('a current transformer cannot use readings: the file is refused at sensor.readings.use', async () => {
    const { validateDesign } = await import('../../src/model/design.js');
    const doc = structuredClone((await import('../../src/model/demos.js')).DEMOS.find((x) => x.id === 'appliance-ct')!.document) as any;
    doc.sensor.readings = { use: true, points: [[0, 0], [1, 0.0165], [2, 0.033]] };
    const v = validateDesign(doc);
    expect(v.ok).toBe(false);
    if (!v.ok) expect(v.problems.map((p) => p.path)).toContain('sensor.readings.use');
  });
});

describe('a Hall sensor in a gapped core from readings', () => {
  // Our own scenario: the bench-clamp demo's core, whose real gap fringes so that it reads 12 % above
  // the fringing-free model. Readings at the 5 V regulated rail (the sensor is ratiometric at 5 V).
  const base = designFrom('bench-clamp');
  const spec = base.sensor as any;
  const model = spec.hallSensitivity * gapFieldPerAmp(spec.turns, spec.core.gap, spec.core.pathLength, spec.core.permeability);
  const F = 1.12;
  const pts = readingsOf(model * F, 2.49, [-10, -7.5, -5, -2.5, 0, 2.5, 5, 7.5, 10], 5, 0.5e-3);
  const d = designFrom('bench-clamp', (x) => { x.sensor.readings = { use: true, points: pts }; });
  it('the implied fringing factor is the measured slope over the gap model\'s', () => {
    const { readings } = sensorFromReadings(d);
    const slope = fitReadings(pts).line!.slope;
    expect(readings!.fringing).toBeCloseTo(slope / model, 12);
    expect(Math.abs(readings!.fringing! - F)).toBeLessThan(0.01);
  });
  it('the effective gap puts the measured slope back into B = μ0·N·I/(g + l/μr) (Ampère\'s law)', () => {
    const { readings } = sensorFromReadings(d);
    const slope = fitReadings(pts).line!.slope;
    const g = readings!.effectiveGap!;
    expect(spec.hallSensitivity * (MU0 * spec.turns) / (g + spec.core.pathLength / spec.core.permeability)).toBeCloseTo(slope, 12);
    expect(g).toBeLessThan(spec.core.gap);
  });
  it('the report lists the implied fringing and gap among the sensor figures, and uses the measured sensitivity', () => {
    const r = analyse(d, { spreadTrials: 0 });
    const keys = r.front.figures.map((f) => f.key);
    expect(keys).toContain('readingsFringing');
    expect(keys).toContain('readingsGap');
    expect(r.front.sensitivity).toBeCloseTo(fitReadings(pts).line!.slope, 10);
  });
  it('the fit\'s tolerance, not the datasheet\'s 3 %, sizes the gain trimmer and enters the error budget', () => {
    const datasheet = analyse(base, { spreadTrials: 0 });
    const measured = analyse(d, { spreadTrials: 0 });
    const tol = sensorFromReadings(d).readings!.sensitivityTolerance;
    expect(tol).toBeLessThan(0.01);
    // The scale stack the gain trimmer must absorb shrinks by the difference of the two sensor tolerances
    // (the resistor pair's 2·t·(G−1)/G moves by well under 0.1 % with the gain).
    const drop = datasheet.stage!.network.gainTrim!.need - measured.stage!.network.gainTrim!.need;
    expect(Math.abs(drop - (0.03 - tol))).toBeLessThan(1e-3);
    const term = measured.errors!.terms.find((t) => t.name === 'sensor sensitivity tolerance')!;
    expect(term.value).toBeCloseTo(20 * tol, 9);
  });
  it('readings of the wrong sign imply an impossible fringing and are refused with a fail finding', () => {
    const neg = readingsOf(-model, 2.5, [-10, -5, 0, 5, 10]);
    const r = analyse(designFrom('bench-clamp', (x) => { x.sensor.readings = { use: true, points: neg }; }), { spreadTrials: 0 });
    expect(r.warnings.find((w) => w.code === 'readings-implausible')?.level).toBe('fail');
  });
});

describe('the linear region on the bench-clamp demo\'s own transfer', () => {
  // The demo's output against current, clipped where the stage saturates, read at every fourth point of its
  // transfer curve with 2 mV rms of invented noise: the fit must end its linear region at the clip point.
  const r = analyse(designFrom('bench-clamp'), { spreadTrials: 0 });
  const t = r.transfer!;
  const rand = mulberry32(21);
  const pts: Reading[] = [];
  for (let i = 0; i < t.x.length; i += 4) pts.push([t.x[i]!, t.y[i]! + 2e-3 * gauss(rand)]);
  const step = t.x[4]! - t.x[0]!;
  const f = fitReadings(pts);
  it('the high end of the linear region lies within one reading step of the stage\'s clip point', () => {
    expect(r.clip!.measurandHigh).toBeLessThan(t.x[t.x.length - 1]!);
    expect(Math.abs(f.linear![1] - r.clip!.measurandHigh)).toBeLessThanOrEqual(step);
  });
  it('below, the stage clips only past the plotted span, so the linear region starts at the first reading', () => {
    expect(r.clip!.measurandLow).toBeLessThan(t.x[0]!);
    expect(f.linear![0]).toBe(pts[0]![0]);
    expect(f.beyondLow).toEqual([]);
  });
  it('the fitted slope is the stage\'s scale', () => {
    expect(f.line!.slope).toBeCloseTo(r.dc!.out[1], 3);
  });
});
