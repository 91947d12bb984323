/**
 * Modified nodal analysis (Ho, Ruehli & Brennan, "The modified nodal approach to network analysis",
 * IEEE Trans. Circuits Syst. 22, 1975) on a small dense complex matrix.
 *
 * A small hand-written solver instead of mathjs matrices: the circuits have 10–30 unknowns and are solved
 * hundreds of times per report (every frequency, every Monte Carlo trial), where mathjs's boxed complex
 * numbers cost an allocation per operation. Typed arrays and an in-place LU keep a solve allocation-free.
 */

export type ElementKind = 'R' | 'C' | 'L' | 'V' | 'I' | 'E' | 'H';

/**
 * What an element stands for in the stage, so that analyses find it by meaning rather than by its netlist
 * name: the signal source, the sensor's zero, each rail, the op-amp's offset source, bias-current sources and
 * gain block, the sensor's source resistance, a current transformer's burden, a shunt, the instrument's input,
 * a closed-loop sensor's compensation driver.
 */
export type ElementRole = 'signal' | 'sensor-zero' | 'rail-positive' | 'rail-negative' | 'rail-regulated' | 'opamp-offset' | 'opamp-gain' | 'sensor-source'
  | 'opamp-bias-positive' | 'opamp-bias-negative' | 'burden' | 'shunt' | 'load' | 'driver';

export interface Element {
  kind: ElementKind;
  /** The netlist designator (unique in a circuit). */
  name: string;
  /** What the element stands for, when an analysis needs to find it. */
  role?: ElementRole;
  /** The parts-list reference of the part this resistor realises (a trimmer gives two halves with the same part). */
  part?: string;
  /** That part's tolerance (fraction; a trimmer's is on its whole track). */
  tolerance?: number;
  /** Node indices (0 = ground). For V, E: + and −. For I: current flows from `a` through the source into `b`. */
  a: number;
  b: number;
  /** R: ohms (0 = wire), C: farads, L: henries, E: low-frequency gain, H: transresistance (V/A). */
  value: number;
  /** Sources: DC value at zero measurand and per unit of measurand. */
  dc0?: number;
  dc1?: number;
  /** Sources: AC amplitude per unit of measurand. */
  ac?: number;
  /** Extra DC columns (offset voltage, bias current …) by name. */
  extra?: Record<string, number>;
  /** Noise: resistors are noisy unless false; sources carry a white density (V/√Hz or A/√Hz). */
  noisy?: boolean;
  noise?: number;
  /** Sources: 1/f corner of the density, Hz (0 or absent = white): density² = noise²·(1 + f_c/f). */
  noiseCorner?: number;
  /** E: controlling nodes (+, −) and the dominant pole, Hz (0 = none). */
  cp?: number;
  cn?: number;
  pole?: number;
  /** H: the element (index) whose branch current controls it: V(a) − V(b) = value · I(ctrl). */
  ctrl?: number;
}

export interface Circuit {
  nodeNames: string[];
  elements: Element[];
  /** Unknown index of each element's branch current, or −1. */
  branch: Int32Array;
  size: number;
}

/** Numbers the branch currents after the node voltages: V, E, H, L and zero-ohm R each get one. */
export function compile(nodeNames: string[], elements: Element[]): Circuit {
  const branch = new Int32Array(elements.length).fill(-1);
  let k = nodeNames.length - 1;
  elements.forEach((e, i) => {
    if (e.kind === 'V' || e.kind === 'E' || e.kind === 'H' || e.kind === 'L' || (e.kind === 'R' && e.value === 0)) branch[i] = k++;
  });
  return { nodeNames, elements, branch, size: k };
}

/** A dense complex matrix and vector, row-major, in split real/imaginary typed arrays. */
export interface Cx {
  n: number;
  re: Float64Array;
  im: Float64Array;
}

const cx = (n: number, len: number): Cx => ({ n, re: new Float64Array(len), im: new Float64Array(len) });

/** Receives one matrix entry: row, column (−1 = ground, skipped) and its real and imaginary parts. */
type StampSink = (row: number, col: number, re: number, im: number) => void;

/**
 * The MNA rules, once: calls `add` for every entry the circuit puts into the matrix at angular frequency ω.
 * Inductors are left open (I = 0) with `openInductors`. At ω = 0 every imaginary part is zero.
 */
function eachStamp(c: Circuit, omega: number, openInductors: boolean, add: StampSink): void {
  const els = c.elements;
  for (let i = 0; i < els.length; i++) {
    const e = els[i]!;
    const a = e.a - 1, b = e.b - 1, k = c.branch[i]!;
    switch (e.kind) {
      case 'R':
        if (e.value === 0) {
          add(a, k, 1, 0); add(b, k, -1, 0); add(k, a, 1, 0); add(k, b, -1, 0);
        } else {
          const g = 1 / e.value;
          add(a, a, g, 0); add(b, b, g, 0); add(a, b, -g, 0); add(b, a, -g, 0);
        }
        break;
      case 'C': {
        const y = omega * e.value;
        if (y === 0) break;
        add(a, a, 0, y); add(b, b, 0, y); add(a, b, 0, -y); add(b, a, 0, -y);
        break;
      }
      case 'L':
        add(a, k, 1, 0); add(b, k, -1, 0);
        if (openInductors) {
          add(k, k, 1, 0); // I = 0
        } else {
          add(k, a, 1, 0); add(k, b, -1, 0);
          if (omega !== 0) add(k, k, 0, -omega * e.value);
        }
        break;
      case 'V':
        add(a, k, 1, 0); add(b, k, -1, 0); add(k, a, 1, 0); add(k, b, -1, 0);
        break;
      case 'E': {
        // V(a) − V(b) = A(jω)·(V(cp) − V(cn)), A(jω) = A0 / (1 + jω/ωp).
        let gr = e.value, gi = 0;
        if (e.pole && e.pole > 0) {
          const x = omega / (2 * Math.PI * e.pole);
          const d = 1 + x * x;
          gr = e.value / d; gi = (-e.value * x) / d;
        }
        add(a, k, 1, 0); add(b, k, -1, 0); add(k, a, 1, 0); add(k, b, -1, 0);
        add(k, (e.cp ?? 0) - 1, -gr, -gi); add(k, (e.cn ?? 0) - 1, gr, gi);
        break;
      }
      case 'H': {
        // A current-controlled voltage source (SPICE's H): V(a) − V(b) − r·I(ctrl) = 0, I(ctrl) a branch current.
        const kc = c.branch[e.ctrl ?? -1] ?? -1;
        add(a, k, 1, 0); add(b, k, -1, 0); add(k, a, 1, 0); add(k, b, -1, 0);
        add(k, kc, -e.value, 0);
        break;
      }
      case 'I':
        break;
    }
  }
}

/**
 * Stamps the circuit at angular frequency ω into the complex A (n×n). With `transpose` the transpose is
 * stamped instead, for the adjoint solve. Inductors are left open when `openInductors`.
 */
export function stamp(c: Circuit, omega: number, A: Cx, transpose = false, openInductors = false): void {
  const n = c.size;
  A.re.fill(0); A.im.fill(0);
  eachStamp(c, omega, openInductors, (r, col, vr, vi) => {
    if (r < 0 || col < 0) return;
    const idx = transpose ? col * n + r : r * n + col;
    A.re[idx]! += vr; A.im[idx]! += vi;
  });
}

/** In-place LU with partial pivoting; returns the pivot order, or null for a singular matrix. */
export function luFactor(A: Cx): Int32Array | null {
  const n = A.n, re = A.re, im = A.im;
  const piv = new Int32Array(n);
  for (let i = 0; i < n; i++) piv[i] = i;
  for (let k = 0; k < n; k++) {
    let p = k, best = 0;
    for (let i = k; i < n; i++) {
      const m = Math.abs(re[i * n + k]!) + Math.abs(im[i * n + k]!);
      if (m > best) { best = m; p = i; }
    }
    if (best === 0 || !Number.isFinite(best)) return null;
    if (p !== k) {
      for (let j = 0; j < n; j++) {
        const t1 = re[k * n + j]!; re[k * n + j] = re[p * n + j]!; re[p * n + j] = t1;
        const t2 = im[k * n + j]!; im[k * n + j] = im[p * n + j]!; im[p * n + j] = t2;
      }
      const t = piv[k]!; piv[k] = piv[p]!; piv[p] = t;
    }
    const dr = re[k * n + k]!, di = im[k * n + k]!;
    const dd = dr * dr + di * di;
    for (let i = k + 1; i < n; i++) {
      const ar = re[i * n + k]!, ai = im[i * n + k]!;
      if (ar === 0 && ai === 0) continue;
      const lr = (ar * dr + ai * di) / dd, li = (ai * dr - ar * di) / dd;
      re[i * n + k] = lr; im[i * n + k] = li;
      for (let j = k + 1; j < n; j++) {
        const ur = re[k * n + j]!, ui = im[k * n + j]!;
        if (ur === 0 && ui === 0) continue;
        re[i * n + j]! -= lr * ur - li * ui;
        im[i * n + j]! -= lr * ui + li * ur;
      }
    }
  }
  return piv;
}

/** Scratch for luSolve's permuted vector (grown when a larger system comes; nothing is kept between calls). */
let solveScratch = new Float64Array(64);

/** Solves LU·x = P·b in place in (br, bi). */
export function luSolve(A: Cx, piv: Int32Array, br: Float64Array, bi: Float64Array): void {
  const n = A.n, re = A.re, im = A.im;
  if (solveScratch.length < 2 * n) solveScratch = new Float64Array(2 * n);
  const xr = solveScratch.subarray(0, n), xi = solveScratch.subarray(n, 2 * n);
  for (let i = 0; i < n; i++) { xr[i] = br[piv[i]!]!; xi[i] = bi[piv[i]!]!; }
  for (let i = 0; i < n; i++) {
    let sr = xr[i]!, si = xi[i]!;
    for (let j = 0; j < i; j++) {
      const lr = re[i * n + j]!, li = im[i * n + j]!;
      sr -= lr * xr[j]! - li * xi[j]!; si -= lr * xi[j]! + li * xr[j]!;
    }
    xr[i] = sr; xi[i] = si;
  }
  for (let i = n - 1; i >= 0; i--) {
    let sr = xr[i]!, si = xi[i]!;
    for (let j = i + 1; j < n; j++) {
      const ur = re[i * n + j]!, ui = im[i * n + j]!;
      sr -= ur * xr[j]! - ui * xi[j]!; si -= ur * xi[j]! + ui * xr[j]!;
    }
    const dr = re[i * n + i]!, di = im[i * n + i]!, dd = dr * dr + di * di;
    xr[i] = (sr * dr + si * di) / dd; xi[i] = (si * dr - sr * di) / dd;
  }
  br.set(xr); bi.set(xi);
}

/** Right-hand side for DC: pick a source value (dc0, dc1 or an extra column) per element. */
export function rhs(c: Circuit, pick: (e: Element) => number): Float64Array {
  const b = new Float64Array(c.size);
  c.elements.forEach((e, i) => {
    if (e.kind === 'V') b[c.branch[i]!] = pick(e);
    else if (e.kind === 'I') {
      const v = pick(e);
      if (e.a > 0) b[e.a - 1]! -= v;
      if (e.b > 0) b[e.b - 1]! += v;
    }
  });
  return b;
}

export interface DcSolution {
  /** Solutions for each requested column, indexed by unknown. */
  columns: Float64Array[];
}

/** Stamps the DC (ω = 0) matrix into a real n×n array; inductors are shorts, or open with `openInductors`. */
export function stampReal(c: Circuit, A: Float64Array, openInductors = false): void {
  const n = c.size;
  A.fill(0);
  eachStamp(c, 0, openInductors, (r, col, vr) => {
    if (r >= 0 && col >= 0) A[r * n + col]! += vr;
  });
}

/** In-place real LU with partial pivoting into `piv`; false for a singular matrix. */
export function luFactorReal(A: Float64Array, n: number, piv: Int32Array): boolean {
  for (let i = 0; i < n; i++) piv[i] = i;
  for (let k = 0; k < n; k++) {
    let p = k, best = 0;
    for (let i = k; i < n; i++) { const m = Math.abs(A[i * n + k]!); if (m > best) { best = m; p = i; } }
    if (best === 0 || !Number.isFinite(best)) return false;
    if (p !== k) {
      for (let j = 0; j < n; j++) { const t = A[k * n + j]!; A[k * n + j] = A[p * n + j]!; A[p * n + j] = t; }
      const t = piv[k]!; piv[k] = piv[p]!; piv[p] = t;
    }
    const d = A[k * n + k]!;
    for (let i = k + 1; i < n; i++) {
      const l = A[i * n + k]!;
      if (l === 0) continue;
      const f = l / d;
      A[i * n + k] = f;
      for (let j = k + 1; j < n; j++) { const u = A[k * n + j]!; if (u !== 0) A[i * n + j]! -= f * u; }
    }
  }
  return true;
}

/** Solves with a real LU: b is overwritten by x; `scratch` has length n. */
export function luSolveReal(A: Float64Array, n: number, piv: Int32Array, b: Float64Array, scratch: Float64Array): void {
  for (let i = 0; i < n; i++) scratch[i] = b[piv[i]!]!;
  for (let i = 0; i < n; i++) { let s = scratch[i]!; for (let j = 0; j < i; j++) s -= A[i * n + j]! * scratch[j]!; scratch[i] = s; }
  for (let i = n - 1; i >= 0; i--) { let s = scratch[i]!; for (let j = i + 1; j < n; j++) s -= A[i * n + j]! * scratch[j]!; scratch[i] = s / A[i * n + i]!; }
  b.set(scratch);
}

/**
 * DC solve for several right-hand sides with one real factorisation. `passband` leaves inductors open so
 * that an AC-coupled sensor (a current transformer) shows its passband scale.
 */
export function solveDc(c: Circuit, picks: Array<(e: Element) => number>, passband = false): DcSolution | null {
  const n = c.size;
  const A = new Float64Array(n * n);
  stampReal(c, A, passband);
  const piv = new Int32Array(n);
  if (!luFactorReal(A, n, piv)) return null;
  const scratch = new Float64Array(n);
  return {
    columns: picks.map((p) => {
      const b = rhs(c, p);
      luSolveReal(A, n, piv, b, scratch);
      return b;
    }),
  };
}

export interface Workspace {
  A: Cx;
  yr: Float64Array;
  yi: Float64Array;
  /** Sweeps: solve through the frequency-independent part eliminated once (`adjointReduction`). */
  reduce?: boolean;
  /** The reduction built for `reducedFor` (undefined: not built yet; null: this circuit cannot be reduced). */
  reduction?: AdjointReduction | null;
  reducedFor?: number;
}

/**
 * Preallocated matrices and vectors for repeated solves of one circuit (no allocation per frequency). With
 * `reduce` (a sweep over many frequencies) the solves go through `adjointReduction`.
 */
export function workspace(c: Circuit, reduce = false): Workspace {
  return { A: cx(c.size, c.size * c.size), yr: new Float64Array(c.size), yi: new Float64Array(c.size), reduce };
}

/**
 * Adjoint solve at one frequency: y with Aᵀ·y = e_out. Then the transfer from any source to V(out) is read
 * from y: a current injected into node j gives y[j−1]; a voltage source in branch k gives y[k].
 * Returns false when the matrix is singular.
 */
export function adjointAt(c: Circuit, omega: number, outNode: number, ws: Workspace): boolean {
  if (ws.reduce) {
    if (ws.reduction === undefined || ws.reducedFor !== outNode) { ws.reduction = adjointReduction(c, outNode); ws.reducedFor = outNode; }
    if (ws.reduction) return reducedAdjointAt(ws.reduction, omega, ws);
  }
  stamp(c, omega, ws.A, true);
  const piv = luFactor(ws.A);
  if (!piv) return false;
  ws.yr.fill(0); ws.yi.fill(0);
  ws.yr[outNode - 1] = 1;
  luSolve(ws.A, piv, ws.yr, ws.yi);
  return true;
}

/**
 * The adjoint system with its frequency-independent part eliminated once. Only capacitors, inductors and
 * gain blocks with a pole put entries into the matrix that change with frequency; the unknowns those entries
 * touch (set D) are few. Ordering the others (set S) first, Aᵀ = [A11 A12; A21 A22(ω)] with A11, A12, A21
 * real and fixed, so A11 is factored once and each frequency solves only the Schur complement
 * (A22(ω) − A21·A11⁻¹·A12)·y2 = b2 − A21·A11⁻¹·b1, then y1 = A11⁻¹·b1 − A11⁻¹·A12·y2 (block Gaussian
 * elimination; Golub & Van Loan, Matrix Computations, §3.2 on block LU; from memory). The answer is the full
 * solve's to rounding; a circuit where A11 is singular, or where the split saves nothing, is not reduced.
 */
export interface AdjointReduction {
  n: number;
  /** Unknowns of the fixed part (S) and of the frequency-dependent part (D). */
  s: Int32Array;
  d: Int32Array;
  /** The frequency-dependent elements alone (others replaced by an inert source), stamped per frequency. */
  dynamic: Circuit;
  /** A22's fixed entries minus A21·A11⁻¹·A12 (n2×n2), A11⁻¹·A12 (n1×n2), A11⁻¹·b1 and b2 − A21·A11⁻¹·b1. */
  base: Float64Array;
  x: Float64Array;
  z: Float64Array;
  c: Float64Array;
  /** Scratch: the dynamic stamp (n×n) and the Schur complement (n2×n2). */
  t: Cx;
  schur: Cx;
  br: Float64Array;
  bi: Float64Array;
}

const INERT: Element = { kind: 'I', name: '', a: 0, b: 0, value: 0 };
const isDynamic = (e: Element) => e.kind === 'C' || e.kind === 'L' || (e.kind === 'E' && !!e.pole && e.pole > 0);

/** Builds the reduction of a circuit's adjoint system for output node `outNode` (null: solve it whole). */
export function adjointReduction(c: Circuit, outNode: number): AdjointReduction | null {
  const n = c.size;
  const only = (keep: (e: Element) => boolean): Circuit => ({ ...c, elements: c.elements.map((e) => (keep(e) ? e : INERT)) });
  const fixed = cx(n, n * n), t1 = cx(n, n * n), t2 = cx(n, n * n);
  stamp(only((e) => !isDynamic(e)), 0, fixed, true);
  const dynamic = only(isDynamic);
  // Entries that differ between two frequencies are the frequency-dependent ones; the rest of the dynamic
  // elements' entries (their incidence ±1) are fixed.
  stamp(dynamic, 1, t1, true);
  stamp(dynamic, 2, t2, true);
  const inD = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const k = i * n + j;
      if (t1.re[k] !== t2.re[k] || t1.im[k] !== t2.im[k]) { inD[i] = 1; inD[j] = 1; }
    }
  }
  const d = Int32Array.from({ length: n }, (_, i) => i).filter((i) => inD[i] === 1);
  const s = Int32Array.from({ length: n }, (_, i) => i).filter((i) => inD[i] === 0);
  const n1 = s.length, n2 = d.length;
  // Nothing to gain when nothing changes with frequency, or when almost everything does.
  if (n2 === 0 || n1 < 2) return null;
  // Outside D×D every entry must be real and fixed.
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) if ((!inD[i] || !inD[j]) && (t1.im[i * n + j] !== 0 || fixed.im[i * n + j] !== 0)) return null;
  }
  const entry = (i: number, j: number) => fixed.re[i * n + j]! + t1.re[i * n + j]!;
  const a11 = new Float64Array(n1 * n1);
  for (let i = 0; i < n1; i++) for (let j = 0; j < n1; j++) a11[i * n1 + j] = entry(s[i]!, s[j]!);
  const piv = new Int32Array(n1);
  if (!luFactorReal(a11, n1, piv)) return null;
  const scratch = new Float64Array(n1), col = new Float64Array(n1);
  const x = new Float64Array(n1 * n2);
  for (let j = 0; j < n2; j++) {
    for (let i = 0; i < n1; i++) col[i] = entry(s[i]!, d[j]!);
    luSolveReal(a11, n1, piv, col, scratch);
    for (let i = 0; i < n1; i++) x[i * n2 + j] = col[i]!;
  }
  const out = outNode - 1;
  const z = new Float64Array(n1);
  for (let i = 0; i < n1; i++) z[i] = s[i] === out ? 1 : 0;
  luSolveReal(a11, n1, piv, z, scratch);
  const base = new Float64Array(n2 * n2), cvec = new Float64Array(n2);
  for (let i = 0; i < n2; i++) {
    let ci = d[i] === out ? 1 : 0;
    for (let k = 0; k < n1; k++) ci -= entry(d[i]!, s[k]!) * z[k]!;
    cvec[i] = ci;
    for (let j = 0; j < n2; j++) {
      let v = fixed.re[d[i]! * n + d[j]!]!;
      for (let k = 0; k < n1; k++) v -= entry(d[i]!, s[k]!) * x[k * n2 + j]!;
      base[i * n2 + j] = v;
    }
  }
  for (const a of [x, z, cvec, base]) for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i]!)) return null;
  return { n, s, d, dynamic, base, x, z, c: cvec, t: cx(n, n * n), schur: cx(n2, n2 * n2), br: new Float64Array(n2), bi: new Float64Array(n2) };
}

/** One frequency through a reduction: the same y as the whole adjoint solve (to rounding), in ws.yr, ws.yi. */
function reducedAdjointAt(r: AdjointReduction, omega: number, ws: Workspace): boolean {
  const { n, s, d, t, schur } = r;
  const n1 = s.length, n2 = d.length;
  stamp(r.dynamic, omega, t, true);
  for (let i = 0; i < n2; i++) {
    for (let j = 0; j < n2; j++) {
      const k = d[i]! * n + d[j]!;
      schur.re[i * n2 + j] = r.base[i * n2 + j]! + t.re[k]!;
      schur.im[i * n2 + j] = t.im[k]!;
    }
  }
  const piv = luFactor(schur);
  if (!piv) return false;
  r.br.set(r.c); r.bi.fill(0);
  luSolve(schur, piv, r.br, r.bi);
  for (let j = 0; j < n2; j++) { ws.yr[d[j]!] = r.br[j]!; ws.yi[d[j]!] = r.bi[j]!; }
  for (let i = 0; i < n1; i++) {
    let yr = r.z[i]!, yi = 0;
    for (let j = 0; j < n2; j++) { const xv = r.x[i * n2 + j]!; yr -= xv * r.br[j]!; yi -= xv * r.bi[j]!; }
    ws.yr[s[i]!] = yr; ws.yi[s[i]!] = yi;
  }
  return true;
}

/** Transfer (re, im) from the measurand to the output: every driven source's AC amplitude, after adjointAt. */
export function signalTransfer(c: Circuit, ws: Workspace): [number, number] {
  let re = 0, im = 0;
  for (let i = 0; i < c.elements.length; i++) {
    const e = c.elements[i]!;
    if ((e.kind === 'V' || e.kind === 'I') && e.ac) {
      const [hr, hi] = transferFrom(c, i, ws);
      re += e.ac * hr; im += e.ac * hi;
    }
  }
  return [re, im];
}

/** Transfer (re, im) to the output from element i's unit source, after adjointAt. */
export function transferFrom(c: Circuit, i: number, ws: Workspace): [number, number] {
  const e = c.elements[i]!;
  if (e.kind === 'V' || e.kind === 'E' || e.kind === 'H' || e.kind === 'L' || (e.kind === 'R' && e.value === 0)) {
    const k = c.branch[i]!;
    return [ws.yr[k]!, ws.yi[k]!];
  }
  // Current from a into b: +1 into b, −1 out of a.
  const br = e.b > 0 ? ws.yr[e.b - 1]! : 0, bi = e.b > 0 ? ws.yi[e.b - 1]! : 0;
  const ar = e.a > 0 ? ws.yr[e.a - 1]! : 0, ai = e.a > 0 ? ws.yi[e.a - 1]! : 0;
  return [br - ar, bi - ai];
}
