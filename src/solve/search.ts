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
  // Sort by value, single parts first among equals so that deduplication keeps the simpler arm: the single
  // parts were written first, so a stable sort by value alone keeps them first among equals.
  sortByValue(v, idx, m);
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

/**
 * Sorts idx[0..m) by v[idx] ascending, stably: a least-significant-digit radix sort on the values' IEEE 754
 * bits, 16 bits a pass (for positive doubles the bit patterns order as the numbers do; Knuth, The Art of
 * Computer Programming, vol. 3, §5.2.5, radix sorting; from memory). Linear in m: an E96 window of 63 000 arms
 * sorts in a few milliseconds where a comparison sort took most of a hundred. Every value must be positive.
 */
function sortByValue(v: Float64Array, idx: Uint32Array, m: number): void {
  const bits = new Uint32Array(v.buffer, v.byteOffset, v.length * 2);
  let src: Uint32Array<ArrayBufferLike> = idx.subarray(0, m), dst: Uint32Array<ArrayBufferLike> = new Uint32Array(m);
  const count = new Uint32Array(65536);
  for (let pass = 0; pass < 4; pass++) {
    const word = pass >> 1, shift = (pass & 1) * 16;
    // The two 32-bit halves of a double: which is low depends on the platform's byte order.
    const at = (i: number) => (bits[2 * i + (LITTLE_ENDIAN ? word : 1 - word)]! >>> shift) & 0xffff;
    count.fill(0);
    for (let t = 0; t < m; t++) count[at(src[t]!)]!++;
    let sum = 0;
    for (let d = 0; d < 65536; d++) { const c = count[d]!; count[d] = sum; sum += c; }
    for (let t = 0; t < m; t++) { const i = src[t]!; dst[count[at(i)]!++] = i; }
    [src, dst] = [dst, src];
  }
  // An even number of passes: the sorted order ends in the array that came in.
}

const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

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
  /** The smallest |error| anywhere, with its arms (the true optimum, whatever the ranking); found when first read. */
  readonly best: PairCandidate | null;
  /** How many (a, b) pairs were evaluated so far (the scan for `best` included once it has run). */
  readonly evaluated: number;
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

/** 1.5^(parts − 2) for two to four parts: the part-count factor of `score`, exact in binary. */
const PARTS_FACTOR = [1, 1, 1, 1.5, 2.25];
/** First arms visited outward before the rest may be left to the ascending scan. */
const OUTWARD_VISITS = 256;
/** About how many arms the ascending scan covers in the time of one outward visit. */
const SCAN_PER_VISIT = 6;
/** Relative margin on the stopping bound, far above the rounding of the logarithm (about 1e-16). */
const BOUND_MARGIN = 1e-12;

/** log10 of every arm of a table (cached per table): the preference factor's bound without a logarithm per arm. */
const logCache = new WeakMap<ArmTable, Float64Array>();
function log10Values(t: ArmTable): Float64Array {
  let hit = logCache.get(t);
  if (!hit) {
    hit = new Float64Array(t.size);
    for (let i = 0; i < t.size; i++) hit[i] = Math.log10(t.value[i]!);
    logCache.set(t, hit);
  }
  return hit;
}

/**
 * Index of the first value ≥ x, searched from index `from` outward (galloping, then binary search): the same
 * answer as `lowerBound`, in O(log d) for an answer d places away.
 */
function seek(v: Float64Array, n: number, from: number, x: number): number {
  let lo: number, hi: number;
  if (from < 0) return lowerBound(v, x);
  if (from < n && v[from]! < x) {
    // Every index up to `lo` − 1 holds less than x; gallop up until one holds at least x (or the end).
    lo = from + 1; hi = lo;
    for (let step = 1; hi < n && v[hi]! < x; step *= 2) { lo = hi + 1; hi = lo + step; }
    if (hi > n) hi = n;
  } else {
    // Index `hi` holds at least x (or is the end); gallop down until one holds less.
    hi = Math.min(from, n); lo = hi - 1;
    for (let step = 1; lo >= 0 && v[lo]! >= x; step *= 2) { hi = lo; lo = hi - step; }
    lo = Math.max(lo + 1, 0);
  }
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (v[mid]! < x) lo = mid + 1; else hi = mid;
  }
  return lo;
}

/** Table indices of the single-part arms, ascending (cached per table). */
const singlesCache = new WeakMap<ArmTable, Int32Array>();
function singleIndices(t: ArmTable): Int32Array {
  let hit = singlesCache.get(t);
  if (!hit) {
    const out: number[] = [];
    for (let i = 0; i < t.size; i++) if (t.kind[i] === ARM_SINGLE) out.push(i);
    hit = Int32Array.from(out);
    singlesCache.set(t, hit);
  }
  return hit;
}

/**
 * Fast search: each first arm with the two arms around its ideal partner.
 *
 * The ranked list is the first `keep` candidates by (score, first arm, second arm): exactly what offering
 * every candidate of the window in ascending order would keep. Since score = max(|e|, floor) · 1.5^(parts−2)
 * · (1 + 0.5·|log10(a/aPref)|), and the first two factors are at least floor and 1.5^(parts of a + fewest parts
 * of a second arm − 2), a first arm for which that least score exceeds the worst score kept cannot enter, nor
 * can any arm farther from the preferred value on its side. So the first arms are visited outward
 * from the preferred value, nearest first, and each side stops at that bound: first for two-part first arms,
 * then (continuing over the single parts only) for single ones. With floor 0 that bound rules nothing out, so
 * the ranking is done instead in the ascending scan below.
 *
 * `best`, the least |error| anywhere in the window (the true optimum, whatever the ranking), needs every first
 * arm: it is found by a scan of the whole window, the first time it is read (or at once, with floor 0).
 *
 * On a kit (`fits`, src/solve/kit.ts), the partners beside the ideal one may take a value the first arm already
 * uses up: the nearest partner that fits on each side is then taken instead, the best on that side since the
 * error grows with the distance from the ideal partner; every bound above only grows with it, so the search
 * stays exact.
 */
export function searchPairs(tA: ArmTable, tB: ArmTable, prob: PairProblem, keep = 10, fits?: PairFits): PairResult {
  let evaluated = 0;
  const aMin = prob.aMin ?? 0, aMax = prob.aMax ?? Infinity;
  const floor = prob.floor, pref = prob.preferredA;
  const fns = problemFunctions(prob);
  const rf = prob.ratio;
  const cA = rf ? rf.cA : 0, cB = rf ? rf.cB : 0, rk = rf ? rf.k : 1, rm = rf ? rf.m : 1;
  const av = tA.value, ak = tA.kind;
  const bv = tB.value, bn = tB.size, bk = tB.kind;
  // The nearest partner at or below / at or above index j that a kit can build with first arm i.
  // Below the ideal partner the walk meets arms of one value with the most parts first (the table lists fewer
  // parts first among equal values, src/solve/kit.ts): the one with the fewest parts that fits is taken.
  const fitBelow = (i: number, j: number): number => {
    while (j >= 0 && !fits!(tA, i, tB, j)) j--;
    for (let k = j - 1; k >= 0 && bv[k] === bv[j]; k--) if (fits!(tA, i, tB, k)) j = k;
    return j;
  };
  const fitAbove = (i: number, j: number): number => { while (j < bn && !fits!(tA, i, tB, j)) j++; return j; };
  // Only the first arms inside the window: the table is sorted, so find its ends by binary search.
  const iStart = lowerBound(av, aMin);
  const iEnd = Math.max(iStart, upperBound(av, aMax));

  // The kept candidates, best first by (score, i, j), in fixed typed arrays (no allocation per offer).
  const cap = Number.isFinite(keep) ? Math.max(Math.ceil(keep), 0) : 2 * tA.size;
  const kI = new Int32Array(cap), kJ = new Int32Array(cap), kP = new Int32Array(cap);
  const kE = new Float64Array(cap), kS = new Float64Array(cap);
  let kept = 0;
  let worstKept = cap > 0 ? Infinity : -Infinity;
  const offer = (i: number, j: number, e: number, parts: number, sc: number): void => {
    if (kept >= cap) {
      const w = cap - 1;
      if (!(sc < kS[w]! || (sc === kS[w]! && (i < kI[w]! || (i === kI[w]! && j < kJ[w]!))))) return;
      kept--;
    }
    let pos = kept;
    while (pos > 0 && (kS[pos - 1]! > sc || (kS[pos - 1]! === sc && (kI[pos - 1]! > i || (kI[pos - 1]! === i && kJ[pos - 1]! > j))))) {
      kI[pos] = kI[pos - 1]!; kJ[pos] = kJ[pos - 1]!; kP[pos] = kP[pos - 1]!; kE[pos] = kE[pos - 1]!; kS[pos] = kS[pos - 1]!;
      pos--;
    }
    kI[pos] = i; kJ[pos] = j; kP[pos] = parts; kE[pos] = e; kS[pos] = sc;
    kept++;
    worstKept = kept >= cap ? kS[cap - 1]! : Infinity;
  };
  /**
   * Offers first arm i with the two arms around its ideal partner, found from `hint` (the last partner on this
   * side); returns the partner's index. `aEst` is the preference factor from the cached logarithms, within
   * about 1e-15 of the exact one: a candidate it rules out with the margin is out; one that may enter gets
   * the exact factor, the same product in the same order as `score`.
   */
  const visit = (i: number, aEst: number, hint: number): number => {
    const a = av[i]!;
    const bi = rf ? (a + cA) / rk - cB : fns.idealB(a);
    if (!(bi > 0) || !Number.isFinite(bi)) return hint;
    const j0 = seek(bv, bn, hint, bi);
    let aF = -1;
    const pairA = ak[i] !== ARM_SINGLE;
    const jLow = fits ? fitBelow(i, j0 - 1) : j0 - 1, jHigh = fits ? fitAbove(i, j0) : j0;
    for (let side = 0; side < 2; side++) {
      const j = side === 0 ? jLow : jHigh;
      if (j < 0 || j >= bn) continue;
      if (pairSingleDone && pairA && bk[j] === ARM_SINGLE) continue;
      evaluated++;
      const e = rf ? rm * ((a + cA) / (bv[j]! + cB) / rk - 1) : fns.error(a, bv[j]!);
      if (!Number.isFinite(e)) continue;
      const parts = (ak[i] === ARM_SINGLE ? 1 : 2) + (bk[j] === ARM_SINGLE ? 1 : 2);
      const lead = Math.max(Math.abs(e), floor) * PARTS_FACTOR[parts]!;
      if (lead * aEst > worstKept * (1 + BOUND_MARGIN)) continue;
      if (aF < 0) aF = 1 + 0.5 * Math.abs(Math.log10(a / pref));
      offer(i, j, e, parts, lead * aF);
    }
    return j0;
  };

  // Set once every candidate of a two-part first arm with a single-part second arm has been offered (below).
  let pairSingleDone = false;
  const logs = log10Values(tA), logPref = Math.log10(pref);
  // The least error anywhere (null: none; undefined: not yet scanned).
  let best: PairCandidate | null | undefined;
  if (keep > 0 && iEnd > iStart && floor > 0) {
    const singles = singleIndices(tA);
    // The fewest parts a candidate can have with a single-part or a two-part first arm: the second arm adds one
    // part, or two when its table has no single parts (e.g. a window of series and parallel pairs only).
    const bLeast = singleIndices(tB).length > 0 ? 1 : 2;
    const singleFactor = PARTS_FACTOR[1 + bLeast]!;
    let pairFactor = PARTS_FACTOR[2 + bLeast]!;
    // A ratio form with k > 0 and cA, cB ≥ 0 has its ideal partner rising with a. Once that partner lies beyond
    // the last arm of the table (going up) or below the first (going down), no arm farther out on that side can
    // do better than the end of the table does for this one: |e| ≥ |m|·|(a + cA)/(b_end + cB)/k − 1|. A lower
    // bound on the error of every candidate from here outward (0 when none is known), a hair under it for rounding.
    const monotone = rf !== undefined && rk > 0 && cA >= 0 && cB >= 0 && bn > 0;
    const bLo = bn > 0 ? bv[0]! + cB : 0, bHi = bn > 0 ? bv[bn - 1]! + cB : 0;
    const beyond = (a: number, goingUp: boolean): number => {
      if (!monotone) return 0;
      const q = (a + cA) / rk;
      const gap = goingUp ? (q > bHi ? (a + cA) / bHi / rk - 1 : 0) : (q < bLo ? 1 - (a + cA) / bLo / rk : 0);
      return gap > 0 ? Math.max(0, Math.abs(rm) * (gap - 1e-12) * (1 - 1e-9)) : 0;
    };
    const singlesB = singleIndices(tB);
    /**
     * Offers every candidate of a two-part first arm outside [vLo, vHi) (those inside were visited) with a
     * single-part second arm: for each single part s of the second table, the first arms whose ideal partner has
     * s beside it (s = j0 − 1 or j0, so the partner lies in (b[s−1], b[s+1]]) form a run, a = k·(b + cB) − cA,
     * widened a hair and checked exactly. The two-part first arms visited after it have only two-part partners
     * left: four parts, so their bound takes 1.5². Not done (false) when the runs hold more than `most` arms.
     */
    const offerPairSingles = (vLo: number, vHi: number, most: number): boolean => {
      // On a kit the partners beside the ideal one may not fit: this shortcut takes them as they are, so it is not used.
      if (fits || !monotone || singlesB.length === 0 || singles.length === tA.size) return false;
      const biOf = (a: number) => (a + cA) / rk - cB;
      const bFirst = biOf(av[iStart]!), bLast = biOf(av[iEnd - 1]!);
      let p0 = 0, p1 = singlesB.length;
      { let lo = 0, hi = singlesB.length; while (lo < hi) { const mid = (lo + hi) >>> 1; if (bv[singlesB[mid]!]! < bFirst) lo = mid + 1; else hi = mid; } p0 = Math.max(lo - 1, 0); }
      { let lo = 0, hi = singlesB.length; while (lo < hi) { const mid = (lo + hi) >>> 1; if (bv[singlesB[mid]!]! <= bLast) lo = mid + 1; else hi = mid; } p1 = Math.min(lo + 1, singlesB.length); }
      const runFrom = new Int32Array(Math.max(p1 - p0, 0)), runTo = new Int32Array(Math.max(p1 - p0, 0));
      let total = 0;
      for (let p = p0; p < p1; p++) {
        const sj = singlesB[p]!;
        const aLo = sj > 0 ? rk * (bv[sj - 1]! + cB) - cA : -Infinity;
        const aHi = sj + 1 < bn ? rk * (bv[sj + 1]! + cB) - cA : Infinity;
        const from = Math.max(iStart, lowerBound(av, aLo - Math.abs(aLo) * 1e-9 - 1e-9));
        const to = Math.min(iEnd, upperBound(av, aHi + Math.abs(aHi) * 1e-9 + 1e-9));
        runFrom[p - p0] = from; runTo[p - p0] = to;
        total += Math.max(to - from, 0);
        if (total > most) return false;
      }
      let hint = -1;
      for (let p = p0; p < p1; p++) {
        const sj = singlesB[p]!;
        for (let i = runFrom[p - p0]!; i < runTo[p - p0]!; i++) {
          if (ak[i] === ARM_SINGLE || (i >= vLo && i < vHi)) continue;
          const a = av[i]!;
          const bi = biOf(a);
          if (!(bi > 0) || !Number.isFinite(bi)) continue;
          const j0 = hint = seek(bv, bn, hint, bi);
          if (sj !== j0 - 1 && sj !== j0) continue;
          evaluated++;
          const e = rm * ((a + cA) / (bv[sj]! + cB) / rk - 1);
          if (!Number.isFinite(e)) continue;
          const lead = Math.max(Math.abs(e), floor) * PARTS_FACTOR[3]!;
          if (lead * (1 + 0.5 * Math.abs(logs[i]! - logPref)) > worstKept * (1 + BOUND_MARGIN)) continue;
          offer(i, sj, e, 3, lead * (1 + 0.5 * Math.abs(Math.log10(a / pref))));
        }
      }
      pairSingleDone = true;
      pairFactor = PARTS_FACTOR[4]!;
      return true;
    };
    // Each side: the next index, whether only single parts are left to visit (then `s` steps through
    // `singles`), and whether it is done.
    const iP = Math.min(Math.max(lowerBound(av, pref), iStart), iEnd);
    let dn = iP - 1, up = iP;
    let dnSingles = false, upSingles = false;
    let dnS = -1, upS = -1;
    // Each side's last partner index, where the next partner search starts.
    let jUp = -1, jDn = -1;
    let split = false;
    for (let visits = 0; dn >= iStart || up < iEnd; visits++) {
      // Where the bound does not prune (say a tiny floor, with low-error four-part pairs all around the
      // preferred value), the candidates with a single part on one side only are offered at once, so that the
      // two-part first arms left need a four-part bound; where even that does not prune, the arms left are
      // offered by the ascending scan, several times cheaper per arm. Each is tried once the arms visited
      // reach a sixth of those left (so the visit costs at most about twice what the better of the two would).
      // The list kept is the same either way.
      if (visits >= OUTWARD_VISITS && visits * SCAN_PER_VISIT >= dn + 1 - iStart + iEnd - up) {
        if (!split && offerPairSingles(dn + 1, up, (dn + 1 - iStart + iEnd - up) >> 2)) { split = true; visits = 0; }
        else {
          scan(iStart, dn + 1, true);
          scan(up, iEnd, true);
          break;
        }
      }
      const goUp = up < iEnd && (dn < iStart || av[up]! / pref <= pref / av[dn]!);
      const i = goUp ? up : dn;
      const aEst = 1 + 0.5 * Math.abs(logs[i]! - logPref);
      const limit = worstKept * (1 + BOUND_MARGIN);
      const lower = Math.max(beyond(av[i]!, goUp), floor);
      const stop = lower * singleFactor * aEst > limit;
      const pairsOut = lower * pairFactor * aEst > limit;
      if (!stop && (!pairsOut || ak[i] === ARM_SINGLE)) {
        if (goUp) jUp = visit(i, aEst, jUp < 0 ? jDn : jUp); else jDn = visit(i, aEst, jDn < 0 ? jUp : jDn);
      }
      // Step outward: over every arm, or over the single parts alone once two-part arms are ruled out.
      if (goUp) {
        if (pairsOut && !upSingles) { upSingles = true; upS = lowerBound32(singles, i + 1); } else if (upSingles) upS++;
        up = stop ? iEnd : upSingles ? (upS < singles.length && singles[upS]! < iEnd ? singles[upS]! : iEnd) : up + 1;
      } else {
        if (pairsOut && !dnSingles) { dnSingles = true; dnS = lowerBound32(singles, i) - 1; } else if (dnSingles) dnS--;
        dn = stop ? iStart - 1 : dnSingles ? (dnS >= 0 && singles[dnS]! >= iStart ? singles[dnS]! : iStart - 1) : dn - 1;
      }
    }
  }
  /**
   * The least error over first arms [from, to) in ascending order, the first least kept. With `rank` the same
   * pass also offers each candidate to the ranked list (the logarithm taken only for one that may enter): the
   * whole ranking with a floor of 0, where the score bound rules nothing out, or the arms the outward visit left.
   */
  function scan(from: number, to: number, rank: boolean): PairCandidate | null {
    // Locals, not the enclosing function's (captured) variables: the hot loop reads them from registers.
    const av = tA.value, ak = tA.kind, bv = tB.value, bn = tB.size, bk = tB.kind;
    const r = prob.ratio, cA = r ? r.cA : 0, cB = r ? r.cB : 0, rk = r ? r.k : 1, rm = r ? r.m : 1;
    const i0 = from, i1 = to, fl = floor, lg = logs, lp = logPref, ap = pref;
    // The worst score kept (Infinity until the list is full), refreshed after each offer.
    let wk = worstKept;
    let bestErr = Infinity, bestI = -1, bestJ = -1;
    let j0 = -1, count = 0;
    for (let i = i0; i < i1; i++) {
      const a = av[i]!;
      const bi = r ? (a + cA) / rk - cB : fns.idealB(a);
      if (!(bi > 0) || !Number.isFinite(bi)) continue;
      // The ideal partner moves with a, so walk from the last position (binary search on the first use):
      // amortised O(1) per arm when b(a) is monotone, and still exact when it is not.
      if (j0 < 0) j0 = lowerBound(bv, bi);
      else {
        while (j0 < bn && bv[j0]! < bi) j0++;
        while (j0 > 0 && bv[j0 - 1]! >= bi) j0--;
      }
      const jLow = fits ? fitBelow(i, j0 - 1) : j0 - 1, jHigh = fits ? fitAbove(i, j0) : j0;
      for (let side = 0; side < 2; side++) {
        const j = side === 0 ? jLow : jHigh;
        if (j < 0 || j >= bn) continue;
        count++;
        const e = r ? rm * ((a + cA) / (bv[j]! + cB) / rk - 1) : fns.error(a, bv[j]!);
        if (!Number.isFinite(e)) continue;
        const ae = Math.abs(e);
        if (ae < bestErr) { bestErr = ae; bestI = i; bestJ = j; }
        // The score is at least max(|e|, floor) (every other factor is ≥ 1, and rounding is monotone).
        if (!rank || Math.max(ae, fl) > wk || (pairSingleDone && ak[i] !== ARM_SINGLE && bk[j] === ARM_SINGLE)) continue;
        const parts = (ak[i] === ARM_SINGLE ? 1 : 2) + (bk[j] === ARM_SINGLE ? 1 : 2);
        const lead = Math.max(ae, fl) * PARTS_FACTOR[parts]!;
        if (lead * (1 + 0.5 * Math.abs(lg[i]! - lp)) > wk * (1 + BOUND_MARGIN)) continue;
        offer(i, j, e, parts, lead * (1 + 0.5 * Math.abs(Math.log10(a / ap))));
        wk = worstKept;
      }
    }
    evaluated += count;
    return bestI >= 0
      ? { a: armAt(tA, bestI), b: armAt(tB, bestJ), error: fns.error(av[bestI]!, bv[bestJ]!), parts: partCount(tA, bestI) + partCount(tB, bestJ), score: NaN }
      : null;
  }
  if (keep > 0 && !(floor > 0)) best = scan(iStart, iEnd, true);
  const ranked: PairCandidate[] = [];
  for (let n = 0; n < kept; n++) ranked.push({ a: armAt(tA, kI[n]!), b: armAt(tB, kJ[n]!), error: kE[n]!, parts: kP[n]!, score: kS[n]! });
  return {
    ranked,
    get best() { if (best === undefined) best = scan(iStart, iEnd, false); return best; },
    get evaluated() { return evaluated; },
  };
}

/** Index of the first value > x (binary search). */
function upperBound(values: Float64Array, x: number): number {
  let lo = 0, hi = values.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (values[mid]! <= x) lo = mid + 1; else hi = mid;
  }
  return lo;
}

/** Index of the first value ≥ x in an ascending integer array (binary search). */
function lowerBound32(values: Int32Array, x: number): number {
  let lo = 0, hi = values.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (values[mid]! < x) lo = mid + 1; else hi = mid;
  }
  return lo;
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
