/**
 * The solver on a resistor kit. The kit values are IEC 60063 E-series members (E12/E6, published); the kits
 * and targets are scenarios of our own. The oracle builds every arm straight from the kit's values and
 * counts (not from the arm table) and tries every pair.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { kitArmTable, kitShortfall, pairFitsKit } from '../../src/solve/kit.js';
import { searchPairs, type RatioForm } from '../../src/solve/search.js';
import { kitListText, kitValues, parseKitList, seriesToBuyFrom, type KitValue } from '../../src/model/kit.js';
import { formatEng, parseQuantity } from '../../src/model/units.js';
import { valuesInRange } from '../../src/model/eseries.js';
import type { Arrangement } from '../../src/model/design.js';

const RUNS = Math.max(60, Math.floor(Number(process.env.FUZZ_RUNS ?? 2000) / 10));

/** Every arm of a kit as [ohms, kit indices], straight from the values and counts. */
function armsOf(kit: readonly KitValue[], arr: readonly Arrangement[]): Array<[number, number[]]> {
  const out: Array<[number, number[]]> = [];
  kit.forEach((v, i) => { if (arr.includes('single')) out.push([v.ohms, [i]]); });
  for (let i = 0; i < kit.length; i++) for (let j = i; j < kit.length; j++) {
    const x = kit[i]!.ohms, y = kit[j]!.ohms;
    if (arr.includes('series')) out.push([x + y, [i, j]]);
    if (arr.includes('parallel')) out.push([(x * y) / (x + y), [i, j]]);
  }
  return out;
}

/** The smallest |error| over every pair of arms the kit can build together (counts respected), by brute force. */
function exhaustive(kit: readonly KitValue[], arr: readonly Arrangement[], r: RatioForm): number {
  const arms = armsOf(kit, arr);
  const builds = (ks: number[]) => ks.every((k) => ks.filter((x) => x === k).length <= kit[k]!.count);
  let best = Infinity;
  for (const [a, ka] of arms) for (const [b, kb] of arms) {
    // The pair problem's own definition (src/solve/search.ts): a first arm whose ideal partner is not a
    // positive resistance has no partner.
    if (!((a + r.cA) / r.k - r.cB > 0)) continue;
    if (!builds([...ka, ...kb])) continue;
    const e = Math.abs(r.m * ((a + r.cA) / (b + r.cB) / r.k - 1));
    if (e < best) best = e;
  }
  return best;
}

const E12 = [...valuesInRange('E12', 100, 100e3)];

describe('searchPairs on a kit', () => {
  // Property: on any kit (a subset of E12 values from 100 Ω to 100 kΩ with 1–3 of each, or as many as needed)
  // and any gain ratio, the fast search with the kit's quantity check finds the same smallest error as trying
  // every pair of arms the kit can build, and the pair it reports can be built.
  it('finds the same best error as an exhaustive search over the same kit, and never takes more parts than the kit holds', () => {
    fc.assert(fc.property(
      fc.uniqueArray(fc.integer({ min: 0, max: E12.length - 1 }), { minLength: 1, maxLength: 10 }),
      fc.array(fc.constantFrom(1, 1, 2, 3, Infinity), { minLength: 10, maxLength: 10 }),
      fc.double({ min: 0.05, max: 200, noNaN: true }),
      fc.constantFrom<Arrangement[]>(['single', 'series', 'parallel'], ['single', 'series'], ['single']),
      fc.double({ min: 0, max: 5e3, noNaN: true }),
      // Floor 0 ranks in the ascending scan; a floor above 0 visits first arms outward from the preferred one.
      fc.constantFrom(0, 1e-3, 0.05),
      (idx, counts, k, arr, cB, floor) => {
        const kit: KitValue[] = [...idx].sort((a, b) => a - b).map((i, n) => ({ ohms: E12[i]!, count: counts[n]! }));
        const t = kitArmTable(kit, arr);
        const ratio = { cA: 0, cB, k, m: 1 };
        const fast = searchPairs(t, t, { preferredA: 1e4, floor, ratio }, 5, pairFitsKit);
        const want = exhaustive(kit, arr, ratio);
        if (want === Infinity) { expect(fast.best).toBeNull(); return; }
        expect(Math.abs(fast.best!.error)).toBeCloseTo(want, 12);
        for (const c of [fast.best!, ...fast.ranked]) {
          const used = [...c.a.parts, ...c.b.parts];
          for (const v of kit) expect(used.filter((p) => p === v.ohms).length).toBeLessThanOrEqual(v.count);
        }
      },
    ), { numRuns: RUNS, seed: 18 });
  });

  // Scenario of our own: a gain ratio of exactly 20 from a kit of 1 kΩ and 10 kΩ parts. Two 10 kΩ in series
  // over the 1 kΩ make it; with one 10 kΩ the kit cannot, and the best it builds is 10 kΩ / 1 kΩ (error −50 %).
  it('two 10 kΩ in series need two 10 kΩ in the kit', () => {
    const ratio = { cA: 0, cB: 0, k: 20, m: 1 };
    const arr: Arrangement[] = ['single', 'series', 'parallel'];
    const one = kitArmTable([{ ohms: 1e3, count: 1 }, { ohms: 1e4, count: 1 }], arr);
    const two = kitArmTable([{ ohms: 1e3, count: 1 }, { ohms: 1e4, count: 2 }], arr);
    expect([...one.value]).toEqual([1e7 / 11e3, 1e3, 1e4, 11e3]);
    const withTwo = searchPairs(two, two, { preferredA: 1e4, floor: 0, ratio }, 5, pairFitsKit).best!;
    expect(withTwo.error).toBe(0);
    expect(withTwo.a.parts).toEqual([1e4, 1e4]);
    expect(withTwo.b.parts).toEqual([1e3]);
    const withOne = searchPairs(one, one, { preferredA: 1e4, floor: 0, ratio }, 5, pairFitsKit).best!;
    expect(withOne.error).toBeCloseTo(-0.5, 12);
    // Without the check the search would pair 10 kΩ with itself: the kit holds one.
    expect(pairFitsKit(one, 2, one, 2)).toBe(false);
  });
});

describe('kitValues and friends', () => {
  it('merges a series and listed parts, adding counts, inside the window (E3 from IEC 60063: 10, 22, 47)', () => {
    const v = kitValues({ series: 'E3', min: 10, max: 100, count: 2, parts: [{ ohms: 47, count: 1 }, { ohms: 33 }, { ohms: 1e6 }] }, 1, 1e5);
    expect(v).toEqual([{ ohms: 10, count: 2 }, { ohms: 22, count: 2 }, { ohms: 33, count: Infinity }, { ohms: 47, count: 3 }, { ohms: 100, count: 2 }]);
    expect(kitValues({ parts: [] , min: 10, max: 100 }, 1, 1e5)).toEqual([]);
  });
  it('buys from the next finer series (E12 → E24), E24 for a list, none after E192', () => {
    expect(seriesToBuyFrom({ series: 'E12', min: 10, max: 1e6, parts: [] })).toBe('E24');
    expect(seriesToBuyFrom({ min: 10, max: 1e6, parts: [{ ohms: 100 }] })).toBe('E24');
    expect(seriesToBuyFrom({ series: 'E192', min: 10, max: 1e6, parts: [] })).toBeNull();
  });
  it('kitShortfall names each value a parts list takes more often than the kit holds', () => {
    const parts = [1e4, 1e4, 1e4, 1e3].map((ohms) => ({ kind: 'resistor', ohms, role: 'feedback' }));
    expect(kitShortfall(parts, [{ ohms: 1e4, count: 2 }, { ohms: 1e3, count: 1 }])).toEqual([{ ohms: 1e4, used: 3, held: 2 }]);
    expect(kitShortfall(parts, [{ ohms: 1e4, count: Infinity }])).toEqual([]);
  });
});

describe('parseKitList(text) and kitListText(parts)', () => {
  const read = (s: string) => parseQuantity(s, 'ohm');
  // Codes from IEC 60062 (published examples): 4K7 = 4.7 kΩ, 470R = 470 Ω, 47K3 = 47.3 kΩ.
  it('reads values as fields do (IEC 60062 codes, prefixes, units) with optional counts, and names what it cannot read', () => {
    const r = parseKitList('10k x2, 4K7;470R\n47K3 ×3, 1 MΩ, banana, 10k x0', read);
    expect(r.parts).toEqual([{ ohms: 1e4, count: 2 }, { ohms: 4700 }, { ohms: 470 }, { ohms: 47300, count: 3 }, { ohms: 1e6 }]);
    expect(r.problems).toEqual(['"banana" is not a resistance', '"10k x0" has a count that is not a whole number from 1']);
  });
  it('reads back what kitListText wrote', () => {
    const parts = [{ ohms: 4700, count: 2 }, { ohms: 150e3 }];
    const text = kitListText(parts, (x) => formatEng(x, 'Ω', 4));
    expect(text).toBe('4.700 kΩ ×2, 150.0 kΩ');
    expect(parseKitList(text, read)).toEqual({ parts, problems: [] });
  });
  it('an empty text is an empty list', () => expect(parseKitList(' , \n', read)).toEqual({ parts: [], problems: [] }));
});
