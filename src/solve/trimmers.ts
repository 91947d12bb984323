/**
 * Trimmer sizing, once, from the tolerance stacks (our definitions, stated in docs/method.md):
 * - coverage: a trimmer's half-span (from its setting to the nearer end) must be at least COVERAGE × the
 *   worst-case stack it has to absorb;
 * - resolution: among standard trimmers that give the coverage, the smallest wastes the least resolution;
 *   its settable step is SETTABILITY of its full travel.
 */
import type { Design, Topology } from '../model/design.js';
import { TRIMMER_VALUES } from '../model/eseries.js';
import type { SensorFront } from '../physics/sensors.js';
import { referenceRails, type IdealStage } from '../physics/topology.js';

/** Trim half-span must be at least this many times the worst-case stack it absorbs (our margin). */
export const COVERAGE = 1.5;
/** Fraction of a trimmer's travel a person can set reliably (single-turn cermet, common practice, from memory). */
export const SETTABILITY = 1 / 200;
/** End-to-end tolerance of a trimmer (±20 %, common practice). */
export const TRIMMER_TOLERANCE = 0.2;
/**
 * What a rheostat at mid can be relied on to move either way, as a fraction of its value: half its travel,
 * less its own ±20 % (which both shrinks the travel and shifts the mid point).
 */
export const RHEOSTAT_USABLE = 0.5 - TRIMMER_TOLERANCE;

/** The smallest standard trimmer value (1-2-5, 100 Ω … 1 MΩ, common practice) at or above `ohms`; the largest above that. Example: standardTrimmer(3000) = 5000. */
export function standardTrimmer(ohms: number): number {
  return TRIMMER_VALUES.find((v) => v >= ohms) ?? TRIMMER_VALUES[TRIMMER_VALUES.length - 1]!;
}

/**
 * How the scale moves with the feedback resistance: d(scale)/scale = s · dRf/Rf, with s = (G−1)/G for the
 * non-inverting stage (G = 1 + Rf/Rleg) and 1 for the inverting one (G = Rf/Rin). Example: G = 8 → 0.875.
 */
export function feedbackSensitivity(topology: Topology, gain: number): number {
  return topology === 'non-inverting' ? (gain - 1) / gain : 1;
}

/**
 * The scale a rheostat of `trimOhms` at mid, in series with a fixed feedback arm `fixedOhms`, is sure to
 * move either way (fraction of scale): RHEOSTAT_USABLE · Rt/(Rf + Rt/2) · s. Example: 10 kΩ with 100 kΩ at
 * s = 1 → 0.3 · 10/105 = 2.86 %.
 */
export function gainTrimHalfSpan(trimOhms: number, fixedOhms: number, sensitivity: number): number {
  return ((RHEOSTAT_USABLE * trimOhms) / (fixedOhms + trimOhms / 2)) * sensitivity;
}

/**
 * The largest fixed feedback arm with which a rheostat of `trimOhms` still covers `need` (fraction of scale)
 * with COVERAGE: `gainTrimHalfSpan` solved for Rf. Example: 10 kΩ, s = 1, need 1 % → 0.3·10k/0.015 − 5k = 195 kΩ.
 */
export function feedbackForCoverage(trimOhms: number, sensitivity: number, need: number): number {
  return (RHEOSTAT_USABLE * trimOhms * sensitivity) / (COVERAGE * Math.max(need, 1e-12)) - trimOhms / 2;
}

/**
 * Worst-case relative scale error the gain trim must absorb: sensor spread, the resistors that set the scale,
 * the regulated rail of a ratiometric sensor. The resistors' share (each ±tol, worst case, from the closed
 * forms in src/physics/topology.ts): non-inverting 2·tol·(G−1)/G; summing non-inverting 2·tol·((K−1)/K + 1 − α);
 * inverting, summing inverting and difference 2·tol.
 */
export function scaleStack(design: Design, front: SensorFront, ideal: IdealStage): number {
  const tol = design.target.tolerance;
  const resistors = ideal.topology === 'non-inverting' ? 2 * tol * ideal.feedbackSensitivity
    : ideal.topology === 'summing-non-inverting' ? 2 * tol * (ideal.feedbackSensitivity + 1 - ideal.split)
    : 2 * tol;
  const rail = front.ratiometricSupply && design.supply.sensorRail === 'regulated' && design.supply.regulated ? design.supply.regulated.tolerance : 0;
  return front.sensitivityTolerance + resistors + rail;
}

/**
 * How far the zero moves, V, per unit of fractional scale change made by the span trim: the non-inverting and
 * inverting stages pivot about the reference, (Vref − Vq)·G; the summing stages scale the whole output, |zero|;
 * the difference stage moves its sensor term and the reference's share, |m·Vq| + |Vref|.
 */
function zeroPerSpan(ideal: IdealStage, quiescent: number): number {
  const ref = Number.isFinite(ideal.reference) ? ideal.reference : 0;
  switch (ideal.topology) {
    case 'non-inverting': case 'inverting': return Math.abs(ref - quiescent) * ideal.gain;
    case 'summing-non-inverting': case 'summing-inverting': return Math.abs(ideal.pinZero);
    case 'difference': return Math.abs(ideal.gain * quiescent) + Math.abs(ref);
  }
}

/**
 * Worst-case zero error at the op-amp output, V, that the zero trim must absorb: the sensor's quiescent
 * spread × G, the op-amp's offset × noise gain and bias current × Rf, the reference's own tolerance × its
 * leverage, and the zero shift the span trim causes when it moves the gain by `gainTrimSpan`.
 */
export function zeroStack(design: Design, front: SensorFront, ideal: IdealStage, gainTrimSpan: number, feedbackOhms: number): number {
  const { opamp, target } = design;
  const [lo, hi] = referenceRails(design);
  const vspan = hi - lo;
  const ref = Number.isFinite(ideal.reference) ? ideal.reference : 0;
  const r = (ref - lo) / vspan;
  const dividerTol = vspan * Math.max(r * (1 - r), 0) * 2 * target.tolerance;
  const railTol = design.supply.referenceRail === 'regulated' && design.supply.regulated ? Math.abs(ref - lo) * design.supply.regulated.tolerance : 0;
  return ideal.gain * front.quiescentTolerance + ideal.noiseGain * opamp.offsetVoltage + Math.abs(opamp.biasCurrent) * feedbackOhms
    + ideal.leverage * (dividerTol + railTol) + zeroPerSpan(ideal, front.quiescent) * gainTrimSpan;
}
