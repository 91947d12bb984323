/**
 * Property-based tests (fast-check, fixed seed) for the bench loop: any text never makes the readings
 * reader throw; any readings never make the fit or the trim throw or show NaN/Infinity in their words or
 * their JSON objects. FUZZ_RUNS raises the count (`npm run fuzz`).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseReadings } from '../../src/model/readings.js';
import { fitJson, fitReadings } from '../../src/analysis/fit.js';
import { trimFromReadings, trimJson } from '../../src/analysis/trim.js';
import { analyse } from '../../src/analysis/report.js';
import { fitLines, trimLines } from '../../src/present/readings.js';
import { designFrom } from '../helpers.js';

const RUNS = Math.max(20, Math.floor(Number(process.env.FUZZ_RUNS ?? 2000) / 20));
const SEED = 20261202;
const reading = fc.tuple(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.double({ min: -1000, max: 1000, noNaN: true }));

describe('readings under random input', () => {
  it('parseReadings never throws and returns only finite pairs', () => {
    fc.assert(fc.property(fc.string({ maxLength: 400 }), (text) => {
      const r = parseReadings(text);
      for (const [x, y] of r.points) { expect(Number.isFinite(x)).toBe(true); expect(Number.isFinite(y)).toBe(true); }
    }), { numRuns: RUNS * 5, seed: SEED });
  });
  it('fitReadings and its words never throw or show NaN', () => {
    fc.assert(fc.property(fc.array(reading, { maxLength: 30 }), (pts) => {
      const f = fitReadings(pts);
      const text = fitLines(f, pts, 'A').join(' ');
      expect(text).not.toMatch(/NaN|Infinity/);
      const j = fitJson(f);
      for (const v of [j.slope, j.intercept, j.residualStd]) expect(v === null || Number.isFinite(v)).toBe(true);
    }), { numRuns: RUNS * 5, seed: SEED });
  });
  it('trimFromReadings on the bench-clamp demo never throws or shows NaN, whatever the readings', () => {
    const r = analyse(designFrom('bench-clamp'), { spreadTrials: 0 });
    const input = { design: r.design, front: r.front, stage: r.stage };
    fc.assert(fc.property(fc.array(fc.tuple(fc.double({ min: -50, max: 50, noNaN: true }), fc.double({ min: -20, max: 20, noNaN: true })), { maxLength: 5 }), (pts) => {
      const t = trimFromReadings(input, pts);
      expect(trimLines(t, r.stage!.parts, 'A').join(' ')).not.toMatch(/NaN|Infinity/);
      const j = trimJson(t) as { settings: Array<{ setting: number | null }> };
      for (const s of j.settings) expect(s.setting === null || Number.isFinite(s.setting)).toBe(true);
    }), { numRuns: RUNS, seed: SEED });
  });
});
