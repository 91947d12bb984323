/**
 * The design file: one JSON document that describes a sensor front end (format "gainwright-design").
 * All numbers are SI base units (V, A, Ω, Hz, s, T, m, K, F; battery capacity in coulombs, 1 mAh = 3.6 C).
 * See docs/design-format.md for every field.
 */
import { check, quoteText, type Problem, type Spec } from './validate.js';
import type { SeriesName } from './eseries.js';
import { MAX_READINGS, type Reading } from './readings.js';
import { REGULATOR_DROPOUT } from './constants.js';
import { kitValues } from './kit.js';

export const DESIGN_FORMAT = 'gainwright-design';
export const DESIGN_VERSION = 1;
/** Largest design document the app and CLI accept, in bytes. */
export const MAX_DESIGN_BYTES = 1_000_000;

/**
 * The single-op-amp stages (docs/method.md, "Stages"): the four sign cases of Vout = m·Vs + b taught for
 * single-supply design, plus the four-resistor difference stage.
 */
export type Topology = 'non-inverting' | 'inverting' | 'summing-non-inverting' | 'summing-inverting' | 'difference';
/** Every stage, in the order `auto` considers them. */
export const TOPOLOGIES: readonly Topology[] = ['non-inverting', 'inverting', 'summing-non-inverting', 'summing-inverting', 'difference'];
export type TopologyChoice = Topology | 'auto';
export type Arrangement = 'single' | 'series' | 'parallel';
export type Rail = 'positive' | 'regulated';

/** Fields every sensor model has; the sensor front (src/physics/sensors.ts) carries them on. */
export interface SensorCommon {
  /** What is measured, as a unit symbol: "A", "mT", "V", "K". */
  measurand: string;
  /** Output resistance of the sensor, Ω. */
  sourceResistance: number;
  /** Output noise density of the sensor, V/√Hz (white). */
  noiseDensity: number;
  /** Small-signal −3 dB bandwidth of the sensor, Hz (single pole). */
  bandwidth: number;
  /** Relative tolerance of the sensitivity (0.02 = ±2 %). */
  sensitivityTolerance: number;
  /** Tolerance of the quiescent output, V. */
  quiescentTolerance: number;
  /** Relative drift of the sensitivity, 1/K. */
  sensitivityDrift: number;
  /** Drift of the quiescent output, V/K. */
  quiescentDrift: number;
  /** Sensor supply current, A (drawn from the rail that feeds it). */
  supplyCurrent: number;
  /** Current the sensor output can source or sink, A (0 = not stated). */
  outputDrive: number;
  /**
   * Bench readings of the sensor's output against the measurand (docs/design-format.md). With `use`, the
   * sensitivity and zero (and their tolerances) come from the fit of these readings instead of the
   * figures above (voltage-output and hall-gap-core sensors). Absent or null: none taken.
   */
  readings?: SensorReadings | null;
}

/** Readings of a sensor taken on the bench: [measurand, output volts] pairs, and whether the design uses their fit. */
export interface SensorReadings {
  use: boolean;
  points: Reading[];
}

export interface VoltageOutputSensor extends SensorCommon {
  type: 'voltage-output';
  /** Output volts per measurand unit. */
  sensitivity: number;
  /** Output at zero measurand, V. */
  quiescent: number;
  /** Lowest and highest output the sensor can reach, V. */
  outputMin: number;
  outputMax: number;
  /** If set, sensitivity and quiescent scale with the sensor's supply; they were given at this supply, V. */
  ratiometricSupply: number | null;
  /**
   * A differential output (a bridge): the voltage of the sensor's − output terminal, V; its + terminal sits
   * at commonMode + quiescent + sensitivity·x. Null: single-ended, the − terminal is the amplifier's ground.
   */
  commonMode: number | null;
  /** The supply range the sensor is specified for, V (null or absent = not stated). */
  supplyMin?: number | null;
  supplyMax?: number | null;
}

export interface HallGapCoreSensor extends SensorCommon {
  type: 'hall-gap-core';
  /** Hall sensor output per flux density, V/T. */
  hallSensitivity: number;
  /** Output at zero field, V. */
  quiescent: number;
  /** Largest |B| over which the Hall sensor stays linear, T. */
  linearField: number;
  outputMin: number;
  outputMax: number;
  ratiometricSupply: number | null;
  /** The supply range the Hall sensor is specified for, V (null or absent = not stated). */
  supplyMin?: number | null;
  supplyMax?: number | null;
  /** Turns of the measured conductor through the core. */
  turns: number;
  core: {
    /** Mean magnetic path length in the core material (excluding the gap), m. */
    pathLength: number;
    /** Relative permeability of the core material. */
    permeability: number;
    /** Air gap length, m. */
    gap: number;
    /** Saturation flux density of the core material, T. */
    saturation: number;
    /**
     * Fringing factor F = A_g/A_c: the gap's effective area over the core's cross-section (1 = fringing
     * neglected). Used when width and depth are not given.
     */
    fringing: number;
    /**
     * Optional cross-section of the core at the gap, m × m; when given the gap's effective area is
     * (width + g)·(depth + g). One alone is taken as a square section.
     */
    width?: number;
    depth?: number;
  };
}

export interface CurrentTransformerSensor extends SensorCommon {
  type: 'current-transformer';
  /** Secondary turns (primary is one pass, times primaryTurns). */
  secondaryTurns: number;
  primaryTurns: number;
  /** Burden resistor, Ω. */
  burden: number;
  /** Burden power rating, W. */
  burdenPower: number;
  /** Core inductance factor A_L, H per turn². */
  inductanceFactor: number;
  /** Secondary winding resistance, Ω. */
  windingResistance: number;
  /** Voltage the low end of the burden is tied to, V. */
  quiescent: number;
  // --- issue 19 (turns and burden trade): optional core figures for the saturation current.
  /**
   * The core's magnetic cross-section, width × depth (m; depth absent: a square section), and its saturation
   * flux density (T); absent or null: not stated.
   */
  core?: { width: number; depth?: number; saturation: number } | null;
  /** Lowest frequency of interest, Hz (absent: 50 Hz, the lower mains frequency): the core saturates first there. */
  lowestFrequency?: number;
  // --- end issue 19
}

export interface ShuntSensor extends SensorCommon {
  type: 'shunt';
  /** Shunt resistance, Ω (low side, referenced to the amplifier's ground). */
  resistance: number;
  /** Shunt power rating, W. */
  powerRating: number;
  /**
   * A high-side shunt: the voltage of its supply end, V (the load end sits I·R below it). Null: a low-side
   * shunt with its lower end on the amplifier's ground.
   */
  commonMode: number | null;
}

// --- closed-loop Hall sensor (issue #20) ------------------------------------------------------------------
/**
 * A closed-loop (zero-flux) Hall current sensor: the Hall sensor in the core's gap drives, through the loop's
 * compensation network and a driver, a current through a compensation winding on the same core that cancels
 * the primary's ampere-turns; the output is that current across the measurement resistor R_M, whose low end
 * sits at `reference`. See docs/method.md ("Closed-loop Hall sensor").
 */
export interface ClosedLoopHallSensor extends SensorCommon {
  type: 'closed-loop-hall';
  /** Hall sensor output per flux density, V/T (its sign is matched by the winding's polarity). */
  hallSensitivity: number;
  /** Hall sensor output at zero field, V; the driver's + input is held at the same voltage. */
  quiescent: number;
  /** Largest |B| over which the Hall sensor stays linear, T. */
  linearField: number;
  /** The core as for `hall-gap-core`, plus its cross-section `area`, m². */
  core: HallGapCoreSensor['core'] & { area: number };
  /** Turns of the measured conductor through the core (1: one pass). */
  primaryTurns: number;
  /** Turns of the compensation winding, N_s. */
  compensationTurns: number;
  /** Resistance of the compensation winding, Ω; when absent it is computed from `wire`. */
  windingResistance?: number;
  /**
   * The winding's copper wire, for R_w when it is not given: its diameter (m) or its American wire gauge
   * (`gauge`, used when no diameter is given), and the mean length of one turn (m).
   */
  wire?: { diameter?: number; gauge?: number; turnLength: number } | null;
  /** The measurement resistor R_M, Ω. */
  measurementResistance: number;
  /** Voltage R_M's low end is tied to, V (default: the middle of the rails). */
  reference?: number;
  /** The driver: an op-amp alone or with a complementary (push-pull) transistor output stage. */
  driver: {
    outputStage: 'op-amp' | 'push-pull';
    /** Driver op-amp's gain-bandwidth product, Hz, and open-loop gain, dB. */
    gbw: number;
    openLoopGainDb: number;
    /** How close the op-amp's output comes to each rail, V. */
    swing: number;
    /** Further drop of the output stage (a push-pull pair's base-emitter voltage), V. */
    drop: number;
    /** Largest current the driver can deliver either way, A. */
    currentLimit: number;
    /** Driver's own quiescent current, A. */
    quiescentCurrent: number;
    /** Output resistance of the driver in series with the winding, Ω. */
    outputResistance: number;
  };
  /**
   * The loop's compensation: an inverting integrator, R_i from the Hall sensor to the driver's − input and
   * C_i (with R_z in series, a zero at 1/(2π·R_z·C_i); 0 = a pure integrator) from its output back to it.
   */
  compensation: { inputResistance: number; capacitance: number; zeroResistance: number };
}
// --- end closed-loop Hall sensor ----------------------------------------------------------------------------

export type SensorSpec = VoltageOutputSensor | HallGapCoreSensor | CurrentTransformerSensor | ShuntSensor | ClosedLoopHallSensor;
export type SensorType = SensorSpec['type'];

export interface Supply {
  /** Positive rail, V. */
  positive: number;
  /** Negative rail, V (0 for a single supply). */
  negative: number;
  /** An optional regulated rail (e.g. a 5 V regulator fed by the battery). */
  regulated: {
    voltage: number;
    tolerance: number;
    quiescentCurrent: number;
    /** Input-to-output voltage below which the regulator drops out, V (default 0.3, a low-dropout part). */
    dropout: number;
    /** Output drift, parts of one per kelvin (default 100 ppm/K). */
    drift: number;
  } | null;
  /** Which rail feeds the sensor. */
  sensorRail: Rail;
  /** Which rail the offset reference divider hangs from. */
  referenceRail: Rail;
  /**
   * Tolerance of the positive and negative rails of a bench supply, parts of one (default 0.01). Unused with
   * a battery, whose sag the battery sweep follows.
   */
  tolerance: number;
  /** Battery feeding the positive rail (and the regulator), or null for a bench supply. */
  battery: {
    fresh: number; endOfLife: number; capacity: number;
    /**
     * What the battery makes of the rails: `positive` (it is the positive rail, over `negative`), `split` (one
     * battery split about the amplifier's ground by a rail splitter: ±half its voltage), `pair` (a second,
     * equal battery makes the negative rail: ±its voltage), `regulated` (the battery feeds `regulated`, whose
     * output is the positive rail: the whole front end, op-amp too, runs from the regulator; `positive` equals
     * the regulator's voltage; issue 18). Default `positive`.
     */
    rails?: 'positive' | 'split' | 'pair' | 'regulated';
    /** Current the rail splitter itself draws, A (used with `split`; absent: SPLITTER_CURRENT, 1 mA). */
    splitterCurrent?: number;
  } | null;
}

export interface OpAmpSpec {
  /** Free text name of the archetype or part the figures come from. */
  name: string;
  gbw: number;
  slewRate: number;
  openLoopGainDb: number;
  /** Input common-mode range: volts above the negative rail, volts below the positive rail. */
  inputLow: number;
  inputHigh: number;
  /** Output swing: volts above the negative rail, volts below the positive rail. */
  outputLow: number;
  outputHigh: number;
  voltageNoise: number;
  currentNoise: number;
  offsetVoltage: number;
  biasCurrent: number;
  supplyCurrent: number;
  /** Open-loop output resistance, Ω. */
  outputResistance: number;
  /** Largest output current, A. */
  outputCurrent: number;
  /** Offset drift, V/K. */
  offsetDrift: number;
  /** Power-supply rejection ratio at DC, dB (default 80): the offset moves by ΔV_supply/PSRR. */
  psrrDb: number;
  /** 1/f corners of the voltage and current noise, Hz (0 = white only): density² = white²·(1 + f_c/f). */
  voltageNoiseCorner: number;
  currentNoiseCorner: number;
}

export interface Target {
  /** Output volts per measurand unit; the sign is the wanted polarity. */
  scale: number;
  /** Output at zero measurand, V. */
  zero: number;
  /** The measurand range that must be covered (peak values for DC, rms for "ac-rms"). */
  range: [number, number];
  /** "dc" or "ac-rms": an AC range given in rms is checked at its sine peak (√2 × rms). */
  signal: 'dc' | 'ac-rms';
  topology: TopologyChoice;
  series: SeriesName;
  tolerance: number;
  arrangements: Arrangement[];
  resistanceMin: number;
  resistanceMax: number;
  /** Resistor temperature coefficient, 1/K. */
  tempco: number;
  /** Trimmer temperature coefficient of the whole track, 1/K (default 100 ppm/K). */
  trimmerTempco: number;
  /** Fit a span (gain) trimmer and a zero trimmer. */
  trim: { gain: boolean; zero: boolean };
  /** Bandwidth the user needs, Hz (0 = none stated). */
  bandwidth: number;
  /** Which of the solver's ranked gain-network alternatives to build (0 = the top-ranked one). */
  alternative: number;
  /** The resistors at hand (src/model/kit.ts): the solver picks from these instead of the whole series (null: the whole series). */
  kit?: ResistorKit | null;
  // --- issue 19: a range switch.
  /**
   * The switch's further positions: 1 to 3 ranges `{ scale, range }` after the first, which is this target's
   * own `scale` and `range` (so a probe has 2 to 4 ranges; the zero and everything else are shared). Absent
   * or empty: no switch.
   */
  ranges?: RangeSpec[];
  /**
   * How the switch is wired: `single-pole` switches the feedback arm alone (the zero moves with the gain and
   * each range is zeroed on its own), `two-pole` also switches the reference so the zero holds; `auto`
   * (absent) takes a single pole when the zero would move less than `analysis.zeroLimit` on every range.
   */
  rangeSwitch?: RangeSwitchChoice;
  // --- end issue 19
}

/**
 * A resistor kit: every value of a series between two limits (optionally so many of each), plus further
 * values, each with an optional count; without a series, the listed values are the whole kit. A count left
 * out means as many as needed.
 */
export interface ResistorKit {
  series?: SeriesName;
  /** Limits of the series part, Ω. */
  min: number;
  max: number;
  /** How many of each series value (absent: as many as needed). */
  count?: number;
  parts: Array<{ ohms: number; count?: number }>;
}

/** Issue 19: one further position of a range switch. */
export interface RangeSpec {
  /** Output volts per measurand unit on this range (the same sign as the target's). */
  scale: number;
  /** The measurand range this position covers, [low, high]. */
  range: [number, number];
}
export type RangeSwitchWiring = 'single-pole' | 'two-pole';
export type RangeSwitchChoice = 'auto' | RangeSwitchWiring;

export interface Output {
  /** Optional RC at the op-amp output: series resistance then capacitance to ground. */
  filter: { resistance: number; capacitance: number } | null;
  /** The instrument's input: 1 MΩ ∥ 15 pF for an oscilloscope by default (common practice). */
  load: { resistance: number; capacitance: number };
}

export interface Environment {
  temperature: number;
  temperatureMin: number;
  temperatureMax: number;
}

/** A measurand waveform to look at in time (measurand units, hertz). */
export interface MeasurandWaveform {
  /** step: low to high at t = 0 after settling at low; sine, square, triangle: periodic between low and high. */
  shape: 'step' | 'sine' | 'square' | 'triangle';
  low: number;
  high: number;
  /** Repetition frequency, Hz (not used by a step). */
  frequency: number;
  /** Square: fraction of the period at high; triangle: fraction of the period rising. */
  duty: number;
}

export interface AnalysisOptions {
  /** Band for integrated noise, Hz; null = 1 Hz to 100 × the chain's −3 dB bandwidth. */
  noiseBand: [number, number] | null;
  spreadTrials: number;
  spreadSeed: number;
  /** Yield limit for the spread: fractional scale error and zero error (V). */
  scaleLimit: number;
  zeroLimit: number;
  /** Measurand waveform for the time-domain solve (null = none). */
  waveform: MeasurandWaveform | null;
}

/** The meter used to calibrate: each reading is uncertain by ±(meterRelative × reading + meterDigits). */
export interface CalibrationMeter {
  /** Parts of one of the reading (default 0.005, i.e. 0.5 %). */
  meterRelative: number;
  /** The digits' share on a voltage reading, V (default 0.003: 3 counts of 1 mV). */
  meterDigits: number;
}

export interface Design {
  format: typeof DESIGN_FORMAT;
  version: typeof DESIGN_VERSION;
  title: string;
  notes: string;
  sensor: SensorSpec;
  supply: Supply;
  opamp: OpAmpSpec;
  target: Target;
  output: Output;
  environment: Environment;
  analysis: AnalysisOptions;
  calibration: CalibrationMeter;
  /** Readings of the built probe: [measurand, output volts at the instrument] pairs, for the trim solve ([] = none). */
  probeReadings?: Reading[];
  /** Trimmer wiper settings (0…1) while the probe readings were taken, by part reference; a trimmer not listed is at its parts-list setting. */
  probeSettings?: Array<[string, number]>;
}

// ---------------------------------------------------------------------------------------------------------
// Schema

// Bounds: every number has a largest and a smallest meaningful size. A value beyond them is a typing slip
// (a missing prefix, an exponent's sign) that would otherwise reach the analysis as an underflow or an
// overflow; the limits sit orders of magnitude outside any real part (common practice), so no design of
// real parts meets them. `minAbs` refuses tiny non-zero sizes; zero stays allowed where it means "none".
const V = (o: Partial<Spec & { t: 'num' }> = {}): Spec => ({ t: 'num', what: 'volts', maxAbs: 1000, minAbs: 1e-9, ...o } as Spec);
const num = (what: string, check: 'positive' | 'nonneg' | 'any' | 'fraction', o: object = {}): Spec => ({ t: 'num', what, check, ...o } as Spec);
const opt = (s: Spec, def: unknown): Spec => ({ ...s, def } as Spec);

/** One bench reading: [measurand, volts]. */
const readingSpec: Spec = { t: 'tuple', items: [num('measurand units', 'any', { maxAbs: 1e9, minAbs: 1e-12 }), V()] };
const readingsList: Spec = { t: 'list', item: readingSpec, def: [], maxItems: MAX_READINGS };

/**
 * A measurand's unit symbol: a letter, µ, Ω, ° or % first, then letters, digits, µ, Ω, °, %, ², ³, /, ^, · or
 * a hyphen. Nothing that could start a new line, a comment or a formula in any output.
 */
export const UNIT_SYMBOL = /^[A-Za-zµμΩ°%][A-Za-z0-9µμΩ°%²³/^·-]*$/;

/** A ferrite core with a gap: the same fields for the open-loop Hall clamp and the closed-loop sensor. */
const gappedCoreFields: Record<string, Spec> = {
  pathLength: num('metres', 'positive', { min: 1e-4, max: 100 }),
  permeability: num('(relative permeability)', 'positive', { min: 1, max: 1e7 }),
  gap: num('metres', 'positive', { min: 1e-6, max: 1 }),
  saturation: num('teslas', 'positive', { min: 1e-3, max: 100 }),
  fringing: opt(num('(factor)', 'positive', { min: 0.1, max: 10 }), 1),
  width: num('metres', 'positive', { min: 1e-5, max: 10, optional: true }),
  depth: num('metres', 'positive', { min: 1e-5, max: 10, optional: true }),
};

const sensorCommon: Record<string, Spec> = {
  measurand: { t: 'str', def: 'A', maxLength: 16, pattern: UNIT_SYMBOL, patternHint: 'must be a unit symbol such as A, mT, V or kPa (letters, digits, µ, Ω, °, %, / and ^ only)' },
  sourceResistance: opt(num('ohms', 'nonneg', { max: 1e9, minAbs: 1e-6 }), 0),
  noiseDensity: opt(num('volts per root hertz', 'nonneg', { max: 1e-3, minAbs: 1e-15 }), 0),
  bandwidth: opt(num('hertz', 'positive', { min: 1e-3, max: 1e10 }), 1e9),
  sensitivityTolerance: opt(num('parts of one', 'fraction', { minAbs: 1e-9 }), 0),
  quiescentTolerance: opt(num('volts', 'nonneg', { max: 100, minAbs: 1e-12 }), 0),
  sensitivityDrift: opt(num('parts of one per kelvin', 'any', { maxAbs: 1, minAbs: 1e-12 }), 0),
  quiescentDrift: opt(num('volts per kelvin', 'any', { maxAbs: 1, minAbs: 1e-12 }), 0),
  supplyCurrent: opt(num('amperes', 'nonneg', { max: 10, minAbs: 1e-12 }), 0),
  outputDrive: opt(num('amperes', 'nonneg', { max: 10, minAbs: 1e-12 }), 0),
  readings: { t: 'obj', nullable: true, def: null, fields: { use: { t: 'bool', def: true }, points: readingsList } },
};

const sensorVariants: Record<string, Record<string, Spec>> = {
  'voltage-output': {
    ...sensorCommon,
    sensitivity: num('volts per measurand unit', 'any', { maxAbs: 1e6, minAbs: 1e-9 }),
    quiescent: V(),
    outputMin: V({ optional: true }),
    outputMax: V({ optional: true }),
    ratiometricSupply: { t: 'num', what: 'volts', check: 'positive', min: 0.1, max: 1000, optional: true },
    commonMode: V({ optional: true }),
    supplyMin: { t: 'num', what: 'volts', check: 'positive', min: 0.1, max: 1000, optional: true },
    supplyMax: { t: 'num', what: 'volts', check: 'positive', min: 0.1, max: 1000, optional: true },
  },
  'hall-gap-core': {
    ...sensorCommon,
    hallSensitivity: num('volts per tesla', 'any', { maxAbs: 1e6, minAbs: 1e-6 }),
    quiescent: V(),
    linearField: num('teslas', 'positive', { min: 1e-6, max: 100 }),
    outputMin: V({ optional: true }),
    outputMax: V({ optional: true }),
    ratiometricSupply: { t: 'num', what: 'volts', check: 'positive', min: 0.1, max: 1000, optional: true },
    supplyMin: { t: 'num', what: 'volts', check: 'positive', min: 0.1, max: 1000, optional: true },
    supplyMax: { t: 'num', what: 'volts', check: 'positive', min: 0.1, max: 1000, optional: true },
    turns: num('turns', 'positive', { min: 1, max: 1e6, whole: true }),
    core: { t: 'obj', fields: { ...gappedCoreFields } },
  },
  'current-transformer': {
    ...sensorCommon,
    secondaryTurns: num('turns', 'positive', { min: 1, max: 1e7, whole: true }),
    primaryTurns: opt(num('turns', 'positive', { min: 1, max: 1e6, whole: true }), 1),
    burden: num('ohms', 'positive', { min: 1e-3, max: 1e9 }),
    burdenPower: opt(num('watts', 'positive', { min: 1e-4, max: 1e6 }), 0.25),
    inductanceFactor: num('henries per turn squared', 'positive', { min: 1e-12, max: 1 }),
    windingResistance: opt(num('ohms', 'nonneg', { max: 1e9, minAbs: 1e-6 }), 0),
    quiescent: opt(V(), 0),
    // --- issue 19: core cross-section and saturation for the trade sweep's saturation current.
    core: { t: 'obj', nullable: true, optional: true, fields: { width: num('metres', 'positive', { min: 1e-5, max: 10 }), depth: num('metres', 'positive', { min: 1e-5, max: 10, optional: true }), saturation: num('teslas', 'positive', { min: 1e-3, max: 100 }) } },
    lowestFrequency: num('hertz', 'positive', { min: 1e-3, max: 1e6, optional: true }),
    // --- end issue 19
  },
  // --- closed-loop Hall sensor (issue #20) ---
  'closed-loop-hall': {
    ...sensorCommon,
    hallSensitivity: num('volts per tesla', 'any', { maxAbs: 1e6, minAbs: 1e-6 }),
    quiescent: V(),
    linearField: num('teslas', 'positive', { min: 1e-6, max: 100 }),
    core: {
      t: 'obj',
      fields: {
        ...gappedCoreFields,
        area: num('square metres', 'positive', { min: 1e-9, max: 10 }),
      },
    },
    primaryTurns: opt(num('turns', 'positive', { min: 1, max: 1e6, whole: true }), 1),
    compensationTurns: num('turns', 'positive', { min: 1, max: 1e6, whole: true }),
    windingResistance: num('ohms', 'nonneg', { max: 1e6, minAbs: 1e-6, optional: true }),
    wire: {
      t: 'obj', nullable: true, def: null,
      fields: { diameter: num('metres', 'positive', { min: 1e-6, max: 0.1, optional: true }), gauge: num('(AWG)', 'nonneg', { max: 56, whole: true, optional: true }), turnLength: num('metres', 'positive', { min: 1e-4, max: 10 }) },
    },
    measurementResistance: num('ohms', 'positive', { min: 1e-3, max: 1e7 }),
    reference: V({ optional: true }),
    driver: {
      t: 'obj',
      fields: {
        outputStage: { t: 'str', oneOf: ['op-amp', 'push-pull'], def: 'op-amp' },
        gbw: opt(num('hertz', 'positive', { min: 1, max: 1e11 }), 1e6),
        openLoopGainDb: opt(num('decibels', 'any', { min: 20, max: 200 }), 100),
        swing: opt(num('volts', 'nonneg', { max: 100, minAbs: 1e-9 }), 1.5),
        drop: opt(num('volts', 'nonneg', { max: 100, minAbs: 1e-9 }), 0),
        currentLimit: opt(num('amperes', 'positive', { min: 1e-6, max: 100 }), 0.02),
        quiescentCurrent: opt(num('amperes', 'nonneg', { max: 10, minAbs: 1e-12 }), 1e-3),
        outputResistance: opt(num('ohms', 'nonneg', { max: 1e6, minAbs: 1e-6 }), 1),
      },
    },
    compensation: {
      t: 'obj',
      fields: {
        inputResistance: num('ohms', 'positive', { min: 1, max: 1e9 }),
        capacitance: num('farads', 'positive', { min: 1e-15, max: 1 }),
        zeroResistance: opt(num('ohms', 'nonneg', { max: 1e9, minAbs: 1e-6 }), 0),
      },
    },
  },
  // --- end closed-loop Hall sensor ---
  shunt: {
    ...sensorCommon,
    resistance: num('ohms', 'positive', { min: 1e-6, max: 1e9 }),
    powerRating: opt(num('watts', 'positive', { min: 1e-4, max: 1e6 }), 0.25),
    commonMode: V({ optional: true }),
  },
};

// --- issue 18: the resistor kit's schema and limit rule, one source for `target.kit` and the kit file (src/model/kit-file.ts).
/** A resistor kit (`target.kit`, and the `kit` of a kit file): a series between limits with a count, plus listed values. */
export const KIT_SCHEMA: Extract<Spec, { t: 'obj' }> = {
  t: 'obj',
  fields: {
    series: { t: 'str', oneOf: ['E3', 'E6', 'E12', 'E24', 'E48', 'E96', 'E192'], optional: true },
    min: opt(num('ohms', 'positive', { min: 0.1, max: 1e10 }), 10),
    max: opt(num('ohms', 'positive', { min: 0.1, max: 1e10 }), 1e6),
    count: num('(count)', 'positive', { max: 1e6, whole: true, optional: true }),
    parts: {
      t: 'list', def: [], maxItems: 500,
      item: { t: 'obj', fields: { ohms: num('ohms', 'positive', { min: 0.01, max: 1e10 }), count: num('(count)', 'positive', { max: 1e6, whole: true, optional: true }) } },
    },
  },
};

/** The kit's own rule beyond its schema: a series part's limits in order. `path` is where the kit sits (`target.kit`). */
export function kitLimitProblem(kit: ResistorKit, path: string): Problem | null {
  return kit.series && kit.min >= kit.max ? { path: `${path}.min`, message: `must be below ${path}.max`, other: [`${path}.max`] } : null;
}
// --- end issue 18

/** The op-amp's figures: the design's `opamp`, and each entry of an op-amp list file (src/model/opamp-list.ts). */
export const OPAMP_SCHEMA: Spec = {
  t: 'obj',
  fields: {
    name: { t: 'str', def: 'custom', maxLength: 80 },
    gbw: num('hertz', 'positive', { min: 1, max: 1e11 }),
    slewRate: num('volts per second', 'positive', { min: 1, max: 1e12 }),
    openLoopGainDb: num('decibels', 'any', { min: 20, max: 200 }),
    inputLow: num('volts', 'any', { min: -100, max: 100, minAbs: 1e-9 }),
    inputHigh: num('volts', 'any', { min: -100, max: 100, minAbs: 1e-9 }),
    outputLow: num('volts', 'nonneg', { max: 100, minAbs: 1e-9 }),
    outputHigh: num('volts', 'nonneg', { max: 100, minAbs: 1e-9 }),
    voltageNoise: num('volts per root hertz', 'nonneg', { max: 1e-3, minAbs: 1e-15 }),
    currentNoise: num('amperes per root hertz', 'nonneg', { max: 1e-3, minAbs: 1e-18 }),
    offsetVoltage: num('volts', 'nonneg', { max: 1, minAbs: 1e-12 }),
    biasCurrent: num('amperes', 'any', { maxAbs: 1e-2, minAbs: 1e-18 }),
    supplyCurrent: num('amperes', 'nonneg', { max: 10, minAbs: 1e-12 }),
    outputResistance: opt(num('ohms', 'nonneg', { max: 1e6, minAbs: 1e-6 }), 50),
    outputCurrent: opt(num('amperes', 'positive', { min: 1e-6, max: 100 }), 0.02),
    offsetDrift: opt(num('volts per kelvin', 'nonneg', { max: 1e-2, minAbs: 1e-15 }), 0),
    psrrDb: opt(num('decibels', 'any', { min: 20, max: 200 }), 80),
    voltageNoiseCorner: opt(num('hertz', 'nonneg', { max: 1e9, minAbs: 1e-6 }), 0),
    currentNoiseCorner: opt(num('hertz', 'nonneg', { max: 1e9, minAbs: 1e-6 }), 0),
  },
};

const SCHEMA: Spec = {
  t: 'obj',
  fields: {
    format: { t: 'str', oneOf: [DESIGN_FORMAT] },
    version: { t: 'num', what: '(format version)', check: 'positive', whole: true },
    title: { t: 'str', def: 'Untitled design', maxLength: 200 },
    notes: { t: 'str', def: '', maxLength: 10_000 },
    sensor: { t: 'variant', tag: 'type', variants: sensorVariants },
    supply: {
      t: 'obj',
      fields: {
        positive: V(),
        negative: V(),
        regulated: {
          t: 'obj', nullable: true, def: null,
          fields: {
            voltage: num('volts', 'positive', { min: 0.1, max: 1000 }),
            tolerance: opt(num('parts of one', 'fraction', { minAbs: 1e-9 }), 0.02),
            quiescentCurrent: opt(num('amperes', 'nonneg', { max: 10, minAbs: 1e-12 }), 0),
            dropout: opt(num('volts', 'nonneg', { max: 100, minAbs: 1e-6 }), REGULATOR_DROPOUT),
            drift: opt(num('parts of one per kelvin', 'nonneg', { max: 0.01, minAbs: 1e-12 }), 100e-6),
          },
        },
        tolerance: opt(num('parts of one', 'fraction', { minAbs: 1e-9 }), 0.01),
        sensorRail: { t: 'str', oneOf: ['positive', 'regulated'], def: 'positive' },
        referenceRail: { t: 'str', oneOf: ['positive', 'regulated'], def: 'positive' },
        battery: {
          t: 'obj', nullable: true, def: null,
          fields: {
            fresh: num('volts', 'positive', { min: 0.1, max: 1000 }),
            endOfLife: num('volts', 'positive', { min: 0.1, max: 1000 }),
            capacity: num('coulombs', 'positive', { min: 0.36, max: 1e9 }),
            rails: { t: 'str', oneOf: ['positive', 'split', 'pair', 'regulated'], def: 'positive' },
            splitterCurrent: num('amperes', 'nonneg', { max: 1, minAbs: 1e-9, optional: true }),
          },
        },
      },
    },
    opamp: OPAMP_SCHEMA,
    target: {
      t: 'obj',
      fields: {
        scale: num('volts per measurand unit', 'any', { maxAbs: 1e6, minAbs: 1e-9 }),
        zero: V(),
        range: { t: 'tuple', items: [num('measurand units', 'any', { maxAbs: 1e9, minAbs: 1e-12 }), num('measurand units', 'any', { maxAbs: 1e9, minAbs: 1e-12 })] },
        signal: { t: 'str', oneOf: ['dc', 'ac-rms'], def: 'dc' },
        topology: { t: 'str', oneOf: ['auto', ...TOPOLOGIES], def: 'auto' },
        series: { t: 'str', oneOf: ['E3', 'E6', 'E12', 'E24', 'E48', 'E96', 'E192'], def: 'E96' },
        tolerance: opt(num('parts of one', 'fraction', { min: 1e-5 }), 0.01),
        arrangements: { t: 'list', item: { t: 'str', oneOf: ['single', 'series', 'parallel'] }, def: ['single', 'series', 'parallel'], nonEmpty: true, maxItems: 3 },
        resistanceMin: opt(num('ohms', 'positive', { min: 1, max: 1e9 }), 1e3),
        resistanceMax: opt(num('ohms', 'positive', { min: 1, max: 1e10 }), 1e6),
        tempco: opt(num('parts of one per kelvin', 'any', { maxAbs: 0.01, minAbs: 1e-12 }), 100e-6),
        trimmerTempco: opt(num('parts of one per kelvin', 'any', { maxAbs: 0.01, minAbs: 1e-12 }), 100e-6),
        trim: {
          t: 'obj', def: { gain: true, zero: true },
          fields: { gain: { t: 'bool', def: true }, zero: { t: 'bool', def: true } },
        },
        bandwidth: opt(num('hertz', 'nonneg', { max: 1e10, minAbs: 1e-3 }), 0),
        alternative: opt(num('(index)', 'nonneg', { max: 50, whole: true }), 0),
        kit: { ...KIT_SCHEMA, nullable: true, def: null },
        // --- issue 19: a range switch's further positions and its wiring.
        ranges: {
          t: 'list', optional: true, maxItems: 3,
          item: { t: 'obj', fields: {
            scale: num('volts per measurand unit', 'any', { maxAbs: 1e6, minAbs: 1e-9 }),
            range: { t: 'tuple', items: [num('measurand units', 'any', { maxAbs: 1e9, minAbs: 1e-12 }), num('measurand units', 'any', { maxAbs: 1e9, minAbs: 1e-12 })] },
          } },
        },
        rangeSwitch: { t: 'str', oneOf: ['auto', 'single-pole', 'two-pole'], optional: true },
        // --- end issue 19
      },
    },
    output: {
      t: 'obj',
      def: { filter: null, load: { resistance: 1e6, capacitance: 15e-12 } },
      fields: {
        filter: {
          t: 'obj', nullable: true, def: null,
          fields: { resistance: num('ohms', 'positive', { min: 1e-3, max: 1e9 }), capacitance: num('farads', 'nonneg', { max: 1, minAbs: 1e-15 }) },
        },
        load: {
          t: 'obj', def: { resistance: 1e6, capacitance: 15e-12 },
          fields: { resistance: num('ohms', 'positive', { min: 1, max: 1e15 }), capacitance: opt(num('farads', 'nonneg', { max: 1, minAbs: 1e-15 }), 0) },
        },
      },
    },
    environment: {
      t: 'obj',
      def: { temperature: 298.15, temperatureMin: 283.15, temperatureMax: 313.15 },
      fields: {
        temperature: opt(num('kelvins', 'positive', { min: 1, max: 1000 }), 298.15),
        temperatureMin: opt(num('kelvins', 'positive', { min: 1, max: 1000 }), 283.15),
        temperatureMax: opt(num('kelvins', 'positive', { min: 1, max: 1000 }), 313.15),
      },
    },
    probeReadings: readingsList,
    probeSettings: { t: 'list', item: { t: 'tuple', items: [{ t: 'str', maxLength: 16 }, num('parts of the travel', 'fraction')] }, def: [], maxItems: 20 },
    analysis: {
      t: 'obj',
      def: {},
      fields: {
        noiseBand: {
          t: 'tuple', optional: true, nullable: true,
          items: [num('hertz', 'positive', { min: 1e-3, max: 1e11 }), num('hertz', 'positive', { min: 1e-3, max: 1e11 })],
        },
        spreadTrials: opt(num('trials', 'positive', { min: 10, max: 1e6, whole: true }), 2000),
        spreadSeed: opt(num('(seed)', 'nonneg', { max: 2 ** 32, whole: true }), 1),
        scaleLimit: opt(num('parts of one', 'fraction', { minAbs: 1e-9 }), 0.01),
        zeroLimit: opt(num('volts', 'positive', { min: 1e-9, max: 100 }), 0.02),
        waveform: {
          t: 'obj', nullable: true, def: null,
          fields: {
            shape: { t: 'str', oneOf: ['step', 'sine', 'square', 'triangle'] },
            low: num('measurand units', 'any', { maxAbs: 1e9, minAbs: 1e-12 }),
            high: num('measurand units', 'any', { maxAbs: 1e9, minAbs: 1e-12 }),
            frequency: opt(num('hertz', 'nonneg', { max: 1e9, minAbs: 1e-6 }), 0),
            duty: opt(num('parts of one', 'fraction', { minAbs: 1e-6 }), 0.5),
          },
        },
      },
    },
    calibration: {
      t: 'obj',
      def: {},
      fields: {
        meterRelative: opt(num('parts of one', 'fraction', { minAbs: 1e-9 }), 0.005),
        meterDigits: opt(num('volts', 'nonneg', { max: 100, minAbs: 1e-12 }), 0.003),
      },
    },
  },
};

/** A number field of the format with its bounds, for tools and tests that go through every field. */
export interface NumberField {
  /** Dotted path, list items as `.0`, `.1` (`target.range.1`). */
  path: string;
  min?: number;
  max?: number;
  maxAbs?: number;
  minAbs?: number;
  check: 'positive' | 'nonneg' | 'any' | 'fraction';
  whole: boolean;
}

/** Every number field of a design with this sensor type, with its bounds, read from the schema itself. */
export function numberFields(type: SensorType): NumberField[] {
  const out: NumberField[] = [];
  const walk = (spec: Spec, path: string) => {
    if (spec.t === 'num') out.push({ path, min: spec.min, max: spec.max, maxAbs: spec.maxAbs, minAbs: spec.minAbs, check: spec.check ?? 'any', whole: !!spec.whole });
    else if (spec.t === 'obj') for (const [k, s] of Object.entries(spec.fields)) walk(s, path ? `${path}.${k}` : k);
    else if (spec.t === 'tuple') spec.items.forEach((s, i) => walk(s, `${path}.${i}`));
    else if (spec.t === 'variant') for (const [k, s] of Object.entries(spec.variants[type]!)) walk(s, `${path}.${k}`);
  };
  walk(SCHEMA, '');
  return out.filter((f) => f.path !== 'version');
}

export type ValidationResult = { ok: true; design: Design } | { ok: false; problems: Problem[] };

/**
 * Migrates older documents to the current version. Version 1 is current; each future version adds one
 * step here, with a test per step.
 */
export function migrate(doc: Record<string, unknown>, problems: Problem[]): Record<string, unknown> | null {
  const v = doc.version;
  if (typeof v !== 'number' || !Number.isInteger(v) || v < 1) {
    problems.push({ path: 'version', message: `must be a whole number from 1 to ${DESIGN_VERSION}` });
    return null;
  }
  if (v > DESIGN_VERSION) {
    problems.push({ path: 'version', message: `is ${v}, newer than this Gainwright understands (${DESIGN_VERSION}); update Gainwright to open it` });
    return null;
  }
  return doc;
}

/**
 * Checks a parsed JSON value as a design and fills in defaults. Every problem names its field path:
 * `opamp.gbw: must be a positive number of hertz`.
 */
export function validateDesign(doc: unknown): ValidationResult {
  const problems: Problem[] = [];
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc)) {
    return { ok: false, problems: [{ path: '(document)', message: 'must be a JSON object' }] };
  }
  const d = doc as Record<string, unknown>;
  if (d.format !== DESIGN_FORMAT) {
    problems.push({ path: 'format', message: `must be "${DESIGN_FORMAT}"${typeof d.format === 'string' ? ` (got "${d.format.slice(0, 40)}")` : ''}` });
    return { ok: false, problems };
  }
  const migrated = migrate(d, problems);
  if (!migrated) return { ok: false, problems };
  const out = check(migrated, SCHEMA, '', problems) as Record<string, unknown> | undefined;
  if (problems.length || !out) return { ok: false, problems };
  const design = out as unknown as Design;
  if (design.analysis.noiseBand === undefined) design.analysis.noiseBand = null;
  crossCheck(design, problems);
  return problems.length ? { ok: false, problems } : { ok: true, design };
}

/**
 * Rules that tie fields together. Each problem sits at one field, lists in `other` every further field it
 * involves, and says what would fix it, naming fields by path (a screen writes them as labels).
 */
function crossCheck(d: Design, problems: Problem[]): void {
  const p = (path: string, message: string, other: string[] = []) => problems.push({ path, message, other });
  const s = d.sensor;
  const span = d.supply.positive - d.supply.negative;
  if (d.supply.positive <= 0) p('supply.positive', 'must be above 0 V');
  else if (d.supply.positive <= d.supply.negative) p('supply.positive', 'must be above supply.negative: raise supply.positive or lower supply.negative', ['supply.negative']);
  if (d.supply.negative > 0) p('supply.negative', 'must be 0 V (single supply) or below 0 V (split supply)');
  if (d.target.range[0] >= d.target.range[1]) p('target.range[0]', 'must be below target.range[1]: the range runs from low to high', ['target.range[1]']);
  if (d.target.scale === 0) p('target.scale', 'must not be zero');
  // Issue 19: each further range runs low to high and keeps the target's polarity (one stage, one sign).
  (d.target.ranges ?? []).forEach((r, i) => {
    if (r.range[0] >= r.range[1]) p(`target.ranges[${i}].range[0]`, `must be below target.ranges[${i}].range[1]: the range runs from low to high`, [`target.ranges[${i}].range[1]`]);
    if (r.scale === 0) p(`target.ranges[${i}].scale`, 'must not be zero');
    else if (Math.sign(r.scale) !== Math.sign(d.target.scale)) p(`target.ranges[${i}].scale`, 'must have the same sign as target.scale: one stage gives one polarity on every range', ['target.scale']);
  });
  if (d.target.resistanceMin >= d.target.resistanceMax) p('target.resistanceMin', 'must be below target.resistanceMax', ['target.resistanceMax']);
  else if (d.target.resistanceMax / d.target.resistanceMin < 10) p('target.resistanceMax', 'must be at least ten times target.resistanceMin so that arms can be found: raise target.resistanceMax or lower target.resistanceMin', ['target.resistanceMin']);
  const e = d.environment;
  if (e.temperatureMin > e.temperature) p('environment.temperatureMin', 'must not be above environment.temperature: lower environment.temperatureMin or raise environment.temperature', ['environment.temperature']);
  if (e.temperature > e.temperatureMax) p('environment.temperatureMax', 'must not be below environment.temperature: raise environment.temperatureMax or lower environment.temperature', ['environment.temperature']);
  if (d.supply.battery && d.supply.battery.fresh <= d.supply.battery.endOfLife) p('supply.battery.endOfLife', 'must be below supply.battery.fresh', ['supply.battery.fresh']);
  // A split battery or a pair of batteries makes symmetric rails about the amplifier's ground.
  if (d.supply.battery && (d.supply.battery.rails === 'split' || d.supply.battery.rails === 'pair') && Math.abs(d.supply.negative + d.supply.positive) > 1e-9 * d.supply.positive) {
    p('supply.negative', `must be −supply.positive with ${d.supply.battery.rails === 'split' ? 'a split battery' : 'a second battery'} (the rails are symmetric about ground): set supply.negative to ${-d.supply.positive} V`, ['supply.positive', 'supply.battery.rails']);
  }
  if (d.supply.sensorRail === 'regulated' && !d.supply.regulated) p('supply.sensorRail', 'is the regulated rail, but supply.regulated is off: feed the sensor from the positive rail or keep supply.regulated', ['supply.regulated']);
  if (d.supply.referenceRail === 'regulated' && !d.supply.regulated) p('supply.referenceRail', 'is the regulated rail, but supply.regulated is off: take the reference from the positive rail or keep supply.regulated', ['supply.regulated']);
  // --- issue 18: a front end wholly on a regulator fed by the battery.
  const wholeOnRegulator = d.supply.battery?.rails === 'regulated';
  if (wholeOnRegulator && d.supply.negative !== 0) p('supply.negative', 'must be 0 V when the battery feeds a regulator for the whole front end (the regulator makes one rail over ground)', ['supply.battery.rails']);
  else if (wholeOnRegulator && !d.supply.regulated) p('supply.battery.rails', 'is the regulator\'s output, but supply.regulated is off: switch supply.regulated on or let the battery make the positive rail', ['supply.regulated']);
  else if (wholeOnRegulator && Math.abs(d.supply.positive - d.supply.regulated!.voltage) > 1e-9 * d.supply.positive) {
    p('supply.positive', `is the regulator's output with the battery feeding the regulator: set supply.positive to ${+d.supply.regulated!.voltage.toPrecision(6)} V (supply.regulated.voltage)`, ['supply.regulated.voltage', 'supply.battery.rails']);
  } else if (wholeOnRegulator && d.supply.regulated!.voltage + d.supply.regulated!.dropout > d.supply.battery!.fresh) {
    const need = +(d.supply.regulated!.voltage + d.supply.regulated!.dropout).toPrecision(4);
    p('supply.regulated.voltage', `needs a fresh battery of at least ${need} V (its ${+d.supply.regulated!.voltage.toPrecision(4)} V plus ${+d.supply.regulated!.dropout.toPrecision(3)} V dropout): lower supply.regulated.voltage or use a battery of more volts`, ['supply.battery.fresh', 'supply.regulated.dropout']);
  }
  // --- end issue 18
  if (!wholeOnRegulator && d.supply.regulated && d.supply.regulated.voltage + d.supply.regulated.dropout > span) {
    const need = +(d.supply.regulated.voltage + d.supply.regulated.dropout + d.supply.negative).toPrecision(4);
    p('supply.regulated.voltage', `needs supply.positive of at least ${need} V (its ${+d.supply.regulated.voltage.toPrecision(4)} V plus ${+d.supply.regulated.dropout.toPrecision(3)} V dropout): raise supply.positive, lower supply.regulated.voltage or switch supply.regulated off`, ['supply.positive', 'supply.regulated', 'supply.regulated.dropout']);
  }
  if (d.opamp.inputLow + d.opamp.inputHigh >= span) {
    p('opamp.inputHigh', 'leaves no input common-mode range on these rails (opamp.inputLow + opamp.inputHigh is larger than the supply span): widen the rails or choose an op-amp whose inputs reach closer to them', ['opamp.inputLow', 'supply.positive']);
  }
  if (d.opamp.outputLow + d.opamp.outputHigh >= span) {
    p('opamp.outputHigh', 'leaves no output swing on these rails (opamp.outputLow + opamp.outputHigh is larger than the supply span): widen the rails or choose an op-amp whose output swings closer to them', ['opamp.outputLow', 'supply.positive']);
  }
  if (d.analysis.noiseBand && d.analysis.noiseBand[0] >= d.analysis.noiseBand[1]) p('analysis.noiseBand[0]', 'must be below analysis.noiseBand[1]', ['analysis.noiseBand[1]']);
  const w = d.analysis.waveform;
  if (w) {
    if (w.low === w.high) p('analysis.waveform.high', 'must differ from analysis.waveform.low');
    if (w.shape !== 'step' && !(w.frequency > 0)) p('analysis.waveform.frequency', `must be a positive number of hertz for a ${w.shape} wave`);
    if ((w.shape === 'square' || w.shape === 'triangle') && !(w.duty > 0 && w.duty < 1)) p('analysis.waveform.duty', 'must lie between 0 and 1 (not at either end)');
  }
  if (s.type === 'voltage-output' || s.type === 'hall-gap-core') {
    const sens = s.type === 'voltage-output' ? s.sensitivity : s.hallSensitivity;
    if (sens === 0) p(`sensor.${s.type === 'voltage-output' ? 'sensitivity' : 'hallSensitivity'}`, 'must not be zero');
    if (s.outputMin !== undefined && s.outputMax !== undefined && s.outputMin >= s.outputMax) p('sensor.outputMin', 'must be below sensor.outputMax', ['sensor.outputMax']);
    if (typeof s.supplyMin === 'number' && typeof s.supplyMax === 'number' && s.supplyMin >= s.supplyMax) p('sensor.supplyMin', 'must be below sensor.supplyMax', ['sensor.supplyMax']);
  }
  if (s.readings?.use && s.type !== 'voltage-output' && s.type !== 'hall-gap-core') {
    p('sensor.readings.use', 'can only be true for a voltage-output or hall-gap-core sensor: a current transformer or shunt is set by its parts');
  }
  const kit = d.target.kit;
  if (kit) {
    const limits = kitLimitProblem(kit, 'target.kit');
    if (limits) problems.push(limits);
    else if (!kitValues(kit, d.target.resistanceMin, d.target.resistanceMax).length) {
      p('target.kit', 'holds no value between target.resistanceMin and target.resistanceMax: add values to the kit or widen the window', ['target.resistanceMin', 'target.resistanceMax']);
    }
  }
  if ((s.type === 'hall-gap-core' || s.type === 'closed-loop-hall') && s.core.gap >= s.core.pathLength) p('sensor.core.gap', 'must be shorter than sensor.core.pathLength', ['sensor.core.pathLength']);
  // --- closed-loop Hall sensor (issue #20) ---
  if (s.type === 'closed-loop-hall') {
    if (s.hallSensitivity === 0) p('sensor.hallSensitivity', 'must not be zero');
    if (s.windingResistance === undefined && !s.wire) p('sensor.windingResistance', 'is needed, or sensor.wire (its diameter and mean turn length) to compute it', ['sensor.wire']);
    if (s.wire && s.wire.diameter === undefined && s.wire.gauge === undefined) p('sensor.wire.diameter', 'is needed, or sensor.wire.gauge (AWG), to compute the winding\'s resistance', ['sensor.wire.gauge']);
    const ref = s.reference ?? (d.supply.positive + d.supply.negative) / 2;
    if (!(ref > d.supply.negative && ref < d.supply.positive)) p('sensor.reference', 'must lie between the rails so that the driver can drive the winding both ways', ['supply.positive', 'supply.negative']);
  }
  // --- end closed-loop Hall sensor ---
}

/** Formats problems one per line: `opamp.gbw: must be a positive number of hertz`. */
export function formatProblems(problems: Problem[]): string {
  return problems.map((q) => `${q.path}: ${q.message}`).join('\n');
}

/**
 * Reads the bytes of a design file as text, the same way in the app and the CLI: UTF-8 with or without a
 * byte-order mark, or UTF-16 (little or big endian, with a mark, or without one when the first character is
 * ASCII, as every JSON document's is). Anything else is refused with one line.
 */
export function decodeDesignBytes(bytes: Uint8Array): { ok: true; text: string } | { ok: false; problems: Problem[] } {
  if (bytes.length > MAX_DESIGN_BYTES) return { ok: false, problems: [tooLarge()] };
  let encoding = 'utf-8';
  let start = 0;
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) start = 3;
  else if (bytes[0] === 0xff && bytes[1] === 0xfe) { encoding = 'utf-16le'; start = 2; }
  else if (bytes[0] === 0xfe && bytes[1] === 0xff) { encoding = 'utf-16be'; start = 2; }
  else if (bytes.length >= 2 && bytes[0] !== 0 && bytes[1] === 0) encoding = 'utf-16le';
  else if (bytes.length >= 2 && bytes[0] === 0 && bytes[1] !== 0) encoding = 'utf-16be';
  try {
    return { ok: true, text: new TextDecoder(encoding, { fatal: true, ignoreBOM: true }).decode(bytes.subarray(start)) };
  } catch {
    return { ok: false, problems: [{ path: '(file)', message: `is not text (neither UTF-8 nor ${encoding === 'utf-8' ? 'UTF-16' : encoding.toUpperCase()} throughout)` }] };
  }
}

/** The one wording of a file over its size limit: `is larger than 1 MB; a design file is a few kB`. */
export function tooLargeMessage(limit: number, what = 'a design file is a few kB'): string {
  return `is larger than ${limit >= 1e6 ? `${limit / 1e6} MB` : `${limit / 1e3} kB`}; ${what}`;
}
const tooLarge = (): Problem => ({ path: '(file)', message: tooLargeMessage(MAX_DESIGN_BYTES) });

/** Where JSON.parse stopped, as one line: the engine's own message quotes the text, control characters and all. */
function jsonErrorAt(text: string, err: unknown): string {
  const msg = err instanceof Error ? err.message : '';
  const pos = /position (\d+)/.exec(msg)?.[1] ?? firstBadCharacter(text);
  if (pos !== null) {
    const before = text.slice(0, Number(pos));
    const line = before.split('\n').length;
    const column = before.length - before.lastIndexOf('\n');
    return `is not valid JSON (at line ${line}, column ${column})`;
  }
  if (/end of (JSON )?input/i.test(msg)) return 'is not valid JSON (it ends too early)';
  return 'is not valid JSON';
}

/** The offset of the first character that cannot begin a JSON token, or null when every one can. */
function firstBadCharacter(text: string): number | null {
  const token = /[ \t\n\r]*(?:[{}[\],:]|"(?:[^"\\\u0000-\u001f]|\\.)*"|-?[0-9][0-9.eE+-]*|true|false|null)/y;
  let at = 0;
  while (token.exec(text)) at = token.lastIndex;
  const rest = /^[ \t\n\r]*/.exec(text.slice(at))![0].length;
  return at + rest < text.length ? at + rest : null;
}

/**
 * The path of the first key that appears twice in one object of a (valid) JSON text, or null. JSON.parse
 * keeps the last silently; a design file says what it means once. A scan of tokens with an explicit stack,
 * so that deep nesting cannot overflow the call stack.
 */
export function firstDuplicateKey(text: string): string | null {
  const token = /[ \t\n\r]*(?:([{}[\],:])|("(?:[^"\\]|\\.)*")|(-?[0-9][0-9.eE+-]*|true|false|null))/y;
  const stack: Array<{ obj: boolean; keys: Set<string>; path: string; n: number; key: string }> = [];
  const join = (path: string, key: string) => {
    const k = /^[A-Za-z_$][\w$]*$/.test(key) ? key : quoteText(key);
    return path ? `${path}.${k}` : k;
  };
  const childPath = () => {
    const f = stack[stack.length - 1];
    if (!f) return '';
    return f.obj ? join(f.path, f.key) : `${f.path}[${f.n}]`;
  };
  let expectKey = false;
  for (let m = token.exec(text); m; m = token.exec(text)) {
    const punct = m[1], str = m[2];
    const top = stack[stack.length - 1];
    if (punct === '{' || punct === '[') {
      stack.push({ obj: punct === '{', keys: new Set(), path: childPath(), n: 0, key: '' });
      expectKey = punct === '{';
    } else if (punct === '}' || punct === ']') {
      stack.pop();
      expectKey = false;
    } else if (punct === ',') {
      if (top?.obj) expectKey = true; else if (top) top.n++;
    } else if (str !== undefined && expectKey && top) {
      const key = JSON.parse(str) as string;
      if (top.keys.has(key)) return join(top.path, key);
      top.keys.add(key);
      top.key = key;
      expectKey = false;
    }
  }
  return null;
}

/** Parses JSON text as a design, with a message (not an exception) for text that is not JSON. */
export function parseDesignText(text: string): ValidationResult {
  if (text.length > MAX_DESIGN_BYTES) return { ok: false, problems: [tooLarge()] };
  // A byte-order mark that reached the text (a file read as UTF-8 by the caller) is not part of the JSON.
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  let doc: unknown;
  try {
    doc = JSON.parse(body);
  } catch (err) {
    return { ok: false, problems: [{ path: '(file)', message: jsonErrorAt(body, err) }] };
  }
  const twice = firstDuplicateKey(body);
  if (twice) return { ok: false, problems: [{ path: twice, message: 'appears twice in the file: keep the one you mean and delete the other' }] };
  return validateDesign(doc);
}

/** The design as a document to save: stable key order, numbers as they are. */
export function serialiseDesign(d: Design): string {
  return JSON.stringify(d, null, 2) + '\n';
}

export type { Problem };
