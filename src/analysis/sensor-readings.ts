/**
 * A sensor "from readings": the fit of the bench readings kept in the design (sensor.readings) sets the
 * sensor's sensitivity and zero and their tolerances, so that trim sizing and the error budget work with
 * what was measured. Readings are taken at the rail that feeds the sensor; for a ratiometric sensor they
 * are brought back to the supply its figures are stated at.
 *
 * Tolerances from the fit: the expanded uncertainty U = k·u with the coverage factor k = t(0.975, n − 2),
 * Student's t for the fit's degrees of freedom, for about 95 % coverage (JCGM 100:2008, Guide to the
 * expression of uncertainty in measurement, Annex G, from memory):
 *   sensitivityTolerance = k·se(b1)/|b1|,  quiescentTolerance = k·se(b0).
 *
 * Hall sensor in a gapped core: the measured sensitivity S_m, against the gap model's
 * S = k_H·μ0·N/(g + l_e/μr) (src/physics/sensors.ts), implies
 *   fringing factor F = S_m / S  and  effective gap g_eff = μ0·N·k_H/S_m − l_e/μr
 * (the same Ampère's-law circuit solved for F or for g; Umans, Fitzgerald & Kingsley's Electric
 * Machinery, 7th ed., §1.1).
 */
import type { Design, HallGapCoreSensor, VoltageOutputSensor } from '../model/design.js';
import { finding, type Finding } from '../model/findings.js';
import { MU0 } from '../model/constants.js';
import { gapAreaRatio, gapFieldPerAmp, sensorRailVoltage, type SensorFront } from '../physics/sensors.js';
import { MIN_READINGS, fitReadings, type ReadingsFit } from './fit.js';
import { studentQuantile } from './distributions.js';

/** Coverage probability of the tolerances taken from a fit (two-sided). */
export const FIT_COVERAGE = 0.95;
/** Fringing factors the design file accepts (sensor.core.fringing). */
const FRINGING_LIMITS: [number, number] = [0.1, 10];

export interface SensorFromReadings {
  fit: ReadingsFit;
  /** Whether the design's sensor figures were replaced by the fit's. */
  applied: boolean;
  /** At the rail that feeds the sensor: output per measurand unit and output at zero, V. */
  sensitivity: number;
  quiescent: number;
  /** The tolerances that go into the design, and the coverage factor k used. */
  sensitivityTolerance: number;
  quiescentTolerance: number;
  coverage: number;
  /** Hall sensor in a gapped core: fringing factor and effective gap (m) implied by the measured sensitivity. */
  fringing: number | null;
  effectiveGap: number | null;
  /** Where the readings leave the straight line (null when they stay on it at that end). */
  linearLow: number | null;
  linearHigh: number | null;
}

/**
 * The design as analysed when its sensor is "from readings": sensitivity and zero (and their tolerances)
 * replaced by the fit's, with what the fit implies. Designs without readings in use come back unchanged.
 */
export function sensorFromReadings(design: Design): { design: Design; readings: SensorFromReadings | null; warnings: Finding[] } {
  const spec = design.sensor;
  const warnings: Finding[] = [];
  const r = spec.readings;
  if (!r || r.points.length === 0 || (spec.type !== 'voltage-output' && spec.type !== 'hall-gap-core')) return { design, readings: null, warnings };
  const fit = fitReadings(r.points);
  const m = spec.measurand;
  const line = fit.line;
  const out: SensorFromReadings = {
    fit, applied: false, sensitivity: NaN, quiescent: NaN, sensitivityTolerance: NaN, quiescentTolerance: NaN, coverage: NaN,
    fringing: null, effectiveGap: null,
    linearLow: fit.beyondLow.length && fit.linear ? fit.linear[0] : null,
    linearHigh: fit.beyondHigh.length && fit.linear ? fit.linear[1] : null,
  };
  if (!line || fit.problem) {
    if (r.use) {
      const have = fit.problem?.have ?? 0;
      warnings.push(finding('readings-too-few', 'fail', { allAtOneValue: fit.problem?.code === 'no-spread', have, need: MIN_READINGS, measurand: m }));
    }
    return { design, readings: out, warnings };
  }
  const k = line.dof > 0 ? studentQuantile(0.5 + FIT_COVERAGE / 2, line.dof) : NaN;
  out.coverage = k;
  out.sensitivity = line.slope;
  out.quiescent = line.intercept;
  out.sensitivityTolerance = Math.min(Math.abs((k * line.slopeStdError) / line.slope), 1);
  out.quiescentTolerance = k * line.interceptStdError;
  // Figures at the rail; a ratiometric sensor's are stated at its ratiometric supply.
  const rail = sensorRailVoltage(design);
  const toSpec = spec.ratiometricSupply ? spec.ratiometricSupply / rail : 1;
  let gEff: number | null = null;
  if (spec.type === 'hall-gap-core') {
    const { pathLength, permeability, gap } = spec.core;
    // The ratio of the measured sensitivity to the unfringed formula (the "fringing factor" readings imply) …
    const model = spec.hallSensitivity * gapFieldPerAmp(spec.turns, gap, pathLength, permeability);
    out.fringing = (line.slope * toSpec) / model;
    const g = (MU0 * spec.turns * spec.hallSensitivity) / (line.slope * toSpec) - pathLength / permeability;
    out.effectiveGap = g > 0 ? g : null;
    // … and the gap that, in the fringed model of src/physics/sensors.ts (B_gap = μ0·N/(g + F·l_e/μr), F the
    // gap's area ratio, itself a function of g when the core's section is given), gives the measured slope.
    let ge = g;
    for (let i = 0; i < 20 && ge > 0; i++) ge = (MU0 * spec.turns * spec.hallSensitivity) / (line.slope * toSpec) - (gapAreaRatio({ ...spec.core, gap: ge }) * pathLength) / permeability;
    gEff = ge > 0 ? ge : null;
  }
  if (!r.use) return { design, readings: out, warnings };
  if (!(out.quiescentTolerance >= 0) || !(Number.isFinite(out.sensitivityTolerance))) {
    // Two points leave no degrees of freedom (cannot happen past the three-point check; kept for safety).
    return { design, readings: out, warnings };
  }
  const common = { sensitivityTolerance: out.sensitivityTolerance, quiescentTolerance: out.quiescentTolerance * toSpec, quiescent: line.intercept * toSpec };
  let sensor: VoltageOutputSensor | HallGapCoreSensor;
  if (spec.type === 'voltage-output') {
    if (line.slope === 0) return { design, readings: out, warnings };
    sensor = { ...spec, ...common, sensitivity: line.slope * toSpec };
  } else {
    const f = out.fringing!;
    if (!(f >= FRINGING_LIMITS[0] && f <= FRINGING_LIMITS[1])) {
      warnings.push(finding('readings-implausible', 'fail', { fringing: f, low: FRINGING_LIMITS[0], high: FRINGING_LIMITS[1] }));
      return { design, readings: out, warnings };
    }
    if (gEff === null) return { design, readings: out, warnings };
    // The measurement sets the gap the model uses (the core's flux follows from it); the area ratio stays as given.
    sensor = { ...spec, ...common, core: { ...spec.core, gap: gEff } };
  }
  out.applied = true;
  return { design: { ...design, sensor }, readings: out, warnings };
}

/**
 * The front with what the readings add: the measured end of the linear region as a sensor limit, and
 * the fit's figures. Returns the front unchanged when no readings are in use.
 */
export function frontWithReadings(front: SensorFront, sr: SensorFromReadings | null, measurand: string): SensorFront {
  if (!sr || !sr.applied) return front;
  const limits = front.limits.slice();
  if (sr.linearLow !== null || sr.linearHigh !== null) {
    limits.push({
      kind: 'sensor', low: sr.linearLow ?? -Infinity, high: sr.linearHigh ?? Infinity,
      data: { cause: 'sensor', what: 'readings', low: sr.linearLow, high: sr.linearHigh, measurand },
    });
  }
  const figures = front.figures.slice();
  figures.push({ key: 'readingsSensitivity', label: `Sensitivity from ${sr.fit.used} readings`, value: sr.sensitivity, unit: `V/${measurand}` });
  figures.push({ key: 'readingsResidualStd', label: 'Residual deviation of the readings', value: sr.fit.line?.residualStd ?? NaN, unit: 'V' });
  if (sr.fringing !== null) figures.push({ key: 'readingsFringing', label: 'Fringing factor the readings imply', value: sr.fringing, unit: '' });
  if (sr.effectiveGap !== null) figures.push({ key: 'readingsGap', label: 'Effective gap the readings imply (no fringing)', value: sr.effectiveGap, unit: 'm' });
  if (sr.linearLow !== null) figures.push({ key: 'readingsLinearLow', label: 'Readings linear down to', value: sr.linearLow, unit: measurand });
  if (sr.linearHigh !== null) figures.push({ key: 'readingsLinearHigh', label: 'Readings linear up to', value: sr.linearHigh, unit: measurand });
  return { ...front, limits, figures };
}
