/**
 * The whole build from one resistor kit (issue 18): each network searched in what the networks before it left
 * of the kit. Kit values are IEC 60063 E12/E6 members (published); kits and designs are scenarios of our own.
 * The oracles build every arm straight from the kit's values and counts (never from the arm tables) and try
 * every pair, or count every part of a finished build against the kit.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { kitArmTable, kitShortfall, kitWithout, pairFitsKit } from '../../src/solve/kit.js';
import { searchPairs, type RatioForm } from '../../src/solve/search.js';
import { kitValues, type KitValue } from '../../src/model/kit.js';
import { valuesInRange, type SeriesName } from '../../src/model/eseries.js';
import type { Arrangement } from '../../src/model/design.js';
import { analyse } from '../../src/analysis/report.js';
import { designFrom, shuntOnSplitSupply } from '../helpers.js';

const RUNS = Math.max(60, Math.floor(Number(process.env.FUZZ_RUNS ?? 2000) / 10));

/** The least |error| of a pair problem over every pair of arms buildable together from `kit` (counts respected), by brute force. */
function bruteForce(kit: readonly KitValue[], arr: readonly Arrangement[], r: RatioForm): number {
  const arms: Array<[number, number[]]> = [];
  kit.forEach((v, i) => { if (arr.includes('single')) arms.push([v.ohms, [i]]); });
  for (let i = 0; i < kit.length; i++) for (let j = i; j < kit.length; j++) {
    const x = kit[i]!.ohms, y = kit[j]!.ohms;
    if (arr.includes('series')) arms.push([x + y, [i, j]]);
    if (arr.includes('parallel')) arms.push([(x * y) / (x + y), [i, j]]);
  }
  let best = Infinity;
  for (const [a, ka] of arms) for (const [b, kb] of arms) {
    // The pair problem's own definition (src/solve/search.ts): no partner where the ideal one is not positive.
    if (!((a + r.cA) / r.k - r.cB > 0)) continue;
    const ks = [...ka, ...kb];
    if (!ks.every((k) => ks.filter((x) => x === k).length <= kit[k]!.count)) continue;
    best = Math.min(best, Math.abs(r.m * ((a + r.cA) / (b + r.cB) / r.k - 1)));
  }
  return best;
}

const E12 = [...valuesInRange('E12', 100, 100e3)];

describe('kitWithout(table, parts) and the pair search on what is left', () => {
  // Property: on any small kit (E12 values, 1–3 of each or as many as needed), with any parts already taken
  // from it (a divider's, say), the search on the rest finds the least error of every pair the rest can
  // build, and what it offers can be built from the rest.
  it('equals a brute force over the kit less the parts taken, and never takes more than is left', () => {
    fc.assert(fc.property(
      fc.uniqueArray(fc.integer({ min: 0, max: E12.length - 1 }), { minLength: 1, maxLength: 8 }),
      fc.array(fc.constantFrom(1, 1, 2, 2, 3, Infinity), { minLength: 8, maxLength: 8 }),
      fc.array(fc.nat(7), { maxLength: 4 }),
      fc.double({ min: 0.05, max: 50, noNaN: true }),
      fc.constantFrom<Arrangement[]>(['single', 'series', 'parallel'], ['single', 'series'], ['single']),
      fc.constantFrom(0, 1e-3, 0.05),
      (idx, counts, takeIdx, k, arr, floor) => {
        const kit: KitValue[] = [...idx].sort((a, b) => a - b).map((i, n) => ({ ohms: E12[i]!, count: counts[n]! }));
        const taken = takeIdx.map((t) => kit[t % kit.length]!.ohms);
        // What is left, counted by hand: each part taken once, a value held without limit unchanged.
        const left = kit.map((v) => ({ ohms: v.ohms, count: v.count - taken.filter((x) => x === v.ohms).length }));
        if (left.some((v) => v.count < 0)) return; // more taken than held: not a state the solver reaches
        const t = kitWithout(kitArmTable(kit, arr), taken);
        const ratio = { cA: 0, cB: 0, k, m: 1 };
        const fast = searchPairs(t, t, { preferredA: 1e4, floor, ratio }, 5, pairFitsKit);
        const want = bruteForce(left.filter((v) => v.count > 0), arr, ratio);
        if (want === Infinity) { expect(fast.best).toBeNull(); return; }
        expect(Math.abs(fast.best!.error)).toBeCloseTo(want, 12);
        for (const c of [fast.best!, ...fast.ranked]) {
          const used = [...c.a.parts, ...c.b.parts];
          for (const v of left) expect(used.filter((p) => p === v.ohms).length).toBeLessThanOrEqual(v.count);
        }
      },
    ), { numRuns: RUNS, seed: 1821 });
  });

  // Scenario of our own: a ratio of exactly 1 from one 1.2 kΩ, one 1.5 kΩ and one 2.7 kΩ (E12 values;
  // 1.2 k + 1.5 k = 2.7 k). The single 2.7 kΩ cannot be both arms: 2.7 k over 1.2 k + 1.5 k in series can,
  // so the table must keep that series arm beside the single part of the same value.
  it('keeps an arm of two parts equal in value to a single part the kit holds once, and the search takes it', () => {
    const kit = [{ ohms: 1200, count: 1 }, { ohms: 1500, count: 1 }, { ohms: 2700, count: 1 }];
    const t = kitArmTable(kit, ['single', 'series']);
    const best = searchPairs(t, t, { preferredA: 2700, floor: 0, ratio: { cA: 0, cB: 0, k: 1, m: 1 } }, 3, pairFitsKit).best!;
    expect(best.error).toBe(0);
    expect([best.a.parts, best.b.parts].sort((x, y) => x.length - y.length)).toEqual([[2700], [1200, 1500]]);
    // Held without limit, the single part serves both arms and the equal pair is left out of the table.
    const plenty = kitArmTable(kit.map((v) => ({ ...v, count: Infinity })), ['single', 'series']);
    expect([...plenty.value].filter((v) => v === 2700)).toHaveLength(1);
  });

  it('kitWithout takes one of a value per part, drops a value used up, and leaves unlimited values and other tables alone', () => {
    const t = kitArmTable([{ ohms: 1e3, count: 1 }, { ohms: 1e4, count: 2 }, { ohms: 2.2e4, count: Infinity }], ['single', 'series']);
    const less = kitWithout(t, [1e4, 1e3]) as typeof t;
    expect(less.values).toEqual([{ ohms: 1e4, count: 1 }, { ohms: 2.2e4, count: Infinity }]);
    // Two 10 kΩ in series are no longer an arm: one is left.
    expect([...less.value]).not.toContain(2e4);
    expect(kitWithout(t, [2.2e4, 4.7e4])).toBe(t);
    expect(kitWithout(t, [])).toBe(t);
  });
});

/** Every fixed resistor of a finished build (the range switch's whole list when there is one), burden aside. */
function buildParts(r: ReturnType<typeof analyse>) {
  const all = r.ranges?.ok ? r.ranges.value.parts : r.stage?.parts ?? [];
  return all.filter((p) => p.kind === 'resistor' && p.role !== 'burden');
}

describe('a whole build from a kit with few of each value', () => {
  // Designs of each stage family the solver has: the generic demo (non-inverting with a zero pot), a current
  // transformer (inverting), a shunt on split rails (a reference by wire), the two-range clamp (a range switch),
  // the generic demo with no zero trimmer (fixed dividers, where the zero rests on the parts), and two offset stages.
  const designs: Array<[string, (x: any) => void]> = [
    ['generic-sensor', () => {}],
    ['appliance-ct', () => {}],
    ['generic-sensor', shuntOnSplitSupply],
    ['two-range-clamp', () => {}],
    ['generic-sensor', (x) => { x.target.trim = { gain: false, zero: false }; }],
    // The stages that add an offset through their own parts: a difference stage across the shunt, a summing
    // non-inverting stage after the transformer.
    ['generic-sensor', (x) => { shuntOnSplitSupply(x); x.target.topology = 'difference'; }],
    ['appliance-ct', (x) => { x.target.topology = 'summing-non-inverting'; }],
  ];
  // Property: whatever the kit (a series from E6 to E24 with one to three of each, plus a few listed values
  // with small counts), no build the solver offers takes a value more often than the kit holds it, and the
  // report says nothing about quantities (kit-quantity is the check on the whole build).
  it('no solved build uses more of any value than the kit holds', () => {
    fc.assert(fc.property(
      fc.nat(designs.length - 1),
      fc.constantFrom<SeriesName>('E6', 'E12', 'E24'),
      fc.integer({ min: 1, max: 3 }),
      fc.array(fc.record({ i: fc.nat(E12.length - 1), count: fc.integer({ min: 1, max: 2 }) }), { maxLength: 4 }),
      (d, series, count, listed) => {
        const [id, patch] = designs[d]!;
        const design = designFrom(id, (x) => { patch(x); x.target.kit = { series, min: 100, max: 1e6, count, parts: listed.map((p) => ({ ohms: E12[p.i]!, count: p.count })) }; });
        const r = analyse(design, { spreadTrials: 0, trade: false, acPoints: 21 });
        const held = kitValues(design.target.kit!, design.target.resistanceMin, design.target.resistanceMax);
        expect(kitShortfall(buildParts(r), held)).toEqual([]);
        expect(r.warnings.filter((w) => w.code === 'kit-quantity')).toEqual([]);
      },
    ), { numRuns: 40, seed: 1822 });
  });
});
