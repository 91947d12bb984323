/**
 * The solver on a resistor kit: arm tables built from the kit's values instead of a whole series (an arm of
 * two equal parts only where the kit holds two), and the check that a pair of arms together takes no value
 * more often than the kit holds it. The pair search itself is the same (src/solve/search.ts).
 */
import type { Arrangement, Target } from '../model/design.js';
import { kitValues, type KitValue } from '../model/kit.js';
import { ARM_PARALLEL, ARM_SERIES, ARM_SINGLE, armTable, type ArmTable, type PairFits } from './search.js';

/** An arm table from a kit: each arm's parts as indices into the kit's values, and how many of each it holds. */
export interface KitArmTable extends ArmTable {
  /** Index into `held` of the first and second part (−1: no second part). */
  k1: Int32Array;
  k2: Int32Array;
  /** How many of each kit value there are (Infinity: as many as needed). */
  held: Float64Array;
}

const kitCache = new Map<string, KitArmTable>();

/**
 * Every arm the kit can make: each value alone, and two values in series or in parallel, where two equal
 * values need two in the kit. Deduplicated by value (the arm with fewer parts kept), ascending.
 */
export function kitArmTable(values: readonly KitValue[], arrangements: readonly Arrangement[]): KitArmTable {
  const key = `${values.map((v) => `${v.ohms}x${v.count}`).join(',')}|${[...arrangements].sort().join(',')}`;
  const hit = kitCache.get(key);
  if (hit) return hit;
  const n = values.length;
  const rows: Array<[number, number, number, number, number]> = []; // value, i, j, kind, parts
  if (arrangements.includes('single')) for (let i = 0; i < n; i++) rows.push([values[i]!.ohms, i, -1, ARM_SINGLE, 1]);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      if (i === j && values[i]!.count < 2) continue;
      const x = values[i]!.ohms, y = values[j]!.ohms;
      if (arrangements.includes('series')) rows.push([x + y, i, j, ARM_SERIES, 2]);
      if (arrangements.includes('parallel')) rows.push([(x * y) / (x + y), i, j, ARM_PARALLEL, 2]);
    }
  }
  rows.sort((a, b) => a[0] - b[0] || a[4] - b[4]);
  const kept = rows.filter((r, t) => t === 0 || Math.abs(r[0] - rows[t - 1]![0]) > rows[t - 1]![0] * 1e-12);
  const m = kept.length;
  const out: KitArmTable = {
    value: new Float64Array(m), p1: new Float64Array(m), p2: new Float64Array(m), kind: new Uint8Array(m), size: m,
    k1: new Int32Array(m), k2: new Int32Array(m), held: Float64Array.from(values, (v) => v.count),
  };
  kept.forEach(([v, i, j, kind], t) => {
    out.value[t] = v; out.kind[t] = kind;
    out.p1[t] = values[i]!.ohms; out.k1[t] = i;
    out.p2[t] = j >= 0 ? values[j]!.ohms : 0; out.k2[t] = j;
  });
  kitCache.set(key, out);
  return out;
}

/** The arm table the solver uses for a target: its kit's when it has one, else the whole series in the window. */
export function targetArmTable(target: Target, arrangements: readonly Arrangement[] = target.arrangements): ArmTable {
  return target.kit ? kitArmTable(kitValues(target.kit, target.resistanceMin, target.resistanceMax), arrangements) : armTable(target.series, target.resistanceMin, target.resistanceMax, arrangements);
}

/** What the parts are drawn from, for a finding: the kit, or the series. */
export function seriesLabel(target: Target): string {
  return target.kit ? 'kit' : target.series;
}

const isKit = (t: ArmTable): t is KitArmTable => 'held' in t;

/**
 * The kit check for a pair search over these tables (`pairFitsKit`), or none when neither comes from a kit:
 * a series holds every value without limit, and the search keeps its shortcuts that a kit rules out.
 */
export function kitFits(a: ArmTable, b: ArmTable = a): PairFits | undefined {
  return isKit(a) || isKit(b) ? pairFitsKit : undefined;
}

/**
 * Whether arm i of table a and arm j of table b can both be built from the kit: no value taken more often
 * than it is held (always true for series tables). Both tables must come from the same kit.
 */
export function pairFitsKit(a: ArmTable, i: number, b: ArmTable, j: number): boolean {
  if (!isKit(a) || !isKit(b)) return true;
  const x1 = a.k1[i]!, x2 = a.k2[i]!, y1 = b.k1[j]!, y2 = b.k2[j]!;
  const uses = (k: number) => (k === x1 ? 1 : 0) + (k === x2 ? 1 : 0) + (k === y1 ? 1 : 0) + (k === y2 ? 1 : 0);
  for (const k of [x1, x2, y1, y2]) if (k >= 0 && uses(k) > a.held[k]!) return false;
  return true;
}

/** Values a parts list takes more often than the kit holds them (fixed resistors only). */
export function kitShortfall(parts: ReadonlyArray<{ kind: string; ohms: number; role: string }>, held: readonly KitValue[]): Array<{ ohms: number; used: number; held: number }> {
  const out: Array<{ ohms: number; used: number; held: number }> = [];
  for (const v of held) {
    if (v.count === Infinity) continue;
    // The burden of a current transformer is the sensor's own part, not taken from the kit.
    const used = parts.filter((p) => p.kind === 'resistor' && p.role !== 'burden' && Math.abs(p.ohms - v.ohms) <= v.ohms * 1e-9).length;
    if (used > v.count) out.push({ ohms: v.ohms, used, held: v.count });
  }
  return out;
}
