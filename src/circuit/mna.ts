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
 * name: the signal source, the sensor's zero, each rail, the op-amp's offset source and gain block, the
 * sensor's source resistance.
 */
export type ElementRole = 'signal' | 'sensor-zero' | 'rail-positive' | 'rail-negative' | 'rail-regulated' | 'opamp-offset' | 'opamp-gain' | 'sensor-source';

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

/** Solves LU·x = P·b in place in (br, bi). */
export function luSolve(A: Cx, piv: Int32Array, br: Float64Array, bi: Float64Array): void {
  const n = A.n, re = A.re, im = A.im;
  const xr = new Float64Array(n), xi = new Float64Array(n);
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
}

/** Preallocated matrices and vectors for repeated solves of one circuit (no allocation per frequency). */
export function workspace(c: Circuit): Workspace {
  return { A: cx(c.size, c.size * c.size), yr: new Float64Array(c.size), yi: new Float64Array(c.size) };
}

/**
 * Adjoint solve at one frequency: y with Aᵀ·y = e_out. Then the transfer from any source to V(out) is read
 * from y: a current injected into node j gives y[j−1]; a voltage source in branch k gives y[k].
 * Returns false when the matrix is singular.
 */
export function adjointAt(c: Circuit, omega: number, outNode: number, ws: Workspace): boolean {
  stamp(c, omega, ws.A, true);
  const piv = luFactor(ws.A);
  if (!piv) return false;
  ws.yr.fill(0); ws.yi.fill(0);
  ws.yr[outNode - 1] = 1;
  luSolve(ws.A, piv, ws.yr, ws.yi);
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
  const yb = e.b > 0 ? [ws.yr[e.b - 1]!, ws.yi[e.b - 1]!] : [0, 0];
  const ya = e.a > 0 ? [ws.yr[e.a - 1]!, ws.yi[e.a - 1]!] : [0, 0];
  return [yb[0]! - ya[0]!, yb[1]! - ya[1]!];
}
