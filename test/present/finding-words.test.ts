/**
 * The one wording module: every finding code has a title and a sentence (the compiler holds the table to the
 * code list; these tests hold the words to the data), limits and stage reasons are worded from numbers.
 */
import { describe, expect, it } from 'vitest';
import { FINDING_WORDS, LIMIT_NAMES, findingTitle, limitWhy, sayFinding, stageReasonWords, topologyWhy } from '../../src/present/finding-words.js';
import { finding, type FindingCode } from '../../src/model/findings.js';
import { analyse } from '../../src/analysis/report.js';
import { DEMOS, demoDesign } from '../../src/model/demos.js';

describe('finding words', () => {
  it('every code has a title of its own, not the code itself', () => {
    const codes = Object.keys(FINDING_WORDS) as FindingCode[];
    expect(codes.length).toBeGreaterThan(40);
    for (const c of codes) {
      expect(findingTitle(c)).not.toBe(c);
      expect(findingTitle(c).length).toBeGreaterThan(3);
    }
  });
  it('sayFinding words the numbers of the data: capacitive-load with 47 Ω says "47.0 Ω"', () => {
    expect(sayFinding(finding('capacitive-load', 'caution', { isolation: 47 }))).toMatch(/about 47\.0 Ω/);
  });
  it('burden-power states power and rating from the data', () => {
    expect(sayFinding(finding('burden-power', 'fail', { power: 0.7123, rating: 0.25 }))).toBe('The burden dissipates 0.712 W at the top of the range, above its 0.25 W rating.');
  });
  it('limitWhy gives the swing from its numbers: 0.05 V to 7.5 V', () => {
    expect(limitWhy({ cause: 'opamp-output', low: 0.05, high: 7.5 })).toBe('the op-amp output swings only from 0.05 V to 7.5 V');
    expect(limitWhy({ cause: 'opamp-current', current: 0.02 })).toMatch(/±20 mA/);
    expect(Object.keys(LIMIT_NAMES).sort()).toEqual(['burden', 'core', 'driver', 'opamp-current', 'opamp-input', 'opamp-output', 'sensor']);
  });
  it('stage reasons are worded from their data: a gain of 0.5 cannot be had non-inverting', () => {
    expect(stageReasonWords({ code: 'cannot-attenuate', gain: 0.5 })).toBe('a non-inverting stage cannot attenuate: the target needs a gain of 0.500');
    expect(topologyWhy({ chosen: { topology: 'inverting', reasons: [{ code: 'fits', how: 'inverting' }] }, considered: [] })).toMatch(/^inverting: an inverting stage gives the opposite polarity/);
  });
  it('every demo\'s findings come out as sentences with no NaN, Infinity or undefined in them', () => {
    for (const demo of DEMOS) {
      const r = analyse(demoDesign(demo.id), { spreadTrials: 0 });
      expect(r.warnings.length).toBeGreaterThan(0);
      for (const w of r.warnings) {
        const text = sayFinding(w);
        expect(text, w.code).not.toMatch(/NaN|Infinity|undefined|\[object/);
        expect(text.length).toBeGreaterThan(10);
      }
    }
  });
});
