/**
 * Reference networks: what sets the voltage at the foot of a non-inverting ground leg or at an inverting
 * stage's + input. Three kinds, each built from the design's arms:
 * - a tie straight to a rail (or to ground on split rails) when the reference is there: no parts;
 * - a divider of two fixed arms between the rails;
 * - a divider with a zero potentiometer between its arms, its travel centred on the wanted ratio and its
 *   wiper setting solved exactly.
 * Thevenin of a divider top T, bottom B from rails Vb…Vt: V = Vb + (Vt − Vb)·B/(T + B), R = T·B/(T + B)
 * (Thevenin's theorem, any circuits textbook).
 */
import type { Design } from '../model/design.js';
import type { Arm, ReferenceNetwork, Trimmer } from '../circuit/network.js';
import { armAt, lowerBound, searchPairs, type ArmTable } from './search.js';
import { COVERAGE, SETTABILITY, standardTrimmer } from './trimmers.js';
import { TRIMMER_VALUES } from '../model/eseries.js';
import { kitFits, kitWithout, partsOfArms } from './kit.js';
import { referenceRails } from '../physics/topology.js';

/** Wiper settings a person can rely on reaching (the ends of a cermet track are not linear; common practice). */
export const WIPER_MIN = 0.02;
export const WIPER_MAX = 0.98;

const par = (a: number, b: number) => (a === 0 || b === 0 ? 0 : (a * b) / (a + b));

/** Which rail the divider's top hangs from, and the rails' voltages. */
export function referenceSpan(design: Design): { lo: number; hi: number; topRail: 'positive' | 'regulated' } {
  const [lo, hi] = referenceRails(design);
  return { lo, hi, topRail: design.supply.referenceRail === 'regulated' && design.supply.regulated ? 'regulated' : 'positive' };
}

/** A reference network with nothing in it: a unity buffer's. */
export function noReference(design: Design): ReferenceNetwork {
  const { lo, hi, topRail } = referenceSpan(design);
  return { kind: 'none', railBottom: lo, railTop: hi, topRail, top: null, bottom: null, trim: null, voltage: NaN, thevenin: 0 };
}

/**
 * The tie for a reference that sits on a rail or on ground (split rails), or null when it sits nowhere
 * a wire can reach. `tol` is the voltage within which it counts as there.
 */
export function railTie(design: Design, vref: number, tol: number): ReferenceNetwork | null {
  const { lo, hi, topRail } = referenceSpan(design);
  const at = [lo, hi, ...(lo < 0 ? [0] : [])].find((v) => Math.abs(vref - v) <= tol);
  if (at === undefined) return null;
  return { kind: 'rail', railBottom: lo, railTop: hi, topRail, top: null, bottom: null, trim: null, voltage: at, thevenin: 0 };
}

/** Open-circuit voltage and Thevenin resistance of top – pot (wiper at s from the bottom) – bottom. */
export function dividerAt(lo: number, hi: number, top: number, pot: number, bottom: number, s: number): { voltage: number; thevenin: number } {
  const upper = top + (1 - s) * pot, lower = bottom + s * pot;
  return { voltage: lo + (hi - lo) * (lower / (upper + lower)), thevenin: par(upper, lower) };
}

/** The wiper setting (from the bottom) at which top – pot – bottom gives the ratio r of the rail span: s = (r·Σ − B)/Rp. */
function wiperFor(top: number, pot: number, bottom: number, r: number): number {
  return (r * (top + pot + bottom) - bottom) / pot;
}

/** The arm nearest `ohms` (log distance) in a table, or null when `ohms` is below half the smallest arm (a wire serves). */
export function nearestArm(table: ArmTable, ohms: number): Arm | null {
  if (!(ohms > 0) || table.size === 0 || ohms < table.value[0]! / 2) return null;
  const j = lowerBound(table.value, ohms);
  let best = -1, bestD = Infinity;
  for (const k of [j - 1, j]) {
    if (k < 0 || k >= table.size) continue;
    const d = Math.abs(Math.log(table.value[k]! / ohms));
    if (d < bestD) { bestD = d; best = k; }
  }
  return best < 0 ? null : armAt(table, best);
}

/**
 * A divider with a zero potentiometer for a Thevenin near `rth` at ratio r, its pot the smallest standard
 * value whose travel covers `needAtRef` (V at the reference) with COVERAGE either side of the wiper once the
 * fixed arms are rounded to the table. `leverage` turns volts at the reference into volts at the output.
 * Its reach may exceed the coverage by at most `maxOversize` (so the setting stays fine). Null when no
 * standard pot does both (the reference sits too near a rail for it, or the divider is too small for any pot).
 */
export function trimmedDivider(design: Design, table: ArmTable, r: number, rth: number, needAtRef: number, leverage: number, maxOversize = Infinity): ReferenceNetwork | null {
  const { lo, hi, topRail } = referenceSpan(design);
  const vspan = hi - lo;
  const rc = Math.min(Math.max(r, 1e-3), 1 - 1e-3);
  const sigma = rth / (rc * (1 - rc));
  const h = (COVERAGE * Math.max(needAtRef, 1e-9)) / vspan;
  for (const pot of TRIMMER_VALUES) {
    if (pot < standardTrimmer(2 * h * sigma)) continue;
    if (pot > sigma * 4) break;
    // Travel centred on r where the rails allow, else against the nearer rail.
    const potFrac = pot / Math.max(sigma, pot);
    const lowFrac = Math.min(Math.max(r - potFrac / 2, 0), 1 - potFrac);
    const total = Math.max(sigma, pot);
    const top = nearestArm(table, (1 - lowFrac - potFrac) * total);
    // On a kit the bottom arm comes from what the top arm leaves (src/solve/kit.ts).
    const bottom = nearestArm(kitWithout(table, partsOfArms(top)), lowFrac * total);
    const t = top?.ohms ?? 0, b = bottom?.ohms ?? 0;
    const s = wiperFor(t, pot, b, r);
    if (!(s >= WIPER_MIN && s <= WIPER_MAX)) continue;
    const sum = t + pot + b;
    const perTravel = (pot / sum) * vspan * leverage;
    const reach = Math.min(s, 1 - s) * perTravel;
    const need = needAtRef * leverage;
    if (reach < COVERAGE * need || reach > COVERAGE * need * maxOversize) continue;
    const at = dividerAt(lo, hi, t, pot, b, s);
    const trim: Trimmer = { ohms: pot, setting: s, need, halfSpan: reach, step: perTravel * SETTABILITY };
    return { kind: 'divider', railBottom: lo, railTop: hi, topRail, top, bottom, trim, voltage: at.voltage, thevenin: at.thevenin };
  }
  return null;
}

/**
 * A divider of two fixed arms for the ratio r with a Thevenin near `rth`: the pair search over the table
 * with top/bottom = (1−r)/r, the top arm within a factor of two of its ideal (so the Thevenin stays near
 * `rth`), ranked on the zero error it makes at the output (−V_span·leverage·r(1−r)·ε for a ratio error ε,
 * to first order; the voltage is then computed exactly from the parts). Null when no pair exists.
 */
export function fixedDivider(design: Design, table: ArmTable, r: number, rth: number, leverage: number, floorVolts: number): ReferenceNetwork | null {
  const { lo, hi, topRail } = referenceSpan(design);
  const vspan = hi - lo;
  if (!(r > 0 && r < 1)) return null;
  const prefTop = rth / r;
  const res = searchPairs(table, table, {
    preferredA: prefTop,
    floor: Math.max(floorVolts, 1e-12),
    aMin: prefTop / 2,
    aMax: prefTop * 2,
    ratio: { cA: 0, cB: 0, k: (1 - r) / r, m: -vspan * leverage * r * (1 - r) },
  }, 1, kitFits(table));
  const pick = res.ranked[0];
  if (!pick) return null;
  const t = pick.a.ohms, b = pick.b.ohms;
  return { kind: 'divider', railBottom: lo, railTop: hi, topRail, top: pick.a, bottom: pick.b, trim: null, voltage: lo + vspan * (b / (t + b)), thevenin: par(t, b) };
}

/**
 * Moves a trimmed divider's wiper so that its open-circuit voltage is `vref` exactly (the fixed parts stay);
 * null when that setting leaves the usable travel. The trimmer's reach and step are recomputed.
 */
export function resetWiper(ref: ReferenceNetwork, vref: number): ReferenceNetwork | null {
  if (ref.kind !== 'divider' || !ref.trim) return ref;
  const { railBottom: lo, railTop: hi } = ref;
  const t = ref.top?.ohms ?? 0, b = ref.bottom?.ohms ?? 0, pot = ref.trim.ohms;
  const s = wiperFor(t, pot, b, (vref - lo) / (hi - lo));
  if (!(s >= WIPER_MIN && s <= WIPER_MAX)) return null;
  const perTravel = ref.trim.step / SETTABILITY;
  const at = dividerAt(lo, hi, t, pot, b, s);
  return { ...ref, trim: { ...ref.trim, setting: s, halfSpan: Math.min(s, 1 - s) * perTravel }, voltage: at.voltage, thevenin: at.thevenin };
}
