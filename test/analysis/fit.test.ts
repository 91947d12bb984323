import { describe, expect, it } from 'vitest';
import { fitJson, fitReadings, leastSquares } from '../../src/analysis/fit.js';
import { betaRegularised, fisherQuantile, lnGamma, studentQuantile } from '../../src/analysis/distributions.js';
import { mulberry32 } from '../../src/model/random.js';
import type { Reading } from '../../src/model/readings.js';

/**
 * NIST Statistical Reference Datasets, linear least squares, "Norris" (lower difficulty, 36 observations;
 * https://www.itl.nist.gov/div898/strd/lls/data/Norris.shtml). The data and the certified values as shipped
 * in the GNU Scientific Library's fit tests (repository BrianGladman/gsl, fit/test.c: B0, B1, their
 * standard deviations, residual sum of squares 26.6173985294224); the certified residual standard deviation
 * 0.884796396144373 is √(26.6173985294224 / 34), 34 residual degrees of freedom (NIST's page lists it too).
 */
const NORRIS_X = [0.2, 337.4, 118.2, 884.6, 10.1, 226.5, 666.3, 996.3, 448.6, 777.0, 558.2, 0.4, 0.6, 775.5, 666.9, 338.0,
  447.5, 11.6, 556.0, 228.1, 995.8, 887.6, 120.2, 0.3, 0.3, 556.8, 339.1, 887.2, 999.0, 779.0, 11.1, 118.3, 229.2, 669.1, 448.9, 0.5];
const NORRIS_Y = [0.1, 338.8, 118.1, 888.0, 9.2, 228.1, 668.5, 998.5, 449.1, 778.9, 559.2, 0.3, 0.1, 778.1, 668.8, 339.3,
  448.9, 10.8, 557.7, 228.3, 998.0, 888.8, 119.6, 0.3, 0.6, 557.6, 339.3, 888.0, 998.5, 778.9, 10.2, 117.6, 228.9, 668.4, 449.2, 0.2];

/** Gaussian noise from the seeded generator (Box–Muller). */
function gauss(rand: () => number): number {
  return Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
}

describe('leastSquares against NIST StRD Norris', () => {
  const f = leastSquares(NORRIS_X, NORRIS_Y)!;
  it('leastSquares(Norris) gives the certified slope and intercept to 1e-12 relative', () => {
    expect(Math.abs(f.slope / 1.00211681802045 - 1)).toBeLessThan(1e-12);
    expect(Math.abs(f.intercept / -0.262323073774029 - 1)).toBeLessThan(1e-11);
  });
  it('leastSquares(Norris) gives the certified standard deviations of the estimates and the residual SD', () => {
    expect(Math.abs(f.slopeStdError / 0.429796848199937e-3 - 1)).toBeLessThan(1e-10);
    expect(Math.abs(f.interceptStdError / 0.232818234301152 - 1)).toBeLessThan(1e-10);
    expect(Math.abs(f.residualStd / 0.884796396144373 - 1)).toBeLessThan(1e-10);
    expect(f.dof).toBe(34);
  });
  it('fitReadings(Norris) keeps all 36 points: no knee and no outlier at the 1 % Bonferroni level', () => {
    const r = fitReadings(NORRIS_X.map((x, i) => [x, NORRIS_Y[i]!] as Reading));
    expect(r.used).toBe(36);
    expect(r.outliers).toEqual([]);
    expect(r.linear).toEqual([0.2, 999.0]);
    expect(Math.abs(r.line!.slope / 1.00211681802045 - 1)).toBeLessThan(1e-12);
  });
});

describe('distributions', () => {
  // Γ(n) = (n − 1)! (definition).
  it('lnGamma(5) = ln 24 and lnGamma(11) = ln 3628800', () => {
    expect(lnGamma(5)).toBeCloseTo(Math.log(24), 12);
    expect(lnGamma(11)).toBeCloseTo(Math.log(3628800), 10);
  });
  // I_x(a, a) is symmetric about x = ½ (definition); I_x(1, 1) = x.
  it('betaRegularised(0.5, 3, 3) = 0.5 and betaRegularised(0.3, 1, 1) = 0.3', () => {
    expect(betaRegularised(0.5, 3, 3)).toBeCloseTo(0.5, 12);
    expect(betaRegularised(0.3, 1, 1)).toBeCloseTo(0.3, 12);
  });
  // Upper critical values of Student's t (NIST/SEMATECH e-Handbook of Statistical Methods, §1.3.6.7.2, three decimals).
  it.each([[0.975, 1, 12.706], [0.975, 10, 2.228], [0.995, 5, 4.032], [0.999, 3, 10.215], [0.975, 100, 1.984], [0.95, 30, 1.697]])(
    'studentQuantile(%d, %d) = %d', (p, nu, t) => {
      expect(studentQuantile(p, nu)).toBeCloseTo(t, 3);
    });
  // F(1, ν) is t(ν)² (definition of F), so the F quantile at 1 − α equals the square of t at 1 − α/2.
  it('fisherQuantile(0.95, 1, 10) = 2.228²', () => {
    expect(fisherQuantile(0.95, 1, 10)).toBeCloseTo(2.228 ** 2, 2);
  });
  it('studentQuantile outside (0.5, 1) is NaN rather than a wrong number', () => {
    expect(studentQuantile(0.3, 5)).toBeNaN();
    expect(studentQuantile(0.9, 0)).toBeNaN();
  });
});

describe('fitReadings: the linear region and outliers', () => {
  // Our own invented readings: a sensor at 25 mV/A around 2.5 V, read every 2 A from −40 A to +40 A with
  // 2 mV rms of noise, whose output saturates above +24 A: y = y(24) + S·τ·(1 − e^(−(x−24)/τ)), τ = 5 A.
  const S = 0.025, Q = 2.5, KNEE = 24, TAU = 5, NOISE = 0.002;
  const make = (seed: number): Reading[] => {
    const rand = mulberry32(seed);
    const pts: Reading[] = [];
    for (let x = -40; x <= 40; x += 2) {
      const clean = x <= KNEE ? Q + S * x : Q + S * KNEE + S * TAU * (1 - Math.exp(-(x - KNEE) / TAU));
      pts.push([x, clean + NOISE * gauss(rand)]);
    }
    return pts;
  };
  for (const seed of [1, 2, 3, 4, 5]) {
    it(`a line with noise and a saturating top (seed ${seed}): the high end of the linear region is found within one step of the knee`, () => {
      const f = fitReadings(make(seed));
      expect(f.line).not.toBeNull();
      expect(f.linear![0]).toBe(-40);
      expect(f.linear![1]).toBeGreaterThanOrEqual(KNEE - 2);
      expect(f.linear![1]).toBeLessThanOrEqual(KNEE + 2);
      expect(f.beyondHigh.length).toBeGreaterThanOrEqual(7);
      expect(f.beyondLow).toEqual([]);
      // The slope and intercept land on the invented line within four standard errors.
      expect(Math.abs(f.line!.slope - S)).toBeLessThan(4 * f.line!.slopeStdError);
      expect(Math.abs(f.line!.intercept - Q)).toBeLessThan(4 * f.line!.interceptStdError);
      expect(f.line!.residualStd).toBeGreaterThan(NOISE * 0.6);
      expect(f.line!.residualStd).toBeLessThan(NOISE * 1.5);
    });
  }
  it('a straight line with noise keeps every point (seed 7)', () => {
    const rand = mulberry32(7);
    const pts: Reading[] = [];
    for (let x = -20; x <= 20; x += 2) pts.push([x, Q + S * x + NOISE * gauss(rand)]);
    const f = fitReadings(pts);
    expect(f.used).toBe(pts.length);
    expect(f.linear).toEqual([-20, 20]);
  });
  it('a single wrong reading in the middle is flagged as an outlier and left out', () => {
    const rand = mulberry32(11);
    const pts: Reading[] = [];
    for (let x = 0; x <= 20; x += 1) pts.push([x, Q + S * x + NOISE * gauss(rand)]);
    pts[9] = [9, pts[9]![1] + 0.05];
    const f = fitReadings(pts);
    expect(f.outliers).toEqual([9]);
    expect(f.used).toBe(pts.length - 1);
    expect(f.linear).toEqual([0, 20]);
    expect(Math.abs(f.line!.slope - S)).toBeLessThan(4 * f.line!.slopeStdError);
  });
  it('a symmetric saturation at both ends loses points at both ends', () => {
    const rand = mulberry32(5);
    const pts: Reading[] = [];
    for (let x = -40; x <= 40; x += 2) pts.push([x, Q + S * 20 * Math.tanh(x / 20) + NOISE * gauss(rand)]);
    const f = fitReadings(pts);
    expect(f.beyondLow.length).toBeGreaterThan(0);
    expect(f.beyondHigh.length).toBeGreaterThan(0);
    expect(f.linear![0]).toBeLessThan(0);
    expect(f.linear![1]).toBeGreaterThan(0);
  });
  it('readings exactly on a line are all used, with zero residual deviation', () => {
    const f = fitReadings([[0, 1], [1, 3], [2, 5], [3, 7], [4, 9]]);
    expect(f.used).toBe(5);
    expect(f.line!.slope).toBeCloseTo(2, 12);
    expect(f.line!.residualStd).toBeCloseTo(0, 12);
  });
  it('fewer than three usable readings give the too-few-points problem and no line', () => {
    const f = fitReadings([[0, 2.5], [1, Number.NaN], [2, 2.55]]);
    expect(f.line).toBeNull();
    expect(f.problem).toEqual({ code: 'too-few-points', have: 2, need: 3 });
    expect(f.unusable).toEqual([1]);
  });
  it('readings all at one measurand give the no-spread problem', () => {
    expect(fitReadings([[1, 2], [1, 2.1], [1, 2.2]]).problem?.code).toBe('no-spread');
  });
  it('fitJson has exactly the keys of the gainwright-fit object, and null for what two points cannot give', () => {
    const j = fitJson(fitReadings([[0, 1], [1, 3], [2, 5.1]]));
    expect(Object.keys(j)).toEqual(['format', 'version', 'slope', 'intercept', 'slopeStdError', 'interceptStdError', 'residualStd', 'linear', 'points', 'used', 'outliers']);
    expect(j.format).toBe('gainwright-fit');
    expect(j.used).toBe(3);
    const none = fitJson(fitReadings([[0, 1]]));
    expect(none.slope).toBeNull();
    expect(none.linear).toBeNull();
  });
});
