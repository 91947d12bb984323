/**
 * Magnetic-circuit figures beyond the sensor front itself: the inductance a gapped core adds to the
 * conductor through it, and the primary current at which a current transformer's core saturates. SI units
 * throughout (m, m², T, H, Hz, A, Ω).
 */
import { MU0 } from '../model/constants.js';

/**
 * The constant of the transformer equation, V_rms = 4.44·f·N·A·B_peak: for a sinusoidal flux
 * Φ = Φ_peak·sin ωt the induced EMF N·dΦ/dt has rms value ω·N·Φ_peak/√2 = (2π/√2)·f·N·A·B_peak, and
 * 2π/√2 = √2·π = 4.4429 (textbooks round it to 4.44; e.g. Umans, Fitzgerald & Kingsley's Electric
 * Machinery, 7th ed., ch. 2).
 */
export const TRANSFORMER_EMF_FACTOR = Math.SQRT2 * Math.PI;

/**
 * The core's cross-section A_c = width · depth, m²; one dimension alone is taken as a square section (as
 * `gapAreaRatio` does); null when neither is given.
 * `coreCrossSection({ width: 0.01, depth: 0.008 })` → 8e-5 m².
 */
export function coreCrossSection(core: { width?: number; depth?: number }): number | null {
  const a = core.width ?? core.depth, b = core.depth ?? core.width;
  return a && b ? a * b : null;
}

/**
 * Inductance of N turns on a gapped core, H: L = N²/(R_c + R_g) with R_c = l_e/(μ0·μr·A_c) and
 * R_g = g/(μ0·F·A_c) (Ampère's law round the magnetic circuit; Umans, Fitzgerald & Kingsley's Electric
 * Machinery, 7th ed., §1.2, L = N²/R_tot), i.e.
 *   L = μ0·N²·A_c / (g/F + l_e/μr),
 * F = A_g/A_c the gap's fringing (1: neglected, giving the plain L = μ0·N²·A/(g + l/μr)). For a clamp this is
 * the inductance inserted in series with the measured conductor (N passes of it).
 * `gappedCoreInductance(1, 1.5e-3, 0.06, 2000, 1, 1e-4)` → 8.2133e-8 H (derived).
 */
export function gappedCoreInductance(turns: number, gap: number, pathLength: number, permeability: number, areaRatio: number, area: number): number {
  return (MU0 * turns * turns * area) / (gap / areaRatio + pathLength / permeability);
}

/**
 * Primary rms current at which a current transformer's core reaches its saturation flux density at
 * frequency f, A. The secondary current I_s = I_p·N_p/N_s flows through the burden and the winding, so the
 * EMF the core must support is E = I_s·(R_B + R_w); the transformer equation E = 4.44·f·N_s·A·B_peak
 * (`TRANSFORMER_EMF_FACTOR`) then gives
 *   I_p,sat = 4.44·f·N_s²·A·B_sat / (N_p·(R_B + R_w)).
 * Lower frequencies saturate first (the flux for a given EMF grows as 1/f). Leakage inductance neglected.
 * `ctSaturationCurrent({ secondaryTurns: 1000, primaryTurns: 1, burden: 100, windingResistance: 20, area: 1e-4, saturation: 0.3, frequency: 50 })`
 * → 55.5 A rms (derived).
 */
export function ctSaturationCurrent(ct: { secondaryTurns: number; primaryTurns: number; burden: number; windingResistance: number; area: number; saturation: number; frequency: number }): number {
  const emf = TRANSFORMER_EMF_FACTOR * ct.frequency * ct.secondaryTurns * ct.area * ct.saturation;
  return (emf / (ct.burden + ct.windingResistance)) * (ct.secondaryTurns / ct.primaryTurns);
}
