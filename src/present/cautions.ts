/**
 * The safety cautions, in one place: the app's banner, the printed sheet, the text report, the JSON report and
 * the parts list's header all take them from here, worded for the sensor at hand.
 */
import type { SensorType } from '../model/design.js';
import type { SensorCaution } from '../model/findings.js';

/** Cautions for any probe clamped or fitted round a conductor (common practice for home-built current probes). */
export const SAFETY_CAUTIONS: readonly string[] = [
  'Clamp only onto insulated conductors. Never fit a probe to a bare or damaged conductor.',
  'A home-built probe has no measurement-category (CAT) rating: do not rely on it for protection from mains voltages.',
  'De-energise the circuit before fitting or removing the probe, and re-check before switching on.',
  'Follow local electrical codes and defer to a licensed electrician for work on fixed installations.',
];

/** A shunt is wired into the circuit it measures: its cautions differ from a clamp's (common practice). */
const SHUNT_CAUTIONS: readonly string[] = [
  'A shunt is wired into the circuit it measures: the amplifier and everything connected to it sit at that circuit\'s potential. Use it only on circuits at a safe low voltage, never on mains.',
  'A home-built probe has no measurement-category (CAT) rating: do not rely on it for protection from mains voltages.',
  'De-energise the circuit before wiring the shunt in or out, and re-check before switching on.',
  'Follow local electrical codes and defer to a licensed electrician for work on fixed installations.',
];

/**
 * A voltage-output sensor module: the measured current may pass through it (an in-line module) or it may sit
 * beside or round a conductor; either way its isolation is the module's own (common practice).
 */
const MODULE_CAUTIONS: readonly string[] = [
  'A sensor module that the measured current passes through is wired into that circuit: connect and disconnect it only with that circuit de-energised, and use it only within the isolation voltage its maker states; one that sits round a conductor goes only onto insulated conductors.',
  'A home-built probe has no measurement-category (CAT) rating: do not rely on it for protection from mains voltages.',
  'De-energise the circuit before fitting or removing the sensor, and re-check before switching on.',
  'Follow local electrical codes and defer to a licensed electrician for work on fixed installations.',
];

/** The cautions that belong to one kind of sensor. */
export const SENSOR_CAUTIONS: Record<SensorCaution, string> = {
  'ct-open-secondary': 'Never leave a current transformer secondary open while the primary carries current: the open secondary can rise to a dangerous voltage. Keep the burden soldered in place.',
  'closed-loop-open-winding': 'Never break the compensation winding\'s circuit (the measurement resistor, the driver or its supply) while the clamped conductor carries current: at AC the winding is a current transformer\'s secondary and its open ends can rise to a dangerous voltage. Switch the probe on before clamping it round the conductor, and take it off before switching off.',
};

/** Every caution for a design's sensor: the general list for its kind, then the sensor's own. */
export function cautionsFor(sensorType: SensorType, own: readonly SensorCaution[]): string[] {
  const general = sensorType === 'shunt' ? SHUNT_CAUTIONS : sensorType === 'voltage-output' ? MODULE_CAUTIONS : SAFETY_CAUTIONS;
  return [...general, ...own.map((c) => SENSOR_CAUTIONS[c])];
}
