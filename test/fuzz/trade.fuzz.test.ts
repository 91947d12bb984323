/**
 * Property suite for the turns trade (issue 19): any Hall clamp core or current transformer a file may
 * hold gives a trade whose every row is finite (or null where a figure does not apply) and whose words hold
 * no NaN or Infinity. Each case is 14–15 stage solves, so the count is small; FUZZ_RUNS raises it.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { tradeSweep } from '../../src/analysis/trade.js';
import { tradeJson, tradeLines } from '../../src/present/trade.js';
import { designFrom, nonFinitePaths } from '../helpers.js';

const RUNS = Math.max(6, Math.round(Number(process.env.FUZZ_RUNS ?? 2000) / 300));

describe('turns trade property suite', () => {
  it('a Hall clamp: any turns, gap, path, permeability and section', () => {
    fc.assert(fc.property(fc.integer({ min: 1, max: 40 }), fc.integer({ min: 1, max: 50 }), fc.integer({ min: 20, max: 200 }), fc.integer({ min: 100, max: 10000 }), fc.option(fc.integer({ min: 2, max: 30 }), { nil: undefined }), (turns, gapTenths, pathMm, mu, sideMm) => {
      const d = designFrom('bench-clamp', (x) => {
        x.sensor.turns = turns; x.sensor.core.gap = gapTenths * 1e-4; x.sensor.core.pathLength = pathMm * 1e-3; x.sensor.core.permeability = mu;
        if (sideMm) x.sensor.core.width = sideMm * 1e-3;
      });
      const t = tradeSweep(d)!;
      expect(t.points.length).toBeGreaterThanOrEqual(14);
      expect(nonFinitePaths(tradeJson(t))).toEqual([]);
      expect(tradeLines(t, 'A').join('\n')).not.toMatch(/NaN|Infinity|undefined/);
    }), { numRuns: RUNS, seed: 19 });
  });
  it('a current transformer: any turns, burden, winding and core', () => {
    fc.assert(fc.property(fc.integer({ min: 50, max: 5000 }), fc.integer({ min: 1, max: 1000 }), fc.integer({ min: 0, max: 200 }), fc.integer({ min: 2, max: 30 }), (turns, burden, rw, sideMm) => {
      const d = designFrom('appliance-ct', (x) => { x.sensor.secondaryTurns = turns; x.sensor.burden = burden; x.sensor.windingResistance = rw; x.sensor.core = { width: sideMm * 1e-3, saturation: 0.3 }; });
      const t = tradeSweep(d)!;
      expect(nonFinitePaths(tradeJson(t))).toEqual([]);
      expect(tradeLines(t, 'A').join('\n')).not.toMatch(/NaN|Infinity|undefined/);
    }), { numRuns: RUNS, seed: 19 });
  });
});
