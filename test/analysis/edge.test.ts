/** Edge designs answer with guidance, not failure (robustness issue). */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../src/analysis/report.js';
import { reportJson } from '../../src/present/json.js';
import { validateDesign, type Design } from '../../src/model/design.js';
import { DEMOS } from '../../src/model/demos.js';
import { designFrom } from '../helpers.js';
import { verdictsOf } from '../../src/present/verdicts.js';
import { sayFinding } from '../../src/present/finding-words.js';

const design = (patch: (d: any) => void): Design => designFrom('generic-sensor', patch);
const finite = (x: unknown): boolean => typeof x === 'number' ? Number.isFinite(x) : Array.isArray(x) ? x.every(finite) : x && typeof x === 'object' ? Object.values(x).every(finite) : true;

describe('edge designs', () => {
  it('a wanted gain of exactly 1 gives a buffer', () => {
    const r = analyse(design((d) => { d.target.scale = 0.0125; d.target.zero = 2.5; }), { spreadTrials: 0 });
    expect(r.stage!.gain).toBe(1);
    expect(r.warnings.map((w) => w.code)).toContain('buffer-no-trim');
    expect(finite(reportJson(r))).toBe(true);
  });
  it('a gain below 1 with the sensor\'s polarity is built by the summing non-inverting stage at the scale asked', () => {
    const r = analyse(design((d) => { d.target.scale = 0.005; d.target.zero = 2.5; }), { spreadTrials: 0 });
    expect(r.stage!.ideal.topology).toBe('summing-non-inverting');
    // The circuit's own DC solution (MNA), not the solver's closed form: scale and zero within 0.1 % of the span.
    expect(Math.abs(r.dc!.out[1] / 0.005 - 1)).toBeLessThan(1e-3);
    expect(Math.abs(r.dc!.out[0] - 2.5)).toBeLessThan(1e-3 * 0.005 * 40);
  });
  it('a gain below 1 asked of the non-inverting stage explains how to get there', () => {
    const r = analyse(design((d) => { d.target.scale = 0.005; d.target.zero = 2.5; d.target.topology = 'non-inverting'; }), { spreadTrials: 0 });
    expect(r.stage).toBeNull();
    expect(sayFinding(r.warnings.find((w) => w.code === 'guidance')!)).toMatch(/reverse the conductor/i);
    expect(verdictsOf(r)[0]!.level).toBe('fail');
    expect(finite(reportJson(r))).toBe(true);
  });
  it('a gain below 1 with opposite polarity is met by an attenuating inverting stage', () => {
    const r = analyse(design((d) => { d.target.scale = -0.005; d.target.zero = 2.5; }), { spreadTrials: 0 });
    expect(r.stage!.ideal.topology).toBe('inverting');
    expect(r.stage!.gain).toBeLessThan(1);
  });
  it('a ratio outside the resistance window says to widen it', () => {
    const r = analyse(design((d) => { d.target.scale = 12.5; d.target.range = [-0.2, 0.2]; d.target.resistanceMin = 1e3; d.target.resistanceMax = 2e4; }), { spreadTrials: 0 });
    expect(sayFinding(r.warnings.find((w) => w.code === 'gain-unrealisable')!)).toMatch(/widen the resistance window/);
    expect(finite(reportJson(r))).toBe(true);
  });
  it('a single supply with a range that needs negative output shows where it clips and what would fit', () => {
    const r = analyse(design((d) => { d.target.zero = 0.5; }), { spreadTrials: 0 });
    const w = r.warnings.find((x) => x.code === 'clips-in-range-low')!;
    expect(sayFinding(w)).toMatch(/split supply/);
    // Output floor 0.05 V at 100 mV/A about 0.5 V: (0.05 − 0.5)/0.1 = −4.5 A, within ±0.05 A (toBeCloseTo(·, 1)): the
    // solver builds the scale within 0.1 % (0.005 A here) and the op-amp's 50 Ω output resistance shifts the floor by
    // under 1 mV (Ohm's law; 0.01 A at 100 mV/A).
    expect(r.clip!.measurandLow).toBeCloseTo((0.05 - 0.5) / 0.1, 1);
  });
  it('rails too low for the op-amp are refused with the field named', () => {
    const v = validateDesign({ ...structuredClone(DEMOS.find((d) => d.id === 'generic-sensor')!.document), supply: { positive: 1.5, negative: 0 } });
    expect(v.ok).toBe(false);
    if (!v.ok) expect(v.problems.map((p) => p.path)).toEqual(expect.arrayContaining(['opamp.inputHigh', 'opamp.outputHigh']));
  });
  it('an op-amp that cannot reach the bandwidth gets a failure line with the figure', () => {
    const r = analyse(design((d) => { d.target.bandwidth = 1e6; }), { spreadTrials: 0 });
    expect(verdictsOf(r).find((v) => v.title.startsWith('Bandwidth'))!.level).toBe('fail');
    expect(r.warnings.map((w) => w.code)).toEqual(expect.arrayContaining(['bandwidth-short', 'slew-limited']));
  });
  it('old files keep opening: version 1 is read as it is; 0 and newer versions are refused with a reason', () => {
    const doc = structuredClone(DEMOS[0]!.document);
    expect(validateDesign(doc).ok).toBe(true);
    const v0 = validateDesign({ ...doc, version: 0 });
    expect(!v0.ok && v0.problems[0]!.message).toMatch(/whole number from 1/);
    const v2 = validateDesign({ ...doc, version: 2 });
    expect(!v2.ok && v2.problems[0]!.message).toMatch(/newer/);
  });
});
