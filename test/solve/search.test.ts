import { describe, expect, it } from 'vitest';
import { armTable, score, searchPairs, searchPairsExhaustive, type ArmTable, type PairProblem } from '../../src/solve/search.js';
import { isMember } from '../../src/model/eseries.js';
import { mulberry32 } from '../../src/model/random.js';

describe('armTable', () => {
  it('holds singles, series and parallel pairs from the window, deduplicated and sorted', () => {
    const t = armTable('E12', 1e3, 1e4, ['single', 'series', 'parallel']);
    // 13 singles; 91 series and 91 parallel pairs before deduplication.
    expect(t.size).toBeGreaterThan(13);
    expect(t.size).toBeLessThanOrEqual(13 + 91 + 91);
    for (let i = 1; i < t.size; i++) expect(t.value[i]!).toBeGreaterThan(t.value[i - 1]!);
    for (let i = 0; i < t.size; i++) {
      expect(isMember(t.p1[i]!, 'E12')).toBe(true);
      if (t.kind[i]) expect(isMember(t.p2[i]!, 'E12')).toBe(true);
    }
  });
  it('equals a table built by brute force: every arm of E24 parts in 100 Ω–1 MΩ, sorted by value with a single part first among equal values, duplicates within 1e-12 dropped', () => {
    const t = armTable('E24', 100, 1e6, ['single', 'series', 'parallel']);
    const base = [...armTable('E24', 100, 1e6, ['single']).value];
    // Every arm, built the plain way: (value, parts, first part, second part, kind), sorted by value then parts.
    const all: Array<[number, number, number, number, number]> = base.map((x) => [x, 1, x, 0, 0]);
    for (let i = 0; i < base.length; i++) for (let j = i; j < base.length; j++) {
      const x = base[i]!, y = base[j]!;
      all.push([x + y, 2, x, y, 1], [(x * y) / (x + y), 2, x, y, 2]);
    }
    all.sort((p, q) => p[0] - q[0] || p[1] - q[1]);
    // Dropping compares with the last kept value, as the table does.
    const want: typeof all = [];
    for (const r of all) if (!want.length || Math.abs(r[0] - want[want.length - 1]![0]) > want[want.length - 1]![0] * 1e-12) want.push(r);
    expect(t.size).toBe(want.length);
    want.forEach((r, k) => { expect(t.value[k]).toBe(r[0]); expect(t.kind[k] === 0 ? 1 : 2).toBe(r[1]); });
  });
  it('with only single parts it is the series itself', () => {
    expect([...armTable('E6', 1e3, 1e4, ['single']).value]).toEqual([1000, 1500, 2200, 3300, 4700, 6800, 10000]);
  });
});

describe('searchPairs finds the true optimum', () => {
  const ratioProblem = (k: number, offset = 0): PairProblem => ({
    idealB: (a) => a / k - offset,
    error: (a, b) => a / (b + offset) / k - 1,
    preferredA: 1e4, floor: 0,
  });
  // Required by the foundation issue: fast search vs exhaustive over E12/E24 two-part arms, many random targets.
  it.each(['E12', 'E24'] as const)('same best error as an exhaustive search on %s two-part arms over 60 random targets', (series) => {
    const t = armTable(series, 1e3, 1e5, ['single', 'series', 'parallel']);
    const rand = mulberry32(42);
    for (let n = 0; n < 60; n++) {
      const k = 10 ** (rand() * 3 - 1); // 0.1 … 100
      const offset = rand() < 0.5 ? 0 : rand() * 2000;
      const p = ratioProblem(k, offset);
      const fast = searchPairs(t, t, p);
      const slow = searchPairsExhaustive(t, t, p);
      expect(Math.abs(fast.best!.error)).toBe(slow.bestError);
      expect(fast.evaluated).toBeLessThan(slow.evaluated / 20);
    }
  });
  it('an exact ratio is found with zero error: 10 k / 1 k = 10', () => {
    const t = armTable('E12', 1e3, 1e5, ['single']);
    const r = searchPairs(t, t, ratioProblem(10));
    expect(Math.abs(r.best!.error)).toBe(0);
  });
  it('ranks by score and keeps distinct alternatives', () => {
    const t = armTable('E24', 1e3, 1e6, ['single', 'series', 'parallel']);
    const r = searchPairs(t, t, { ...ratioProblem(7.3), floor: 5e-4 }, 8);
    expect(r.ranked.length).toBe(8);
    for (let i = 1; i < r.ranked.length; i++) expect(r.ranked[i]!.score).toBeGreaterThanOrEqual(r.ranked[i - 1]!.score);
    const keys = new Set(r.ranked.map((c) => `${c.a.ohms}/${c.b.ohms}`));
    expect(keys.size).toBe(8);
  });
  it('returns nothing when no partner fits', () => {
    const t = armTable('E12', 1e3, 1e4, ['single']);
    const r = searchPairs(t, t, { idealB: () => -1, error: () => 0, preferredA: 1e3, floor: 0 });
    expect(r.best).toBeNull();
    expect(r.ranked).toEqual([]);
  });
});

describe('the closed-form fast path', () => {
  it('gives the same ranking and optimum as the general functions it stands for', () => {
    const t = armTable('E96', 1e3, 1e6, ['single', 'series', 'parallel']);
    const rand = mulberry32(7);
    for (let n = 0; n < 20; n++) {
      const g = 1 + 10 ** (rand() * 2), half = rand() * 5000, rth = rand() * 3000;
      const general: PairProblem = { idealB: (a) => (a + half) / (g - 1) - rth, error: (a, b) => (1 + (a + half) / (b + rth)) / g - 1, preferredA: 1e5, floor: 5e-4, aMin: 4e4, aMax: 2.5e5 };
      const fast = { ...general, ratio: { cA: half, cB: rth, k: g - 1, m: (g - 1) / g } };
      const a = searchPairs(t, t, general), b = searchPairs(t, t, fast);
      expect(b.best!.error).toBeCloseTo(a.best!.error, 12);
      expect(b.ranked.map((c) => [c.a.ohms, c.b.ohms])).toEqual(a.ranked.map((c) => [c.a.ohms, c.b.ohms]));
    }
  });
});

/**
 * The ranking written out plainly, as the reference the fast search must equal: every first arm of the window
 * in ascending order with the two arms around its ideal partner (the unimodal error makes those the best for
 * that arm), each scored with `score`, stably sorted, the first `keep` kept.
 */
function rankedByBruteForce(t: ArmTable, prob: PairProblem, keep: number): Array<[number, number, number, number]> {
  // The ratio form (a + cA)/(b + cB) = k with signed error m·(ratio/k − 1), written out here.
  const r = prob.ratio;
  const idealB = r ? (a: number) => (a + r.cA) / r.k - r.cB : prob.idealB!;
  const error = r ? (a: number, b: number) => r.m * ((a + r.cA) / (b + r.cB) / r.k - 1) : prob.error!;
  const all: Array<[number, number, number, number]> = [];
  for (let i = 0; i < t.size; i++) {
    const a = t.value[i]!;
    if (a < (prob.aMin ?? 0) || a > (prob.aMax ?? Infinity)) continue;
    const bi = idealB(a);
    if (!(bi > 0) || !Number.isFinite(bi)) continue;
    let lo = 0, hi = t.size;
    while (lo < hi) { const mid = (lo + hi) >> 1; if (t.value[mid]! < bi) lo = mid + 1; else hi = mid; }
    for (const j of [lo - 1, lo]) {
      if (j < 0 || j >= t.size) continue;
      const e = error(a, t.value[j]!);
      if (!Number.isFinite(e)) continue;
      const parts = (t.kind[i] ? 2 : 1) + (t.kind[j] ? 2 : 1);
      all.push([a, t.value[j]!, e, score(e, parts, a, prob.preferredA, prob.floor)]);
    }
  }
  return all.sort((x, y) => x[3] - y[3]).slice(0, keep);
}

describe('the ranked list', () => {
  it('equals a brute-force ranking of every first arm, over random ratio problems, windows, floors and list lengths', () => {
    const rand = mulberry32(11);
    const tables = [armTable('E12', 1e3, 1e6, ['single', 'series', 'parallel']), armTable('E24', 100, 1e5, ['single', 'series']), armTable('E24', 1e3, 1e5, ['single'])];
    for (let n = 0; n < 120; n++) {
      const t = tables[n % tables.length]!;
      // Ratios that the table can and cannot reach (k from 1e-4 to 1e4), offsets like a trimmer's mid value and a
      // Thevenin, either sign of the error lever, and windows around or beside the preferred value.
      const k = 10 ** (rand() * 8 - 4);
      const ratio = { cA: rand() < 0.5 ? 0 : rand() * 5e3, cB: rand() < 0.5 ? 0 : rand() * 2e3, k, m: (rand() < 0.2 ? -1 : 1) * (0.1 + rand()) };
      const pref = 10 ** (3 + rand() * 3);
      const aMin = rand() < 0.5 ? undefined : 10 ** (2 + rand() * 3);
      const aMax = rand() < 0.5 ? undefined : (aMin ?? 1e3) * 10 ** (rand() * 3);
      const floor = [0, 5e-4, 1e-3, 1e-2][n % 4]!;
      const keep = [1, 2, 3, 10][(n >> 2) % 4]!;
      const prob: PairProblem = { preferredA: pref, floor, aMin, aMax, ratio };
      const got = searchPairs(t, t, prob, keep).ranked.map((c) => [c.a.ohms, c.b.ohms, c.error, c.score]);
      expect(got, JSON.stringify(prob)).toEqual(rankedByBruteForce(t, prob, keep));
    }
  });
  it('equals the brute-force ranking for divider-like problems on E96 two-part arms: a tiny floor in volts, one kept, a window of 2× about the preferred arm', () => {
    // Low-error four-part pairs everywhere near the preferred arm, so the score bound prunes little by itself.
    const t = armTable('E96', 1e3, 1e6, ['single', 'series', 'parallel']);
    const rand = mulberry32(13);
    for (let n = 0; n < 12; n++) {
      const r = 0.05 + 0.9 * rand(), pref = 10 ** (3.5 + 2 * rand());
      const prob: PairProblem = { preferredA: pref, floor: [1e-6, 1e-5, 1e-4][n % 3]!, aMin: pref / 2, aMax: pref * 2, ratio: { cA: 0, cB: 0, k: (1 - r) / r, m: -10 * r * (1 - r) } };
      const keep = [1, 3][n % 2]!;
      const got = searchPairs(t, t, prob, keep).ranked.map((c) => [c.a.ohms, c.b.ohms, c.error, c.score]);
      expect(got, JSON.stringify(prob)).toEqual(rankedByBruteForce(t, prob, keep));
    }
  });
  it('equals the brute-force ranking for a problem given as functions (no ratio form)', () => {
    const t = armTable('E24', 1e3, 1e5, ['single', 'series', 'parallel']);
    const rand = mulberry32(12);
    for (let n = 0; n < 20; n++) {
      const k = 10 ** (rand() * 2 - 1);
      const prob: PairProblem = { idealB: (a) => Math.sqrt(a * 1e4) / k, error: (a, b) => Math.sqrt(a * 1e4) / b / k - 1, preferredA: 2e4, floor: 1e-3 };
      const got = searchPairs(t, t, prob, 5).ranked.map((c) => [c.a.ohms, c.b.ohms, c.error, c.score]);
      expect(got).toEqual(rankedByBruteForce(t, prob, 5));
    }
  });
});
