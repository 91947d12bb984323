/**
 * Demo designs. Every one is a scenario of our own invention (the figures are plausible round numbers, not
 * taken from any product), and says so in its notes.
 */
import { validateDesign, type Design } from './design.js';
import { OPAMP_ARCHETYPES } from './opamps.js';

const bipolar = OPAMP_ARCHETYPES.find((a) => a.id === 'bipolar-general')!.spec;
const cmos = OPAMP_ARCHETYPES.find((a) => a.id === 'cmos-rail-to-rail')!.spec;

export interface Demo {
  id: string;
  label: string;
  document: Record<string, unknown>;
}

/** The bench clamp's document: a demo of its own and the base of the two-range clamp. */
const BENCH_CLAMP: Record<string, unknown> = {
  format: 'gainwright-design', version: 1,
  title: 'Bench clamp, 100 mV/A, 9 V battery (demo)',
  notes: 'Demo scenario of our own invention: a linear Hall sensor glued into a 1.5 mm gap cut in a ferrite ring, one pass of the wire, read on a scope. The sensor and the offset reference run from a 5 V regulator so that the zero holds as the battery sags.',
  sensor: {
    type: 'hall-gap-core', measurand: 'A', hallSensitivity: 25, quiescent: 2.5, linearField: 0.08,
    outputMin: 0.2, outputMax: 4.8, ratiometricSupply: 5, sourceResistance: 50, noiseDensity: 400e-9,
    bandwidth: 100e3, sensitivityTolerance: 0.03, quiescentTolerance: 0.02, supplyCurrent: 6e-3,
    turns: 1, core: { pathLength: 0.06, permeability: 2000, gap: 1.5e-3, saturation: 0.35, fringing: 1 },
  },
  supply: {
    positive: 9, negative: 0, regulated: { voltage: 5, tolerance: 0.02, quiescentCurrent: 5e-6 },
    sensorRail: 'regulated', referenceRail: 'regulated',
    battery: { fresh: 9.6, endOfLife: 6.0, capacity: 565e-3 * 3600 },
  },
  opamp: { ...bipolar },
  target: { scale: 0.1, zero: 4.5, range: [-20, 20], topology: 'auto', series: 'E96', tolerance: 0.01, arrangements: ['single', 'series', 'parallel'], resistanceMin: 1e3, resistanceMax: 1e6, bandwidth: 20e3 },
  output: { filter: { resistance: 100, capacitance: 0 }, load: { resistance: 1e6, capacitance: 15e-12 } },
  // Calibrated with a 4½-digit bench meter: about 0.1 % of the reading plus 1 mV (common practice).
  calibration: { meterRelative: 0.001, meterDigits: 0.001 },
};

export const DEMOS: readonly Demo[] = [
  {
    id: 'bench-clamp',
    label: 'DC/AC bench clamp for a scope on a 9 V battery',
    document: BENCH_CLAMP,
  },
  {
    id: 'appliance-ct',
    label: 'Appliance current transformer into a 3.3 V ADC',
    document: {
      format: 'gainwright-design', version: 1,
      title: 'Appliance CT into a 3.3 V ADC (demo)',
      notes: 'Demo scenario of our own invention: a clip-on current transformer (2000 turns) on one insulated conductor of an appliance lead, burden 33 Ω, into a microcontroller ADC centred on half its 3.3 V reference. Never open the secondary while the primary carries current.',
      sensor: {
        type: 'current-transformer', measurand: 'A', secondaryTurns: 2000, primaryTurns: 1, burden: 33, burdenPower: 0.25,
        inductanceFactor: 3e-6, windingResistance: 60, quiescent: 0, sensitivityTolerance: 0.02,
      },
      supply: { positive: 3.3, negative: 0 },
      opamp: { ...cmos },
      target: { scale: -0.09, zero: 1.65, range: [-10, 10], signal: 'ac-rms', topology: 'auto', series: 'E96', tolerance: 0.01, arrangements: ['single', 'series', 'parallel'], resistanceMin: 1e3, resistanceMax: 1e6, bandwidth: 2e3 },
      output: { filter: { resistance: 1000, capacitance: 10e-9 }, load: { resistance: 1e8, capacitance: 10e-12 } },
      // Calibrated with a 4½-digit bench meter: about 0.1 % of the reading plus 1 mV (common practice).
      calibration: { meterRelative: 0.001, meterDigits: 0.001 },
    },
  },
  {
    id: 'generic-sensor',
    label: 'Generic voltage-output current sensor, 9 V single supply',
    document: {
      format: 'gainwright-design', version: 1,
      title: 'Generic 12.5 mV/A sensor to 100 mV/A (demo)',
      notes: 'Demo scenario of our own invention: a voltage-output current sensor module (12.5 mV/A around 2.5 V) scaled to 100 mV/A centred on 4.5 V for a scope, on a 9 V bench supply.',
      sensor: { type: 'voltage-output', measurand: 'A', sensitivity: 0.0125, quiescent: 2.5, outputMin: 0.25, outputMax: 4.75, sourceResistance: 50, noiseDensity: 4e-7, bandwidth: 1.2e5 },
      supply: { positive: 9, negative: 0 },
      opamp: { gbw: 1e6, slewRate: 5e5, openLoopGainDb: 100, inputLow: 0, inputHigh: 1.5, outputLow: 0.05, outputHigh: 1.5, voltageNoise: 3.5e-8, currentNoise: 1e-13, offsetVoltage: 3e-3, biasCurrent: 5e-8, supplyCurrent: 5e-4 },
      target: { scale: 0.1, zero: 4.5, range: [-20, 20], topology: 'auto', series: 'E96', tolerance: 0.01, arrangements: ['single', 'series', 'parallel'], resistanceMin: 1e3, resistanceMax: 1e6 },
      // Calibrated with a 4½-digit bench meter: about 0.1 % of the reading plus 1 mV (common practice).
      calibration: { meterRelative: 0.001, meterDigits: 0.001 },
    },
  },
  // --- closed-loop Hall sensor (issue #20) ---
  {
    id: 'closed-loop-clamp',
    label: 'Closed-loop (zero-flux) DC clamp to ±25 A on ±5 V',
    document: {
      format: 'gainwright-design', version: 1,
      title: 'Closed-loop clamp, ±25 A, 100 mV/A, ±5 V (demo)',
      notes: 'Demo scenario of our own invention: the bench clamp\'s ferrite ring (1.5 mm gap, 8 mm × 8 mm section) with a 1000-turn compensation winding of 0.25 mm copper, a linear Hall sensor in the gap, an integrator with a zero driving the winding through a complementary transistor pair, and an 82 Ω measurement resistor to ground, on a ±5 V bench supply. The core is held at zero flux up to about ±34 A.',
      sensor: {
        type: 'closed-loop-hall', measurand: 'A', hallSensitivity: 25, quiescent: 2.5, linearField: 0.08,
        sourceResistance: 50, noiseDensity: 400e-9, bandwidth: 100e3, sensitivityTolerance: 0.03, quiescentTolerance: 0.02, supplyCurrent: 6e-3,
        core: { pathLength: 0.06, permeability: 2000, gap: 1.5e-3, saturation: 0.35, fringing: 1, width: 0.008, depth: 0.008, area: 64e-6 },
        primaryTurns: 1, compensationTurns: 1000, wire: { diameter: 0.25e-3, turnLength: 0.036 }, measurementResistance: 82, reference: 0,
        driver: { outputStage: 'push-pull', gbw: 1e7, openLoopGainDb: 100, swing: 1, drop: 0.7, currentLimit: 0.1, quiescentCurrent: 2e-3, outputResistance: 1 },
        compensation: { inputResistance: 10e3, capacitance: 220e-12, zeroResistance: 3.3e6 },
      },
      supply: { positive: 5, negative: -5 },
      opamp: { ...bipolar },
      target: { scale: 0.1, zero: 0, range: [-25, 25], topology: 'auto', series: 'E96', tolerance: 0.01, arrangements: ['single', 'series', 'parallel'], resistanceMin: 1e3, resistanceMax: 1e6, bandwidth: 20e3 },
      output: { filter: { resistance: 100, capacitance: 0 }, load: { resistance: 1e6, capacitance: 15e-12 } },
      calibration: { meterRelative: 0.001, meterDigits: 0.001 },
    },
  },
  // --- end closed-loop Hall sensor ---
  // Issue 19: the bench clamp with a second range.
  {
    id: 'two-range-clamp',
    label: 'Two-range bench clamp (100 mV/A and 40 mV/A) with a range switch',
    document: {
      format: 'gainwright-design', version: 1,
      title: 'Two-range bench clamp, 100 mV/A and 40 mV/A (demo)',
      notes: 'Demo scenario of our own invention (issue 19): the bench clamp with a range switch, 100 mV/A to ±20 A and 40 mV/A to ±50 A on one stage, the zero at 4.5 V on both. The switch picks the feedback arm and the reference together, so the zero holds when the range changes.',
      // Everything else is the bench clamp's own.
      ...Object.fromEntries(Object.entries(BENCH_CLAMP).filter(([k]) => !['format', 'version', 'title', 'notes', 'target'].includes(k))),
      target: { ...(BENCH_CLAMP.target as Record<string, unknown>), ranges: [{ scale: 0.04, range: [-50, 50] }] },
    },
  },
];

/** A demo as a validated design (throws only if a demo itself is invalid, which a test guards). */
export function demoDesign(id: string = DEMOS[0]!.id): Design {
  const demo = DEMOS.find((d) => d.id === id) ?? DEMOS[0]!;
  const v = validateDesign(structuredClone(demo.document));
  if (!v.ok) throw new Error(`demo ${demo.id} is invalid: ${v.problems.map((p) => `${p.path}: ${p.message}`).join('; ')}`);
  return v.design;
}
