/**
 * The resistor solver: from an ideal stage (gain and reference) to real E-series parts, a reference
 * divider and trimmers sized to cover the tolerance stack.
 *
 * Trimmer sizing (our definitions, stated in docs/method.md):
 * - coverage: a trimmer's half-span (from its mid setting to either end) must be at least
 *   COVERAGE × the worst-case tolerance stack it has to absorb;
 * - resolution: the smallest standard trimmer (100 Ω, 200 Ω, 500 Ω, 1 kΩ … 1 MΩ) that gives that
 *   coverage wastes the least resolution; its settable step is SETTABILITY of its full travel.
 */
import type { Design } from '../model/design.js';
import { TRIMMER_VALUES, usualTolerance } from '../model/eseries.js';
import { armAt, armTable, lowerBound, searchPairs, type PairCandidate, type PairResult } from './search.js';
import type { Arm, Part, PartRole, ReferenceNetwork, StageNetwork, Trimmer } from '../circuit/network.js';
export type { Arm, Part, PartRole, ReferenceNetwork, StageNetwork, Trimmer } from '../circuit/network.js';
import type { SensorFront } from '../physics/sensors.js';
import { referenceFor, referenceRails, type IdealStage } from '../physics/topology.js';
import { formatEng } from '../model/units.js';
import type { Warning } from '../model/findings.js';

/** Trim half-span must be at least this many times the worst-case stack it absorbs. */
export const COVERAGE = 1.5;
/** Fraction of a trimmer's travel a person can set reliably (single-turn cermet, common practice, from memory). */
export const SETTABILITY = 1 / 200;
/** End-to-end tolerance of a trimmer (±20 %, common practice). */
export const TRIMMER_TOLERANCE = 0.2;

export interface SolvedStage {
  ideal: IdealStage;
  network: StageNetwork;
  parts: Part[];
  /** Gain alternatives, ranked; `chosen` is the index built. */
  alternatives: PairCandidate[];
  chosen: number;
  /** The smallest gain error the search found anywhere (the optimum). */
  bestError: number;
  /** Ideal-op-amp gain and reference from the real parts, trimmers at their settings. */
  gain: number;
  reference: number;
  /** Relative scale error before trimming (trimmers at mid). */
  scaleError: number;
  warnings: Warning[];
}

const trimmerAtLeast = (ohms: number): number => TRIMMER_VALUES.find((v) => v >= ohms) ?? TRIMMER_VALUES[TRIMMER_VALUES.length - 1]!;

/** The smallest standard trimmer value at or above `ohms` (common practice 1-2-5 values). */
export function standardTrimmer(ohms: number): number {
  return trimmerAtLeast(ohms);
}

const par = (a: number, b: number) => (a === 0 || b === 0 ? 0 : (a * b) / (a + b));

/**
 * Preferred feedback resistance: 100 kΩ (10 kΩ–100 kΩ is the usual range for general-purpose op-amps:
 * low enough for noise and bias-current error, high enough not to load the output or drain a battery;
 * common practice), kept inside the window.
 */
export function preferredFeedback(design: Design): number {
  const { resistanceMin: lo, resistanceMax: hi } = design.target;
  return Math.min(Math.max(100e3, lo * 10), hi / 2);
}

/** Worst-case relative scale error the gain trim must absorb. */
export function scaleStack(design: Design, front: SensorFront, ideal: IdealStage): number {
  const tol = design.target.tolerance;
  const g = ideal.gain;
  const resistors = ideal.topology === 'non-inverting' ? (2 * tol * (g - 1)) / g : 2 * tol;
  const rail = front.ratiometricSupply && design.supply.sensorRail === 'regulated' && design.supply.regulated ? design.supply.regulated.tolerance : 0;
  return front.sensitivityTolerance + resistors + rail;
}

/** Worst-case zero error at the op-amp output, V, that the zero trim must absorb. */
export function zeroStack(design: Design, front: SensorFront, ideal: IdealStage, gainTrimSpan: number): number {
  const { opamp, target } = design;
  const g = ideal.gain;
  const ng = ideal.noiseGain;
  const [lo, hi] = referenceRails(design);
  const vspan = hi - lo;
  const r = Number.isFinite(ideal.reference) ? (ideal.reference - lo) / vspan : 0;
  const refGain = ideal.topology === 'non-inverting' ? g - 1 : 1 + g;
  const dividerTol = vspan * Math.max(r * (1 - r), 0) * 2 * target.tolerance;
  const railTol = design.supply.referenceRail === 'regulated' && design.supply.regulated ? Math.abs(ideal.reference - lo) * design.supply.regulated.tolerance : 0;
  const fromSpanTrim = Math.abs((Number.isFinite(ideal.reference) ? ideal.reference : 0) - front.quiescent) * g * gainTrimSpan;
  return g * front.quiescentTolerance + ng * opamp.offsetVoltage + Math.abs(opamp.biasCurrent) * preferredFeedback(design) + refGain * (dividerTol + railTol) + fromSpanTrim;
}

interface DividerSolve {
  ref: ReferenceNetwork;
  warnings: Warning[];
}

/** The arm nearest `ohms` (log distance) from a table, or null below half the window's smallest part. */
function nearestArm(table: ReturnType<typeof armTable>, ohms: number, min: number): Arm | null {
  if (!(ohms > 0) || ohms < min / 2) return null;
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
 * Solves the reference divider for an open-circuit voltage `vref` and a Thevenin near `rthTarget`.
 *
 * With a zero trimmer: the potentiometer's travel is placed across [r − h, r + h] of the rail span (h the
 * coverage it needs, clipped at the rails), fixed parts above and below it, and the wiper setting is solved
 * so that the divider gives `vref` exactly; the parts list says where to set it. Without one: two fixed
 * arms from the pair search.
 */
export function solveDivider(design: Design, vref: number, rthTarget: number, zeroNeedAtRef: number, refGain: number): DividerSolve {
  const [lo, hi] = referenceRails(design);
  const topRail = design.supply.referenceRail === 'regulated' && design.supply.regulated ? 'regulated' : 'positive';
  const vspan = hi - lo;
  const warnings: Warning[] = [];
  const r = (vref - lo) / vspan;
  const wantTrim = design.target.trim.zero;
  if (!wantTrim && (Math.abs(r) < 1e-6 || Math.abs(1 - r) < 1e-6)) {
    const v = r < 0.5 ? lo : hi;
    return { ref: { kind: 'rail', railBottom: lo, railTop: hi, topRail, top: null, bottom: null, trim: null, voltage: v, thevenin: 0 }, warnings };
  }
  const { series, resistanceMin, resistanceMax, arrangements, tolerance } = design.target;
  const rc = Math.min(Math.max(r, 0.02), 0.98);
  const sigma = Math.min(Math.max(rthTarget / (rc * (1 - rc)), resistanceMin * 2), resistanceMax * 2);

  if (!wantTrim) {
    const table = armTable(series, resistanceMin, resistanceMax, arrangements);
    const prefTop = Math.max(sigma * (1 - r), resistanceMin);
    const res: PairResult = searchPairs(table, table, {
      preferredA: prefTop,
      floor: Math.max(vspan * refGain * tolerance / 50, 1e-6),
      aMin: prefTop / 2,
      aMax: prefTop * 2,
      // top/bottom = (1−r)/r, ranked on the zero error it makes at the output, to first order in the ratio
      // error ε: −V_span·G_ref·r(1−r)·ε volts (the divider's voltage is then computed exactly from its parts).
      ratio: { cA: 0, cB: 0, k: (1 - r) / r, m: -vspan * refGain * r * (1 - r) },
    }, 1);
    if (!res.ranked.length) {
      warnings.push({ code: 'reference-unrealisable', level: 'fail', message: `No divider from ${series} parts in the window gives ${vref.toPrecision(4)} V.` });
      return { ref: { kind: 'divider', railBottom: lo, railTop: hi, topRail, top: null, bottom: null, trim: null, voltage: NaN, thevenin: 0 }, warnings };
    }
    const top = res.ranked[0]!.a, bottom = res.ranked[0]!.b;
    return { ref: { kind: 'divider', railBottom: lo, railTop: hi, topRail, top, bottom, trim: null, voltage: lo + vspan * (bottom.ohms / (top.ohms + bottom.ohms)), thevenin: par(top.ohms, bottom.ohms) }, warnings };
  }

  // With a zero trimmer: its travel spans [r − h, r + h] (with a fifth more for part rounding), clipped at the rails.
  // Single parts above and below the trimmer first; if their rounding pushes the wiper too far off mid for
  // the coverage, two-part arms (which land within a few 0.01 %) instead.
  const singles = armTable(series, resistanceMin, resistanceMax, arrangements.includes('single') ? ['single'] : arrangements);
  const full = armTable(series, resistanceMin, resistanceMax, arrangements);
  let table = singles;
  const h = (COVERAGE * Math.max(zeroNeedAtRef, 1e-6)) / vspan;
  let lowFrac = Math.max(0, r - 1.2 * h), highFrac = Math.min(1, r + 1.2 * h);
  if (highFrac - lowFrac < 1e-6) { lowFrac = Math.max(0, r - 1e-3); highFrac = Math.min(1, r + 1e-3); }
  let rp = standardTrimmer((highFrac - lowFrac) * sigma);
  let trim: Trimmer | null = null, top: Arm | null = null, bottom: Arm | null = null, setting = 0.5, voltage = NaN, thevenin = 0;
  for (let attempt = 0; attempt < 5; attempt++) {
    const total = rp / (highFrac - lowFrac);
    top = nearestArm(table, (1 - highFrac) * total, resistanceMin);
    bottom = nearestArm(table, lowFrac * total, resistanceMin);
    const rt = top?.ohms ?? 0, rb = bottom?.ohms ?? 0;
    const sum = rt + rp + rb;
    // Wiper position (from the bottom) that gives exactly the wanted ratio.
    setting = (r * sum - rb) / rp;
    const ok = setting >= 0.02 && setting <= 0.98;
    setting = Math.min(Math.max(setting, 0.02), 0.98);
    const upper = rt + (1 - setting) * rp, lower = rb + setting * rp;
    voltage = lo + vspan * (lower / (upper + lower));
    thevenin = par(upper, lower);
    const reach = Math.min(setting, 1 - setting) * (rp / sum) * vspan * refGain;
    trim = { ohms: rp, setting, need: zeroNeedAtRef * refGain, halfSpan: reach, step: (rp / sum) * vspan * refGain * SETTABILITY };
    if (ok && reach >= COVERAGE * trim.need * 0.999) break;
    if (table === singles && full !== singles) { table = full; continue; }
    const bigger = TRIMMER_VALUES.find((v) => v > rp);
    if (!bigger) break;
    rp = bigger;
  }
  if (Math.abs(setting - 0.5) > 0.3) {
    warnings.push({ code: 'zero-trim-off-centre', level: 'info', message: `The reference sits near a rail, so the zero trimmer starts at ${(setting * 100).toFixed(0)} % of its travel.` });
  }
  if (trim && (trim.halfSpan < COVERAGE * trim.need * 0.999 || Math.abs(voltage - vref) * refGain > 0.25 * trim.halfSpan)) {
    warnings.push({ code: 'zero-trim-short', level: 'caution', message: `The zero trimmer reaches ±${formatEng(trim.halfSpan, 'V')} at the output, short of ${COVERAGE} × the ±${formatEng(trim.need, 'V')} worst-case stack, or cannot centre on the wanted zero: the reference ${vref.toPrecision(3)} V sits too near a rail for this gain (reference leverage ${refGain.toPrecision(2)}).` });
  }
  return { ref: { kind: 'divider', railBottom: lo, railTop: hi, topRail, top, bottom, trim, voltage, thevenin }, warnings };
}

/** Ideal-op-amp gain and reference of a realised network. */
export function networkGain(net: StageNetwork, sourceResistance: number): { gain: number; noiseGain: number; reference: number } {
  const rf = (net.feedback?.ohms ?? 0) + (net.gainTrim ? net.gainTrim.ohms * net.gainTrim.setting : 0);
  const rth = net.reference.kind === 'divider' ? net.reference.thevenin : 0;
  if (net.topology === 'non-inverting') {
    if (!net.leg && net.reference.kind === 'none') return { gain: 1, noiseGain: 1, reference: NaN };
    const rleg = (net.leg?.ohms ?? 0) + rth;
    const g = 1 + rf / rleg;
    return { gain: g, noiseGain: g, reference: net.reference.voltage };
  }
  const rin = (net.leg?.ohms ?? 0) + sourceResistance;
  const g = rf / rin;
  return { gain: g, noiseGain: 1 + g, reference: net.reference.voltage };
}

/** Solves the whole stage: reference divider, gain network, trimmers, parts. */
export function solveStage(design: Design, front: SensorFront, ideal: IdealStage): SolvedStage {
  const warnings: Warning[] = [];
  const { target } = design;
  const table = armTable(target.series, target.resistanceMin, target.resistanceMax, target.arrangements);
  const floor = target.tolerance / 20;
  const rfPref = preferredFeedback(design);
  const g = ideal.gain;
  const [railLo, railHi] = referenceRails(design);

  // Unity buffer: a wire from output to − input, nothing else.
  if (ideal.topology === 'non-inverting' && !ideal.needsReference) {
    const network: StageNetwork = { topology: 'non-inverting', feedback: null, gainTrim: null, leg: null, reference: { kind: 'none', railBottom: railLo, railTop: railHi, topRail: 'positive', top: null, bottom: null, trim: null, voltage: NaN, thevenin: 0 } };
    if (target.trim.gain || target.trim.zero) warnings.push({ code: 'buffer-no-trim', level: 'info', message: 'A unity buffer has no gain or zero to trim; the sensor\'s own scale and zero pass straight through.' });
    return { ideal, network, parts: partsOf(network, design), alternatives: [], chosen: 0, bestError: 0, gain: 1, reference: NaN, scaleError: 0, warnings };
  }

  const sStack = scaleStack(design, front, ideal);
  const refGain = ideal.topology === 'non-inverting' ? g - 1 : 1 + g;
  // Gain trimmer in series with the feedback arm: d(scale)/scale = dRf/Rf · (G−1)/G (non-inv) or dRf/Rf (inv).
  const rfSens = ideal.topology === 'non-inverting' ? (g - 1) / g : 1;
  // What a rheostat at mid can be relied on to move either way, as a fraction of its value: half its travel,
  // less its own ±20 % (which both shrinks the travel and shifts the mid point).
  const usable = 0.5 - TRIMMER_TOLERANCE;
  let gainTrimOhms = 0;
  // A trimmer larger than the feedback resistance itself would dominate it (and its ±20 %): cap it there and
  // say so when that falls short, rather than build a network that is mostly trimmer.
  const trimCap = TRIMMER_VALUES.filter((v) => v <= rfPref).pop() ?? TRIMMER_VALUES[0]!;
  if (target.trim.gain) gainTrimOhms = Math.min(standardTrimmer((COVERAGE * sStack * rfPref) / (rfSens * usable)), trimCap);
  /** The scale a rheostat of `trimOhms` in series with a fixed arm `a` is sure to move either way (fraction). */
  const gainHalfSpan = (trimOhms: number, a: number) => ((usable * trimOhms) / (a + trimOhms / 2)) * rfSens;
  // Calibration moves the span trim only as far as the scale is actually off (at most the stack), and the
  // zero moves with it in proportion.
  const zNeed = zeroStack(design, front, ideal, target.trim.gain ? sStack : 0);

  const legPref = ideal.topology === 'non-inverting' ? rfPref / (g - 1) : rfPref / g;
  // The divider's Thevenin is half the ground leg: its current stays small, and the gain trim absorbs its tolerance.
  const rthTarget = ideal.topology === 'non-inverting' ? legPref * 0.5 : par(legPref, rfPref);
  const rs = ideal.topology === 'inverting' ? front.sourceResistance : 0;

  /** Divider, then the gain network around its Thevenin, re-aimed once or twice at the real gain. */
  const solveWith = (trimOhms: number) => {
    let vref = ideal.reference;
    let rthGoal = rthTarget;
    let div = solveDivider(design, vref, rthGoal, zNeed / refGain, refGain);
    // A divider whose Thevenin would fill the whole ground leg (a large zero trimmer makes it grow) leaves no
    // room for Rg: scale it down until it fits.
    for (let k = 0; k < 6 && ideal.topology === 'non-inverting' && div.ref.kind === 'divider' && div.ref.thevenin > 0.8 * legPref; k++) {
      rthGoal *= 0.5;
      div = solveDivider(design, vref, rthGoal, zNeed / refGain, refGain);
    }
    let gainRes: PairResult | null = null;
    let chosen = 0;
    let pick: PairCandidate | null = null;
    const rthOf = (d: DividerSolve) => (ideal.topology === 'non-inverting' && d.ref.kind === 'divider' ? d.ref.thevenin : 0);
    const search = (rth: number): PairResult => {
      const half = trimOhms / 2;
      const aPref = Math.max(rfPref - half, target.resistanceMin);
      // Keep the feedback arm small enough for the trimmer to cover the stack (gainHalfSpan solved for a).
      // If that window cannot land the gain within a tenth of the tolerance, search the whole window instead.
      const aCover = trimOhms ? (usable * trimOhms * rfSens) / (COVERAGE * sStack) - half : Infinity;
      if (aCover > aPref / 2.5 && aCover < aPref * 2.5) {
        const r = searchWindow(rth, half, aPref, aCover);
        if (r.best && Math.abs(r.best.error) <= target.tolerance / 10) return r;
      }
      return searchWindow(rth, half, aPref, aPref * 2.5);
    };
    const searchWindow = (rth: number, half: number, aPref: number, aMax: number): PairResult => {
      // Non-inverting: G = 1 + (a + half)/(b + rth), so the gain error is (G−1)/G · (ratio/(G−1) − 1);
      // inverting: G = (a + half)/(b + Rs).
      const ratio = ideal.topology === 'non-inverting' ? { cA: half, cB: rth, k: g - 1, m: (g - 1) / g } : { cA: half, cB: rs, k: g, m: 1 };
      return searchPairs(table, table, { preferredA: aPref, floor, aMin: aPref / 2.5, aMax, ratio }, 10);
    };
    // Gain network around the divider's Thevenin; the reference re-aimed at the real gain; repeated while the
    // re-aimed divider's Thevenin moves by more than 1e-4 of the leg (which would move the gain as much).
    // The alternative the design asks for, or the last one when there are fewer.
    const take = (res: PairResult): PairCandidate => { chosen = Math.min(target.alternative, res.ranked.length - 1); return res.ranked[chosen]!; };
    let rthUsed = rthOf(div);
    for (let iter = 0; iter < 4; iter++) {
      gainRes = search(rthUsed);
      if (!gainRes.ranked.length) break;
      pick = take(gainRes);
      const vrefNew = referenceFor(ideal.topology, g * (1 + pick.error), front.quiescent, ideal.pinZero);
      if (Math.abs(vrefNew - vref) < 1e-7 * (railHi - railLo)) break;
      vref = vrefNew;
      div = solveDivider(design, vref, rthGoal, zNeed / refGain, refGain);
      const rthNew = rthOf(div);
      if (Math.abs(rthNew - rthUsed) < 1e-4 * legPref) break;
      rthUsed = rthNew;
    }
    // The pick must belong to the divider built: if the loop ended on a moved Thevenin, search once more.
    if (pick && Math.abs(rthOf(div) - rthUsed) >= 1e-4 * legPref) {
      gainRes = search(rthOf(div));
      if (gainRes.ranked.length) pick = take(gainRes);
    }
    return { div, gainRes, chosen, pick };
  };

  let sol = solveWith(gainTrimOhms);
  // The feedback arm found may sit away from the preferred value: if the trimmer then falls short, take the
  // next standard value (at most twice).
  for (let attempt = 0; attempt < 2 && gainTrimOhms && sol.pick; attempt++) {
    if (gainHalfSpan(gainTrimOhms, sol.pick.a.ohms) >= COVERAGE * sStack * 0.999) break;
    const bigger = TRIMMER_VALUES.find((v) => v > gainTrimOhms);
    if (!bigger || bigger > trimCap) break;
    gainTrimOhms = bigger;
    sol = solveWith(gainTrimOhms);
  }
  const { div, gainRes, chosen, pick } = sol;
  warnings.push(...div.warnings);
  if (!gainRes || !pick) {
    warnings.push({ code: 'gain-unrealisable', level: 'fail', message: `No pair of ${target.series} arms within ${formatEng(target.resistanceMin, 'Ω')}…${formatEng(target.resistanceMax, 'Ω')} gives a gain of ${g.toPrecision(4)}; widen the resistance window.` });
    const network: StageNetwork = { topology: ideal.topology, feedback: null, gainTrim: null, leg: null, reference: div.ref };
    return { ideal, network, parts: [], alternatives: [], chosen: 0, bestError: NaN, gain: NaN, reference: div.ref.voltage, scaleError: NaN, warnings };
  }
  let gainTrim: Trimmer | null = null;
  if (gainTrimOhms) {
    const rfTot = pick.a.ohms + gainTrimOhms / 2;
    // The half-span it guarantees, its own tolerance included.
    const halfSpan = gainHalfSpan(gainTrimOhms, pick.a.ohms);
    gainTrim = { ohms: gainTrimOhms, setting: 0.5, need: sStack, halfSpan, step: (gainTrimOhms / rfTot) * rfSens * SETTABILITY };
    if (halfSpan < COVERAGE * sStack * 0.999) {
      const why = ideal.topology === 'non-inverting' && g < 1.5 ? ` Near unity gain the span trim has little leverage ((G−1)/G = ${rfSens.toFixed(2)}): pick a sensor setup with less spread, or more gain and a smaller sensitivity (fewer turns, a longer gap).` : '';
      warnings.push({ code: 'gain-trim-short', level: 'caution', message: `The gain trimmer covers ±${(halfSpan * 100).toFixed(2)} %, less than ${COVERAGE} × the ±${(sStack * 100).toFixed(2)} % worst-case stack.${why}` });
    }
  }
  const network: StageNetwork = { topology: ideal.topology, feedback: pick.a, gainTrim, leg: pick.b, reference: div.ref };
  const real = networkGain(network, front.sourceResistance);
  const scaleError = real.gain / g - 1;
  return { ideal, network, parts: partsOf(network, design), alternatives: gainRes.ranked, chosen, bestError: Math.abs(gainRes.best?.error ?? NaN), gain: real.gain, reference: real.reference, scaleError, warnings };
}

/** Numbers the parts R1, R2 … and RV1, RV2 … in signal-path order and writes their labels and codes. */
export function partsOf(net: StageNetwork, design: Design): Part[] {
  const { series, tolerance } = design.target;
  const tol = tolerance ?? usualTolerance(series);
  const parts: Part[] = [];
  let r = 0, rv = 0;
  const addArm = (arm: Arm | null, role: PartRole) => {
    if (!arm) return;
    for (const ohms of arm.parts) parts.push({ ref: `R${++r}`, role, kind: 'resistor', ohms, series, tolerance: tol, arrangement: arm.arrangement });
  };
  const addTrim = (t: Trimmer | null, role: PartRole) => {
    if (!t) return;
    parts.push({ ref: `RV${++rv}`, role, kind: 'trimmer', ohms: t.ohms, series: 'trimmer', tolerance: TRIMMER_TOLERANCE, arrangement: 'single', setting: t.setting });
  };
  addArm(net.feedback, 'feedback');
  addTrim(net.gainTrim, 'gain-trim');
  addArm(net.leg, net.topology === 'non-inverting' ? 'ground-leg' : 'input');
  if (net.reference.kind === 'divider') {
    addArm(net.reference.top, 'reference-top');
    addTrim(net.reference.trim, 'zero-trim');
    addArm(net.reference.bottom, 'reference-bottom');
  }
  const f = design.output.filter;
  if (f) {
    parts.push({ ref: `R${++r}`, role: 'output-series', kind: 'resistor', ohms: f.resistance, series, tolerance: tol, arrangement: 'single' });
    if (f.capacitance > 0) parts.push({ ref: 'C1', role: 'output-capacitor', kind: 'capacitor', ohms: 0, farads: f.capacitance, series: 'capacitor', tolerance: 0.1, arrangement: 'single' });
  }
  return parts;
}
