/**
 * What every stage solver shares: the solved stage's shape, the acceptance and ranking constants, the
 * preferred feedback resistance, the gain-trimmer options and the parts list. SI units throughout (Ω, V).
 */
import type { Design } from '../model/design.js';
import { TRIMMER_VALUES, usualTolerance } from '../model/eseries.js';
import type { Finding } from '../model/findings.js';
import type { Arm, Part, PartRole, StageNetwork, Trimmer } from '../circuit/network.js';
import type { IdealStage } from '../physics/topology.js';
import type { PairCandidate } from './search.js';
import { TRIMMER_TOLERANCE, feedbackForCoverage } from './trimmers.js';

export interface SolvedStage {
  ideal: IdealStage;
  network: StageNetwork;
  parts: Part[];
  /** Gain alternatives for the reference network built, ranked; `chosen` is the index built. */
  alternatives: PairCandidate[];
  chosen: number;
  /** Ideal-op-amp signal gain (magnitude, pin volts per sensor volt) from the real parts, trimmers at their settings. */
  gain: number;
  /** Ideal-op-amp noise gain of the parts built: 1 + Rf/(what the − input sees to fixed voltages). */
  noiseGain: number;
  reference: number;
  /** Relative scale error before trimming at the op-amp pin, finite open-loop gain included (trimmers at their settings). */
  scaleError: number;
  /** Zero error before trimming at the op-amp pin, V (finite open-loop gain included). */
  zeroError: number;
  warnings: Finding[];
}

/** A built scale may differ from the target by at most this fraction of the resistor tolerance (1 % parts → 0.1 %). */
export const ACCEPT_OF_TOLERANCE = 0.1;
/** Errors below this fraction of the resistor tolerance rank as equal (then parts and preference decide). */
export const FLOOR_OF_TOLERANCE = 0.05;
/** A trimmer may cover at most this many times what it must (one 1-2-5 step and part rounding: 2.5 × 1.3), so its setting stays fine. */
export const MAX_OVERSIZE = 3.25;

/**
 * Preferred feedback resistance: 100 kΩ (10 kΩ–100 kΩ is the usual range for general-purpose op-amps: low
 * enough for noise and bias-current error, high enough not to load the output or drain a battery; common
 * practice), kept inside the window. It only ranks; the whole window is searched.
 */
export function preferredFeedback(design: Design): number {
  const { resistanceMin: lo, resistanceMax: hi } = design.target;
  return Math.min(Math.max(100e3, lo * 10), hi / 2);
}

/** A gain trimmer and the band of fixed feedback arms over which it covers the scale stack. */
export interface GainOption {
  /** Gain trimmer, Ω (0 = none). */
  trim: number;
  /** Window of the fixed feedback arm. */
  aMin: number;
  aMax: number;
  /** Whether the trimmer covers the stack anywhere in the window. */
  covers: boolean;
}

/**
 * The gain-trimmer options: each standard value with the band of fixed feedback arms over which it covers the
 * stack (COVERAGE) without wasting resolution (at most MAX_OVERSIZE × that), and no larger than the arm; when
 * none covers (little leverage near unity gain), every trimmer and none, marked short. Without a
 * gain trim, one option: no trimmer, the whole window.
 */
export function gainOptions(wantTrim: boolean, sensitivity: number, stack: number, tableMin: number, tableMax: number): GainOption[] {
  if (!wantTrim) return [{ trim: 0, aMin: tableMin, aMax: tableMax, covers: true }];
  const options: GainOption[] = [];
  for (const t of TRIMMER_VALUES) {
    const aMax = Math.min(feedbackForCoverage(t, sensitivity, stack), tableMax);
    const aMin = Math.max(feedbackForCoverage(t, sensitivity, stack * MAX_OVERSIZE), t, tableMin);
    if (aMax >= aMin) options.push({ trim: t, aMin, aMax, covers: true });
  }
  if (!options.length) {
    // None covers: every trimmer no larger than its arm, and no trimmer at all, each marked short (the search
    // then takes whichever lands the gain, and the report says the trim falls short).
    for (const t of TRIMMER_VALUES) if (t <= tableMax) options.push({ trim: t, aMin: Math.max(t, tableMin), aMax: tableMax, covers: false });
    options.push({ trim: 0, aMin: tableMin, aMax: tableMax, covers: false });
  }
  return options;
}

/** Numbers the parts R1, R2 … and RV1, RV2 … in signal-path order. */
export function partsOf(net: StageNetwork, design: Design): Part[] {
  const { series, tolerance } = design.target;
  const tol = tolerance ?? usualTolerance(series);
  const parts: Part[] = [];
  let r = 0, rv = 0;
  const addArm = (arm: Arm | null | undefined, role: PartRole) => {
    if (!arm) return;
    for (const ohms of arm.parts) parts.push({ ref: `R${++r}`, role, kind: 'resistor', ohms, series, tolerance: tol, arrangement: arm.arrangement });
  };
  const addTrim = (t: Trimmer | null, role: PartRole) => {
    if (!t) return;
    parts.push({ ref: `RV${++rv}`, role, kind: 'trimmer', ohms: t.ohms, series: 'trimmer', tolerance: TRIMMER_TOLERANCE, arrangement: 'single', setting: t.setting });
  };
  addArm(net.plusArm, 'plus-input');
  addArm(net.feedback, 'feedback');
  addTrim(net.gainTrim, 'gain-trim');
  addArm(net.leg, net.topology === 'non-inverting' || net.topology === 'summing-non-inverting' ? 'ground-leg' : 'input');
  addArm(net.offsetArm, 'offset');
  if (net.reference.kind === 'divider') {
    addArm(net.reference.top, 'reference-top');
    addTrim(net.reference.trim, 'zero-trim');
    addArm(net.reference.bottom, 'reference-bottom');
  }
  // The burden belongs to the sensor but is a part to buy; its ref matches the circuit's element (RB).
  if (design.sensor.type === 'current-transformer') parts.push({ ref: 'RB', role: 'burden', kind: 'resistor', ohms: design.sensor.burden, series, tolerance: tol, arrangement: 'single' });
  const f = design.output.filter;
  if (f) {
    parts.push({ ref: `R${++r}`, role: 'output-series', kind: 'resistor', ohms: f.resistance, series, tolerance: tol, arrangement: 'single' });
    if (f.capacitance > 0) parts.push({ ref: 'C1', role: 'output-capacitor', kind: 'capacitor', ohms: 0, farads: f.capacitance, series: 'capacitor', tolerance: 0.1, arrangement: 'single' });
  }
  return parts;
}
