/**
 * The solver on a resistor kit: arm tables built from the kit's values instead of a whole series (an arm of
 * two equal parts only where the kit holds two), and the check that a pair of arms together takes no value
 * more often than the kit holds it. The pair search itself is the same (src/solve/search.ts).
 *
 * The whole build within the kit (issue 18): a stage is a few networks found one after another (a reference
 * divider, then the gain pair for it; or the gain pair, then the divider; a range switch's further arms after
 * the first position). Each network is searched in the kit less the parts the networks before it took
 * (`kitWithout`: the same kit with those counts taken off, its arm table built again), so that every build
 * the solver offers can be taken from the drawer at once. Where the stage solver enumerates the reference
 * networks first and searches the gain pair for each (the non-inverting stage), this is exact for the pair:
 * for each divider, the best gain pair over every pair the rest of the kit can build (the property test in
 * test/solve/kit-budget.test.ts checks it against a brute force).
 */
import type { Arrangement, Design, Target } from '../model/design.js';
import { kitValues, type KitValue } from '../model/kit.js';
import { ARM_PARALLEL, ARM_SERIES, ARM_SINGLE, armTable, type ArmTable, type PairFits } from './search.js';

/** An arm table from a kit: each arm's parts as indices into the kit's values, and how many of each it holds. */
export interface KitArmTable extends ArmTable {
  /** Index into `held` of the first and second part (−1: no second part). */
  k1: Int32Array;
  k2: Int32Array;
  /** How many of each kit value there are (Infinity: as many as needed). */
  held: Float64Array;
  /** The kit the table was built from, and its arrangements (for `kitWithout`). */
  values: readonly KitValue[];
  arrangements: readonly Arrangement[];
}

/** Arm tables kept, at most this many (a browser session edits many kits; each table is some tens of kB). */
const KIT_CACHE_MAX = 400;

const kitCache = new Map<string, KitArmTable>();

/**
 * Every arm the kit can make: each value alone, and two values in series or in parallel, where two equal
 * values need two in the kit; ascending by value, fewer parts first among equal values. An arm equal in
 * value to one with fewer (or as many) parts is left out only when that one's values are held without
 * limit: where they may run out (1.2 kΩ + 1.5 kΩ beside a single 2.7 kΩ), both stay, so that the search
 * can take the other.
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
  const unlimited = (r: readonly number[]) => values[r[1]!]!.count === Infinity && (r[2]! < 0 || values[r[2]!]!.count === Infinity);
  const kept: typeof rows = [];
  let lead: (typeof rows)[number] | null = null;
  for (const r of rows) {
    const same = lead !== null && Math.abs(r[0] - lead[0]) <= lead[0] * 1e-12;
    if (!same) { lead = r; kept.push(r); } else if (!unlimited(lead!)) kept.push(r);
  }
  const m = kept.length;
  const out: KitArmTable = {
    value: new Float64Array(m), p1: new Float64Array(m), p2: new Float64Array(m), kind: new Uint8Array(m), size: m,
    k1: new Int32Array(m), k2: new Int32Array(m), held: Float64Array.from(values, (v) => v.count),
    values: values.map((v) => ({ ...v })), arrangements: [...arrangements],
  };
  kept.forEach(([v, i, j, kind], t) => {
    out.value[t] = v; out.kind[t] = kind;
    out.p1[t] = values[i]!.ohms; out.k1[t] = i;
    out.p2[t] = j >= 0 ? values[j]!.ohms : 0; out.k2[t] = j;
  });
  if (kitCache.size >= KIT_CACHE_MAX) kitCache.clear();
  kitCache.set(key, out);
  return out;
}

/** Two resistances within this relative distance are the same kit value. */
const SAME = 1e-9;

/**
 * The table of what is left of a kit once the parts `ohms` are taken (one per entry): the same kit with
 * those counts taken off and its arm table built again. A value held without limit, a value not in the
 * kit (a trimmer's, the sensor's own) and a table from a whole series leave the table as it is.
 * `kitWithout(table of {1 kΩ ×1, 10 kΩ ×2}, [10e3])` → the table of {1 kΩ ×1, 10 kΩ ×1}.
 */
export function kitWithout(table: ArmTable, ohms: readonly number[]): ArmTable {
  if (!isKit(table) || !ohms.length) return table;
  let byParts = withoutCache.get(table);
  if (!byParts) { byParts = new Map(); withoutCache.set(table, byParts); }
  const key = ohms.join(',');
  const hit = byParts.get(key);
  if (hit) return hit;
  const out = kitLess(table, ohms);
  byParts.set(key, out);
  return out;
}

/** `kitWithout`'s answers per table and parts taken (the stage solver asks the same many times). */
const withoutCache = new WeakMap<ArmTable, Map<string, ArmTable>>();

function kitLess(table: KitArmTable, ohms: readonly number[]): ArmTable {
  let changed = false;
  const left = table.values.map((v) => ({ ...v }));
  for (const x of ohms) {
    const v = left.find((h) => Math.abs(h.ohms - x) <= h.ohms * SAME);
    if (!v || v.count === Infinity) continue;
    v.count = Math.max(v.count - 1, 0);
    changed = true;
  }
  return changed ? kitArmTable(left.filter((v) => v.count > 0), table.arrangements) : table;
}

/** The fixed parts of some arms, one entry per part (for `kitWithout`). */
export function partsOfArms(...arms: Array<{ parts: readonly number[] } | null | undefined>): number[] {
  return arms.flatMap((a) => (a ? [...a.parts] : []));
}

/**
 * The fixed resistors a design states itself, not chosen by the solver but taken from the kit too when it
 * holds their value: the output filter's series resistor.
 */
export function statedResistors(design: Design): number[] {
  return design.output.filter ? [design.output.filter.resistance] : [];
}

/**
 * The arm table the solver uses for a target: its kit's when it has one (less the parts `taken`, see
 * `kitWithout`), else the whole series in the window.
 */
export function targetArmTable(target: Target, arrangements: readonly Arrangement[] = target.arrangements, taken: readonly number[] = []): ArmTable {
  return target.kit ? kitWithout(kitArmTable(kitValues(target.kit, target.resistanceMin, target.resistanceMax), arrangements), taken) : armTable(target.series, target.resistanceMin, target.resistanceMax, arrangements);
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
