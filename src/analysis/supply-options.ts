/**
 * Supply choices for a design on a battery: the battery as it is, the sensor and reference on a regulator fed
 * by it, the battery split about the amplifier's ground by a rail splitter, and a second battery for a
 * negative rail. Each choice is a design of its own (only `supply`, and with split rails `target.zero`,
 * change) analysed by the one report, and its row is read off that report as the op-amp comparison reads
 * its rows (`figuresOf`): the linear range fresh and at end of life, the battery life, the verdict.
 */
import type { Design, Supply } from '../model/design.js';
import { REGULATOR_DROPOUT } from '../model/constants.js';
import { analyse, type Report } from './report.js';
import { COMPARE_OPTIONS, figuresOf, type Judge, type RowFigures } from './compare.js';

export type SupplyKind = 'as-is' | 'regulator' | 'split' | 'pair';

export interface SupplyOption extends RowFigures {
  kind: SupplyKind;
  /** The design's supply under this choice, and the zero it is designed for (what adopting it sets). */
  supply: Supply;
  zero: number;
  /** A regulator that could not sit below the new positive rail was left out (sensor and reference moved to the positive rail). */
  regulatorDropped: boolean;
  /** Whether this is the supply the design has now. */
  current: boolean;
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

/** The design with a choice of supply applied, or null when the choice cannot be built on this battery. */
export function withSupply(design: Design, kind: SupplyKind): { design: Design; regulatorDropped: boolean } | null {
  const sup = design.supply;
  const bat = sup.battery;
  if (!bat) return null;
  const rails = bat.rails ?? 'positive';
  // The battery's nominal voltage: the positive rail of a single battery, the span of a split one, the
  // positive rail of a pair.
  const nominal = rails === 'split' ? sup.positive - sup.negative : sup.positive;
  // The zero keeps its place relative to the middle of the rails (the output is read against the new ground).
  const mid = (sup.positive + sup.negative) / 2;
  if (kind === 'as-is') return { design, regulatorDropped: false };
  if (kind === 'regulator') {
    if (sup.regulated && sup.sensorRail === 'regulated' && sup.referenceRail === 'regulated') return null;
    // Fed from the positive rail and regulating against ground, it must fit under the positive rail.
    const voltage = sup.regulated?.voltage ?? regulatorVoltage(design, sup.positive);
    if (voltage === null) return null;
    const regulated = sup.regulated ?? { voltage, tolerance: 0.02, quiescentCurrent: 0, dropout: REGULATOR_DROPOUT, drift: 100e-6 };
    return { design: { ...design, supply: { ...sup, regulated, sensorRail: 'regulated', referenceRail: 'regulated' } }, regulatorDropped: false };
  }
  if (rails === kind) return null;
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

const KINDS: readonly SupplyKind[] = ['as-is', 'regulator', 'split', 'pair'];

/**
 * Every supply choice that can be built for the design's battery, in a fixed order (as it is, a regulator,
 * split rails, a second battery), each a full analysis; empty without a battery. `report` may pass the
 * design's own report (the app has it).
 */
export function supplyOptions(design: Design, judge: Judge, report?: Report): SupplyOption[] {
  if (!design.supply.battery) return [];
  const out: SupplyOption[] = [];
  for (const kind of KINDS) {
    const v = withSupply(design, kind);
    if (!v) continue;
    const r = kind === 'as-is' && report ? report : analyse(v.design, COMPARE_OPTIONS);
    out.push({ kind, supply: v.design.supply, zero: v.design.target.zero, regulatorDropped: v.regulatorDropped, current: kind === 'as-is', ...figuresOf(r, judge) });
  }
  return out;
}
