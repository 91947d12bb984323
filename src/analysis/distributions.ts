/**
 * Student's t and Fisher's F distributions, as far as the readings fit needs them (its tests for points
 * off the line and for curvature). Both rest on the regularised incomplete beta function:
 *   t with ν degrees of freedom, t ≥ 0: P(T ≤ t) = 1 − ½·I_{ν/(ν+t²)}(ν/2, ½)      (Abramowitz & Stegun 26.7.1 with 26.5.27)
 *   F with (d1, d2) degrees of freedom: P(F ≤ f) = I_{d1·f/(d1·f+d2)}(d1/2, d2/2)  (Abramowitz & Stegun 26.6.2)
 * I_x(a, b) is evaluated by its continued fraction with the modified Lentz method (Press, Teukolsky,
 * Vetterling & Flannery, Numerical Recipes, 3rd ed., §6.4, from memory), and ln Γ by Lanczos's series
 * (C. Lanczos, SIAM J. Numer. Anal. B 1, 1964; the g = 7, nine-term coefficient set, from memory: the
 * tests check it against Γ at whole numbers and the quantiles against a published t table).
 * Quantiles are found by bisection on the monotone CDF, to 1e-12 relative.
 */

/** ln Γ(x) for x > 0 (Lanczos, g = 7, nine coefficients; relative error below 1e-14). lnGamma(5) = ln 24. */
export function lnGamma(x: number): number {
  const c = [0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
    12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7];
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - lnGamma(1 - x);
  const z = x - 1;
  let a = c[0]!;
  const t = z + 7.5;
  for (let i = 1; i < 9; i++) a += c[i]! / (z + i);
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(a);
}

/** Continued fraction of the incomplete beta function (modified Lentz). */
function betaFraction(a: number, b: number, x: number): number {
  const tiny = 1e-300;
  let c = 1, d = 1 - ((a + b) * x) / (a + 1);
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 300; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((a + m2 - 1) * (a + m2));
    d = 1 + aa * d; if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c; if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d; h *= d * c;
    aa = (-(a + m) * (a + b + m) * x) / ((a + m2) * (a + m2 + 1));
    d = 1 + aa * d; if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c; if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < 1e-15) break;
  }
  return h;
}

/** Regularised incomplete beta I_x(a, b), 0 ≤ x ≤ 1. betaRegularised(0.5, 2, 2) = 0.5. */
export function betaRegularised(x: number, a: number, b: number): number {
  if (!(x > 0)) return 0;
  if (!(x < 1)) return 1;
  const front = Math.exp(lnGamma(a + b) - lnGamma(a) - lnGamma(b) + a * Math.log(x) + b * Math.log(1 - x));
  return x < (a + 1) / (a + b + 2) ? (front * betaFraction(a, b, x)) / a : 1 - (front * betaFraction(b, a, 1 - x)) / b;
}

/** P(T ≤ t) for Student's t with ν degrees of freedom. studentCdf(12.706, 1) ≈ 0.975. */
export function studentCdf(t: number, nu: number): number {
  if (!(nu > 0) || Number.isNaN(t)) return NaN;
  const tail = 0.5 * betaRegularised(nu / (nu + t * t), nu / 2, 0.5);
  return t >= 0 ? 1 - tail : tail;
}

/** P(F ≤ f) for Fisher's F with (d1, d2) degrees of freedom. */
function fisherCdf(f: number, d1: number, d2: number): number {
  if (!(d1 > 0) || !(d2 > 0) || Number.isNaN(f)) return NaN;
  if (f <= 0) return 0;
  return betaRegularised((d1 * f) / (d1 * f + d2), d1 / 2, d2 / 2);
}

/** The x ≥ 0 at which a CDF reaches p, by bisection (the CDF rises from 0 or ½ at x = 0). */
function quantile(cdf: (x: number) => number, p: number): number {
  let lo = 0, hi = 1;
  while (cdf(hi) < p && hi < 1e12) hi *= 2;
  for (let i = 0; i < 200 && hi - lo > 1e-12 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (cdf(mid) < p) lo = mid; else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * The t with P(T ≤ t) = p for Student's t with ν degrees of freedom, p in (0.5, 1); NaN otherwise.
 * studentQuantile(0.975, 10) = 2.228 (NIST/SEMATECH e-Handbook of Statistical Methods, §1.3.6.7.2).
 */
export function studentQuantile(p: number, nu: number): number {
  if (!(p > 0.5 && p < 1) || !(nu > 0)) return NaN;
  return quantile((t) => studentCdf(t, nu), p);
}

/** The f with P(F ≤ f) = p for Fisher's F with (d1, d2) degrees of freedom, p in (0, 1); NaN otherwise. */
export function fisherQuantile(p: number, d1: number, d2: number): number {
  if (!(p > 0 && p < 1) || !(d1 > 0) || !(d2 > 0)) return NaN;
  return quantile((f) => fisherCdf(f, d1, d2), p);
}
