import { describe, expect, it } from 'vitest';
import { analyse } from '../../src/analysis/report.js';
import { fitReadings } from '../../src/analysis/fit.js';
import { fitLines, probeSheetRows, residualChart, trimLines, trimProblemText } from '../../src/present/readings.js';
import { designFrom } from '../helpers.js';

describe('readings in words', () => {
  it('fitLines with two readings says how many more are needed', () => {
    const lines = fitLines(fitReadings([[0, 2.5], [10, 2.75]]), [[0, 2.5], [10, 2.75]], 'A');
    expect(lines.join(' ')).toMatch(/2 usable readings: a fit with standard errors needs at least 3; take 1 more at different A values/);
  });
  it('fitLines names an unusable reading by its number from 1', () => {
    const pts: Array<[number, number]> = [[0, 2.5], [5, Number.NaN], [10, 2.75], [20, 3.0]];
    expect(fitLines(fitReadings(pts), pts, 'A')[0]).toMatch(/Readings 2 are not two numbers/);
  });
  it('trimProblemText for an AC design points to the calibration steps', () => {
    expect(trimProblemText({ code: 'ac-design' }, 'A')).toMatch(/calibration steps/);
  });
  it('trimLines numbers the turns and never prints NaN', () => {
    const r = analyse(designFrom('bench-clamp', (x) => { x.probeReadings = [[0, 4.57], [10, 5.58]]; }), { spreadTrials: 0 });
    const text = trimLines(r.trim!, r.stage!.parts, 'A').join('\n');
    expect(text).toMatch(/^1\. Turn RV\d/m);
    expect(text).toMatch(/^2\. Turn RV\d/m);
    expect(text).not.toMatch(/NaN|Infinity/);
  });
  it('residualChart plots used and left-out readings as dots, residuals in mV', () => {
    const pts: Array<[number, number]> = [[0, 1], [1, 3.001], [2, 4.999], [3, 7.002], [4, 8.998]];
    const c = residualChart(fitReadings(pts), pts, 'A')!;
    expect(c.dots).toBe(true);
    expect(c.series[0]!.points).toHaveLength(5);
    // Hand derivation, ordinary least squares (any statistics text, e.g. Montgomery & Runger, Applied Statistics and
    // Probability for Engineers, simple linear regression, from memory): x̄ = 2, ȳ = 25/5 = 5, Sxx = 10,
    // Sxy = 8 + 1.999 + 0 + 2.002 + 7.996 = 19.997, so slope 1.9997 V/A and intercept 5 − 2·1.9997 = 1.0006 V.
    // Residuals (reading − line): −0.6, +0.7, −1.0, +2.3, −1.4 mV. In volts they would be 1000 times smaller.
    const expected = [-0.6, 0.7, -1.0, 2.3, -1.4];
    c.series[0]!.points.forEach((p, i) => {
      expect(p.x).toBe(i);
      expect(p.y).toBeCloseTo(expected[i]!, 6);
    });
  });
});

describe('probeSheetRows', () => {
  // The bench-clamp demo's target: 100 mV/A around 4.5 V over −20 … +20 A.
  it('gives 0, +10, +20 and −10 A with the target outputs 4.5, 5.5, 6.5 and 3.5 V', () => {
    const rows = probeSheetRows(analyse(designFrom('bench-clamp'), { spreadTrials: 0 }));
    expect(rows.map((x) => x.measurand)).toEqual([0, 10, 20, -10]);
    rows.forEach((row, i) => expect(row.expected).toBeCloseTo([4.5, 5.5, 6.5, 3.5][i]!, 12));
  });
  it('an AC design gets rms rows at half and full range without a zero row', () => {
    const rows = probeSheetRows(analyse(designFrom('appliance-ct'), { spreadTrials: 0 }));
    expect(rows.map((x) => x.measurand)).toEqual([5, 10]);
    expect(rows[1]!.expected).toBeCloseTo(0.9, 12);
    expect(rows[0]!.unit).toBe('V rms');
  });
});
