/**
 * Supply choices for a design on a battery: the battery as it is, the sensor and reference on a regulator fed
 * by it, the whole front end on that regulator, the battery split about the amplifier's ground by a rail
 * splitter, and a second battery for a negative rail; and beside them the two cheap ways to buy back the
 * range a sagging battery takes: a zero centred for the end of battery life, and the best rail-to-rail
 * output op-amp of the comparison. Each choice is a design of its own (`supply`, `target.zero` and for the
 * op-amp row `opamp` change) analysed by the one report, and its row is read off that report as the op-amp
 * comparison reads its rows (`figuresOf`): the linear range fresh and at end of life, the battery life, the
 * verdict. Units: V, A, hours, measurand units.
 */
import { validateDesign, type Design, type OpAmpSpec, type Supply } from '../model/design.js';
import { RAIL_TO_RAIL_OUTPUT, REGULATOR_DROPOUT, REGULATOR_QUIESCENT } from '../model/constants.js';
import { finding, type Finding } from '../model/findings.js';
import { OPAMP_ARCHETYPES } from '../model/opamps.js';
import { analyse, type Report } from './report.js';
import { endOfLifeVoltage } from './analysis.js';
import { peakRange } from '../physics/topology.js';
import { COMPARE_OPTIONS, figuresOf, rowOf, sortRows, withOpAmp, type ComparisonRow, type Judge, type RowFigures } from './compare.js';

/**
 * `as-is` the design now; `zero` the same with the zero centred for end of life; `rail-to-rail` the same with
 * the comparison's best rail-to-rail output op-amp; `regulator` sensor and reference on a regulator;
 * `front-end-regulated` everything on it; `split` a rail splitter; `pair` a second battery.
 */
export type SupplyKind = 'as-is' | 'zero' | 'rail-to-rail' | 'regulator' | 'front-end-regulated' | 'split' | 'pair';

export interface SupplyOption extends RowFigures {
  kind: SupplyKind;
  /** The design's supply under this choice, and the zero it is designed for (what adopting it sets). */
  supply: Supply;
  zero: number;
  /** The op-amp this row puts in the design (`rail-to-rail`); null: the design's own. */
  opamp: OpAmpSpec | null;
  /** A regulator that could not sit below the new positive rail was left out (sensor and reference moved to the positive rail). */
  regulatorDropped: boolean;
  /** Whether this is the supply the design has now. */
  current: boolean;
  /** What the row changes and why, as findings (worded in src/present/finding-words.ts). */
  notes: Finding[];
  /** More of the range (by at least 1 % of it) is linear at end of battery life than with the design as it is (`endCoverage`). */
  gainsAtEndOfLife: boolean;
}

/** The design a row makes when adopted: its supply and zero, and its op-amp if it names one. */
export function optionDesign(design: Design, o: Pick<SupplyOption, 'supply' | 'zero' | 'opamp'>): Design {
  return { ...design, supply: o.supply, target: { ...design.target, zero: o.zero }, ...(o.opamp ? { opamp: { ...o.opamp } } : {}) };
}

/** A regulator of this output with the figures assumed when the design states none (tolerance ±2 %, 100 ppm/K; common practice). */
export function defaultRegulator(voltage: number): NonNullable<Supply['regulated']> {
  return { voltage, tolerance: 0.02, quiescentCurrent: REGULATOR_QUIESCENT, dropout: REGULATOR_DROPOUT, drift: 100e-6 };
}

/** Regulator outputs tried for a sensor with no stated supply, highest first, V (common practice). */
export const REGULATOR_VOLTAGES: readonly number[] = [5, 3.3];

/**
 * The regulator voltage for the sensor: its ratiometric supply if it states one, else the highest common
 * output within its stated supply range; only a voltage that, with the dropout, fits under the positive rail
 * (null: none does).
 */
export function regulatorVoltage(design: Design, positive: number): number | null {
  const s = design.sensor;
  const stated = 'ratiometricSupply' in s && s.ratiometricSupply ? [s.ratiometricSupply] : [];
  const lo = 'supplyMin' in s && typeof s.supplyMin === 'number' ? s.supplyMin : -Infinity;
  const hi = 'supplyMax' in s && typeof s.supplyMax === 'number' ? s.supplyMax : Infinity;
  const dropout = design.supply.regulated?.dropout ?? REGULATOR_DROPOUT;
  return [...stated, ...REGULATOR_VOLTAGES].find((v) => v >= lo && v <= hi && v + dropout <= positive) ?? null;
}

/**
 * The design with a choice of supply applied, or null when the choice cannot be built on this battery (the
 * `zero` and `rail-to-rail` rows are not supplies: see `supplyOptions`). `front-end-regulated` keeps the
 * zero; `supplyOptions` moves it when it does not fit (`centredZero`).
 */
export function withSupply(design: Design, kind: SupplyKind): { design: Design; regulatorDropped: boolean } | null {
  const sup = design.supply;
  const bat = sup.battery;
  if (!bat) return null;
  const rails = bat.rails ?? 'positive';
  // The battery's nominal voltage: the positive rail of a single battery, the span of a split one, the
  // positive rail of a pair; behind a regulator, its fresh voltage (the file keeps no other).
  const nominal = rails === 'split' ? sup.positive - sup.negative : rails === 'regulated' ? bat.fresh : sup.positive;
  // The zero keeps its place relative to the middle of the rails (the output is read against the new ground).
  const mid = (sup.positive + sup.negative) / 2;
  if (kind === 'as-is') return { design, regulatorDropped: false };
  if (kind === 'zero' || kind === 'rail-to-rail') return null;
  if (kind === 'front-end-regulated') {
    if (rails === 'regulated') return null;
    // The battery feeds the regulator directly: its voltage must hold the regulator's output plus dropout.
    const voltage = sup.regulated && sup.regulated.voltage + sup.regulated.dropout <= nominal ? sup.regulated.voltage : regulatorVoltage(design, nominal);
    if (voltage === null) return null;
    const regulated = sup.regulated?.voltage === voltage ? sup.regulated : defaultRegulator(voltage);
    const supply: Supply = { ...sup, positive: voltage, negative: 0, regulated, sensorRail: 'regulated', referenceRail: 'regulated', battery: { ...bat, rails: 'regulated' } };
    return { design: { ...design, supply }, regulatorDropped: false };
  }
  if (kind === 'regulator') {
    if (sup.regulated && sup.sensorRail === 'regulated' && sup.referenceRail === 'regulated') return null;
    // Fed from the positive rail and regulating against ground, it must fit under the positive rail.
    const voltage = sup.regulated?.voltage ?? regulatorVoltage(design, sup.positive);
    if (voltage === null) return null;
    const regulated = sup.regulated ?? defaultRegulator(voltage);
    return { design: { ...design, supply: { ...sup, regulated, sensorRail: 'regulated', referenceRail: 'regulated' } }, regulatorDropped: false };
  }
  if (rails === kind) return null;
  // Split rails or a pair (from a front end on a regulator too: the battery itself makes the rails again).
  const [positive, negative] = kind === 'split' ? [nominal / 2, -nominal / 2] : [nominal, -nominal];
  // A regulator is fed from the positive rail and regulates against ground: it must fit under the new rail.
  const keep = !sup.regulated || sup.regulated.voltage + sup.regulated.dropout <= positive;
  const supply: Supply = {
    ...sup, positive, negative, battery: { ...bat, rails: kind },
    ...(keep ? {} : { regulated: null, sensorRail: 'positive' as const, referenceRail: 'positive' as const }),
  };
  const zero = design.target.zero - mid + (positive + negative) / 2;
  return { design: { ...design, supply, target: { ...design.target, zero } }, regulatorDropped: !keep };
}

/** Smallest change of zero worth offering, V, and the step a suggested zero is rounded to (10 mV). */
const ZERO_STEP = 0.01;
/** Share of the range a row must add to what is linear at end of battery life to count as buying it back (1 %). */
const GAIN_SHARE = 0.01;
/** How far the zero is moved to measure how each headroom follows it, V. */
const ZERO_PROBE = 0.25;

/**
 * The headrooms a report's range has, V, below and above the range, at each step of the battery sweep (fresh
 * to end of life), or on the design's rails without a battery; empty with no stage.
 */
function headrooms(r: Report): Array<{ low: number; high: number }> {
  if (!r.clip || !r.stage) return [];
  if (!r.design.supply.battery) return [{ low: r.clip.headroom.low, high: r.clip.headroom.high }];
  return r.battery.map((s) => ({ low: s.headroomLow, high: s.headroomHigh }));
}

/** The smallest headroom over the battery's life (on the rails without a battery), V; −∞ with no stage. */
export function worstHeadroom(r: Report): number {
  const h = headrooms(r);
  return h.length ? Math.min(...h.map((x) => Math.min(x.low, x.high))) : -Infinity;
}

/**
 * The zero, V (to 10 mV), that makes the smallest headroom over the battery's life (fresh to end of life, each
 * side of the range) as large as it can be: the zero that centres the range in what the output can reach when
 * it is most pinched. The stage is linear, so every headroom is an affine function of the zero asked for
 * (slope +1 below the range and −1 above it when the zero holds as the battery sags; less or more when the
 * reference hangs from the battery). Two reports, at the zero and ZERO_PROBE towards the middle of the rails,
 * give each line; the smallest of them is highest where a rising line meets a falling one, found among those
 * crossings. When the zero holds and the negative rail is fixed this is the zero that leaves equal headroom
 * below and above the range at end of life: swing 0.05…4.5 V at end of life, output 2.5…6.5 V about a 4.5 V
 * zero → 2.27 or 2.28 V (2.275 V rounded). Null when no stage or no better zero within the rails is found.
 * The caller confirms the zero by a full report (limits that do not move with the zero bend the lines).
 */
export function centredZero(r: Report): number | null {
  const d = r.design;
  const z0 = d.target.zero;
  const h0 = headrooms(r);
  if (!h0.length) return null;
  const mid = (d.supply.positive + d.supply.negative) / 2;
  const dz = z0 > mid ? -ZERO_PROBE : ZERO_PROBE;
  const h1 = headrooms(analyse({ ...d, target: { ...d.target, zero: z0 + dz } }, COMPARE_OPTIONS));
  if (h1.length !== h0.length) return null;
  // Lines h(z) = a + b·(z − z0), one per headroom.
  const lines = h0.flatMap((h, i) => [
    { a: h.low, b: (h1[i]!.low - h.low) / dz },
    { a: h.high, b: (h1[i]!.high - h.high) / dz },
  ]);
  const worst = (z: number) => Math.min(...lines.map((l) => l.a + l.b * (z - z0)));
  let best: number | null = null;
  for (const up of lines) for (const down of lines) {
    if (!(up.b > 1e-6 && down.b < -1e-6)) continue;
    const z = z0 + (down.a - up.a) / (up.b - down.b);
    if (z > d.supply.negative && z < d.supply.positive && (best === null || worst(z) > worst(best))) best = z;
  }
  return best === null ? null : Math.round(best / ZERO_STEP) * ZERO_STEP;
}

/**
 * The design with its zero at `centredZero(r)`, analysed; null when there is none, when it is the zero the
 * design has (within 10 mV), or when the full report of it gains no headroom.
 */
function withCentredZero(r: Report): { design: Design; report: Report } | null {
  const d = r.design;
  const z = centredZero(r);
  if (z === null || Math.abs(z - d.target.zero) < ZERO_STEP / 2) return null;
  const design = { ...d, target: { ...d.target, zero: z } };
  const report = analyse(design, COMPARE_OPTIONS);
  return worstHeadroom(report) > worstHeadroom(r) ? { design, report } : null;
}

/** How much of the range (its peaks) is linear at end of battery life, measurand units (0: none or no figure). */
export function endCoverage(o: Pick<RowFigures, 'endOfLifeLow' | 'endOfLifeHigh'>, design: Design): number {
  if (o.endOfLifeLow === null || o.endOfLifeHigh === null) return 0;
  const [a, b] = peakRange(design);
  return Math.max(0, Math.min(b, o.endOfLifeHigh) - Math.max(a, o.endOfLifeLow));
}

/** Whether an op-amp's output is rail-to-rail (within RAIL_TO_RAIL_OUTPUT of each rail). */
export const railToRailOutput = (o: OpAmpSpec) => o.outputLow <= RAIL_TO_RAIL_OUTPUT && o.outputHigh <= RAIL_TO_RAIL_OUTPUT;

/**
 * The best rail-to-rail output archetype for the design as it is (the comparison's order: passing first):
 * taken from `rows` when the comparison is already at hand, else from a full report of the design with each
 * rail-to-rail archetype. Null when the design's op-amp is rail-to-rail already.
 */
export function bestRailToRail(design: Design, judge: Judge, rows?: readonly ComparisonRow[]): ComparisonRow | null {
  if (railToRailOutput(design.opamp)) return null;
  const list = rows
    ? rows.filter((row) => row.source === 'archetype' && railToRailOutput(row.opamp))
    : sortRows(OPAMP_ARCHETYPES.filter((a) => railToRailOutput(a.spec)).map((a) =>
      rowOf({ source: 'archetype', id: a.id, opamp: a.spec }, analyse(withOpAmp(design, a.spec), COMPARE_OPTIONS), false, judge)));
  return list[0] ?? null;
}

const SUPPLY_KINDS: readonly SupplyKind[] = ['regulator', 'front-end-regulated', 'split', 'pair'];

/**
 * Every supply choice that can be built for the design's battery, each a full analysis, in a fixed order:
 * as it is; the zero centred for end of life (when that gains headroom); the best rail-to-rail output
 * op-amp (when the design's is not); sensor and reference on a regulator; the whole front end on it; split
 * rails; a second battery; each only when the design it makes is a valid file. Empty without a battery. `report` may pass the design's own report and `rows` the
 * op-amp comparison of the same design (the app has them), so neither is computed again.
 *
 * The whole front end on a regulator keeps the zero when the stage fits with it on the regulated rail, else
 * takes the zero centred on that rail when that gains headroom (`centredZero`, the same rule as the zero row).
 */
export function supplyOptions(design: Design, judge: Judge, report?: Report, rows?: readonly ComparisonRow[]): SupplyOption[] {
  const bat = design.supply.battery;
  if (!bat) return [];
  const m = design.sensor.measurand;
  const option = (kind: SupplyKind, d: Design, r: Report, notes: Finding[], regulatorDropped = false): SupplyOption => ({
    kind, supply: d.supply, zero: d.target.zero, opamp: JSON.stringify(d.opamp) === JSON.stringify(design.opamp) ? null : d.opamp, regulatorDropped, current: kind === 'as-is', notes, gainsAtEndOfLife: false, ...figuresOf(r, judge),
  });
  const own = report ?? analyse(design, COMPARE_OPTIONS);
  const asIs = option('as-is', design, own, []);
  // A gain of less than GAIN_SHARE of the range is no gain worth a row or a mark.
  const [a, b] = peakRange(design);
  const gains = (o: SupplyOption) => endCoverage(o, design) > endCoverage(asIs, design) + GAIN_SHARE * (b - a);
  const out: SupplyOption[] = [asIs];
  // The zero row is offered when it buys back range: more of the range linear at end of life.
  const centred = withCentredZero(own);
  const row = centred && option('zero', centred.design, centred.report, []);
  if (row && gains(row)) {
    const eol = endOfLifeVoltage(design);
    if (asIs.endOfLifeLow !== null && asIs.endOfLifeHigh !== null && row.endOfLifeLow !== null && row.endOfLifeHigh !== null) {
      row.notes.push(finding('supply-zero-centred', 'info', { from: design.target.zero, to: row.zero, endOfLife: eol, low: asIs.endOfLifeLow, high: asIs.endOfLifeHigh, newLow: row.endOfLifeLow, newHigh: row.endOfLifeHigh, measurand: m }));
    }
    out.push(row);
  }
  const r2r = bestRailToRail(design, judge, rows);
  if (r2r) {
    // The comparison row's figures, without its own naming fields.
    const { source: _source, id: _id, name: _name, opamp: _opamp, current: _current, ...figures } = r2r;
    out.push({
      ...figures, kind: 'rail-to-rail', supply: design.supply, zero: design.target.zero, opamp: r2r.opamp, regulatorDropped: false, current: false, gainsAtEndOfLife: false,
      notes: [finding('supply-rail-to-rail', 'info', { name: r2r.name, outputLow: r2r.opamp.outputLow, outputHigh: r2r.opamp.outputHigh, low: r2r.endOfLifeLow, high: r2r.endOfLifeHigh, measurand: m })],
    });
  }
  for (const kind of SUPPLY_KINDS) {
    const v = withSupply(design, kind);
    // A choice the file would refuse (an op-amp with no input range on the new rails, a sensor's reference
    // outside them) is not offered: adopting it could only be refused.
    if (!v || !validateDesign(structuredClone(v.design)).ok) continue;
    let d = v.design;
    let r = analyse(d, COMPARE_OPTIONS);
    if (kind === 'front-end-regulated') {
      const moved = figuresOf(r, judge).fits ? null : withCentredZero(r);
      if (moved) ({ design: d, report: r } = moved);
      const reg = d.supply.regulated!;
      out.push(option(kind, d, r, [finding('supply-front-end-regulated', 'info', {
        voltage: reg.voltage, dropout: reg.dropout, quiescent: reg.quiescentCurrent, endOfLife: endOfLifeVoltage(d), batteryEnd: bat.endOfLife,
        zeroFrom: design.target.zero, zeroTo: d.target.zero === design.target.zero ? null : d.target.zero,
      })]));
      continue;
    }
    out.push(option(kind, d, r, [], v.regulatorDropped));
  }
  for (const o of out) o.gainsAtEndOfLife = !o.current && gains(o);
  return out;
}
