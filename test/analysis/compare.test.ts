import { describe, expect, it } from 'vitest';
import { analyse } from '../../src/analysis/report.js';
import { candidates, sortRows, withOpAmp, COMPARE_OPTIONS, type ComparisonRow } from '../../src/analysis/compare.js';
import { comparisonRows } from '../../src/present/comparison.js';
import { verdictsOf } from '../../src/present/verdicts.js';
import { OPAMP_ARCHETYPES, archetype } from '../../src/model/opamps.js';
import { demoDesign } from '../../src/model/demos.js';
import type { OpAmpSpec } from '../../src/model/design.js';
import { designFrom } from '../helpers.js';

const spec = (id: string): OpAmpSpec => archetype(id)!.spec;
/** Two op-amps of a person's own (a scenario of our own): a slow micropower part and a wide one. */
const own: OpAmpSpec[] = [
  { ...spec('cmos-rail-to-rail'), name: 'my micropower part (scenario of our own)', gbw: 1e5, slewRate: 0.05e6, supplyCurrent: 10e-6 },
  { ...spec('bipolar-general'), name: 'my drawer bipolar (scenario of our own)', outputHigh: 2.5, inputHigh: 2 },
];

describe('comparisonRows(design, own)', () => {
  // Every row is read off the full report of the design with that op-amp in it: the figures must be the
  // report's own, one by one (object equality), so the table can never disagree with the report.
  it('each row equals the figures of the full report of the design with that op-amp', () => {
    for (const design of [demoDesign('bench-clamp'), designFrom('generic-sensor')]) {
      const rows = comparisonRows(design, own);
      expect(rows).toHaveLength(OPAMP_ARCHETYPES.length + own.length + (candidates(design, own)[0]!.source === 'design' ? 1 : 0));
      for (const row of rows) {
        const r = analyse(withOpAmp(design, row.opamp), { spreadTrials: 3 });
        const end = design.supply.battery ? r.battery[r.battery.length - 1]! : null;
        expect({
          measurandLow: row.measurandLow, measurandHigh: row.measurandHigh, endOfLifeLow: row.endOfLifeLow, endOfLifeHigh: row.endOfLifeHigh,
          bandwidth: row.bandwidth, fullPower: row.fullPower, noiseReferred: row.noiseReferred, errorAfterTrim: row.errorAfterTrim,
          supplyCurrent: row.supplyCurrent, batteryLife: row.batteryLife, verdict: row.verdict,
        }).toEqual({
          measurandLow: r.clip!.measurandLow, measurandHigh: r.clip!.measurandHigh, endOfLifeLow: end?.measurandLow ?? null, endOfLifeHigh: end?.measurandHigh ?? null,
          bandwidth: r.speed!.smallSignal, fullPower: r.speed!.fullPower, noiseReferred: r.noise!.referredRms, errorAfterTrim: r.errors!.afterTrim,
          supplyCurrent: r.supply!.current, batteryLife: r.supply!.batteryLife, verdict: verdictsOf(r)[0]!.level,
        });
        expect(row.findings).toEqual(r.warnings.filter((w) => w.level !== 'info').map((w) => w.code));
      }
    }
  });

  // Scenario of our own: a 9 V bench supply, 100 mV/A about 4.5 V over ±35 A, so the output must reach
  // 4.5 + 3.5 = 8 V. A general-purpose op-amp whose output stops 1.5 V short of the + rail tops out at 7.5 V,
  // i.e. at (7.5 − 4.5)/0.1 = 30 A (the non-inverting closed form Vout = zero + scale·x, any op-amp textbook;
  // a swing that stops short of the rail is common practice for such parts); a rail-to-rail output (20 mV
  // short) reaches (8.98 − 4.5)/0.1 = 44.8 A. Each within a tolerance ±0.05 A (toBeCloseTo(·, 1)): the solver builds the scale within 0.1 % (0.03 A at 30 A), and the op-amp's
  // 50 Ω output resistance drops about 2 mV (≈ 40 µA into the feedback arm and load; Ohm's law) at the clip, 0.02 A at 100 mV/A.
  it('a general-purpose op-amp 1.5 V short of the + rail fails a 9 V design that a rail-to-rail part passes', () => {
    const design = designFrom('generic-sensor', (x) => { x.opamp = { ...spec('bipolar-general') }; x.target.range = [-35, 35]; });
    const rows = comparisonRows(design);
    const bipolar = rows.find((r) => r.id === 'bipolar-general')!;
    const r2r = rows.find((r) => r.id === 'cmos-rail-to-rail')!;
    expect(bipolar.current).toBe(true);
    expect(bipolar.fits).toBe(false);
    expect(bipolar.verdict).toBe('fail');
    expect(bipolar.misfits).toEqual([{ at: 'supply', side: 'high', cause: 'opamp-output' }]);
    expect(bipolar.measurandHigh!).toBeCloseTo(30, 1);
    expect(r2r.fits).toBe(true);
    expect(r2r.misfits).toEqual([]);
    expect(r2r.measurandHigh!).toBeCloseTo(44.8, 1);
    expect(r2r.verdict).not.toBe('fail');
    // Passing first: the rail-to-rail part sorts above the general-purpose one.
    expect(rows.indexOf(r2r)).toBeLessThan(rows.indexOf(bipolar));
  });

  // Scenario of our own on the battery demo (9.6 V fresh, 6.0 V at end of life, zero 4.5 V, 100 mV/A):
  // at 6.0 V an output 1.5 V short of the rail stops at 4.5 V, the zero itself, so +20 A cannot be reached.
  it('on a battery, a stage that fits when fresh but clips at end of life does not fit, and says where', () => {
    const rows = comparisonRows(demoDesign('bench-clamp'));
    const bipolar = rows.find((r) => r.id === 'bipolar-general')!;
    expect(bipolar.measurandHigh!).toBeGreaterThan(20);
    expect(bipolar.endOfLifeHigh!).toBeCloseTo(0, 1);
    expect(bipolar.fits).toBe(false);
    expect(bipolar.misfits).toEqual([{ at: 'end-of-life', side: 'high', cause: 'opamp-output' }]);
  });

  it('the design\'s own op-amp is a row of its own when its figures match no archetype, and is marked current', () => {
    const design = designFrom('generic-sensor', (x) => { x.opamp = { ...spec('zero-drift'), name: 'edited', gbw: 3e6 }; });
    const c = candidates(design);
    expect(c[0]!.source).toBe('design');
    const rows = comparisonRows(design);
    expect(rows.filter((r) => r.current).map((r) => r.source)).toEqual(['design']);
    // An unedited archetype is not repeated: its archetype row is the current one.
    const plain = designFrom('generic-sensor', (x) => { x.opamp = { ...spec('zero-drift') }; });
    expect(candidates(plain).map((x) => x.source)).not.toContain('design');
    expect(comparisonRows(plain).filter((r) => r.current).map((r) => r.id)).toEqual(['zero-drift']);
  });

  it('the design\'s report, when passed, is used for its own row (same figures as analysing it again)', () => {
    const design = designFrom('generic-sensor');
    const report = analyse(design, COMPARE_OPTIONS);
    const a = comparisonRows(design, [], report);
    const b = comparisonRows(design);
    expect(a).toEqual(b);
  });

  it('a design with no stage gives rows that fail and do not fit, without a thrown error or NaN', () => {
    // Scenario of our own: 10 V/A over ±20 A asks for a 400 V swing on a 9 V supply, which no stage reaches.
    const design = designFrom('generic-sensor', (x) => { x.target.scale = 10; x.target.range = [-20, 20]; });
    const rows = comparisonRows(design);
    for (const r of rows) {
      expect(r.fits).toBe(false);
      expect(r.verdict).toBe('fail');
      for (const v of [r.measurandLow, r.measurandHigh, r.bandwidth, r.noiseReferred]) expect(v === null || Number.isFinite(v)).toBe(true);
    }
  });
});

describe('sortRows(rows)', () => {
  const row = (id: string, verdict: ComparisonRow['verdict'], fits: boolean) => ({ id, verdict, fits }) as ComparisonRow;
  it('puts pass before caution before fail, fitting rows first within a verdict, and keeps the given order otherwise', () => {
    const sorted = sortRows([row('a', 'fail', false), row('b', 'caution', false), row('c', 'pass', true), row('d', 'caution', true), row('e', 'pass', true)]);
    expect(sorted.map((r) => r.id)).toEqual(['c', 'e', 'd', 'b', 'a']);
  });
  it('an empty list stays empty', () => expect(sortRows([])).toEqual([]));
});
