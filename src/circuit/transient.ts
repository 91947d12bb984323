/**
 * Time-domain solve of an MNA circuit (src/circuit/mna.ts) with the second-order backward differentiation
 * formula (BDF2, "Gear 2"): C. W. Gear, "Numerical Initial Value Problems in Ordinary Differential
 * Equations" (Prentice-Hall, 1971); the variable-step coefficients as in Hairer & Wanner, "Solving Ordinary
 * Differential Equations II", §III.5. BDF2 is A-stable and damps modes far faster than the step (the
 * op-amp's output resistance into a cable's capacitance), where the trapezoidal rule would ring. The first
 * step after a breakpoint (an edge or corner of the input) is backward Euler.
 *
 * Every element is taken as it stands: a capacitor i = C·dv/dt, an inductor v = L·di/dt, a gain block with a
 * pole τ·dy/dt + y = A0·v_d (τ = 1/2πf_p). Gain blocks given a large-signal limit (the op-amp's) also obey
 * |dy/dt| ≤ SR (slew) and low ≤ y ≤ high (output swing, with the integrator held at the limit so that it
 * recovers as soon as the loop asks it back). Each step picks the block's mode (linear, slewing, clipped) by
 * solving and re-checking until the mode agrees with the solution (a piecewise-linear Newton).
 * Units: SI (s, V, A). Sources follow v = dc0 + dc1·x(t), x the measurand.
 */
import { luFactorReal, luSolveReal, rhs, stampReal, type Circuit } from './mna.js';

/** Large-signal limits of one gain block (an op-amp): its output swing and slew rate. */
export interface BlockLimit {
  /** Element index of the gain block (an `E` with a pole). */
  index: number;
  /** Output limits of the block's output (V(a) − V(b)), V. */
  low: number;
  high: number;
  /** Slew rate, V/s. */
  slew: number;
}

export interface TransientPlan {
  /** Measurand against time (`left`: the value just before t, where x jumps); sources take dc0 + dc1·x(t). */
  measurand: (t: number, left: boolean) => number;
  /** Start (the circuit sits at its DC point for x just before it) and end of the run, s. */
  t0: number;
  t1: number;
  /** Times where x(t) jumps or has a corner, ascending: the step restarts small there. */
  breakpoints: number[];
  /** Step right after a breakpoint, the largest step near an edge, the largest step, and the largest before `recordFrom`. */
  hMin: number;
  hFine: number;
  hMax: number;
  hMaxWarm: number;
  /** How long after a breakpoint in the recorded window the step stays at most hFine, s. */
  fineFor: number;
  /** Steps from this time on are recorded. */
  recordFrom: number;
  /** Node indices recorded. */
  nodes: number[];
  limits: BlockLimit[];
}

/** Mode of a limited block: 0 linear, ±1 slewing up/down, ±2 held at the high/low limit. */
export type BlockMode = -2 | -1 | 0 | 1 | 2;

export interface TransientTrace {
  /** Step times from `recordFrom`, s. */
  t: Float64Array;
  /** Voltages of the recorded nodes at those times, one array per node. */
  v: Float64Array[];
  /** Per step, bits: 1 when some block slewed, 2 when some block was held at a limit. */
  mode: Uint8Array;
}

interface Factor { A: Float64Array; piv: Int32Array; ok: boolean }

/**
 * Integrates the circuit from its DC point at x(t0⁻) to t1. Returns null when a matrix is singular or the
 * run would take more than 400 000 steps.
 * Example: an RC low-pass (R = 1 kΩ, C = 1 µF) driven by a unit step gives v(1 ms) = 1 − e⁻¹ ≈ 0.632 V.
 */
export function transient(c: Circuit, plan: TransientPlan): TransientTrace | null {
  const n = c.size;
  const els = c.elements;
  const b0 = rhs(c, (e) => e.dc0 ?? 0), b1 = rhs(c, (e) => e.dc1 ?? 0);
  // Dynamic elements and their state quantity q: C → v(a) − v(b); L → branch current; E with pole → v(a) − v(b).
  const dyn: number[] = [];
  els.forEach((e, i) => { if (e.kind === 'C' || e.kind === 'L' || (e.kind === 'E' && e.pole && e.pole > 0)) dyn.push(i); });
  const tau = new Float64Array(els.length);
  for (const i of dyn) { const e = els[i]!; if (e.kind === 'E') tau[i] = 1 / (2 * Math.PI * e.pole!); }
  const blocks = plan.limits.filter((l) => els[l.index]?.kind === 'E');
  const modes = new Int8Array(blocks.length);
  const blockOf = new Int32Array(els.length).fill(-1);
  blocks.forEach((l, j) => { blockOf[l.index] = j; });
  const modeCode = () => { let k = 0; for (let j = 0; j < modes.length; j++) k = k * 5 + modes[j]! + 2; return k; };
  const x = new Float64Array(n), b = new Float64Array(n), scratch = new Float64Array(n);
  const qNow = new Float64Array(els.length), qPrev = new Float64Array(els.length), hist = new Float64Array(els.length);
  const volt = (sol: Float64Array, node: number) => (node > 0 ? sol[node - 1]! : 0);
  const stateOf = (sol: Float64Array, i: number) => {
    const e = els[i]!;
    return e.kind === 'L' ? sol[c.branch[i]!]! : volt(sol, e.a) - volt(sol, e.b);
  };

  // Factorisations by (α, modes): a run uses a handful of step sizes, so most steps only back-substitute.
  const cache = new Map<number, Map<number, Factor>>();
  let cached = 0;
  const factor = (alpha: number): Factor => {
    const code = modeCode();
    let byMode = cache.get(alpha);
    let f = byMode?.get(code);
    if (f) return f;
    if (cached > 400) { cache.clear(); cached = 0; byMode = undefined; }
    if (!byMode) { byMode = new Map(); cache.set(alpha, byMode); }
    const A = new Float64Array(n * n);
    stampReal(c, A, false);
    for (const i of dyn) {
      const e = els[i]!, a = e.a - 1, bb = e.b - 1, k = c.branch[i]!;
      if (e.kind === 'C') {
        const g = e.value * alpha;
        if (a >= 0) A[a * n + a]! += g;
        if (bb >= 0) A[bb * n + bb]! += g;
        if (a >= 0 && bb >= 0) { A[a * n + bb]! -= g; A[bb * n + a]! -= g; }
      } else if (e.kind === 'L') {
        A[k * n + k]! -= e.value * alpha;
      } else {
        // (1 + τα)·y − A0·v_d = τ·hist, or y pinned in a limited mode.
        const bi = blockOf[i]!;
        const m = bi >= 0 ? modes[bi]! : 0;
        if (m !== 0 && !(alpha === 0 && Math.abs(m) === 1)) {
          A.fill(0, k * n, k * n + n);
          if (a >= 0) A[k * n + a] = 1;
          if (bb >= 0) A[k * n + bb] = -1;
        } else {
          if (a >= 0) A[k * n + a]! += tau[i]! * alpha;
          if (bb >= 0) A[k * n + bb]! -= tau[i]! * alpha;
        }
      }
    }
    const piv = new Int32Array(n);
    f = { A, piv, ok: luFactorReal(A, n, piv) };
    byMode.set(code, f);
    cached++;
    return f;
  };

  /** One solve at time t with BDF coefficient α (0 = DC) and the history terms in `hist`. */
  const solveAt = (t: number, alpha: number, left = false): boolean => {
    const xm = plan.measurand(t, left);
    for (let iter = 0; iter < 8; iter++) {
      const f = factor(alpha);
      if (!f.ok) return false;
      for (let r = 0; r < n; r++) b[r] = b0[r]! + xm * b1[r]!;
      for (const i of dyn) {
        const e = els[i]!, k = c.branch[i]!;
        if (e.kind === 'C') {
          const j = e.value * hist[i]!;
          if (e.a > 0) b[e.a - 1]! += j;
          if (e.b > 0) b[e.b - 1]! -= j;
        } else if (e.kind === 'L') {
          b[k] = b[k]! - e.value * hist[i]!;
        } else {
          const bi = blockOf[i]!;
          const m = bi >= 0 ? modes[bi]! : 0;
          const l = bi >= 0 ? blocks[bi]! : null;
          if (l && m === 2) b[k] = l.high;
          else if (l && m === -2) b[k] = l.low;
          else if (l && alpha > 0 && (m === 1 || m === -1)) b[k] = (hist[i]! + m * l.slew) / alpha;
          else b[k] = b[k]! + tau[i]! * hist[i]!;
        }
      }
      x.set(b);
      luSolveReal(f.A, n, f.piv, x, scratch);
      // Does each block's mode agree with the solution? g is the rate the linear block would want.
      let changed = false;
      for (let j = 0; j < blocks.length; j++) {
        const l = blocks[j]!, e = els[l.index]!;
        const y = volt(x, e.a) - volt(x, e.b);
        const vd = volt(x, e.cp ?? 0) - volt(x, e.cn ?? 0);
        const g = (e.value * vd - y) / tau[l.index]!;
        const m = modes[j]!;
        let next: BlockMode = 0;
        const tol = 1e-9 * Math.max(1, Math.abs(l.high), Math.abs(l.low));
        if (m === 2) next = g < 0 ? (alpha > 0 && g < -l.slew ? -1 : 0) : 2;
        else if (m === -2) next = g > 0 ? (alpha > 0 && g > l.slew ? 1 : 0) : -2;
        else if (y > l.high + tol) next = 2;
        else if (y < l.low - tol) next = -2;
        else if (alpha > 0 && g > l.slew * (1 + 1e-9)) next = 1;
        else if (alpha > 0 && g < -l.slew * (1 + 1e-9)) next = -1;
        if (next !== m) { modes[j] = next; changed = true; }
      }
      if (!changed) return true;
    }
    return true;
  };

  // DC point just before t0: capacitors open, inductors shorted, blocks at A0 (clipped if need be).
  hist.fill(0);
  if (!solveAt(plan.t0, 0, true)) return null;
  for (const i of dyn) { qNow[i] = stateOf(x, i); qPrev[i] = qNow[i]!; }

  const maxSteps = 400_000;
  let tBuf = new Float64Array(1024), vBuf = plan.nodes.map(() => new Float64Array(1024)), mBuf = new Uint8Array(1024);
  let count = 0;
  const push = (t: number) => {
    if (t < plan.recordFrom) return;
    if (count === tBuf.length) {
      const grow = <T extends Float64Array | Uint8Array>(a: T): T => { const z = new (a.constructor as new (k: number) => T)(a.length * 2); z.set(a); return z; };
      tBuf = grow(tBuf); vBuf = vBuf.map(grow); mBuf = grow(mBuf);
    }
    tBuf[count] = t;
    plan.nodes.forEach((nd, j) => { vBuf[j]![count] = volt(x, nd); });
    let m = 0;
    for (let j = 0; j < blocks.length; j++) m |= Math.abs(modes[j]!) === 1 ? 1 : modes[j] ? 2 : 0;
    mBuf[count] = m;
    count++;
  };
  push(plan.t0);

  const bps = plan.breakpoints.filter((tb) => tb > plan.t0 && tb <= plan.t1);
  let nextBp = 0;
  let t = plan.t0, h = plan.hMin, hPrev = 0, lastBp = plan.t0, atSize = 0;
  let firstOrder = true;
  let steps = 0;
  while (t < plan.t1 && steps < maxSteps) {
    steps++;
    // Before the recorded window only the slow state has to come out right: edges are not resolved finely there.
    const limit = t < plan.recordFrom ? plan.hMaxWarm : t - lastBp < plan.fineFor ? plan.hFine : plan.hMax;
    h = Math.min(h, limit);
    let tn = t + h;
    let hitsBp = false;
    const bp = bps[nextBp];
    if (bp !== undefined && tn >= bp - 1e-9 * h) { tn = bp; hitsBp = true; }
    if (tn > plan.t1) tn = plan.t1;
    const hh = tn - t;
    if (!(hh > 0)) { t = tn; if (hitsBp) nextBp++; continue; }
    let alpha: number;
    if (firstOrder || hPrev === 0) {
      alpha = 1 / hh;
      for (const i of dyn) hist[i] = qNow[i]! / hh;
    } else {
      const w = hh / hPrev;
      alpha = (1 + 2 * w) / ((1 + w) * hh);
      for (const i of dyn) hist[i] = ((1 + w) * qNow[i]! - ((w * w) / (1 + w)) * qPrev[i]!) / hh;
    }
    const before = modeCode();
    // Arriving at a breakpoint the input still has its value from before the jump.
    if (!solveAt(tn, alpha, hitsBp)) return null;
    for (const i of dyn) { qPrev[i] = qNow[i]!; qNow[i] = stateOf(x, i); }
    hPrev = hh; t = tn;
    push(t);
    firstOrder = false;
    if (hitsBp) {
      nextBp++; lastBp = t; firstOrder = true; h = plan.hMin; atSize = 0; hPrev = 0;
    } else if (modeCode() !== before) {
      // A block entered or left a limit inside the step: its output has a corner there, as the input has at a
      // breakpoint, so the next step restarts as one: shorter, and first order (BDF2's history would carry the
      // slope from before the corner across it, and on a long step overshoot into a cycle of slewing up and down).
      h = Math.max(h / 4, plan.hMin); atSize = 0; firstOrder = true; hPrev = 0;
    } else if (++atSize >= 2) {
      h = Math.min(h * 2, Math.max(plan.hMax, plan.hMaxWarm)); atSize = 0;
    }
  }
  // A run that would need more steps than this is refused rather than left short.
  if (t < plan.t1) return null;
  return { t: tBuf.slice(0, count), v: vBuf.map((a) => a.slice(0, count)), mode: mBuf.slice(0, count) };
}

/** Linear interpolation of (t, v) at x, t ascending; clamped at the ends. `interpolate([0, 1], [0, 10], 0.25)` → 2.5. */
export function interpolate(t: ArrayLike<number>, v: ArrayLike<number>, x: number): number {
  const n = t.length;
  if (n === 0) return NaN;
  if (x <= t[0]!) return v[0]!;
  if (x >= t[n - 1]!) return v[n - 1]!;
  let lo = 0, hi = n - 1;
  while (hi - lo > 1) { const m = (lo + hi) >> 1; if (t[m]! <= x) lo = m; else hi = m; }
  const w = (x - t[lo]!) / (t[hi]! - t[lo]! || 1);
  return v[lo]! + w * (v[hi]! - v[lo]!);
}
