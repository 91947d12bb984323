/**
 * The closed-loop Hall sensor as a `SensorFront`: the voltage across the measurement resistor, above the
 * reference R_M's low end is tied to, is what the stage after it amplifies. SI units.
 */
import type { ClosedLoopHallSensor, Design } from '../model/design.js';
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
    limits: [{ kind: 'driver', low: held.low, high: held.high, data: { cause: 'driver', runsOut: held.limitHigh, saturation: held.saturationHigh, measurand: m } }],
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
    warnings: cl.findings,
    cautions: ['closed-loop-open-winding'],
  };
}
