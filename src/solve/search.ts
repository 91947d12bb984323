/**
 * Search over resistor "arms": one part, or two parts in series or in parallel, from an E-series within a
 * resistance window. A ratio between two arms (a / b) is found by walking every arm `a` and looking up the
 * arm nearest the ideal `b(a)` by binary search: O(N log N) instead of the O(N²) of trying all pairs, and
 * exact for any error that grows monotonically as `b` moves away from `b(a)` (true for every ratio here).
 */
import { valuesInRange, type SeriesName } from '../model/eseries.js';
import type { Arrangement } from '../model/design.js';

export const ARM_SINGLE = 0;
export const ARM_SERIES = 1;
export const ARM_PARALLEL = 2;

export interface ArmTable {
  /** Arm resistance, ascending. */
  value: Float64Array;
  /** First and second part (second is 0 for a single part). */
  p1: Float64Array;
  p2: Float64Array;
  /** ARM_SINGLE, ARM_SERIES or ARM_PARALLEL. */
  kind: Uint8Array;
  size: number;
}

import type { Arm } from '../circuit/network.js';
export type { Arm } from '../circuit/network.js';

const tableCache = new Map<string, ArmTable>();

/**
 * All arms from `series` parts within [min, max], deduplicated (for an equal value the arm with fewer parts
 * is kept), sorted by value. Cached per argument set.
 */
export function armTable(series: SeriesName, min: number, max: number, arrangements: readonly Arrangement[]): ArmTable {
  const key = `${series}|${min}|${max}|${[...arrangements].sort().join(',')}`;
  const hit = tableCache.get(key);
  if (hit) return hit;
  const base = valuesInRange(series, min, max);
  const n = base.length;
  const useSingle = arrangements.includes('single');
  const useSeries = arrangements.includes('series');
  const usePar = arrangements.includes('parallel');
  const pairs = (n * (n + 1)) / 2;
  const cap = (useSingle ? n : 0) + (useSeries ? pairs : 0) + (usePar ? pairs : 0);
  const v = new Float64Array(cap);
  const a = new Float64Array(cap);
  const b = new Float64Array(cap);
  const k = new Uint8Array(cap);
  let m = 0;
  if (useSingle) for (let i = 0; i < n; i++) { v[m] = base[i]!; a[m] = base[i]!; b[m] = 0; k[m] = ARM_SINGLE; m++; }
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      const x = base[i]!, y = base[j]!;
      if (useSeries) { v[m] = x + y; a[m] = x; b[m] = y; k[m] = ARM_SERIES; m++; }
      if (usePar) { v[m] = (x * y) / (x + y); a[m] = x; b[m] = y; k[m] = ARM_PARALLEL; m++; }
    }
  }
  const idx = new Uint32Array(m);
  for (let i = 0; i < m; i++) idx[i] = i;
  // Sort by value, single parts first among equals so that deduplication keeps the simpler arm.
  idx.sort((i, j) => v[i]! - v[j]! || (k[i] === ARM_SINGLE ? 0 : 1) - (k[j] === ARM_SINGLE ? 0 : 1));
  const out: ArmTable = { value: new Float64Array(m), p1: new Float64Array(m), p2: new Float64Array(m), kind: new Uint8Array(m), size: 0 };
  let s = 0;
  let last = -1;
  for (let t = 0; t < m; t++) {
    const i = idx[t]!;
    const val = v[i]!;
    if (last > 0 && Math.abs(val - last) <= last * 1e-12) continue;
    out.value[s] = val; out.p1[s] = a[i]!; out.p2[s] = b[i]!; out.kind[s] = k[i]!;
    last = val; s++;
  }
  out.value = out.value.subarray(0, s); out.p1 = out.p1.subarray(0, s); out.p2 = out.p2.subarray(0, s); out.kind = out.kind.subarray(0, s);
  out.size = s;
  tableCache.set(key, out);
  return out;
}

/** The i-th arm of a table as an `Arm` (value and its one or two parts). */
export function armAt(t: ArmTable, i: number): Arm {
  const kind = t.kind[i]!;
  return {
    ohms: t.value[i]!,
    parts: kind === ARM_SINGLE ? [t.p1[i]!] : [t.p1[i]!, t.p2[i]!],
    arrangement: kind === ARM_SINGLE ? 'single' : kind === ARM_SERIES ? 'series' : 'parallel',
  };
}

const partCount = (t: ArmTable, i: number): number => (t.kind[i] === ARM_SINGLE ? 1 : 2);

/** Index of the first value ≥ x (binary search). */
export function lowerBound(values: Float64Array, x: number): number {
  let lo = 0, hi = values.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (values[mid]! < x) lo = mid + 1; else hi = mid;
  }
  return lo;
}

/** The closed form (a + cA)/(b + cB) = k, with signed error m·(ratio/k − 1). */
export interface RatioForm { cA: number; cB: number; k: number; m: number }

/**
 * A problem is given either as two functions or as a ratio form (which every problem in Gainwright is);
 * the search computes a ratio form inline, without a call per candidate (the hot loop of every solve).
 */
export interface PairProblem {
  /** The ideal second arm for a given first arm; NaN or ≤ 0 when none fits. */
  idealB?: (a: number) => number;
  /** Signed error of the realised quantity for arms a and b. */
  error?: (a: number, b: number) => number;
  /** Preferred value of the first arm, for ranking among near-equal errors. */
  preferredA: number;
  /** Errors below this count as equal (resolution that matters, e.g. tolerance / 20). */
  floor: number;
  /** Optional window on the first arm. */
  aMin?: number;
  aMax?: number;
  /** The problem as a ratio form; takes the place of idealB and error. */
  ratio?: RatioForm;
}

/** The problem's ideal-partner and error functions, from its ratio form when it has one. */
function problemFunctions(prob: PairProblem): { idealB: (a: number) => number; error: (a: number, b: number) => number } {
  const r = prob.ratio;
  if (r) return { idealB: (a) => (a + r.cA) / r.k - r.cB, error: (a, b) => r.m * ((a + r.cA) / (b + r.cB) / r.k - 1) };
  if (!prob.idealB || !prob.error) throw new Error('a pair problem needs a ratio form or both functions');
  return { idealB: prob.idealB, error: prob.error };
}

export interface PairCandidate {
  a: Arm;
  b: Arm;
  error: number;
  parts: number;
  score: number;
}

export interface PairResult {
  /** Ranked best first by score. */
  ranked: PairCandidate[];
  /** The smallest |error| anywhere, with its arms (the true optimum, whatever the ranking). */
  best: PairCandidate | null;
  /** How many (a, b) pairs were evaluated. */
  evaluated: number;
}

/**
 * Ranking score: error dominates until it falls under `floor`; below that, fewer parts and an arm near the
 * preferred value win. score = max(|err|, floor) · 1.5^(parts−2) · (1 + 0.5·|log10(a/aPref)|).
 */
export function score(err: number, parts: number, a: number, pref: number, floor: number): number {
  return Math.max(Math.abs(err), floor) * 1.5 ** (parts - 2) * (1 + 0.5 * Math.abs(Math.log10(a / pref)));
}

/**
 * Whether arm i of one table and arm j of another can be built together (a kit holds each value a limited
 * number of times; src/solve/kit.ts). Absent: any two arms can.
 */
export type PairFits = (tA: ArmTable, i: number, tB: ArmTable, j: number) => boolean;

/** Fast search: each first arm with the two arms around its ideal partner (the nearest that `fits`, on a kit). */
export function searchPairs(tA: ArmTable, tB: ArmTable, prob: PairProblem, keep = 10, fits?: PairFits): PairResult {
  const ranked: PairCandidate[] = [];
  let bestErr = Infinity, bestI = -1, bestJ = -1;
  let evaluated = 0;
  const aMin = prob.aMin ?? 0, aMax = prob.aMax ?? Infinity;
  let worstKept = Infinity;
  const fns = problemFunctions(prob);
  // Only the first arms inside the window: the table is sorted, so find its ends by binary search.
  const iStart = lowerBound(tA.value, aMin);
  const bv = tB.value, bn = tB.size;
  let j0 = -1;
  for (let i = iStart; i < tA.size; i++) {
    const a = tA.value[i]!;
    if (a > aMax) break;
    const rf = prob.ratio;
    const bi = rf ? (a + rf.cA) / rf.k - rf.cB : fns.idealB(a);
    if (!(bi > 0) || !Number.isFinite(bi)) continue;
    // The ideal partner moves with a, so walk from the last position (binary search on the first use):
    // amortised O(1) per arm when b(a) is monotone, and still exact when it is not.
    if (j0 < 0) j0 = lowerBound(bv, bi);
    else {
      while (j0 < bn && bv[j0]! < bi) j0++;
      while (j0 > 0 && bv[j0 - 1]! >= bi) j0--;
    }
    // On a kit, the partners next to the ideal one may take a value the first arm already uses up: the
    // nearest partner that fits on each side is then the best on that side (the error grows with distance).
    let jLow = j0 - 1, jHigh = j0;
    if (fits) {
      while (jLow >= 0 && !fits(tA, i, tB, jLow)) jLow--;
      while (jHigh < bn && !fits(tA, i, tB, jHigh)) jHigh++;
    }
    for (let side = 0; side < 2; side++) {
      const j = side === 0 ? jLow : jHigh;
      if (j < 0 || j >= tB.size) continue;
      evaluated++;
      const e = rf ? rf.m * ((a + rf.cA) / (bv[j]! + rf.cB) / rf.k - 1) : fns.error(a, bv[j]!);
      if (!Number.isFinite(e)) continue;
      const ae = Math.abs(e);
      if (ae < bestErr) { bestErr = ae; bestI = i; bestJ = j; }
      // Every factor of the score is ≥ 1 beyond max(|e|, floor): skip what cannot enter the list.
      if (ranked.length >= keep && Math.max(ae, prob.floor) >= worstKept) continue;
      const parts = partCount(tA, i) + partCount(tB, j);
      const sc = score(e, parts, a, prob.preferredA, prob.floor);
      if (ranked.length < keep || sc < worstKept) {
        insertRanked(ranked, { a: armAt(tA, i), b: armAt(tB, j), error: e, parts, score: sc }, keep);
        worstKept = ranked.length < keep ? Infinity : ranked[ranked.length - 1]!.score;
      }
    }
  }
  const best = bestI >= 0
    ? { a: armAt(tA, bestI), b: armAt(tB, bestJ), error: fns.error(tA.value[bestI]!, tB.value[bestJ]!), parts: partCount(tA, bestI) + partCount(tB, bestJ), score: NaN }
    : null;
  return { ranked, best, evaluated };
}

/** Exhaustive search over all pairs: the reference the fast search is tested (and benchmarked) against. */
export function searchPairsExhaustive(tA: ArmTable, tB: ArmTable, prob: PairProblem): { bestError: number; evaluated: number } {
  let best = Infinity;
  let evaluated = 0;
  const aMin = prob.aMin ?? 0, aMax = prob.aMax ?? Infinity;
  const fns = problemFunctions(prob);
  for (let i = 0; i < tA.size; i++) {
    const a = tA.value[i]!;
    if (a < aMin || a > aMax) continue;
    const bi = fns.idealB(a);
    if (!(bi > 0) || !Number.isFinite(bi)) continue;
    for (let j = 0; j < tB.size; j++) {
      evaluated++;
      const e = Math.abs(fns.error(a, tB.value[j]!));
      if (e < best) best = e;
    }
  }
  return { bestError: best, evaluated };
}

function insertRanked(list: PairCandidate[], c: PairCandidate, keep: number): void {
  // Skip a candidate with the same pair of arms already listed.
  if (list.some((x) => x.a.ohms === c.a.ohms && x.b.ohms === c.b.ohms)) return;
  let pos = list.length;
  while (pos > 0 && list[pos - 1]!.score > c.score) pos--;
  list.splice(pos, 0, c);
  if (list.length > keep) list.pop();
}
