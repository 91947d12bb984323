/**
 * The closed-loop Hall sensor as a `SensorFront`: the voltage across the measurement resistor, above the
 * reference R_M's low end is tied to, is what the stage after it amplifies. SI units.
 */
import type { ClosedLoopHallSensor, Design } from '../model/design.js';
import type { Warning } from '../model/findings.js';
import { closedLoopFigures } from './closed-loop.js';
import type { SensorFront } from './sensors.js';

type Base = Omit<SensorFront, 'sensitivity' | 'quiescent' | 'outputMin' | 'outputMax' | 'ratiometricSupply'>;

/**
 * The front: sensitivity (N_p/N_s)·R_M·T0/(1 + T0), zero at the reference, output resistance R_M (the
 * winding's current is held by the loop), the held range as the sensor's limit. The Hall sensor's zero error
 * ΔV is cancelled by a magnetising current ΔV/r, so it reaches R_M as ΔV·R_M/r (r = Hall volts per ampere
 * of magnetising current); its sensitivity error is divided by the loop gain. The scale's tolerance and drift
 * are R_M's (the design's resistor tolerance and tempco): the turns are exact.
 */
export function closedLoopFront(spec: ClosedLoopHallSensor, design: Pick<Design, 'target' | 'supply'>, base: Base): SensorFront {
  const range = design.target.range;
  const peak = design.target.signal === 'ac-rms' ? Math.SQRT2 : 1;
  const end = Math.max(Math.abs(range[0]), Math.abs(range[1])) * peak;
  const cl = closedLoopFigures(spec, design.supply, end);
  const p = cl.parts;
  const zeroGain = p.measurementResistance / p.hallPerAmp;
  const m = spec.measurand;
  const held = cl.held;
  return {
    ...base,
    sensitivity: cl.sensitivity,
    quiescent: p.reference,
    outputMin: -Infinity,
    outputMax: Infinity,
    ratiometricSupply: null,
    sourceResistance: p.measurementResistance,
    sourceNoisy: true,
    // The loop is part of the stage's circuit; the front itself adds no pole of its own.
    bandwidth: 1e9,
    sensitivityTolerance: design.target.tolerance + spec.sensitivityTolerance * cl.loop.residual,
    sensitivityDrift: design.target.tempco + spec.sensitivityDrift * cl.loop.residual,
    quiescentTolerance: spec.quiescentTolerance * zeroGain,
    quiescentDrift: spec.quiescentDrift * zeroGain,
    supplyCurrent: cl.supplyAtZero,
    limits: [{
      kind: 'driver', low: held.low, high: held.high,
      why: `the driver runs out of ${held.limitHigh === 'current' ? 'current' : 'voltage'} and the core leaves zero flux (the output stops rising; the core saturates at ${fmt(held.saturationHigh)} ${m})`,
    }],
    figures: [
      { key: 'sensitivity', label: 'Sensitivity at R_M, (N_p/N_s)·R_M', value: cl.sensitivity, unit: `V/${m}` },
      { key: 'maxCurrent', label: 'Largest current held at zero flux (the smaller way)', value: Math.min(held.high, -held.low), unit: m },
      { key: 'phaseMargin', label: 'Loop phase margin', value: cl.loop.phaseMargin ?? NaN, unit: '°' },
      { key: 'bandwidth', label: 'Loop (Hall path) bandwidth; the winding carries the signal above it', value: cl.loop.bandwidth, unit: 'Hz' },
      { key: 'crossover', label: 'Loop crossover (|T| = 1)', value: cl.loop.crossover ?? NaN, unit: 'Hz' },
      { key: 'windingInductance', label: 'Compensation winding inductance A_L·N_s²', value: p.inductance, unit: 'H' },
      { key: 'windingResistance', label: 'Compensation winding resistance', value: p.windingResistance, unit: 'Ω' },
      { key: 'windingCorner', label: 'Winding corner R/(2πL) (transformer path from here up)', value: cl.loop.windingCorner, unit: 'Hz' },
      { key: 'flatness', label: 'Largest step in the response across the crossover', value: cl.loop.flatness, unit: '' },
      { key: 'residual', label: 'Scale error left by the finite loop gain 1/(1 + T0)', value: -cl.loop.residual, unit: '' },
      { key: 'supplyAtRangeEnd', label: 'Sensor supply current at the range end (Hall, driver, compensation)', value: cl.supplyAtRangeEnd, unit: 'A' },
      { key: 'driverDissipation', label: 'Driver dissipation, worst within the held range', value: cl.worstDissipation, unit: 'W' },
      { key: 'saturationCurrent', label: 'Core saturates (driver at its limit) at', value: held.saturationHigh, unit: m },
    ],
    warnings: cl.findings.map(closedLoopWarning),
    cautions: ['Never break the compensation winding\'s circuit (the measurement resistor, the driver or its supply) while the clamped conductor carries current: at AC the winding is a current transformer\'s secondary and its open ends can rise to a dangerous voltage. Switch the probe on before clamping it round the conductor and remove it before switching off.'],
  };
}

/**
 * Temporary words for the closed-loop findings until the findings carry data (`{ code, level, data }`); then
 * these sentences move to the wording module in src/present.
 */
function closedLoopWarning(f: ReturnType<typeof closedLoopFigures>['findings'][number]): Warning {
  const d = f.data as Record<string, number>;
  const comp = () => `R_i ${fmt(d.inputResistance!)} Ω, C_i ${fmt(d.capacitance!)} F with R_z ${fmt(d.zeroResistance!)} Ω in series (zero on the winding's corner)`;
  switch (f.code) {
    case 'closed-loop-unstable': return { code: f.code, level: f.level, message: `The loop is unstable (phase margin ${d.phaseMargin === null ? 'none' : `${fmt(d.phaseMargin)}°`}): the output will oscillate. Try ${comp()}.` };
    case 'closed-loop-margin': return { code: f.code, level: f.level, message: `The loop's phase margin is ${fmt(d.phaseMargin!)}° at ${fmt(d.crossover!)} Hz: a step will ring. Try ${comp()}.` };
    case 'closed-loop-flatness': return { code: f.code, level: f.level, message: `The response steps by ${fmt(d.flatness! * 100)} % at ${fmt(d.at!)} Hz, where the Hall path hands over to the transformer path. A zero in the compensation flattens it: ${comp()} leaves ${fmt(d.dip! * 100)} %.` };
    case 'closed-loop-flatness-limit': return { code: f.code, level: f.level, message: `The response steps by ${fmt(d.flatness! * 100)} % at ${fmt(d.at!)} Hz, where the Hall path hands over to the transformer path: about what a 60° phase margin allows with this Hall sensor's bandwidth and this driver's gain-bandwidth. A faster driver or Hall sensor flattens it.` };
    case 'closed-loop-overload': return { code: f.code, level: f.level, message: `Past ${fmt(d.high!)} A (or ${fmt(d.low!)} A) the driver runs out of ${f.data.limitHigh === 'current' ? 'current' : 'voltage'}: the core is no longer held at zero flux, the output stops rising and reads low, the core saturates at ${fmt(d.saturationHigh!)} A and the output collapses. Re-zero after any overload (the core may stay magnetised).` };
    case 'closed-loop-residual': return { code: f.code, level: f.level, message: `The loop's DC gain ${fmt(d.dcLoopGain!)} leaves a scale error of ${fmt(d.residual! * 100)} % (included in the sensitivity).` };
    case 'closed-loop-polarity': return { code: f.code, level: f.level, message: 'If the output runs to a rail at power-up with no current flowing, the compensation winding is connected the wrong way round: swap its two leads.' };
    case 'closed-loop-unmodelled': return { code: f.code, level: f.level, message: 'The transformer path is modelled as a perfect coupling: the winding\'s own capacitance and the core\'s losses, which end it at high frequency, are not modelled.' };
    case 'closed-loop-driver-current': return { code: f.code, level: f.level, message: `The range end needs ${fmt(d.need!)} A from the driver, more than its ${fmt(d.limit!)} A limit: more turns, or a push-pull output stage.` };
  }
}

function fmt(x: number): string {
  return Number.isFinite(x) ? Number(x.toPrecision(3)).toString() : '—';
}
