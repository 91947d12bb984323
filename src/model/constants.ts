/** Physical constants, SI. */

/** Boltzmann constant, J/K: exact by definition (SI Brochure, 9th ed., 2019). */
export const BOLTZMANN = 1.380649e-23;
/** Elementary charge, C: exact by definition (SI Brochure, 9th ed., 2019). */
export const ELEMENTARY_CHARGE = 1.602176634e-19;
/** Vacuum magnetic permeability, N/A²: CODATA 2022 recommended value (measured since 2019). */
export const MU0 = 1.25663706127e-6;
/** Seconds in an hour, for battery life. */
export const HOUR = 3600;
/**
 * Headroom a low-dropout regulator needs between its input and its output to hold regulation, V
 * (common practice for a low-dropout part).
 */
export const REGULATOR_DROPOUT = 0.3;
/**
 * Current a small low-dropout regulator draws for itself, A, when the design does not state it: tens to a
 * few hundred microamperes (common practice, from memory); used by the supply choices (issue 18).
 */
export const REGULATOR_QUIESCENT = 100e-6;
/**
 * Largest distance from a rail at which an op-amp's output counts as rail-to-rail, V: such outputs swing to
 * within tens of millivolts of each rail at light load (common practice).
 */
export const RAIL_TO_RAIL_OUTPUT = 0.1;
/**
 * Current a rail splitter draws from the battery, A: a buffer op-amp's quiescent current and the divider it
 * follows (a few hundred microamperes each; common practice, from memory).
 */
export const SPLITTER_CURRENT = 1e-3;
