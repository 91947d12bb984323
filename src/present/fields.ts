/**
 * What the editor shows for each design field: where it lives in the design, its label in the trade's
 * words, the dimension a typed value is read as, and how its current value is written back for a person.
 */
import { TOPOLOGIES, type Design, type SensorType } from '../model/design.js';
import { STAGE_NAMES } from './words.js';
import { clean, formatEng, parseQuantity, type Dimension, type ParseResult } from '../model/units.js';
import type { Problem } from '../model/validate.js';
import { stepOverRange } from '../analysis/waveform.js';
import { sensorFrontAtRail } from '../physics/sensors.js';

export type Section = 'sensor' | 'amplifier' | 'target' | 'output' | 'supply' | 'environment';

export interface FieldDef {
  path: string;
  label: string;
  section: Section;
  /** Numeric fields: the dimension typed text is read as. */
  dimension?: Dimension;
  /**
   * The unit the value is shown in and a bare number is read in: the trade's customary one (V/µs, nV/√Hz,
   * mV/mT, mm). Ω and Hz are written with an SI prefix chosen for the value (4.7 kΩ, 1 MHz). Per-measurand
   * fields write `mV/A` and take the design's measurand after the slash.
   */
  unit?: string;
  /** Not stored in the design: computed from it and written back through another field (the gain). */
  derived?: boolean;
  /** Select fields: the allowed values (any JSON value) with their labels. */
  options?: Array<[unknown, string]>;
  /** Number fields: an empty entry removes the value (an optional field). */
  clearable?: boolean;
  kind?: 'number' | 'select' | 'bool' | 'text';
  /** Only for these sensor types. */
  sensors?: SensorType[];
  /** Shown only when this optional group is on. */
  group?: string;
  /** A group's switch shown only when this path has a value (a further range after the one before it). */
  after?: string;
  hint?: string;
}

const S = (path: string, label: string, dimension: Dimension, unit: string, sensors?: SensorType[], hint?: string): FieldDef => ({ path, label, section: 'sensor', dimension, unit, sensors, hint, kind: 'number' });
const N = (section: Section, path: string, label: string, dimension: Dimension, unit: string, hint?: string, group?: string): FieldDef => ({ path, label, section, dimension, unit, hint, group, kind: 'number' });
const HALL: SensorType[] = ['hall-gap-core'];
const VOUT: SensorType[] = ['voltage-output'];
const CT: SensorType[] = ['current-transformer'];
const SH: SensorType[] = ['shunt'];
const CL: SensorType[] = ['closed-loop-hall'];

export const SENSOR_TYPES: Array<[SensorType, string]> = [
  ['hall-gap-core', 'Hall sensor in a gapped core'],
  ['closed-loop-hall', 'Closed-loop (zero-flux) Hall sensor'],
  ['current-transformer', 'Current transformer with burden'],
  ['shunt', 'Shunt (low or high side)'],
  ['voltage-output', 'Any voltage-output sensor'],
];

export const FIELDS: readonly FieldDef[] = [
  { path: 'title', label: 'Title', section: 'sensor', kind: 'text' },
  { path: 'notes', label: 'Notes', section: 'sensor', kind: 'text' },
  { path: 'sensor.measurand', label: 'Measurand unit', section: 'sensor', kind: 'text', hint: 'A, mT, V …', sensors: ['voltage-output'] },
  S('sensor.sensitivity', 'Sensitivity', 'V/A', 'mV/A', VOUT, 'volts per measurand unit, e.g. 12.5 mV/A'),
  S('sensor.hallSensitivity', 'Hall sensitivity', 'V/T', 'mV/mT', HALL, 'e.g. 25 mV/mT or 2.5 mV/G'),
  S('sensor.quiescent', 'Quiescent output (zero)', 'V', 'V', [...VOUT, ...HALL], 'output at zero measurand'),
  S('sensor.quiescent', 'Burden low end tied to', 'V', 'V', CT),
  S('sensor.outputMin', 'Sensor output min', 'V', 'V', [...VOUT, ...HALL]),
  S('sensor.outputMax', 'Sensor output max', 'V', 'V', [...VOUT, ...HALL]),
  { ...S('sensor.ratiometricSupply', 'Ratiometric at supply', 'V', 'V', [...VOUT, ...HALL], 'leave empty if not ratiometric'), clearable: true },
  S('sensor.linearField', 'Linear field range (±)', 'T', 'mT', HALL),
  S('sensor.turns', 'Turns of the measured wire', '1', '', HALL),
  S('sensor.core.pathLength', 'Core mean path length', 'm', 'mm', HALL),
  S('sensor.core.permeability', 'Core relative permeability', '1', '', HALL),
  S('sensor.core.gap', 'Air gap', 'm', 'mm', HALL),
  S('sensor.core.saturation', 'Core saturation flux density', 'T', 'mT', HALL),
  S('sensor.core.fringing', 'Fringing factor (gap area / core area)', '1', '', HALL, '1 = fringing neglected; unused when the cross-section is given'),
  { ...S('sensor.core.width', 'Core cross-section at the gap: width', 'm', 'mm', HALL, 'models fringing as (w + g)(d + g); empty = use the factor; one alone = square'), clearable: true },
  { ...S('sensor.core.depth', 'Core cross-section at the gap: depth', 'm', 'mm', HALL), clearable: true },
  S('sensor.secondaryTurns', 'Secondary turns', '1', '', CT),
  S('sensor.primaryTurns', 'Primary passes', '1', '', CT),
  S('sensor.burden', 'Burden resistor', 'ohm', 'Ω', CT),
  S('sensor.burdenPower', 'Burden power rating', 'W', 'W', CT),
  S('sensor.inductanceFactor', 'Core inductance factor A_L', 'H', 'nH', CT, 'per turn²'),
  S('sensor.windingResistance', 'Winding resistance', 'ohm', 'Ω', CT),
  // --- issue 19: the CT core's cross-section and saturation (the trade's saturation current), and the lowest frequency.
  { path: 'sensor.core', label: 'Core cross-section and saturation known', section: 'sensor', kind: 'bool', group: 'sensor.core', sensors: CT },
  { ...S('sensor.core.width', 'Core cross-section: width', 'm', 'mm', CT), group: 'sensor.core' },
  { ...S('sensor.core.depth', 'Core cross-section: depth', 'm', 'mm', CT, 'empty = a square section'), group: 'sensor.core', clearable: true },
  { ...S('sensor.core.saturation', 'Core saturation flux density', 'T', 'mT', CT), group: 'sensor.core' },
  { ...S('sensor.lowestFrequency', 'Lowest frequency of interest', 'Hz', 'Hz', CT, 'empty = 50 Hz; the core saturates first there'), clearable: true },
  // --- end issue 19
  S('sensor.resistance', 'Shunt resistance', 'ohm', 'Ω', SH),
  S('sensor.powerRating', 'Shunt power rating', 'W', 'W', SH),
  { ...S('sensor.commonMode', 'High side: supply-end voltage', 'V', 'V', SH, 'leave empty for a low-side shunt'), clearable: true },
  { ...S('sensor.commonMode', 'Differential: − terminal at', 'V', 'V', VOUT, 'leave empty for a single-ended output'), clearable: true },
  S('sensor.sourceResistance', 'Output resistance', 'ohm', 'Ω', [...VOUT, ...HALL]),
  S('sensor.noiseDensity', 'Output noise density', 'V/Hz^0.5', 'nV/√Hz'),
  S('sensor.bandwidth', 'Sensor bandwidth', 'Hz', 'Hz'),
  S('sensor.sensitivityTolerance', 'Sensitivity tolerance (±)', '1', '%'),
  S('sensor.quiescentTolerance', 'Zero tolerance (±)', 'V', 'mV', [...VOUT, ...HALL]),
  { ...S('sensor.supplyMin', 'Sensor supply: lowest', 'V', 'V', [...VOUT, ...HALL], 'from its datasheet; empty if not stated'), clearable: true },
  { ...S('sensor.supplyMax', 'Sensor supply: highest', 'V', 'V', [...VOUT, ...HALL], 'above this the sensor may be damaged'), clearable: true },
  S('sensor.supplyCurrent', 'Sensor supply current', 'A', 'mA', [...VOUT, ...HALL]),
  S('sensor.outputDrive', 'Sensor output drive (0 = not stated)', 'A', 'mA', [...VOUT, ...HALL]),
  S('sensor.sensitivityDrift', 'Sensitivity drift', '1/K', 'ppm/K'),
  S('sensor.quiescentDrift', 'Zero drift', 'V/K', 'µV/K', [...VOUT, ...HALL]),
  // --- closed-loop Hall sensor (issue #20) ---
  S('sensor.hallSensitivity', 'Hall sensitivity', 'V/T', 'mV/mT', CL, 'its sign only sets which way the winding is connected'),
  S('sensor.quiescent', 'Hall zero (the driver\'s + input sits here)', 'V', 'V', CL),
  S('sensor.linearField', 'Hall linear field range (±)', 'T', 'mT', CL),
  S('sensor.sourceResistance', 'Hall output resistance', 'ohm', 'Ω', CL),
  S('sensor.quiescentTolerance', 'Hall zero tolerance (±)', 'V', 'mV', CL),
  S('sensor.quiescentDrift', 'Hall zero drift', 'V/K', 'µV/K', CL),
  S('sensor.supplyCurrent', 'Hall supply current', 'A', 'mA', CL),
  S('sensor.core.pathLength', 'Core mean path length', 'm', 'mm', CL),
  S('sensor.core.permeability', 'Core relative permeability', '1', '', CL),
  S('sensor.core.gap', 'Air gap', 'm', 'mm', CL),
  S('sensor.core.saturation', 'Core saturation flux density', 'T', 'mT', CL),
  S('sensor.core.area', 'Core cross-section area', '1', 'mm²', CL, 'sets the winding\'s inductance A_L·N²'),
  S('sensor.core.fringing', 'Fringing factor (gap area / core area)', '1', '', CL, '1 = fringing neglected; unused when width and depth are given'),
  { ...S('sensor.core.width', 'Core cross-section at the gap: width', 'm', 'mm', CL), clearable: true },
  { ...S('sensor.core.depth', 'Core cross-section at the gap: depth', 'm', 'mm', CL), clearable: true },
  S('sensor.primaryTurns', 'Primary passes', '1', '', CL),
  S('sensor.compensationTurns', 'Compensation turns N_s', '1', '', CL, 'more turns: less supply current, more inductance'),
  { ...S('sensor.windingResistance', 'Winding resistance', 'ohm', 'Ω', CL, 'empty: computed from the wire'), clearable: true },
  { path: 'sensor.wire', label: 'Wire (computes the winding resistance)', section: 'sensor', kind: 'bool', group: 'sensor.wire', sensors: CL },
  { ...S('sensor.wire.diameter', 'Wire diameter (copper)', 'm', 'mm', CL, 'empty: from the gauge'), group: 'sensor.wire', clearable: true },
  { ...S('sensor.wire.gauge', 'or its American wire gauge (AWG)', '1', '', CL, 'used when no diameter is given'), group: 'sensor.wire', clearable: true },
  { ...S('sensor.wire.turnLength', 'Mean length of one turn', 'm', 'mm', CL), group: 'sensor.wire' },
  S('sensor.measurementResistance', 'Measurement resistor R_M', 'ohm', 'Ω', CL),
  { ...S('sensor.reference', 'R_M low end tied to', 'V', 'V', CL, 'empty: the middle of the rails'), clearable: true },
  { path: 'sensor.driver.outputStage', label: 'Driver', section: 'sensor', kind: 'select', sensors: CL, options: [['op-amp', 'Op-amp alone'], ['push-pull', 'Op-amp with a complementary transistor pair']] },
  S('sensor.driver.gbw', 'Driver op-amp GBW', 'Hz', 'Hz', CL),
  S('sensor.driver.openLoopGainDb', 'Driver open-loop gain (dB)', '1', 'dB', CL),
  S('sensor.driver.swing', 'Driver op-amp swing: from each rail', 'V', 'V', CL),
  S('sensor.driver.drop', 'Output stage drop (a pair\'s V_BE)', 'V', 'V', CL, '0 for the op-amp alone; about 0.7 V for a transistor pair (common practice)'),
  S('sensor.driver.currentLimit', 'Driver current limit', 'A', 'mA', CL),
  S('sensor.driver.quiescentCurrent', 'Driver quiescent current', 'A', 'mA', CL),
  S('sensor.driver.outputResistance', 'Driver output resistance', 'ohm', 'Ω', CL),
  S('sensor.compensation.inputResistance', 'Loop compensation: R_i', 'ohm', 'Ω', CL),
  S('sensor.compensation.capacitance', 'Loop compensation: C_i', 'F', 'nF', CL),
  S('sensor.compensation.zeroResistance', 'Loop compensation: R_z in series with C_i', 'ohm', 'Ω', CL, '0 = a pure integrator (leaves a notch at the hand-over)'),
  // --- end closed-loop Hall sensor ---

  { path: 'opamp.name', label: 'Part or archetype name', section: 'amplifier', kind: 'text' },
  N('amplifier', 'opamp.gbw', 'Gain-bandwidth (GBW)', 'Hz', 'Hz'),
  N('amplifier', 'opamp.slewRate', 'Slew rate', 'V/s', 'V/µs'),
  N('amplifier', 'opamp.openLoopGainDb', 'Open-loop gain (dB)', '1', 'dB'),
  N('amplifier', 'opamp.inputLow', 'Input range: above − rail', 'V', 'V', 'negative if it goes beyond the rail'),
  N('amplifier', 'opamp.inputHigh', 'Input range: below + rail', 'V', 'V'),
  N('amplifier', 'opamp.outputLow', 'Output swing: above − rail', 'V', 'V'),
  N('amplifier', 'opamp.outputHigh', 'Output swing: below + rail', 'V', 'V'),
  N('amplifier', 'opamp.voltageNoise', 'Voltage noise (white)', 'V/Hz^0.5', 'nV/√Hz'),
  N('amplifier', 'opamp.voltageNoiseCorner', 'Voltage noise 1/f corner', 'Hz', 'Hz', '0 = white only'),
  N('amplifier', 'opamp.currentNoise', 'Current noise (white)', 'A/Hz^0.5', 'pA/√Hz'),
  N('amplifier', 'opamp.currentNoiseCorner', 'Current noise 1/f corner', 'Hz', 'Hz', '0 = white only'),
  N('amplifier', 'opamp.offsetVoltage', 'Offset voltage (max)', 'V', 'mV'),
  N('amplifier', 'opamp.offsetDrift', 'Offset drift', 'V/K', 'µV/K'),
  N('amplifier', 'opamp.biasCurrent', 'Bias current', 'A', 'nA'),
  N('amplifier', 'opamp.supplyCurrent', 'Supply current', 'A', 'mA'),
  N('amplifier', 'opamp.psrrDb', 'Power-supply rejection (PSRR, dB)', '1', 'dB'),
  N('amplifier', 'opamp.outputResistance', 'Open-loop output resistance', 'ohm', 'Ω'),
  N('amplifier', 'opamp.outputCurrent', 'Output current limit', 'A', 'mA'),

  N('target', 'target.scale', 'Wanted scale', 'V/A', 'mV/A', 'sign = polarity'),
  { ...N('target', 'target.gain', 'or as a gain', '1', '', 'output volts per sensor volt'), derived: true },
  N('target', 'target.zero', 'Output at zero', 'V', 'V'),
  N('target', 'target.range.0', 'Range from', '1', ''),
  N('target', 'target.range.1', 'Range to', '1', ''),
  // --- issue 19: a range switch: the further ranges (the first is the target above) and the wiring.
  { path: 'target.ranges', label: 'Range switch (a second range)', section: 'target', kind: 'bool', group: 'target.ranges', hint: 'the range above is position 1' },
  ...[0, 1, 2].flatMap((i): FieldDef[] => [
    // The switch's third and fourth positions are switched on one after the other.
    ...(i > 0 ? [{ path: `target.ranges.${i}`, label: `A ${i === 1 ? 'third' : 'fourth'} range on the switch`, section: 'target' as const, kind: 'bool' as const, group: `target.ranges.${i}`, after: `target.ranges.${i - 1}` }] : []),
    { ...N('target', `target.ranges.${i}.scale`, `Range ${i + 2}: scale`, 'V/A', 'mV/A', 'same sign as the wanted scale'), group: `target.ranges.${i}` },
    { ...N('target', `target.ranges.${i}.range.0`, `Range ${i + 2}: from`, '1', ''), group: `target.ranges.${i}` },
    { ...N('target', `target.ranges.${i}.range.1`, `Range ${i + 2}: to`, '1', ''), group: `target.ranges.${i}` },
  ]),
  { path: 'target.rangeSwitch', label: 'Range switch wiring', section: 'target', kind: 'select', group: 'target.ranges', options: [['auto', 'Choose for me'], ['single-pole', 'One pole: feedback only (zero moves)'], ['two-pole', 'Two poles: feedback and reference (zero holds)']] },
  // --- end issue 19
  { path: 'target.signal', label: 'Signal', section: 'target', kind: 'select', options: [['dc', 'DC (range is peak values)'], ['ac-rms', 'AC (range is rms)']] },
  { path: 'target.topology', label: 'Stage', section: 'target', kind: 'select', options: [['auto', 'Choose for me'], ...TOPOLOGIES.map((t): [string, string] => [t, STAGE_NAMES[t][0]!.toUpperCase() + STAGE_NAMES[t].slice(1)])] },
  { path: 'target.series', label: 'Resistor series', section: 'target', kind: 'select', options: ['E12', 'E24', 'E48', 'E96', 'E192'].map((s) => [s, s]) },
  { path: 'target.arrangements', label: 'Parts per arm', section: 'target', kind: 'select', options: [[['single', 'series', 'parallel'], 'one, or two in series or parallel'], [['single', 'series'], 'one, or two in series'], [['single', 'parallel'], 'one, or two in parallel'], [['single'], 'one only']] },
  N('target', 'target.tolerance', 'Resistor tolerance (±)', '1', '%'),
  N('target', 'target.tempco', 'Resistor tempco', '1/K', 'ppm/K'),
  N('target', 'target.trimmerTempco', 'Trimmer tempco', '1/K', 'ppm/K'),
  N('target', 'target.resistanceMin', 'Smallest resistor', 'ohm', 'Ω'),
  N('target', 'target.resistanceMax', 'Largest resistor', 'ohm', 'Ω'),
  N('target', 'target.bandwidth', 'Bandwidth needed', 'Hz', 'Hz', '0 = none stated'),
  { path: 'target.trim.gain', label: 'Fit a span trimmer', section: 'target', kind: 'bool' },
  { path: 'target.trim.zero', label: 'Fit a zero trimmer', section: 'target', kind: 'bool' },
  N('target', 'calibration.meterRelative', 'Calibration meter: ± of reading', '1', '%', '0.5 % for a common handheld meter'),
  N('target', 'calibration.meterDigits', 'Calibration meter: ± digits on a volts reading', 'V', 'V', 'e.g. 3 counts of 1 mV = 3 mV'),

  { path: 'output.filter', label: 'Output resistor / RC filter', section: 'output', kind: 'bool', group: 'output.filter' },
  N('output', 'output.filter.resistance', 'Series resistor', 'ohm', 'Ω', undefined, 'output.filter'),
  N('output', 'output.filter.capacitance', 'Filter capacitor (0 = none)', 'F', 'nF', undefined, 'output.filter'),
  N('output', 'output.load.resistance', 'Instrument input resistance', 'ohm', 'Ω', '1 MΩ for a scope; 50 Ω for its 50 Ω input'),
  N('output', 'output.load.capacitance', 'Instrument + cable capacitance', 'F', 'pF', 'about 15 pF plus ~100 pF per metre of coax (common practice)'),

  N('supply', 'supply.positive', 'Positive rail', 'V', 'V'),
  N('supply', 'supply.negative', 'Negative rail', 'V', 'V', '0 for a single supply'),
  N('supply', 'supply.tolerance', 'Bench rail tolerance (±)', '1', '%', 'unused with a battery (the sweep covers it)'),
  { path: 'supply.regulated', label: 'Regulated rail', section: 'supply', kind: 'bool', group: 'supply.regulated' },
  N('supply', 'supply.regulated.voltage', 'Regulated voltage', 'V', 'V', undefined, 'supply.regulated'),
  N('supply', 'supply.regulated.tolerance', 'Regulator tolerance (±)', '1', '%', undefined, 'supply.regulated'),
  N('supply', 'supply.regulated.quiescentCurrent', 'Regulator quiescent current', 'A', 'µA', undefined, 'supply.regulated'),
  N('supply', 'supply.regulated.dropout', 'Regulator dropout', 'V', 'V', 'about 0.3 V for a low-dropout part, about 1.7 V for a common small linear regulator', 'supply.regulated'),
  N('supply', 'supply.regulated.drift', 'Regulator drift', '1/K', 'ppm/K', undefined, 'supply.regulated'),
  { path: 'supply.sensorRail', label: 'Sensor fed from', section: 'supply', kind: 'select', options: [['positive', 'Positive rail'], ['regulated', 'Regulated rail']] },
  { path: 'supply.referenceRail', label: 'Reference divider from', section: 'supply', kind: 'select', options: [['positive', 'Positive rail'], ['regulated', 'Regulated rail']] },
  { path: 'supply.battery', label: 'Battery', section: 'supply', kind: 'bool', group: 'supply.battery' },
  N('supply', 'supply.battery.fresh', 'Fresh voltage', 'V', 'V', undefined, 'supply.battery'),
  N('supply', 'supply.battery.endOfLife', 'End-of-life voltage', 'V', 'V', undefined, 'supply.battery'),
  N('supply', 'supply.battery.capacity', 'Capacity', 'C', 'mAh', undefined, 'supply.battery'),
  { path: 'supply.battery.rails', label: 'Battery makes', section: 'supply', kind: 'select', group: 'supply.battery', options: [['positive', 'The positive rail'], ['split', 'Split rails (rail splitter)'], ['pair', 'Split rails (a second battery)']] },
  { ...N('supply', 'supply.battery.splitterCurrent', 'Rail splitter current', 'A', 'mA', 'with split rails: what the splitter itself draws (1 mA when empty)', 'supply.battery'), clearable: true },

  N('environment', 'environment.temperature', 'Design temperature', 'K', '°C'),
  N('environment', 'environment.temperatureMin', 'Lowest temperature', 'K', '°C'),
  N('environment', 'environment.temperatureMax', 'Highest temperature', 'K', '°C'),
  N('environment', 'analysis.spreadTrials', 'Spread: Monte Carlo trials', '1', ''),
  N('environment', 'analysis.spreadSeed', 'Spread: random seed', '1', ''),
  N('environment', 'analysis.scaleLimit', 'Spread: scale limit (±)', '1', '%'),
  N('environment', 'analysis.zeroLimit', 'Spread: zero limit (±)', 'V', 'mV'),
  { path: 'analysis.noiseBand', label: 'Own noise band', section: 'environment', kind: 'bool', group: 'analysis.noiseBand' },
  N('environment', 'analysis.noiseBand.0', 'Noise band from', 'Hz', 'Hz', undefined, 'analysis.noiseBand'),
  N('environment', 'analysis.noiseBand.1', 'Noise band to', 'Hz', 'Hz', undefined, 'analysis.noiseBand'),
  { path: 'analysis.waveform', label: 'Own scope waveform', section: 'environment', kind: 'bool', group: 'analysis.waveform', hint: 'off: a step over the range' },
  { path: 'analysis.waveform.shape', label: 'Waveform', section: 'environment', kind: 'select', group: 'analysis.waveform', options: [['step', 'Step from low to high'], ['sine', 'Sine'], ['square', 'Square'], ['triangle', 'Triangle (duty = rising part)']] },
  N('environment', 'analysis.waveform.low', 'Waveform low', '1', '', 'measurand units', 'analysis.waveform'),
  N('environment', 'analysis.waveform.high', 'Waveform high', '1', '', 'measurand units', 'analysis.waveform'),
  N('environment', 'analysis.waveform.frequency', 'Waveform frequency', 'Hz', 'Hz', 'not used by a step', 'analysis.waveform'),
  N('environment', 'analysis.waveform.duty', 'Waveform duty', '1', '%', 'square: time high; triangle: time rising', 'analysis.waveform'),
];

/** Default values for optional groups switched on in the editor. */
export const GROUP_DEFAULTS: Record<string, unknown> = {
  'output.filter': { resistance: 100, capacitance: 0 },
  'supply.regulated': { voltage: 5, tolerance: 0.02, quiescentCurrent: 0, dropout: 0.3, drift: 100e-6 },
  'supply.battery': { fresh: 9.6, endOfLife: 6, capacity: 2034 },
  'analysis.noiseBand': [1, 1e5],
  'sensor.wire': { diameter: 0.25e-3, turnLength: 0.036 },
  // Issue 19: a small ferrite toroid's section, 5 mm × 5 mm, and 0.3 T (common practice for ferrite, from memory).
  'sensor.core': { width: 0.005, depth: 0.005, saturation: 0.3 },
  // Replaced by a range derived from the target (or from the range before) when switched on (groupDefault).
  'target.ranges': [],
  'target.ranges.1': {},
  'target.ranges.2': {},
  // Replaced by a step over the design's own range when switched on (groupDefault).
  'analysis.waveform': { shape: 'step', low: 0, high: 1, frequency: 1000, duty: 0.5 },
};

/** Issue 19: the value an optional group takes when switched off: null, or nothing at all for a list the file leaves out. */
export function groupOff(path: string): null | undefined {
  return path.startsWith('target.ranges') ? undefined : null;
}

/** The value an optional group takes when switched on: the scope waveform starts as a step over the range (a periodic shape gets 1 kHz). */
export function groupDefault(path: string, design: Design): unknown {
  if (path === 'analysis.waveform') return { ...stepOverRange(design), frequency: 1000 };
  // Issue 19: a second range at 2.5 times the span and a 2.5th of the scale (a common bench step).
  const further = (from: { scale: number; range: [number, number] }) => ({ scale: Number((from.scale / 2.5).toPrecision(3)), range: from.range.map((x) => Number((x * 2.5).toPrecision(3))) });
  if (path === 'target.ranges') return [further(design.target)];
  // A third or fourth range: the same step again from the range before it.
  const at = /^target\.ranges\.(\d)$/.exec(path);
  const before = at ? design.target.ranges?.[Number(at[1]) - 1] : undefined;
  if (before) return further(before);
  return GROUP_DEFAULTS[path];
}

/** The value at a dotted path (`target.trim.gain`, `analysis.noiseBand.0`) of a design, or undefined. */
export function getPath(obj: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((o, k) => (o === null || o === undefined ? undefined : (o as Record<string, unknown>)[k]), obj);
}

/** Immutable set: returns a copy of `obj` with `path` set (arrays by numeric key). `undefined` deletes. */
export function setPath<T>(obj: T, path: string, value: unknown): T {
  const [k, ...rest] = path.split('.');
  const src = (obj ?? {}) as Record<string, unknown>;
  const copy: Record<string, unknown> | unknown[] = Array.isArray(src) ? [...src] : { ...src };
  const cur = (src as Record<string, unknown>)[k!];
  const next = rest.length ? setPath(cur, rest.join('.'), value) : value;
  // `undefined` removes: a key from an object, an item from a list (the items after it move up).
  if (next === undefined && Array.isArray(copy)) copy.splice(Number(k), 1);
  else if (next === undefined) delete (copy as Record<string, unknown>)[k!];
  else (copy as Record<string, unknown>)[k!] = next;
  return copy as T;
}

/** The fields that apply to this design (its sensor type and the optional groups that are on). */
export function fieldsFor(design: Design): FieldDef[] {
  const has = (path: string) => getPath(design, path) !== null && getPath(design, path) !== undefined;
  return FIELDS.filter((f) => (!f.sensors || f.sensors.includes(design.sensor.type)) && (!f.group || f.kind === 'bool' || has(f.group)) && (!f.after || has(f.after)));
}

/**
 * How many SI units one display unit is (SI Brochure, 9th ed., table 7 prefixes; 1 mAh = 3.6 C; °C = K − 273.15).
 * Units not listed (Ω, Hz) are written with a prefix chosen for the value and a bare number is in the SI unit.
 */
const DISPLAY_UNITS: Record<string, { factor: number; offset?: number }> = {
  V: { factor: 1 }, mV: { factor: 1e-3 }, W: { factor: 1 }, mA: { factor: 1e-3 }, 'µA': { factor: 1e-6 }, nA: { factor: 1e-9 },
  mm: { factor: 1e-3 }, mT: { factor: 1e-3 }, nH: { factor: 1e-9 }, nF: { factor: 1e-9 }, pF: { factor: 1e-12 },
  'mV/mT': { factor: 1 }, 'V/µs': { factor: 1e6 }, 'nV/√Hz': { factor: 1e-9 }, 'pA/√Hz': { factor: 1e-12 }, 'µV/K': { factor: 1e-6 },
  'mV/A': { factor: 1e-3 }, '%': { factor: 1e-2 }, 'ppm/K': { factor: 1e-6 }, mAh: { factor: 3.6 }, '°C': { factor: 1, offset: 273.15 },
  '': { factor: 1 }, dB: { factor: 1 }, 'mm²': { factor: 1e-6 },
};

/** The unit a field is shown in for this design: per-measurand fields follow the measurand (mV/A, mV/mT). */
function displayUnit(f: FieldDef, design?: Design): string {
  if (f.unit === 'mV/A' && design) return `mV/${design.sensor.measurand}`;
  return f.unit ?? '';
}

const trimZeros = (text: string) => text.replace(/(\.\d*?)0+(\s|$)/, '$1$2').replace(/\.(\s|$)/, '$1');

/** The gain a target scale means: output volts per sensor volt, scale / sensor sensitivity (sign = polarity). */
function targetGain(design: Design): number {
  return design.target.scale / sensorFrontAtRail(design.sensor, design).sensitivity;
}

/** How a value is written in its field: 0.0125 V/A → "12.5 mV/A", 25 V/T → "25 mV/mT", 298.15 K → "25 °C". */
export function displayValue(f: FieldDef, value: unknown, design?: Design): string {
  if (f.path === 'target.gain' && design) value = targetGain(design);
  if (value === undefined || value === null) return '';
  if (typeof value !== 'number') return String(value);
  if (!Number.isFinite(value)) return '';
  const unit = displayUnit(f, design);
  const fixed = f.unit !== undefined ? DISPLAY_UNITS[f.unit] : undefined;
  if (!fixed) return trimZeros(formatEng(value, unit, 4));
  const x = Number(((value - (fixed.offset ?? 0)) / fixed.factor).toPrecision(f.unit === '°C' ? 5 : 6));
  return `${Object.is(x, -0) ? 0 : x} ${unit}`.trim();
}

/** Short help under a field, with the design's own figures where they help (the gain a scale means and back). */
export function fieldHint(f: FieldDef, design: Design): string {
  if (f.path === 'target.scale' || f.path === 'target.gain') {
    const g = targetGain(design);
    if (!Number.isFinite(g)) return f.hint ?? '';
    const polarity = g >= 0 ? 'keeps the sensor\'s polarity (a non-inverting stage, or inverting if it must attenuate)' : 'inverts the sensor\'s polarity (an inverting stage)';
    return f.path === 'target.scale'
      ? `gain ${+g.toPrecision(4)}: ${polarity}`
      : `sign = polarity: ${polarity}; scale ${displayValue(FIELDS.find((x) => x.path === 'target.scale')!, design.target.scale, design)}`;
  }
  return f.hint ?? '';
}

const BARE_NUMBER = /^\s*[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?\s*$/;

/** Reads what a person typed into a field, in SI; a bare number (or arithmetic on bare numbers) is in the field's shown unit. */
export function parseField(f: FieldDef, text: string, design?: Design): ParseResult {
  if (!f.dimension) return { ok: false, message: 'not a number field' };
  const fixed = f.unit !== undefined ? DISPLAY_UNITS[f.unit] : undefined;
  const bare = (x: number) => (fixed ? x * fixed.factor + (fixed.offset ?? 0) : x);
  // Sensitivity and scale are per measurand unit; for a measurand other than amperes take plain V per unit.
  if (f.dimension === 'V/A' && design && design.sensor.measurand !== 'A') {
    if (BARE_NUMBER.test(text)) return { ok: true, value: bare(Number(text)) };
    // The unit after the slash must be the measurand itself: "25 mV/A" is not a reading for a mT sensor.
    const unit = design.sensor.measurand.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
    const m = new RegExp(`^\\s*([-+]?[\\d.eE+-]+)\\s*(m|µ|u)?[Vv]\\s*\\/\\s*${unit}\\s*$`).exec(text);
    if (m) {
      const k = m[2] === 'm' ? 1e-3 : m[2] ? 1e-6 : 1;
      return Number.isFinite(Number(m[1])) ? { ok: true, value: Number(m[1]) * k } : { ok: false, message: `cannot read "${text}"` };
    }
    return { ok: false, message: `cannot read "${text.trim()}" as volts per ${design.sensor.measurand} (e.g. 25 mV/${design.sensor.measurand})` };
  }
  // A number followed by exactly the shown unit (also for units the unit tables lack, such as dB).
  const shownUnit = displayUnit(f, design);
  if (fixed && shownUnit && text.trim().endsWith(shownUnit)) {
    const head = text.trim().slice(0, -shownUnit.length);
    if (BARE_NUMBER.test(head)) return { ok: true, value: clean(bare(Number(head))) };
  }
  return parseQuantity(text, f.dimension, bare);
}

/** What an edit of a field does to the design: the path it writes, the value, and how it was read. */
export type FieldEdit =
  | { ok: true; path: string; value: number; readAs: string | null }
  | { ok: false; message: string; pending?: boolean };

/**
 * Reads a typed value for a field and says where it goes; `readAs` is the value as the field will show it,
 * when the person typed it otherwise ("0.0015 m" is read as "1.5 mm"). A gain is written back as the scale
 * it means (gain × sensor sensitivity).
 */
export function readField(f: FieldDef, text: string, design: Design): FieldEdit {
  const r = parseField(f, text, design);
  if (!r.ok) return r;
  let path = f.path;
  let value = r.value;
  if (f.path === 'target.gain') {
    path = 'target.scale';
    value = r.value * sensorFrontAtRail(design.sensor, design).sensitivity;
    if (!Number.isFinite(value)) return { ok: false, message: `cannot turn a gain of ${text.trim()} into a scale for this sensor` };
  }
  const shown = f.path === 'target.gain'
    ? displayValue(f, null, { ...design, target: { ...design.target, scale: value } })
    : displayValue(f, value, design);
  const typed = text.trim().replace(/\s+/g, ' ');
  return { ok: true, path, value, readAs: typed === shown ? null : shown };
}

/** A problem's path in the editor's form: list items as `.0` (`target.range[0]` → `target.range.0`). */
const dotted = (path: string) => path.replace(/\[(\d+)\]/g, '.$1');

/**
 * The editor field a problem's path points at, preferring the fields that apply to this design (two sensor
 * types label `sensor.quiescent` differently); a path inside a field (`a.b.c` under `a.b`) finds that field.
 */
export function fieldForPath(path: string, design?: Design): FieldDef | undefined {
  const p = dotted(path);
  const pool = design ? [...fieldsFor(design), ...FIELDS] : FIELDS;
  return pool.find((f) => f.path === p) ?? pool.find((f) => p.startsWith(`${f.path}.`));
}

/**
 * A problem in a person's words, for the screen: the field named by its label, every other field a rule
 * involves named by its label too (in quotes), and a broken bound written in the field's own unit; a place
 * that is no editor field (a file's unknown key) is named as an entry, never as a dotted path.
 * `supply.regulated.voltage: needs supply.positive of at least 5.3 V …` → `Regulated voltage needs “Positive
 * rail” of at least 5.3 V …`.
 */
export function problemWords(p: Problem, design?: Design): string {
  const f = fieldForPath(p.path, design);
  const subject = f ? f.label : p.path.startsWith('(') ? `The ${p.path.slice(1, -1)}` : entryName(p.path);
  return `${subject} ${p.limit && f?.kind === 'number' ? boundWords(p, f, design) : labelsFor(p.message, design)}`;
}

/** A place in a document that is no editor field: `opamp.__proto__` → `The entry “__proto__” in opamp`. */
function entryName(path: string): string {
  const parts = dotted(path).split('.');
  const last = parts.pop()!;
  return `The entry “${last}”${parts.length ? ` in ${parts.join(' › ')}` : ''}`;
}

function boundWords(p: Problem, f: FieldDef, design?: Design): string {
  const { kind, value } = p.limit!;
  const show = (x: number) => displayValue(f, x, design) || String(x);
  switch (kind) {
    case 'min': return `must be at least ${show(value)}`;
    case 'max': return `must be at most ${show(value)}`;
    case 'maxAbs': return `must lie within ±${show(value)}`;
    case 'whole': return 'must be a whole number';
    case 'positive': return 'must be more than 0';
    case 'nonneg': return 'must not be negative';
    case 'fraction': return `must lie from ${show(0)} to ${show(1)}`;
    case 'minAbs': return `is too small to mean anything: use ${/use 0 or/.test(p.message) ? '0 or ' : ''}at least ${show(value)}${/in size/.test(p.message) ? ' in size' : ''}`;
  }
}

/** Every field path in a message replaced by its label in quotes, longest paths first. */
function labelsFor(message: string, design?: Design): string {
  const pool = design ? [...fieldsFor(design), ...FIELDS] : [...FIELDS];
  const labels = new Map<string, string>();
  for (const f of pool) if (!labels.has(f.path)) labels.set(f.path, f.label);
  const paths = [...labels.keys()].sort((a, b) => b.length - a.length);
  const esc = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
  const alt = paths.map((p) => esc(p.replace(/\.(\d+)$/, '[$1]')) + '|' + esc(p)).join('|');
  return message.replace(new RegExp(`(?<![\\w.])(${alt})(?![\\w\\[])`, 'g'), (m) => `“${labels.get(dotted(m)) ?? m}”`);
}
