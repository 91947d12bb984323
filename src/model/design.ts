/**
 * The design file: one JSON document that describes a sensor front end (format "gainwright-design").
 * All numbers are SI base units (V, A, Ω, Hz, s, T, m, K, F; battery capacity in coulombs, 1 mAh = 3.6 C).
 * See docs/design-format.md for every field.
 */
import { check, type Problem, type Spec } from './validate.js';
import type { SeriesName } from './eseries.js';

export const DESIGN_FORMAT = 'gainwright-design';
export const DESIGN_VERSION = 1;
/**
 * Headroom a linear regulator needs between its input and its output to hold its voltage, V: about 0.3 V
 * for a low-dropout part (common practice). Used for refusing a regulator on a rail no higher than its
 * output and for the battery sweep.
 */
export const REGULATOR_HEADROOM = 0.3;
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
    /** User correction for fringing: multiplies the gap field (1 = formula as is). */
    fringing: number;
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

export type SensorSpec = VoltageOutputSensor | HallGapCoreSensor | CurrentTransformerSensor | ShuntSensor;
export type SensorType = SensorSpec['type'];

export interface Supply {
  /** Positive rail, V. */
  positive: number;
  /** Negative rail, V (0 for a single supply). */
  negative: number;
  /** An optional regulated rail (e.g. a 5 V regulator fed by the battery). */
  regulated: { voltage: number; tolerance: number; quiescentCurrent: number } | null;
  /** Which rail feeds the sensor. */
  sensorRail: Rail;
  /** Which rail the offset reference divider hangs from. */
  referenceRail: Rail;
  /** Battery feeding the positive rail (and the regulator), or null for a bench supply. */
  battery: { fresh: number; endOfLife: number; capacity: number } | null;
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
  /** Fit a span (gain) trimmer and a zero trimmer. */
  trim: { gain: boolean; zero: boolean };
  /** Bandwidth the user needs, Hz (0 = none stated). */
  bandwidth: number;
  /** Which of the solver's ranked gain-network alternatives to build (0 = the top-ranked one). */
  alternative: number;
}

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

export interface AnalysisOptions {
  /** Band for integrated noise, Hz; null = 1 Hz to 100 × the chain's −3 dB bandwidth. */
  noiseBand: [number, number] | null;
  spreadTrials: number;
  spreadSeed: number;
  /** Yield limit for the spread: fractional scale error and zero error (V). */
  scaleLimit: number;
  zeroLimit: number;
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
}

// ---------------------------------------------------------------------------------------------------------
// Schema

const V = (o: Partial<Spec & { t: 'num' }> = {}): Spec => ({ t: 'num', what: 'volts', maxAbs: 1000, ...o } as Spec);
const num = (what: string, check: 'positive' | 'nonneg' | 'any' | 'fraction', o: object = {}): Spec => ({ t: 'num', what, check, ...o } as Spec);
const opt = (s: Spec, def: unknown): Spec => ({ ...s, def } as Spec);

const sensorCommon: Record<string, Spec> = {
  measurand: { t: 'str', def: 'A', maxLength: 16 },
  sourceResistance: opt(num('ohms', 'nonneg', { max: 1e9 }), 0),
  noiseDensity: opt(num('volts per root hertz', 'nonneg', { max: 1e-3 }), 0),
  bandwidth: opt(num('hertz', 'positive', { max: 1e10 }), 1e9),
  sensitivityTolerance: opt(num('parts of one', 'fraction'), 0),
  quiescentTolerance: opt(num('volts', 'nonneg', { max: 100 }), 0),
  sensitivityDrift: opt(num('parts of one per kelvin', 'any', { maxAbs: 1 }), 0),
  quiescentDrift: opt(num('volts per kelvin', 'any', { maxAbs: 1 }), 0),
  supplyCurrent: opt(num('amperes', 'nonneg', { max: 10 }), 0),
  outputDrive: opt(num('amperes', 'nonneg', { max: 10 }), 0),
};

const sensorVariants: Record<string, Record<string, Spec>> = {
  'voltage-output': {
    ...sensorCommon,
    sensitivity: num('volts per measurand unit', 'any', { maxAbs: 1e6 }),
    quiescent: V(),
    outputMin: V({ optional: true }),
    outputMax: V({ optional: true }),
    ratiometricSupply: { t: 'num', what: 'volts', check: 'positive', max: 1000, optional: true },
    commonMode: V({ optional: true }),
    supplyMin: { t: 'num', what: 'volts', check: 'positive', max: 1000, optional: true },
    supplyMax: { t: 'num', what: 'volts', check: 'positive', max: 1000, optional: true },
  },
  'hall-gap-core': {
    ...sensorCommon,
    hallSensitivity: num('volts per tesla', 'any', { maxAbs: 1e6 }),
    quiescent: V(),
    linearField: num('teslas', 'positive', { max: 100 }),
    outputMin: V({ optional: true }),
    outputMax: V({ optional: true }),
    ratiometricSupply: { t: 'num', what: 'volts', check: 'positive', max: 1000, optional: true },
    supplyMin: { t: 'num', what: 'volts', check: 'positive', max: 1000, optional: true },
    supplyMax: { t: 'num', what: 'volts', check: 'positive', max: 1000, optional: true },
    turns: num('turns', 'positive', { max: 1e6 }),
    core: {
      t: 'obj',
      fields: {
        pathLength: num('metres', 'positive', { max: 100 }),
        permeability: num('(relative permeability)', 'positive', { min: 1, max: 1e7 }),
        gap: num('metres', 'positive', { max: 1 }),
        saturation: num('teslas', 'positive', { max: 100 }),
        fringing: opt(num('(factor)', 'positive', { min: 0.1, max: 10 }), 1),
      },
    },
  },
  'current-transformer': {
    ...sensorCommon,
    secondaryTurns: num('turns', 'positive', { max: 1e7 }),
    primaryTurns: opt(num('turns', 'positive', { max: 1e6 }), 1),
    burden: num('ohms', 'positive', { max: 1e9 }),
    burdenPower: opt(num('watts', 'positive', { max: 1e6 }), 0.25),
    inductanceFactor: num('henries per turn squared', 'positive', { max: 1 }),
    windingResistance: opt(num('ohms', 'nonneg', { max: 1e9 }), 0),
    quiescent: opt(V(), 0),
  },
  shunt: {
    ...sensorCommon,
    resistance: num('ohms', 'positive', { max: 1e9 }),
    powerRating: opt(num('watts', 'positive', { max: 1e6 }), 0.25),
    commonMode: V({ optional: true }),
  },
};

const SCHEMA: Spec = {
  t: 'obj',
  fields: {
    format: { t: 'str', oneOf: [DESIGN_FORMAT] },
    version: { t: 'num', what: '(format version)', check: 'positive' },
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
            voltage: num('volts', 'positive', { max: 1000 }),
            tolerance: opt(num('parts of one', 'fraction'), 0.02),
            quiescentCurrent: opt(num('amperes', 'nonneg', { max: 10 }), 0),
          },
        },
        sensorRail: { t: 'str', oneOf: ['positive', 'regulated'], def: 'positive' },
        referenceRail: { t: 'str', oneOf: ['positive', 'regulated'], def: 'positive' },
        battery: {
          t: 'obj', nullable: true, def: null,
          fields: {
            fresh: num('volts', 'positive', { max: 1000 }),
            endOfLife: num('volts', 'positive', { max: 1000 }),
            capacity: num('coulombs', 'positive', { max: 1e9 }),
          },
        },
      },
    },
    opamp: {
      t: 'obj',
      fields: {
        name: { t: 'str', def: 'custom', maxLength: 80 },
        gbw: num('hertz', 'positive', { max: 1e11 }),
        slewRate: num('volts per second', 'positive', { max: 1e12 }),
        openLoopGainDb: num('decibels', 'any', { min: 20, max: 200 }),
        inputLow: num('volts', 'any', { min: -100, max: 100 }),
        inputHigh: num('volts', 'any', { min: -100, max: 100 }),
        outputLow: num('volts', 'nonneg', { max: 100 }),
        outputHigh: num('volts', 'nonneg', { max: 100 }),
        voltageNoise: num('volts per root hertz', 'nonneg', { max: 1e-3 }),
        currentNoise: num('amperes per root hertz', 'nonneg', { max: 1e-3 }),
        offsetVoltage: num('volts', 'nonneg', { max: 1 }),
        biasCurrent: num('amperes', 'any', { maxAbs: 1e-2 }),
        supplyCurrent: num('amperes', 'nonneg', { max: 10 }),
        outputResistance: opt(num('ohms', 'nonneg', { max: 1e6 }), 50),
        outputCurrent: opt(num('amperes', 'positive', { max: 100 }), 0.02),
        offsetDrift: opt(num('volts per kelvin', 'nonneg', { max: 1e-2 }), 0),
      },
    },
    target: {
      t: 'obj',
      fields: {
        scale: num('volts per measurand unit', 'any', { maxAbs: 1e6 }),
        zero: V(),
        range: { t: 'tuple', items: [num('measurand units', 'any', { maxAbs: 1e9 }), num('measurand units', 'any', { maxAbs: 1e9 })] },
        signal: { t: 'str', oneOf: ['dc', 'ac-rms'], def: 'dc' },
        topology: { t: 'str', oneOf: ['auto', ...TOPOLOGIES], def: 'auto' },
        series: { t: 'str', oneOf: ['E3', 'E6', 'E12', 'E24', 'E48', 'E96', 'E192'], def: 'E96' },
        tolerance: opt(num('parts of one', 'fraction', { min: 1e-5 }), 0.01),
        arrangements: { t: 'list', item: { t: 'str', oneOf: ['single', 'series', 'parallel'] }, def: ['single', 'series', 'parallel'], nonEmpty: true, maxItems: 3 },
        resistanceMin: opt(num('ohms', 'positive', { min: 1, max: 1e9 }), 1e3),
        resistanceMax: opt(num('ohms', 'positive', { min: 1, max: 1e10 }), 1e6),
        tempco: opt(num('parts of one per kelvin', 'any', { maxAbs: 0.01 }), 100e-6),
        trim: {
          t: 'obj', def: { gain: true, zero: true },
          fields: { gain: { t: 'bool', def: true }, zero: { t: 'bool', def: true } },
        },
        bandwidth: opt(num('hertz', 'nonneg', { max: 1e10 }), 0),
        alternative: opt(num('(index)', 'nonneg', { max: 50 }), 0),
      },
    },
    output: {
      t: 'obj',
      def: { filter: null, load: { resistance: 1e6, capacitance: 15e-12 } },
      fields: {
        filter: {
          t: 'obj', nullable: true, def: null,
          fields: { resistance: num('ohms', 'positive', { max: 1e9 }), capacitance: num('farads', 'nonneg', { max: 1 }) },
        },
        load: {
          t: 'obj', def: { resistance: 1e6, capacitance: 15e-12 },
          fields: { resistance: num('ohms', 'positive', { min: 1, max: 1e15 }), capacitance: opt(num('farads', 'nonneg', { max: 1 }), 0) },
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
    analysis: {
      t: 'obj',
      def: {},
      fields: {
        noiseBand: {
          t: 'tuple', optional: true, nullable: true,
          items: [num('hertz', 'positive', { max: 1e11 }), num('hertz', 'positive', { max: 1e11 })],
        },
        spreadTrials: opt(num('trials', 'positive', { min: 10, max: 1e6 }), 2000),
        spreadSeed: opt(num('(seed)', 'nonneg', { max: 2 ** 32 }), 1),
        scaleLimit: opt(num('parts of one', 'fraction'), 0.01),
        zeroLimit: opt(num('volts', 'positive', { max: 100 }), 0.02),
      },
    },
  },
};

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

function crossCheck(d: Design, problems: Problem[]): void {
  const p = (path: string, message: string) => problems.push({ path, message });
  const s = d.sensor;
  if (d.supply.positive <= d.supply.negative) p('supply.positive', 'must be above supply.negative');
  if (d.supply.negative > 0) p('supply.negative', 'must be 0 V (single supply) or below 0 V (split supply)');
  if (d.supply.positive <= 0) p('supply.positive', 'must be above 0 V');
  if (d.target.range[0] >= d.target.range[1]) p('target.range', 'must run from low to high (the first value below the second)');
  if (d.target.scale === 0) p('target.scale', 'must not be zero');
  if (d.target.resistanceMin >= d.target.resistanceMax) p('target.resistanceMin', 'must be below target.resistanceMax');
  if (d.target.resistanceMax / d.target.resistanceMin < 10) p('target.resistanceMax', 'must be at least ten times target.resistanceMin so that arms can be found');
  const e = d.environment;
  if (e.temperatureMin > e.temperature || e.temperature > e.temperatureMax) p('environment.temperature', 'must lie between environment.temperatureMin and environment.temperatureMax');
  if (d.supply.battery && d.supply.battery.fresh <= d.supply.battery.endOfLife) p('supply.battery.endOfLife', 'must be below supply.battery.fresh');
  if ((d.supply.sensorRail === 'regulated' || d.supply.referenceRail === 'regulated') && !d.supply.regulated) {
    p(d.supply.sensorRail === 'regulated' ? 'supply.sensorRail' : 'supply.referenceRail', 'is "regulated" but supply.regulated is not set');
  }
  if (d.supply.regulated && d.supply.regulated.voltage + REGULATOR_HEADROOM > d.supply.positive - d.supply.negative) {
    p('supply.regulated.voltage', `must be at least ${REGULATOR_HEADROOM} V below the supply span it is fed from (${d.supply.positive - d.supply.negative} V): a regulator needs that much headroom to regulate, so a ${d.supply.regulated.voltage} V regulator on a ${d.supply.positive - d.supply.negative} V rail does nothing; tie the sensor and reference to the rail instead`);
  }
  if (d.opamp.inputLow + d.opamp.inputHigh >= d.supply.positive - d.supply.negative) {
    p('opamp.inputHigh', 'leaves no input common-mode range on these rails (inputLow + inputHigh is larger than the supply span)');
  }
  if (d.opamp.outputLow + d.opamp.outputHigh >= d.supply.positive - d.supply.negative) {
    p('opamp.outputHigh', 'leaves no output swing on these rails (outputLow + outputHigh is larger than the supply span)');
  }
  if (d.analysis.noiseBand && d.analysis.noiseBand[0] >= d.analysis.noiseBand[1]) p('analysis.noiseBand', 'must run from low to high');
  if (s.type === 'voltage-output' || s.type === 'hall-gap-core') {
    const sens = s.type === 'voltage-output' ? s.sensitivity : s.hallSensitivity;
    if (sens === 0) p(`sensor.${s.type === 'voltage-output' ? 'sensitivity' : 'hallSensitivity'}`, 'must not be zero');
    if (s.outputMin !== undefined && s.outputMax !== undefined && s.outputMin >= s.outputMax) p('sensor.outputMin', 'must be below sensor.outputMax');
    if (typeof s.supplyMin === 'number' && typeof s.supplyMax === 'number' && s.supplyMin >= s.supplyMax) p('sensor.supplyMin', 'must be below sensor.supplyMax');
  }
  if (s.type === 'hall-gap-core' && s.core.gap >= s.core.pathLength) p('sensor.core.gap', 'must be shorter than sensor.core.pathLength');
}

/** Formats problems one per line: `opamp.gbw: must be a positive number of hertz`. */
export function formatProblems(problems: Problem[]): string {
  return problems.map((q) => `${q.path}: ${q.message}`).join('\n');
}

/** Parses JSON text as a design, with a message (not an exception) for text that is not JSON. */
export function parseDesignText(text: string): ValidationResult {
  if (text.length > MAX_DESIGN_BYTES) {
    return { ok: false, problems: [{ path: '(file)', message: `is larger than ${MAX_DESIGN_BYTES / 1e6} MB; a design file is a few kB` }] };
  }
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (err) {
    return { ok: false, problems: [{ path: '(file)', message: `is not valid JSON (${(err as Error).message})` }] };
  }
  return validateDesign(doc);
}

/** The design as a document to save: stable key order, numbers as they are. */
export function serialiseDesign(d: Design): string {
  return JSON.stringify(d, null, 2) + '\n';
}

export type { Problem };
