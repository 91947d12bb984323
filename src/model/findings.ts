/**
 * Findings: what the core found about a design, as data. Each finding is a code, a level and the numbers
 * (and choices) behind it; the sentences, titles and plain names are written by one wording module,
 * `src/present/finding-words.ts`, which the compiler holds to cover every code here.
 *
 * To add a finding: add its code and data shape to `FindingData`, emit `finding('code', level, data)`, and
 * write its title and sentence in the wording module (the build fails until you do). SI units throughout.
 */
export type FindingLevel = 'fail' | 'caution' | 'info';

/** The limits a stage can meet first (clipping causes). */
export type LimitCause = 'opamp-output' | 'opamp-current' | 'opamp-input' | 'sensor' | 'core' | 'burden' | 'driver';

/**
 * The numbers behind one limit on the linear range, for its wording: the op-amp's swing or input range
 * (V), its current limit (A), the sensor's output limits (V), the core's saturation (T), the Hall sensor's
 * linear field (T) or the burden's / shunt's power rating (W).
 */
export type LimitData =
  | { cause: 'opamp-output'; low: number; high: number }
  | { cause: 'opamp-current'; current: number }
  | { cause: 'opamp-input'; low: number; high: number }
  | { cause: 'sensor'; what: 'output'; low: number; high: number }
  | { cause: 'sensor'; what: 'hall-linear'; field: number }
  | { cause: 'sensor'; what: 'readings'; low: number | null; high: number | null; measurand: string }
  | { cause: 'core'; saturation: number }
  | { cause: 'burden'; part: 'burden' | 'shunt'; power: number }
  /** A closed-loop Hall sensor's driver runs out of voltage or current; the core saturates at `saturation` (measurand units). */
  | { cause: 'driver'; runsOut: 'swing' | 'current'; saturation: number; measurand: string };

/** A reason a stage was or was not taken (see `src/physics/topology.ts`). */
export type StageReason =
  | { code: 'polarity-inverted-ac' }
  | { code: 'polarity-wrong'; keeps: boolean }
  | { code: 'differential-needs-difference' }
  | { code: 'inputs-outside'; what: 'follow-sensor' | 'sit' | 'sit-ground' | 'follow-sum'; low: number; high: number; inputLow: number; inputHigh: number }
  | { code: 'cannot-attenuate'; gain: number }
  | { code: 'buffer-zero-fixed'; sensorZero: number; wanted: number }
  | { code: 'reference-outside'; node: 'reference' | 'plus-input'; voltage: number; railLow: number; railHigh: number }
  | { code: 'no-offset'; plain: 'non-inverting' | 'inverting' }
  | { code: 'no-rail-for-offset'; offset: number; polarity: 'positive' | 'negative' }
  | { code: 'no-gain' }
  | { code: 'fits'; how: 'unity-buffer' | 'non-inverting' | 'inverting-attenuates' | 'inverting' | 'summing-inverting' | 'difference-differential' | 'difference' | 'summing-attenuates' | 'summing-non-inverting' };

/** Guidance when no stage fits (see `chooseTopology`). */
export type StageGuidance =
  | { code: 'polarity-cause'; topology: string; rises: boolean; other: string; measurand: string }
  | { code: 'attenuate-same-polarity' }
  | { code: 'check-rails' };

/** A caution that belongs to one kind of sensor (worded in src/present/cautions.ts). */
export type SensorCaution = 'ct-open-secondary' | 'closed-loop-open-winding';

/** Every finding's code and the data it carries. */
export interface FindingData {
  // The sensor (src/physics/sensors.ts).
  'fringing-model': { areaRatio: number; from: 'section' | 'square-section' | 'factor' };
  'fringing-neglected': Record<string, never>;
  remanence: Record<string, never>;
  'earth-field': { reading: number; measurand: string };
  'gap-critical': { changePerTenthMm: number };
  'burden-power': { power: number; rating: number };
  'ct-no-dc': Record<string, never>;
  'low-side-only': Record<string, never>;
  'shunt-power': { power: number; rating: number };
  // The closed-loop Hall sensor (src/physics/closed-loop.ts; issue #20). Resistances Ω, capacitance F, frequencies Hz, angles degrees.
  'closed-loop-unstable': { phaseMargin: number | null; crossover: number | null; inputResistance: number; capacitance: number; zeroResistance: number };
  'closed-loop-margin': { phaseMargin: number; crossover: number; inputResistance: number; capacitance: number; zeroResistance: number };
  'closed-loop-flatness': { flatness: number; at: number; inputResistance: number; capacitance: number; zeroResistance: number; dip: number };
  'closed-loop-flatness-limit': { flatness: number; at: number };
  'closed-loop-overload': { high: number; low: number; saturationHigh: number; saturationLow: number; limitHigh: 'swing' | 'current'; limitLow: 'swing' | 'current'; measurand: string };
  'closed-loop-residual': { dcLoopGain: number; residual: number };
  'closed-loop-polarity': Record<string, never>;
  'closed-loop-unmodelled': Record<string, never>;
  'closed-loop-driver-current': { need: number; limit: number };
  // Sensor bench readings (src/analysis/sensor-readings.ts).
  'readings-too-few': { allAtOneValue: boolean; have: number; need: number; measurand: string };
  'readings-implausible': { fringing: number; low: number; high: number };
  // The resistor solver (src/solve/).
  'buffer-no-trim': { stage: 'unity' | 'summing-follower' };
  'gain-beyond-loop': { gain: number; openLoopGainDb: number };
  'gain-unrealisable': { series: string; windowLow: number; windowHigh: number; gain: number | null; with: 'window' | 'reference' | 'offset' };
  'reference-unrealisable': { series: string; windowLow: number; windowHigh: number; reference: number };
  'scale-off-target': { series: string; error: number; accept: number; tolerance: number };
  'zero-off-target': { series: string; error: number; span: number; zeroTrim: boolean; networks: boolean };
  'gain-trim-short':
    | { cause: 'none-fits'; leverage: number | null }
    | { cause: 'short'; halfSpan: number; coverage: number; stack: number; nearUnityLeverage: number | null };
  'zero-by-wire': { offsetAtOutput: number };
  'zero-trim-short': { cause: 'on-rail'; rail: number; summed: boolean } | { cause: 'near-rail'; coverage: number };
  'zero-trim-off-centre': { setting: number };
  // A resistor kit (src/analysis/kit.ts): a value used more often than held; the kit short of the target,
  // how close it came (scale error, null when nothing was built; the error the solver accepts, null when
  // the stage failed for another reason) and the one value to buy.
  'kit-quantity': { ohms: number; used: number; held: number };
  'kit-short': { error: number | null; accept: number | null; buy: { ohms: number; series: string; error: number | null; meets: boolean; uses: number } | null };
  // The report (src/analysis/report.ts).
  'gain-not-computable': Record<string, never>;
  'no-topology': { considered: { topology: string; reasons: StageReason[] }[] };
  guidance: StageGuidance;
  singular: Record<string, never>;
  'ac-peak': { peak: number; measurand: string };
  'not-linear-at-zero': { measurand: string; limit: LimitData | null };
  'zero-outside-linear': { low: number; high: number; coversRange: boolean; measurand: string };
  'clips-in-range-low': { at: number; wanted: number; measurand: string; limit: LimitData | null };
  'clips-in-range-high': { at: number; wanted: number; measurand: string; limit: LimitData | null };
  'bandwidth-short': { bandwidth: number; wanted: number };
  'slew-limited': { fullPower: number; wanted: number };
  'ac-low-frequency': { shortfall: number; leadDegrees: number; lowCorner: number; frequency: number };
  'sensor-drive': { draw: number; drive: number };
  'sensor-load': { draw: number; drive: number };
  'flicker-not-given': { voltage: boolean; current: boolean; from: number };
  'common-mode': { commonMode: number; passed: number; passedReferred: number; worst: number; worstReferred: number; worstGain: number; tolerance: number; measurand: string };
  'probe-ratio': { ratio: number; offset: number; offsetShown: number; invert: boolean; ac: boolean; measurand: string };
  'no-50-ohm': Record<string, never>;
  'capacitive-load': { isolation: number };
  'no-zero-trim': Record<string, never>;
  'battery-clips': { voltage: number; endOfLife: number; low: number; high: number; hoursToClip: number | null; hoursToEnd: number | null; measurand: string };
  'battery-scale-shift': { below: number; dropout: number; voltage: number; scale: number; change: number; measurand: string };
  'battery-zero-shift': { shift: number; cause: 'reference-on-battery' | 'ratiometric-sensor' | 'regulator-dropout' | 'battery-fed'; regulated: number | null; dropsOutBelow: number | null };
  'sensor-over-voltage': { high: number; rated: number; from: 'regulated' | 'battery' | 'positive' };
  'sensor-under-voltage': { low: number; rated: number; from: 'regulated' | 'battery' | 'positive' };
  // --- issue 19: the range switch (src/analysis/ranges.ts).
  'range-stage': { topology: string | null; buffer: boolean };
  'range-wiring': { wiring: 'single-pole' | 'two-pole'; decidedBy: 'asked' | 'zero-holds' | 'zero-moves' | 'zero-unreachable'; singlePoleShift: number; limit: number; throws: number; idleCurrent: number };
  'range-unbuilt': { position: number; scale: number; cause: 'zero-unreachable' | 'gain-unreachable'; measurand: string };
  'range-zero-shift': { position: number; scale: number; shift: number; zero: number; residual: number; measurand: string };
  // --- end issue 19
  // --- issue 18: notes on the supply choices (src/analysis/supply-options.ts). Volts, hours, measurand units.
  /** A zero that centres the range in what the output reaches at end of battery life; the linear range there before and after. */
  'supply-zero-centred': { from: number; to: number; endOfLife: number; low: number; high: number; newLow: number; newHigh: number; measurand: string };
  /** The whole front end on a regulator: where the battery's life ends, what the regulator draws, where the zero went (null: kept). */
  'supply-front-end-regulated': { voltage: number; dropout: number; quiescent: number; endOfLife: number; batteryEnd: number; zeroFrom: number; zeroTo: number | null };
  /** The best rail-to-rail output op-amp of the comparison on the battery as it is (`name` is a person's text when not built in). */
  'supply-rail-to-rail': { name: string; outputLow: number; outputHigh: number; low: number | null; high: number | null; measurand: string };
  // --- end issue 18
}

export type FindingCode = keyof FindingData;

/** One finding: its code, its level and its data (a discriminated union on `code`). */
export type Finding = { [K in FindingCode]: { code: K; level: FindingLevel; data: FindingData[K] } }[FindingCode];

/** Builds a finding, typed by its code. `finding('capacitive-load', 'caution', { isolation: 47 })`. */
export function finding<K extends FindingCode>(code: K, level: FindingLevel, data: FindingData[K]): Finding {
  return { code, level, data } as Finding;
}
