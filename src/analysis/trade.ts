/**
 * What each turn and each millimetre buys: the turns / gap trade of a Hall sensor in a gapped core, and the
 * secondary turns / burden trade of a current transformer. Each point of a sweep is the design with one
 * sensor figure changed, its sensor front rebuilt (src/physics/sensors.ts) and its stage solved and
 * analysed as the report would (src/solve, src/circuit, src/analysis/analysis.ts), so the gain, bandwidth and
 * noise of a point are what that build would really give. Returns numbers and codes only; the words are in
 * src/present/trade.ts. SI units throughout; measurand currents in the design's measurand unit.
 */
import type { CurrentTransformerSensor, Design, HallGapCoreSensor } from '../model/design.js';
import { nearest } from '../model/eseries.js';
import { gapAreaRatio, gappedCorePerAmp, sensorFrontAtRail, type SensorFront } from '../physics/sensors.js';
import { coreCrossSection, ctSaturationCurrent, gappedCoreInductance } from '../physics/magnetics.js';
import { chooseTopology } from '../physics/topology.js';
import { solveStage } from '../solve/stage.js';
import { buildCircuit } from '../circuit/build.js';
import { dcLinear, noise, speed } from './analysis.js';
import { sensorFromReadings } from './sensor-readings.js';

/** Turns a Hall clamp is swept over (the design's own is added when it lies outside). */
export const TRADE_TURNS: readonly number[] = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
/** Factors on the design's own gap, or on a CT's own secondary turns and burden: a span either side. */
export const TRADE_FACTORS: readonly number[] = [0.5, Math.SQRT1_2, 1, Math.SQRT2, 2];
/** A CT's turns and burden are swept wider: a burden or a winding is easily changed by a factor of four. */
export const CT_TRADE_FACTORS: readonly number[] = [0.25, 0.5, Math.SQRT1_2, 1, Math.SQRT2, 2, 4];
/** The lowest frequency of interest when a CT design states none, Hz (the lower mains frequency, common practice). */
export const DEFAULT_LOWEST_FREQUENCY = 50;
/** Noise points per sweep point: enough for the integrated figure (Simpson in ln f), fewer than the report's. */
const NOISE_POINTS = 61;

/** Why a point has no chain figures: the first failing finding's code, or one of ours. */
export type TradeUnbuilt = string | null;

/** What the stage built for a point gives: the gain it needs, its bandwidth and its noise referred to the measurand. */
export interface ChainFigures {
  /** Stage gain the target scale then needs, target.scale / sensitivity (signed). */
  gain: number;
  /** Small-signal −3 dB bandwidth of the whole chain, Hz (null when no stage could be built). */
  bandwidth: number | null;
  /** Output noise rms over the report's band, referred to the measurand (measurand units rms). */
  noiseReferred: number | null;
  /** Why no stage could be built, as a finding code (null: built). */
  unbuilt: TradeUnbuilt;
}

export interface HallTradePoint extends ChainFigures {
  /** Which sweep the point belongs to: the turns at the design's gap, or the gap at the design's turns. */
  sweep: 'turns' | 'gap';
  turns: number;
  /** Gap length, m. */
  gap: number;
  /** V per measurand unit. */
  sensitivity: number;
  /** Current at which the core saturates, measurand units (peak). */
  coreSaturation: number;
  /** Current at which the Hall sensor leaves its linear range, measurand units (peak). */
  sensorLinear: number;
  /** Inductance added in series with the measured conductor, H (null: the core's cross-section is not given). */
  insertionInductance: number | null;
  /** The design's own turns and gap. */
  current: boolean;
}

export interface CtTradePoint extends ChainFigures {
  /** Which sweep: the secondary turns at the design's burden, or the burden at the design's turns. */
  sweep: 'turns' | 'burden';
  turns: number;
  /** Burden resistor, Ω. */
  burden: number;
  /** V per measurand unit. */
  sensitivity: number;
  /** The CT's own low-frequency corner (R_B + R_w)/(2π·A_L·N²), Hz. */
  lowCorner: number;
  /** Burden dissipation at the top of the range, W. */
  burdenPower: number;
  /** Primary rms current at which the burden reaches its power rating, measurand units. */
  burdenLimit: number;
  /** Primary rms current at which the core saturates at the lowest frequency of interest (null: core not given). */
  coreSaturation: number | null;
  current: boolean;
}

/** A point of either kind of trade. */
export type TradePoint = HallTradePoint | CtTradePoint;

export type TradeResult =
  | { kind: 'hall-gap-core'; points: HallTradePoint[]; rangeEnd: number; crossSection: number | null }
  | { kind: 'current-transformer'; points: CtTradePoint[]; rangeEnd: number; lowestFrequency: number; coreGiven: boolean };

/** The largest |measurand| the range asks for (rms for an rms range, as given). */
function rangeEnd(design: Design): number {
  const [a, b] = design.target.range;
  return Math.max(Math.abs(a), Math.abs(b));
}

/** Solves and analyses the stage for a design the way the report does, keeping only the figures a trade needs. */
export function chainFigures(design: Design, front: SensorFront): ChainFigures {
  const gain = design.target.scale / front.sensitivity;
  const none = (unbuilt: string): ChainFigures => ({ gain, bandwidth: null, noiseReferred: null, unbuilt });
  if (!Number.isFinite(gain) || gain === 0) return none('gain-not-computable');
  const choice = chooseTopology(design, front);
  if (!choice.chosen) return none('no-topology');
  const stage = solveStage(design, front, choice.chosen);
  const fail = stage.warnings.find((w) => w.level === 'fail');
  if (fail || !Number.isFinite(stage.gain)) return none(fail?.code ?? 'no-realisation');
  const circuit = buildCircuit(design, stage, front);
  const dc = dcLinear(circuit, !front.passesDc);
  if (!dc) return none('singular');
  const sp = speed(design, circuit, front, dc);
  if (!(sp.smallSignal > 0) || !Number.isFinite(sp.smallSignal)) return none('speed');
  const nz = noise(design, circuit, sp, NOISE_POINTS);
  return { gain, bandwidth: sp.smallSignal, noiseReferred: Number.isFinite(nz.referredRms) ? Math.abs(nz.referredRms) : null, unbuilt: null };
}

/** The same design with one sensor changed. */
const withSensor = <S extends Design['sensor']>(design: Design, sensor: S): Design => ({ ...design, sensor });

/** One point of a Hall clamp's trade. */
function hallPoint(design: Design, spec: HallGapCoreSensor, sweep: 'turns' | 'gap', turns: number, gap: number): HallTradePoint {
  const sensor: HallGapCoreSensor = { ...spec, turns, core: { ...spec.core, gap } };
  const d = withSensor(design, sensor);
  const front = sensorFrontAtRail(sensor, d);
  const { pathLength, permeability, saturation } = sensor.core;
  const areaRatio = gapAreaRatio(sensor.core);
  const perAmp = gappedCorePerAmp(turns, gap, pathLength, permeability, areaRatio);
  const area = coreCrossSection(sensor.core);
  return {
    sweep, turns, gap,
    sensitivity: front.sensitivity,
    // The same figures the sensor front gives (one source): B_sat over the core's flux density per ampere,
    // the Hall sensor's linear field over the gap's.
    coreSaturation: saturation / perAmp.core,
    sensorLinear: sensor.linearField / perAmp.gap,
    insertionInductance: area === null ? null : gappedCoreInductance(turns, gap, pathLength, permeability, areaRatio, area),
    current: turns === spec.turns && gap === spec.core.gap,
    ...chainFigures(d, front),
  };
}

/** One point of a current transformer's trade. */
function ctPoint(design: Design, spec: CurrentTransformerSensor, sweep: 'turns' | 'burden', turns: number, burden: number, lowest: number): CtTradePoint {
  const sensor: CurrentTransformerSensor = { ...spec, secondaryTurns: turns, burden };
  const d = withSensor(design, sensor);
  const front = sensorFrontAtRail(sensor, d);
  const burdenLimit = front.limits.find((l) => l.kind === 'burden');
  const core = spec.core ?? null;
  return {
    sweep, turns, burden,
    sensitivity: front.sensitivity,
    lowCorner: front.lowCorner,
    burdenPower: front.figures.find((f) => f.key === 'burdenPower')?.value ?? NaN,
    // The front's limit is a peak (the range is checked at its sine peak); the CT's figures here are rms.
    burdenLimit: burdenLimit ? burdenLimit.high / Math.SQRT2 : Infinity,
    coreSaturation: core ? ctSaturationCurrent({ secondaryTurns: turns, primaryTurns: spec.primaryTurns, burden, windingResistance: spec.windingResistance, area: coreCrossSection(core)!, saturation: core.saturation, frequency: lowest }) : null,
    current: turns === spec.secondaryTurns && burden === spec.burden,
    ...chainFigures(d, front),
  };
}

/** Distinct values, in order, keeping the first of a run of equal ones. */
const distinct = (xs: number[]) => [...new Set(xs)].sort((a, b) => a - b);

/**
 * The trade sweep of a design whose sensor has turns to choose: a Hall sensor in a gapped core (turns 1…10 at
 * the design's gap, and gaps of ½ … 2 × the design's at its turns) or a current transformer (secondary turns
 * and burden each from ¼ to 4 × the design's, the other held; burdens at the nearest E24 value, IEC 60063).
 * Null for the other sensors. The design's own point appears in both sweeps.
 */
export function tradeSweep(given: Design): TradeResult | null {
  const design = sensorFromReadings(given).design;
  const s = design.sensor;
  if (s.type === 'hall-gap-core') {
    const turns = distinct([...TRADE_TURNS, s.turns]);
    const gaps = distinct(TRADE_FACTORS.map((k) => (k === 1 ? s.core.gap : Number((s.core.gap * k).toPrecision(3)))))
      .filter((g) => g >= 1e-6 && g < s.core.pathLength);
    return {
      kind: 'hall-gap-core', rangeEnd: rangeEnd(design), crossSection: coreCrossSection(s.core),
      points: [...turns.map((n) => hallPoint(design, s, 'turns', n, s.core.gap)), ...gaps.map((g) => hallPoint(design, s, 'gap', s.turns, g))],
    };
  }
  if (s.type === 'current-transformer') {
    const lowest = s.lowestFrequency ?? DEFAULT_LOWEST_FREQUENCY;
    const turns = distinct(CT_TRADE_FACTORS.map((k) => Math.max(1, Math.round(s.secondaryTurns * k))));
    const burdens = distinct(CT_TRADE_FACTORS.map((k) => (k === 1 ? s.burden : nearest(s.burden * k, 'E24')))).filter((b) => Number.isFinite(b) && b > 0);
    return {
      kind: 'current-transformer', rangeEnd: rangeEnd(design), lowestFrequency: lowest, coreGiven: !!s.core,
      points: [...turns.map((n) => ctPoint(design, s, 'turns', n, s.burden, lowest)), ...burdens.map((b) => ctPoint(design, s, 'burden', s.secondaryTurns, b, lowest))],
    };
  }
  return null;
}

/** The design edits that adopt a point: field paths and values (applied together by the design's owner). */
export function adoptTradePoint(p: TradePoint): Array<{ path: string; value: number }> {
  if ('gap' in p) return [{ path: 'sensor.turns', value: p.turns }, { path: 'sensor.core.gap', value: p.gap }];
  return [{ path: 'sensor.secondaryTurns', value: p.turns }, { path: 'sensor.burden', value: p.burden }];
}
