/**
 * The solver for the stages that add an offset through their own resistor (summing non-inverting, summing
 * inverting) and the difference stage. Stated as a search, like the two classic stages (src/solve/stage.ts):
 *
 * 1. Reference networks: a wire to the rail (or ground) the reference sits on when no zero trimmer is wanted
 *    there, else dividers (fixed, or with the zero pot) at a few ratios of the rail span and Thevenin values.
 * 2. For each, the feedback pair (Rf plus the gain trimmer's mid value over the leg or input arm, the sensor's
 *    terminal resistance folded in) is searched for the ratio the reference implies, aimed through Black's
 *    formula at the op-amp's finite open-loop gain.
 * 3. For each of the best feedback pairs, the second ratio (α, the offset arm, or the + side pair) is searched
 *    with the realised first ratio and the network's Thevenin folded in, so each pick belongs to its network.
 * 4. A zero pot's wiper is solved exactly (bisection on the realised zero, src/solve/transfer.ts).
 * 5. Every candidate is scored once, as the classic stages are: max(|scale error|, |zero error|/span, floor)
 *    · 1.5^(fixed parts − 2) · (1 + |log10(Rf/Rf_pref)|) · (1 + I_net/I_q); the lowest wins.
 *
 * On a resistor kit with counts each step searches what the steps before it left of the kit (src/solve/kit.ts):
 * the reference from the kit less the design's stated resistors, the feedback pair from what the reference
 * leaves, the second ratio and the offset arm from what the feedback pair leaves.
 */
import type { Design } from '../model/design.js';
import { finding, type Finding, type FindingData } from '../model/findings.js';
import type { Arm, ReferenceNetwork, StageNetwork, Trimmer } from '../circuit/network.js';
import type { SensorFront } from '../physics/sensors.js';
import { loopFactor, peakRange, type IdealStage } from '../physics/topology.js';
import { kitFits, kitWithout, partsOfArms, statedResistors, targetArmTable, seriesLabel } from './kit.js';
import { searchPairs, type ArmTable, type PairCandidate, type PairResult } from './search.js';
import { dividerAt, fixedDivider, nearestArm, noReference, railTie, referenceSpan, trimmedDivider, WIPER_MAX, WIPER_MIN } from './reference.js';
import { COVERAGE, SETTABILITY, gainTrimHalfSpan, scaleStack, zeroStack } from './trimmers.js';
import { ACCEPT_OF_TOLERANCE, FLOOR_OF_TOLERANCE, MAX_OVERSIZE, gainOptions, partsOf, preferredFeedback, type GainOption, type SolvedStage } from './common.js';
import { networkTransfer, openLoopOf } from './transfer.js';

interface Candidate {
  network: StageNetwork;
  opt: GainOption;
  score: number;
  scaleError: number;
  zeroError: number;
  ranked: PairCandidate[];
  pick: PairCandidate | null;
}

/** How many of the best feedback pairs are carried into the second search. */
const FEEDBACK_KEEP = 3;

const fixedParts = (a: Arm | null | undefined) => a?.parts.length ?? 0;

/** Solves a summing non-inverting, summing inverting or difference stage. */
export function solveOffsetStage(design: Design, front: SensorFront, ideal: IdealStage): SolvedStage {
  const warnings: Finding[] = [];
  const w = <K extends keyof FindingData>(code: K, level: Finding['level'], data: FindingData[K]) => warnings.push(finding(code, level, data));
  const { target } = design;
  const top = ideal.topology;
  const fail = <K extends keyof FindingData>(code: K, data: FindingData[K]): SolvedStage => {
    w(code, 'fail', data);
    const network: StageNetwork = { topology: top, feedback: null, gainTrim: null, leg: null, reference: noReference(design) };
    return { ideal, network, parts: [], alternatives: [], chosen: 0, gain: NaN, noiseGain: NaN, reference: NaN, scaleError: NaN, zeroError: NaN, warnings };
  };
  const table = targetArmTable(target, target.arrangements, statedResistors(design));
  if (table.size === 0) return fail('gain-unrealisable', { series: seriesLabel(target), windowLow: target.resistanceMin, windowHigh: target.resistanceMax, gain: null, with: 'window' });
  const singles = target.arrangements.includes('single') ? targetArmTable(target, ['single'], statedResistors(design)) : table;
  const ol = openLoopOf(design);
  const a0 = ol.a0;
  const tol = target.tolerance;
  const floor = tol * FLOOR_OF_TOLERANCE;
  const accept = tol * ACCEPT_OF_TOLERANCE;
  const rfPref = preferredFeedback(design);
  const tableMin = table.value[0]!, tableMax = table.value[table.size - 1]!;
  const { lo, hi } = referenceSpan(design);
  const vspan = hi - lo;
  const [xLo, xHi] = peakRange(design);
  const m = ideal.pinScale / front.sensitivity;
  const b = ideal.offset;
  const outSpan = Math.max(Math.abs(ideal.pinScale * (xHi - xLo)), 1e-9);
  const sStack = scaleStack(design, front, ideal);
  const options = ideal.feedbackRatio > 0 ? gainOptions(target.trim.gain, ideal.feedbackSensitivity, sStack, tableMin, tableMax) : [{ trim: 0, aMin: tableMin, aMax: tableMax, covers: true }];
  const zOut = zeroStack(design, front, ideal, target.trim.gain ? sStack : 0, rfPref);
  const iq = Math.max(design.opamp.supplyCurrent, 1e-6);
  const outMax = Math.max(Math.abs(ideal.pinZero), Math.abs(ideal.pinZero + ideal.pinScale * xLo), Math.abs(ideal.pinZero + ideal.pinScale * xHi), 1e-3);
  const swapped = ideal.swapped;
  const rsPlus = swapped ? front.minusResistance : front.sourceResistance;
  const rsMinus = swapped ? front.sourceResistance : front.minusResistance;

  // Reference networks to try, with the reference voltage each aims at.
  const refs: ReferenceNetwork[] = [];
  const addRef = (ref: ReferenceNetwork | null) => {
    if (ref && !refs.some((x) => x.kind === ref.kind && x.voltage === ref.voltage && x.top?.ohms === ref.top?.ohms && x.bottom?.ohms === ref.bottom?.ohms && x.trim?.ohms === ref.trim?.ohms)) refs.push(ref);
  };
  const tieTol = 1e-6 * vspan;
  /** Reference voltages that give a feedback ratio of at least `minRatio` (summing non-inverting needs K ≥ 1). */
  const wantedRatios = (): number[] => {
    const v0 = ideal.reference;
    const fr = Number.isFinite(v0) ? (v0 - lo) / vspan : 0.5;
    // The difference stage's reference passes with Black's factor k = 1/(1 + (1+G)/A0): aim it at b/k.
    if (top === 'difference') return [(v0 / loopFactor(1 + ideal.gain, a0) - lo) / vspan];
    // The summing stages: the reference can sit anywhere on b's side of ground; a few ratios of the rail span.
    const out = [fr];
    for (const r of [0.5, 0.7, 0.3, 0.85, 0.15]) {
      const v = lo + r * vspan;
      // b = K(1−α)·Vr (summing non-inverting) or −G2·Vr (summing inverting): Vr on b's side or the other.
      const side = top === 'summing-non-inverting' ? Math.sign(b) : -Math.sign(b);
      if (Math.sign(v) !== side || Math.abs(v) < 1e-6) continue;
      if (out.length >= 3) break;
      if (top === 'summing-non-inverting' && m + b / v < 1 + 1e-3) continue;
      out.push(r);
    }
    return out;
  };
  const tie = railTie(design, ideal.reference, tieTol);
  // The Thevenin folds into the arm it feeds (R2, Roff or R4, of the order of the preferred feedback arm):
  // a tenth, a thirtieth and a hundredth of that, inside the window.
  const rthGrid = [rfPref / 10, rfPref / 30, rfPref / 100].filter((x) => x >= tableMin / 4);
  if (!rthGrid.length) rthGrid.push(tableMin);
  const dividers = (withPot: boolean) => {
    for (const r of wantedRatios()) {
      if (!(r > 1e-6 && r < 1 - 1e-6)) continue;
      const leverage = leverageAt(lo + r * vspan);
      const zNeed = zOut / Math.max(leverage, 1e-12);
      for (const rth of rthGrid) {
        addRef(withPot
          ? trimmedDivider(design, singles, r, rth, zNeed, leverage, MAX_OVERSIZE) ?? trimmedDivider(design, table, r, rth, zNeed, leverage, MAX_OVERSIZE)
          : fixedDivider(design, table, r, rth, leverage, floor * outSpan));
      }
    }
  };
  // With a zero trimmer wanted: dividers with the pot; without one (or when no pot covers): a wire to the
  // rail the reference sits on, else fixed dividers.
  if (target.trim.zero) dividers(true);
  if (!refs.length && tie) addRef(tie);
  // Fixed dividers beside a wire give the summing stages a free reference voltage, so both ratios can land.
  if (!target.trim.zero || !refs.length) dividers(false);
  if (!refs.length) {
    return fail('reference-unrealisable', { series: seriesLabel(target), windowLow: target.resistanceMin, windowHigh: target.resistanceMax, reference: ideal.reference });
  }

  /** dVout/dVr at a reference voltage vr for the ideal stage that uses it. */
  function leverageAt(vr: number): number {
    if (top === 'summing-non-inverting') return Math.abs(b / vr);
    if (top === 'summing-inverting') return Math.abs(b / vr);
    return 1;
  }

  const prefFactor = (a: number) => 1 + Math.abs(Math.log10(a / rfPref));
  const dividerCurrent = (ref: ReferenceNetwork) => (ref.kind === 'divider' ? vspan / ((ref.top?.ohms ?? 0) + (ref.trim?.ohms ?? 0) + (ref.bottom?.ohms ?? 0)) : 0);
  let best: Candidate | null = null;
  const partsIn = (net: StageNetwork) => fixedParts(net.feedback) + fixedParts(net.leg) + fixedParts(net.plusArm) + fixedParts(net.offsetArm) + fixedParts(net.reference.top) + fixedParts(net.reference.bottom);
  /** The current the feedback network and the divider draw. */
  const loadsOf = (net: StageNetwork, opt: GainOption) => (net.feedback ? outMax / (net.feedback.ohms + opt.trim / 2 + (net.leg?.ohms ?? 0)) : 0) + dividerCurrent(net.reference);

  /** Scores a network (after the zero pot's wiper is solved) and keeps it when it beats the best. */
  const consider = (network: StageNetwork, opt: GainOption, ranked: PairCandidate[], pick: PairCandidate | null) => {
    let net = network;
    const ref = net.reference;
    // Parts, Rf and the current drawn do not move with the zero pot's wiper: a network whose least score (the
    // error at the floor) cannot beat the best is dropped before its wiper is solved.
    if (best && floor * 1.5 ** (partsIn(net) - 2) * prefFactor(net.feedback?.ohms ?? rfPref) * (1 + loadsOf(net, opt) / iq) >= (best as Candidate).score) return;
    if (ref.kind === 'divider' && ref.trim) {
      const solved = solveWiper(net);
      if (!solved) return;
      net = solved;
    }
    const t = networkTransfer(net, front, ol);
    const scaleError = t.scale / m - 1;
    const zeroError = t.scale * front.quiescent + t.offset - ideal.pinZero;
    if (!Number.isFinite(scaleError) || !Number.isFinite(zeroError)) return;
    const zeroRel = net.reference.trim ? 0 : Math.abs(zeroError) / outSpan;
    const score = Math.max(Math.abs(scaleError), zeroRel, floor) * 1.5 ** (partsIn(net) - 2) * prefFactor(net.feedback?.ohms ?? rfPref) * (1 + loadsOf(net, opt) / iq);
    if (best && score >= best.score) return;
    best = { network: net, opt, score, scaleError, zeroError, ranked, pick };
  };

  /** The wiper setting that puts the zero exactly where wanted (bisection: the zero is monotone in the wiper). */
  function solveWiper(net: StageNetwork): StageNetwork | null {
    const ref = net.reference;
    if (!ref.trim) return net;
    const t = ref.top?.ohms ?? 0, bo = ref.bottom?.ohms ?? 0, pot = ref.trim.ohms;
    const at = (s: number): StageNetwork => {
      const d = dividerAt(lo, hi, t, pot, bo, s);
      return { ...net, reference: { ...ref, voltage: d.voltage, thevenin: d.thevenin, trim: { ...ref.trim!, setting: s } } };
    };
    const err = (s: number) => {
      const tr = networkTransfer(at(s), front, ol);
      return tr.scale * front.quiescent + tr.offset - ideal.pinZero;
    };
    let s0 = WIPER_MIN, s1 = WIPER_MAX;
    let e0 = err(s0);
    const e1 = err(s1);
    if (!(Math.sign(e0) !== Math.sign(e1))) return null;
    for (let i = 0; i < 60 && s1 - s0 > 1e-12; i++) {
      const sm = (s0 + s1) / 2, em = err(sm);
      if (Math.sign(em) === Math.sign(e0)) { s0 = sm; e0 = em; } else s1 = sm;
    }
    const s = (s0 + s1) / 2;
    const built = at(s);
    const perTravel = ref.trim.step / SETTABILITY;
    const reach = Math.min(s, 1 - s) * perTravel;
    if (reach < COVERAGE * ref.trim.need * 0.999) return null;
    return { ...built, reference: { ...built.reference, trim: { ...built.reference.trim!, halfSpan: reach } } };
  }

  const gainTrimOf = (opt: GainOption, feedback: Arm): Trimmer | null => (opt.trim
    ? { ohms: opt.trim, setting: 0.5, need: sStack, halfSpan: gainTrimHalfSpan(opt.trim, feedback.ohms, ideal.feedbackSensitivity), step: (opt.trim / (feedback.ohms + opt.trim / 2)) * ideal.feedbackSensitivity * SETTABILITY }
    : null);
  /** A pair search with both arms from `t` (the kit's rest at this step, or the whole series). */
  const search = (t: ArmTable, ratio: { cA: number; cB: number; k: number; m: number }, pref: number, aMin: number, aMax: number, keep: number): PairResult =>
    searchPairs(t, t, { preferredA: pref, floor, aMin, aMax, ratio }, keep, kitFits(t));
  // The feedback pair depends on the reference only through its voltage (and, on a kit, the parts it leaves):
  // searched once per voltage, trimmer and table.
  const feedbackCache = new Map<ArmTable, Map<string, PairResult>>();
  const feedbackSearch = (left: ArmTable, key: string, opt: GainOption, ratio: { cA: number; cB: number; k: number; m: number }): PairResult => {
    const k = `${key}|${opt.trim}`;
    let byKey = feedbackCache.get(left);
    if (!byKey) { byKey = new Map(); feedbackCache.set(left, byKey); }
    let hit = byKey.get(k);
    if (!hit) { hit = search(left, ratio, rfPref, opt.aMin, opt.aMax, FEEDBACK_KEEP); byKey.set(k, hit); }
    return hit;
  };
  /** What a reference network leaves of a kit, and what a feedback pair leaves of that. */
  const leftByRef = (ref: ReferenceNetwork) => (ref.kind === 'divider' ? kitWithout(table, partsOfArms(ref.top, ref.bottom)) : table);
  const leftByPair = (left: ArmTable, fb: PairCandidate | null) => (fb ? kitWithout(left, partsOfArms(fb.a, fb.b)) : left);

  /**
   * The least score a network with this reference, feedback pair and trimmer can reach: the error floor, the
   * parts already fixed plus the one or two arms still to come (one part each at least), the preference for
   * Rf and the current the parts fixed so far draw. Nothing below it can beat the best found (branch and bound).
   */
  const bound = (ref: ReferenceNetwork, fb: PairCandidate | null, opt: GainOption, armsToCome: number): number => {
    const parts = (fb?.parts ?? 0) + fixedParts(ref.top) + fixedParts(ref.bottom) + armsToCome;
    const rf = fb ? fb.a.ohms : rfPref;
    const loads = (fb ? outMax / (rf + opt.trim / 2 + fb.b.ohms) : 0) + dividerCurrent(ref);
    return floor * 1.5 ** (parts - 2) * prefFactor(rf) * (1 + loads / iq);
  };
  const beaten = (x: number) => best !== null && x >= (best as Candidate).score;
  // Cheaper networks first, so that the bound prunes early.
  refs.sort((x, y) => bound(x, null, options[0]!, 0) - bound(y, null, options[0]!, 0));
  for (const ref of refs) {
    if (beaten(bound(ref, null, options[0]!, 3))) continue;
    const vr = ref.kind === 'none' ? 0 : ref.voltage;
    const rth = ref.kind === 'divider' ? ref.thevenin : 0;
    const left = leftByRef(ref);
    for (const opt of options) {
      const half = opt.trim / 2;
      if (top === 'summing-non-inverting') {
        // k·K = m + b/Vr, α = m/(k·K); K = 1 is a follower (no Rf, no Rg).
        const kk0 = vr !== 0 ? m + b / vr : 1;
        const kAim = kk0 / (1 - kk0 / a0);
        if (!(kAim >= 1 - 1e-9)) continue;
        const follower = kAim < 1 + 1e-6;
        // K's error moves the scale and, with no pot, the zero's offset part in proportion.
        const kLever = ((kAim - 1) / kAim) * (1 + (target.trim.zero ? 0 : Math.abs(b) / outSpan));
        const feedbacks: Array<PairCandidate | null> = follower ? [null] : feedbackSearch(left, `${vr}`, opt, { cA: half, cB: 0, k: kAim - 1, m: kLever }).ranked;
        const fres = follower ? [] : (feedbacks as PairCandidate[]);
        for (const fb of feedbacks) {
          if (follower && opt.trim) continue;
          if (beaten(bound(ref, fb, opt, 2))) continue;
          const kReal = fb ? 1 + (fb.a.ohms + half) / fb.b.ohms : 1;
          const kLoop = loopFactor(kReal, a0) * kReal;
          const alpha = m / kLoop;
          if (!(alpha > 0 && alpha < 1)) continue;
          // (R2 + Rth)/(R1 + Rs) = α/(1 − α); the error in α is (1 − α) times the ratio's.
          // R2 near half the preferred feedback arm, well above the Thevenin, and small enough for R1 to fit.
          const rho = alpha / (1 - alpha);
          const r2Lo = Math.max(tableMin, (tableMin + rsPlus) * rho * 1.15 - rth), r2Hi = Math.min(tableMax, (tableMax + rsPlus) * rho / 1.15 - rth);
          if (!(r2Hi >= r2Lo)) continue;
          const pref = Math.min(Math.max(rfPref / 2, 10 * rth, r2Lo * 1.1), r2Hi / 1.1);
          // A ratio error ε moves the scale by (1−α)·ε and, with no pot to absorb it, the zero by α·|b|·ε.
          const zeroLever = ref.trim ? 0 : (alpha * Math.abs(b)) / outSpan;
          const sres = search(leftByPair(left, fb), { cA: rth, cB: rsPlus, k: alpha / (1 - alpha), m: 1 - alpha + zeroLever }, pref, Math.max(tableMin, pref / 1.1), Math.min(tableMax, pref * 1.1), 2);
          for (const sp of sres.ranked) {
            const network: StageNetwork = { topology: top, feedback: fb ? fb.a : null, gainTrim: fb ? gainTrimOf(opt, fb.a) : null, leg: fb ? fb.b : null, reference: ref, plusArm: sp.b, offsetArm: sp.a };
            consider(network, opt, fres, fb);
          }
        }
      } else if (top === 'summing-inverting') {
        // G1 = Rf/(Rin + Rs) aimed through k = (1 + 1/A0)/(1 − (G1 + G2)/A0)⁻¹; G2 = Rf/(Roff + Rth) = |b|/Vr.
        const g2w = Math.abs(b / vr);
        const inv = (1 + 1 / a0) / (1 - (Math.abs(m) + g2w) / a0);
        if (!(inv > 0)) continue;
        const g1 = Math.abs(m) * inv;
        // The sensor's + terminal feeds Rin here: its resistance is the source resistance.
        const res = feedbackSearch(left, `${vr}`, opt, { cA: half, cB: front.sourceResistance, k: g1, m: 1 });
        for (const fb of res.ranked) {
          if (beaten(bound(ref, fb, opt, 1))) continue;
          const rf = fb.a.ohms + half;
          const roff = nearestArm(leftByPair(left, fb), rf / (g2w * inv) - rth);
          if (!roff) continue;
          consider({ topology: top, feedback: fb.a, gainTrim: gainTrimOf(opt, fb.a), leg: fb.b, reference: ref, offsetArm: roff }, opt, res.ranked, fb);
        }
      } else {
        // Difference: G = Rf/(Rin + Rs−) aimed like the inverting stage; then (R4 + Rth)/(R3 + Rs+) = G realised.
        const gAim = (ideal.gain * (1 + 1 / a0)) / (1 - ideal.gain / a0);
        if (!(gAim > 0)) continue;
        const res = feedbackSearch(left, 'difference', opt, { cA: half, cB: rsMinus, k: gAim, m: 1 });
        for (const fb of res.ranked) {
          if (beaten(bound(ref, fb, opt, 2))) continue;
          const gReal = (fb.a.ohms + half) / (fb.b.ohms + rsMinus);
          // A ratio error ε of the + side moves the scale by ε/(1+G) and the zero by about ε·G/(1+G)·(|Vcm| + |Vref|)
          // (the common-mode error of a mismatched pair): ranked on both, the zero's against the output span.
          const cmLever = ((gReal / (1 + gReal)) * (Math.abs(front.commonMode ?? 0) + Math.abs(vr))) / outSpan;
          const pres = search(leftByPair(left, fb), { cA: rth, cB: rsPlus, k: gReal, m: 1 / (1 + gReal) + cmLever }, fb.a.ohms, Math.max(tableMin, fb.a.ohms / 1.1), Math.min(tableMax, fb.a.ohms * 1.1), 2);
          for (const pp of pres.ranked) {
            consider({ topology: top, feedback: fb.a, gainTrim: gainTrimOf(opt, fb.a), leg: fb.b, reference: ref, plusArm: pp.b, offsetArm: pp.a, swapped }, opt, res.ranked, fb);
          }
        }
      }
    }
  }

  const found = best as Candidate | null;
  if (!found) {
    return fail('gain-unrealisable', { series: seriesLabel(target), windowLow: target.resistanceMin, windowHigh: target.resistanceMax, gain: ideal.gain, with: 'offset' });
  }
  if (Math.abs(found.scaleError) > accept) {
    return fail('scale-off-target', { series: seriesLabel(target), error: found.scaleError, accept, tolerance: tol });
  }
  if (!found.network.reference.trim && Math.abs(found.zeroError) > accept * outSpan) {
    return fail('zero-off-target', { series: seriesLabel(target), error: found.zeroError, span: outSpan, zeroTrim: target.trim.zero, networks: true });
  }
  const net = found.network;
  if (net.gainTrim && !found.opt.covers) {
    w('gain-trim-short', 'caution', { cause: 'short', halfSpan: net.gainTrim.halfSpan, coverage: COVERAGE, stack: sStack, nearUnityLeverage: null });
  }
  if (target.trim.gain && !net.gainTrim && net.feedback) {
    w('gain-trim-short', 'caution', { cause: 'none-fits', leverage: null });
  } else if (target.trim.gain && !net.gainTrim) {
    w('buffer-no-trim', 'info', { stage: 'summing-follower' });
  }
  if (target.trim.zero && !net.reference.trim) {
    w('zero-trim-short', 'caution', net.reference.kind === 'rail' ? { cause: 'on-rail', rail: net.reference.voltage, summed: true } : { cause: 'near-rail', coverage: COVERAGE });
  } else if (net.reference.trim && Math.abs(net.reference.trim.setting - 0.5) > 0.3) {
    w('zero-trim-off-centre', 'info', { setting: net.reference.trim.setting });
  }
  const t = networkTransfer(net, front, ol);
  const chosen = found.pick ? Math.max(found.ranked.findIndex((c) => c.a.ohms === found.pick!.a.ohms && c.b.ohms === found.pick!.b.ohms), 0) : 0;
  return {
    ideal, network: net, parts: partsOf(net, design), alternatives: found.ranked, chosen,
    gain: t.gain, noiseGain: t.noiseGain, reference: net.reference.kind === 'none' ? NaN : net.reference.voltage,
    scaleError: found.scaleError, zeroError: found.zeroError, warnings,
  };
}
