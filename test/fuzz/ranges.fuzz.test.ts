/**
 * Property suite for the range switch (issue 19): any further ranges a file may hold (scales of the target's
 * sign over six decades, ranges anywhere, either wiring, on the two stages it is designed for) are refused at
 * their field or reported with finite figures and words; never a throw, a NaN or an Infinity.
 * FUZZ_RUNS raises the count (`npm run fuzz`).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyse } from '../../src/analysis/report.js';
import { validateDesign } from '../../src/model/design.js';
import { DEMOS } from '../../src/model/demos.js';
import { reportJson } from '../../src/present/json.js';
import { verdictsOf } from '../../src/present/verdicts.js';
import { calibrationSteps } from '../../src/present/calibration.js';
import { rangeTable } from '../../src/present/ranges.js';
import { nonFinitePaths } from '../helpers.js';

const RUNS = Math.max(20, Math.round(Number(process.env.FUZZ_RUNS ?? 2000) / 40));

// Round figures a person would type (a double generator's favourite subnormals are a different suite's job).
const rangeArb = fc.record({
  scale: fc.integer({ min: -16, max: 4 }).map((k) => Number((10 ** (k / 4)).toPrecision(3))),
  lo: fc.integer({ min: -200, max: 0 }),
  hi: fc.integer({ min: 1, max: 200 }),
});

describe('range switch property suite', () => {
  it.each([['two-range-clamp', 1], ['generic-sensor', -1]] as const)('%s: any further ranges are reported with finite figures or refused at their field', (id, sign) => {
    let analysed = 0, built = 0;
    fc.assert(fc.property(fc.array(rangeArb, { minLength: 1, maxLength: 3 }), fc.constantFrom('auto', 'single-pole', 'two-pole'), (ranges, wiring) => {
      const doc = structuredClone(DEMOS.find((d) => d.id === id)!.document) as any;
      if (sign < 0) { doc.target.topology = 'inverting'; doc.target.scale = -0.1; }
      doc.target.ranges = ranges.map((r) => ({ scale: sign * r.scale, range: [r.lo, r.hi] }));
      doc.target.rangeSwitch = wiring;
      const v = validateDesign(doc);
      if (!v.ok) { expect(v.problems.every((p) => p.path.startsWith('target.ranges'))).toBe(true); return; }
      const r = analyse(v.design, { spreadTrials: 0, acPoints: 21 });
      analysed++;
      if (r.ranges?.ok && r.ranges.value.positions.every((p) => p.report?.dc)) built++;
      const j = reportJson(r) as { ranges: unknown[]; rangeSwitch: unknown };
      expect(nonFinitePaths(j.ranges)).toEqual([]);
      expect(nonFinitePaths(j.rangeSwitch)).toEqual([]);
      const words = [...verdictsOf(r).flatMap((x) => [x.title, x.detail]), ...calibrationSteps(r).map((c) => c.text), ...(rangeTable(r)?.rows.flatMap((x) => x.cells) ?? [])].join('\n');
      expect(words).not.toMatch(/NaN|Infinity|undefined/);
    }), { numRuns: RUNS, seed: 19 });
    // The suite must reach the analysis, and a good share of switches must build every position.
    expect(analysed).toBeGreaterThan(RUNS / 2);
    expect(built).toBeGreaterThan(0);
    console.log(`${id}: ${analysed} of ${RUNS} analysed, ${built} with every position built`);
  });
});
