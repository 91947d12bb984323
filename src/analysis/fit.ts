/**
 * A sensor from its readings: a straight line fitted by least squares, with the standard errors of its
 * slope and intercept, the residual standard deviation, the points that leave the linear region at either
 * end, and single outliers. Numbers only; src/present/readings.ts says them in words.
 *
 * The line (ordinary least squares; Montgomery, Peck & Vining, Introduction to Linear Regression Analysis,
 * 5th ed., §2.2–2.3, from memory; the NIST StRD Norris dataset checks it in the tests):
 *   x̄ = Σx/n, ȳ = Σy/n, Sxx = Σ(x − x̄)², Sxy = Σ(x − x̄)(y − ȳ)
 *   slope b1 = Sxy/Sxx, intercept b0 = ȳ − b1·x̄
 *   residual variance s² = Σ(y − b0 − b1·x)²/(n − 2)
 *   se(b1) = s/√Sxx, se(b0) = s·√(1/n + x̄²/Sxx)
 *
 * The linear region (our rule, built from two textbook tests at stated levels; docs/method.md):
 * sort the usable points by measurand and start from all of them. Repeat while at least four remain:
 *  1. Fit the line and compute every point's externally studentised residual (R-student)
 *       t_i = e_i / √(s_(i)²·(1 − h_i)),  h_i = 1/m + (x_i − x̄)²/Sxx,
 *       s_(i)² = ((m − 2)·s² − e_i²/(1 − h_i)) / (m − 3)
 *     (Montgomery, Peck & Vining §4.2.2; Belsley, Kuh & Welsch 1980). The largest |t_i| is an outlier at
 *     level α = 0.01 when it exceeds the Bonferroni bound t(1 − α/(2m), m − 3) (the outlier test of
 *     Weisberg, Applied Linear Regression, 4th ed., §9.4, from memory). At an end of the run the point
 *     leaves the linear region; inside it, it is flagged as a single outlier and left out of the fit.
 *  2. Otherwise test the run for curvature: add x² and x³ to the line (x² alone for five points) and
 *     compare by the extra-sum-of-squares F test (Montgomery, Peck & Vining §3.3.2) at level 0.01. If the
 *     added terms are significant, the end point with the larger |t_i| leaves the linear region.
 *  3. Otherwise stop: what remains is the linear region, and the line fitted to it is the result.
 * Both tests need noise to judge by: readings that lie exactly on a line (s = 0) stop at once.
 */
import type { Reading } from '../model/readings.js';
import { fisherQuantile, studentQuantile } from './distributions.js';

/** Level of the Bonferroni outlier test (1 %: a clean set of readings loses a point by chance about once in a hundred). */
export const OUTLIER_ALPHA = 0.01;
/** Level of the curvature test (1 %, as for outliers). */
export const CURVATURE_ALPHA = 0.01;
/** Fewest usable readings a fit gives standard errors from. */
export const MIN_READINGS = 3;

export interface LineFit {
  slope: number;
  intercept: number;
  /** Standard errors of slope and intercept (NaN with two points). */
  slopeStdError: number;
  interceptStdError: number;
  /** Residual standard deviation s, in output units (NaN with two points). */
  residualStd: number;
  /** Points used and degrees of freedom (n − 2). */
  n: number;
  dof: number;
  xMean: number;
  sxx: number;
}

/**
 * Ordinary least-squares line through (x, y), or null with fewer than two points or no spread in x.
 * leastSquares([0, 1, 2], [1, 3, 5]) → slope 2, intercept 1, residualStd 0.
 */
export function leastSquares(xs: ArrayLike<number>, ys: ArrayLike<number>): LineFit | null {
  const n = xs.length;
  if (n < 2 || ys.length !== n) return null;
  let sx = 0, sy = 0;
  for (let i = 0; i < n; i++) { sx += xs[i]!; sy += ys[i]!; }
  const xm = sx / n, ym = sy / n;
  let sxx = 0, sxy = 0;
  for (let i = 0; i < n; i++) { const dx = xs[i]! - xm; sxx += dx * dx; sxy += dx * (ys[i]! - ym); }
  if (!(sxx > 0) || !Number.isFinite(sxx)) return null;
  const slope = sxy / sxx;
  const intercept = ym - slope * xm;
  let ss = 0;
  for (let i = 0; i < n; i++) { const e = ys[i]! - intercept - slope * xs[i]!; ss += e * e; }
  const dof = n - 2;
  const s = dof > 0 ? Math.sqrt(ss / dof) : NaN;
  return { slope, intercept, slopeStdError: s / Math.sqrt(sxx), interceptStdError: s * Math.sqrt(1 / n + (xm * xm) / sxx), residualStd: s, n, dof, xMean: xm, sxx };
}

/** Residual sum of squares of y regressed on the given columns (modified Gram–Schmidt; columns are not changed). */
function residualSumOfSquares(columns: number[][], y: number[]): number {
  const q: number[][] = [];
  const r = y.slice();
  for (const col of columns) {
    const v = col.slice();
    for (const u of q) { let d = 0; for (let i = 0; i < v.length; i++) d += u[i]! * v[i]!; for (let i = 0; i < v.length; i++) v[i]! -= d * u[i]!; }
    let norm = 0; for (const a of v) norm += a * a;
    norm = Math.sqrt(norm);
    if (!(norm > 1e-12)) continue;
    const u = v.map((a) => a / norm);
    q.push(u);
    let d = 0; for (let i = 0; i < r.length; i++) d += u[i]! * r[i]!;
    for (let i = 0; i < r.length; i++) r[i]! -= d * u[i]!;
  }
  let ss = 0; for (const a of r) ss += a * a;
  return ss;
}

export type FitProblem =
  | { code: 'too-few-points'; have: number; need: number }
  | { code: 'no-spread'; have: number; need: number };

export interface ReadingsFit {
  /** The line fitted to the linear region without outliers (null when the readings cannot give one). */
  line: LineFit | null;
  problem: FitProblem | null;
  /** Readings given, and readings the line was fitted to. */
  points: number;
  used: number;
  /** Indices (into the readings as given) of the points the line was fitted to. */
  usedIndices: number[];
  /** Single outliers inside the linear region, left out of the fit. */
  outliers: number[];
  /** Points beyond the linear region at its low and high end. */
  beyondLow: number[];
  beyondHigh: number[];
  /** Readings that are not two finite numbers. */
  unusable: number[];
  /** The measurand span of the points used: the linear region the readings show. */
  linear: [number, number] | null;
  /** Each reading's residual from the fitted line, output units (NaN for an unusable one). */
  residuals: number[];
}

interface Judged { t: number[]; s: number; fit: LineFit }

/** R-student of each point of a run (see the module comment). */
function judge(xs: number[], ys: number[]): Judged | null {
  const fit = leastSquares(xs, ys);
  if (!fit) return null;
  const m = xs.length;
  const s2 = fit.residualStd ** 2;
  const t = xs.map((x, i) => {
    const e = ys[i]! - fit.intercept - fit.slope * x;
    const h = 1 / m + (x - fit.xMean) ** 2 / fit.sxx;
    const si2 = ((m - 2) * s2 - (e * e) / (1 - h)) / (m - 3);
    const v = e / Math.sqrt(Math.max(si2, 0) * (1 - h));
    return Number.isNaN(v) ? 0 : v;
  });
  return { t, s: fit.residualStd, fit };
}

/** Whether a cubic (or quadratic, for five points) bends significantly away from the line through the run. */
function curved(xs: number[], ys: number[]): boolean {
  const m = xs.length;
  if (m < 5) return false;
  const lo = Math.min(...xs), hi = Math.max(...xs);
  const mid = (lo + hi) / 2, half = (hi - lo) / 2 || 1;
  const u = xs.map((x) => (x - mid) / half);
  const one = u.map(() => 1);
  const extra = m >= 6 ? 2 : 1;
  const cols = [one, u, u.map((a) => a * a), u.map((a) => a * a * a)].slice(0, 2 + extra);
  const rssLine = residualSumOfSquares(cols.slice(0, 2), ys);
  const rssBent = residualSumOfSquares(cols, ys);
  const dof = m - 2 - extra;
  if (!(rssBent > 0)) return rssLine > 0;
  const f = ((rssLine - rssBent) / extra) / (rssBent / dof);
  return f > fisherQuantile(1 - CURVATURE_ALPHA, extra, dof);
}

/**
 * Fits readings (measurand, output) as described in the module comment.
 * fitReadings([[0, 2.5], [10, 2.75], [20, 3.0]]).line → slope 0.025, intercept 2.5.
 */
export function fitReadings(readings: readonly Reading[]): ReadingsFit {
  const out: ReadingsFit = {
    line: null, problem: null, points: readings.length, used: 0, usedIndices: [], outliers: [], beyondLow: [], beyondHigh: [], unusable: [],
    linear: null, residuals: readings.map(() => NaN),
  };
  const usable: number[] = [];
  readings.forEach((r, i) => {
    if (Array.isArray(r) && Number.isFinite(r[0]) && Number.isFinite(r[1])) usable.push(i); else out.unusable.push(i);
  });
  if (usable.length < MIN_READINGS) {
    out.problem = { code: 'too-few-points', have: usable.length, need: MIN_READINGS };
    return out;
  }
  const order = usable.slice().sort((a, b) => readings[a]![0] - readings[b]![0] || a - b);
  if (readings[order[0]!]![0] === readings[order[order.length - 1]!]![0]) {
    out.problem = { code: 'no-spread', have: usable.length, need: 2 };
    return out;
  }
  const outliers = new Set<number>();
  const maxOutliers = Math.max(1, Math.floor(usable.length / 10));
  let lo = 0, hi = order.length - 1;
  for (;;) {
    const run = order.slice(lo, hi + 1).filter((i) => !outliers.has(i));
    const m = run.length;
    if (m < 4) break;
    const xs = run.map((i) => readings[i]![0]), ys = run.map((i) => readings[i]![1]);
    // A run with one measurand value left cannot be judged further.
    if (xs[0] === xs[m - 1]) break;
    const j = judge(xs, ys);
    if (!j) break;
    const yspan = Math.max(...ys.map(Math.abs), 1e-300);
    if (!(j.s > 1e-12 * yspan)) break;
    let worst = 0;
    for (let k = 1; k < m; k++) if (Math.abs(j.t[k]!) > Math.abs(j.t[worst]!)) worst = k;
    const bound = studentQuantile(1 - OUTLIER_ALPHA / (2 * m), m - 3);
    const dropEnd = (k: number) => {
      // Drop the run's end point k (0 or m − 1) from the window, with any outliers flagged beyond it.
      if (k === 0) { while (order[lo] !== run[0]) lo++; out.beyondLow.push(run[0]!); lo++; }
      else { while (order[hi] !== run[m - 1]) hi--; out.beyondHigh.push(run[m - 1]!); hi--; }
    };
    if (Math.abs(j.t[worst]!) > bound) {
      if (worst === 0 || worst === m - 1) { dropEnd(worst); continue; }
      if (outliers.size < maxOutliers) { outliers.add(run[worst]!); continue; }
    }
    if (curved(xs, ys)) {
      dropEnd(Math.abs(j.t[0]!) >= Math.abs(j.t[m - 1]!) ? 0 : m - 1);
      continue;
    }
    break;
  }
  const run = order.slice(lo, hi + 1).filter((i) => !outliers.has(i));
  // Outliers flagged before the run shrank past them now lie beyond it: count them there instead.
  for (const i of outliers) {
    const pos = order.indexOf(i);
    if (pos < lo) out.beyondLow.push(i); else if (pos > hi) out.beyondHigh.push(i); else out.outliers.push(i);
  }
  out.outliers.sort((a, b) => a - b);
  out.beyondLow.sort((a, b) => readings[a]![0] - readings[b]![0]);
  out.beyondHigh.sort((a, b) => readings[a]![0] - readings[b]![0]);
  const line = leastSquares(run.map((i) => readings[i]![0]), run.map((i) => readings[i]![1]));
  if (!line) {
    out.problem = { code: 'no-spread', have: run.length, need: 2 };
    return out;
  }
  out.line = line;
  out.usedIndices = run.slice().sort((a, b) => a - b);
  out.used = run.length;
  out.linear = [readings[run[0]!]![0], readings[run[run.length - 1]!]![0]];
  out.residuals = readings.map((r, i) => (usable.includes(i) ? r[1] - line.intercept - line.slope * r[0] : NaN));
  return out;
}

/**
 * The fit as the CLI's JSON object (format "gainwright-fit", version 1). Indices count from 0 in the order
 * the readings were given; numbers that cannot be computed are null.
 */
export function fitJson(f: ReadingsFit): Record<string, unknown> {
  const num = (x: number | undefined) => (x === undefined || !Number.isFinite(x) ? null : x);
  return {
    format: 'gainwright-fit',
    version: 1,
    slope: num(f.line?.slope),
    intercept: num(f.line?.intercept),
    slopeStdError: num(f.line?.slopeStdError),
    interceptStdError: num(f.line?.interceptStdError),
    residualStd: num(f.line?.residualStd),
    linear: f.linear ? [f.linear[0], f.linear[1]] : null,
    points: f.points,
    used: f.used,
    outliers: f.outliers.slice(),
  };
}
