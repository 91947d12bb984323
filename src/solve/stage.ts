/**
 * The stage solver: from an ideal stage (gain, reference, polarity) to standard parts, stated as one search.
 *
 * 1. Aim at the real circuit: the gain the ideal closed forms must give is the wanted one corrected for the
 *    op-amp's finite open-loop gain (Black's formula, `aimedGain`), and the reference is solved from the
 *    same corrected closed form; the load divider is already undone in the ideal stage's pin scale.
 * 2. Size the trimmers once from the tolerance stacks (src/solve/trimmers.ts).
 * 3. Enumerate reference networks: a tie to the rail or ground the reference sits on, else dividers (fixed,
 *    or with the zero pot) over a grid of Thevenin resistances the ground leg can hold.
 * 4. For each, search the gain pair with the network's Thevenin and the gain trimmer's mid value folded in
 *    (non-inverting G = 1 + (Rf + Rt/2)/(Rg + Rth); inverting G = (Rf + Rt/2)/(Rin + Rs)), so the pick
 *    belongs to its network by construction; solve the zero pot's wiper exactly for the gain realised.
 * 5. Score every candidate once: score = max(|scale error|, |zero error|/output span, floor) ·
 *    1.5^(fixed parts − 2) · (1 + |log10(Rf/Rf_pref)|) · (1 + I_net/I_q): Rf_pref (100 kΩ kept inside the
 *    window) stands for noise and bias-current error, I_net/I_q is the current the divider and feedback
 *    network draw against the op-amp's own quiescent current (battery drain and output loading). Reference candidates are visited best bound first and the
 *    search stops when no remaining one can beat the best score (branch and bound: exact for this score).
 * 6. Accept only what is right: a scale more than ACCEPT of the target off, or a zero more than ACCEPT of
 *    the output span off with no trimmer to fix it, is a failure with what to change, never a caution.
 *
 * On a resistor kit with counts, the whole stage comes out of the kit at once (src/solve/kit.ts): the
 * resistors the design states (an output filter's) are taken first, each reference network is built from
 * what is left, and the gain pair for it is searched in what the network leaves in turn (inverting: the gain
 * pair first, its reference from the rest). So every candidate scored can be built from the drawer together.
 */
import type { Design } from '../model/design.js';
import { TRIMMER_VALUES } from '../model/eseries.js';
import { finding, type Finding, type FindingData } from '../model/findings.js';
import type { Arm, ReferenceNetwork, StageNetwork, Trimmer } from '../circuit/network.js';
import type { SensorFront } from '../physics/sensors.js';
import { aimedGain, loopFactor, noiseGain, peakRange, referenceFor, referenceLeverage, type IdealStage } from '../physics/topology.js';
import { kitFits, kitWithout, partsOfArms, statedResistors, targetArmTable, seriesLabel } from './kit.js';
import { searchPairs, type PairCandidate, type PairResult } from './search.js';
import { fixedDivider, nearestArm, noReference, railTie, referenceSpan, resetWiper, trimmedDivider } from './reference.js';
import { COVERAGE, SETTABILITY, feedbackSensitivity, gainTrimHalfSpan, scaleStack, zeroStack } from './trimmers.js';
import {
  ACCEPT_OF_TOLERANCE, FLOOR_OF_TOLERANCE, MAX_OVERSIZE, gainOptions, partsOf, preferredFeedback, type GainOption, type SolvedStage,
} from './common.js';
import { solveOffsetStage } from './offset-stages.js';
import { networkTransfer, openLoopOf, type OpenLoop } from './transfer.js';

export type { SolvedStage } from './common.js';
export { ACCEPT_OF_TOLERANCE, FLOOR_OF_TOLERANCE, MAX_OVERSIZE, preferredFeedback, partsOf } from './common.js';

/** Ideal-op-amp gain, noise gain and reference of a realised network (trimmers at their settings). */
export function networkGain(net: StageNetwork, sourceResistance: number): { gain: number; noiseGain: number; reference: number } {
  const rf = (net.feedback?.ohms ?? 0) + (net.gainTrim ? net.gainTrim.ohms * net.gainTrim.setting : 0);
  const rth = net.reference.kind === 'divider' ? net.reference.thevenin : 0;
  if (net.topology === 'non-inverting') {
    if (!net.leg && net.reference.kind === 'none') return { gain: 1, noiseGain: 1, reference: NaN };
    const g = 1 + rf / ((net.leg?.ohms ?? 0) + rth);
    return { gain: g, noiseGain: g, reference: net.reference.voltage };
  }
  const g = rf / ((net.leg?.ohms ?? 0) + sourceResistance);
  return { gain: g, noiseGain: 1 + g, reference: net.reference.voltage };
}

/** What the closed loop really gives for a network: scale and zero at the pin (src/solve/transfer.ts), relative to the ideal stage. */
function realised(net: StageNetwork, ideal: IdealStage, front: SensorFront, ol: OpenLoop): { gain: number; reference: number; scaleError: number; zeroError: number } {
  const t = networkTransfer(net, front, ol);
  const m = ideal.pinScale / front.sensitivity;
  return { gain: t.gain, reference: net.reference.kind === 'none' ? NaN : net.reference.voltage, scaleError: t.scale / m - 1, zeroError: t.scale * front.quiescent + t.offset - ideal.pinZero };
}

/** The reference that puts the zero where wanted for an ideal-op-amp gain G with a loop factor k applied. */
function referenceAimed(ideal: IdealStage, g: number, front: SensorFront, k: number): number {
  return referenceFor(ideal.topology, g, front.quiescent, ideal.pinZero / k);
}

interface Candidate {
  network: StageNetwork;
  ranked: PairCandidate[];
  best: number;
  chosen: number;
  score: number;
  scaleError: number;
  zeroError: number;
}

const fixedParts = (a: Arm | null) => a?.parts.length ?? 0;

/** Solves the whole stage: reference network, gain network, trimmers, parts. */
export function solveStage(design: Design, front: SensorFront, ideal: IdealStage): SolvedStage {
  const warnings: Finding[] = [];
  const { target } = design;
  const w = <K extends keyof FindingData>(code: K, level: Finding['level'], data: FindingData[K]) => warnings.push(finding(code, level, data));

  // Unity buffer: a wire from output to − input, nothing else.
  if (ideal.topology === 'non-inverting' && !ideal.needsReference) {
    const network: StageNetwork = { topology: 'non-inverting', feedback: null, gainTrim: null, leg: null, reference: noReference(design) };
    if (target.trim.gain || target.trim.zero) w('buffer-no-trim', 'info', { stage: 'unity' });
    return { ideal, network, parts: partsOf(network, design), alternatives: [], chosen: 0, gain: 1, noiseGain: 1, reference: NaN, scaleError: 0, zeroError: 0, warnings };
  }

  if (ideal.topology !== 'non-inverting' && ideal.topology !== 'inverting') return solveOffsetStage(design, front, ideal);

  const table = targetArmTable(target, target.arrangements, statedResistors(design));
  // Single parts beside a zero pot are usually enough (its wiper absorbs their rounding): offered as well.
  const singles = target.arrangements.includes('single') ? targetArmTable(target, ['single'], statedResistors(design)) : table;
  /** What the kit has left once a reference network's fixed parts are taken (the table itself off a kit). */
  const leftBy = (t: typeof table, ref: ReferenceNetwork | null) => (ref && ref.kind === 'divider' ? kitWithout(t, partsOfArms(ref.top, ref.bottom)) : t);
  const ol = openLoopOf(design);
  const a0 = ol.a0;
  const top = ideal.topology;
  const gAim = aimedGain(top, ideal.gain, a0);
  const fail = <K extends keyof FindingData>(code: K, data: FindingData[K]): SolvedStage => {
    w(code, 'fail', data);
    const network: StageNetwork = { topology: top, feedback: null, gainTrim: null, leg: null, reference: noReference(design) };
    return { ideal, network, parts: [], alternatives: [], chosen: 0, gain: NaN, noiseGain: NaN, reference: NaN, scaleError: NaN, zeroError: NaN, warnings };
  };
  if (!Number.isFinite(gAim) || gAim <= 0) {
    return fail('gain-beyond-loop', { gain: ideal.gain, openLoopGainDb: design.opamp.openLoopGainDb });
  }
  if (table.size === 0) return fail('gain-unrealisable', { series: seriesLabel(target), windowLow: target.resistanceMin, windowHigh: target.resistanceMax, gain: null, with: 'window' });

  const tol = target.tolerance;
  const floor = tol * FLOOR_OF_TOLERANCE;
  const accept = tol * ACCEPT_OF_TOLERANCE;
  const rfPref = preferredFeedback(design);
  const sens = feedbackSensitivity(top, gAim);
  const sStack = scaleStack(design, front, ideal);
  const [xLo, xHi] = peakRange(design);
  const outSpan = Math.max(Math.abs(ideal.pinScale * (xHi - xLo)), 1e-9);
  const { lo, hi } = referenceSpan(design);
  const vspan = hi - lo;
  const tableMin = table.value[0]!, tableMax = table.value[table.size - 1]!;
  const rs = top === 'inverting' ? front.sourceResistance : 0;

  const options: GainOption[] = gainOptions(target.trim.gain, sens, sStack, tableMin, tableMax);

  const prefFactor = (a: number) => 1 + Math.abs(Math.log10(a / rfPref));
  // Loading: the current the divider and the feedback network draw, against the op-amp's own quiescent
  // current (a stage that doubles its supply drain costs a factor of two).
  const iq = Math.max(design.opamp.supplyCurrent, 1e-6);
  const outMax = Math.max(Math.abs(ideal.pinZero), Math.abs(ideal.pinZero + ideal.pinScale * xLo), Math.abs(ideal.pinZero + ideal.pinScale * xHi), 1e-3);
  const dividerCurrent = (ref: ReferenceNetwork) => (ref.kind === 'divider' ? vspan / ((ref.top?.ohms ?? 0) + (ref.trim?.ohms ?? 0) + (ref.bottom?.ohms ?? 0)) : 0);
  const scoreOf = (err: number, parts: number, a: number, current: number) => Math.max(err, floor) * 1.5 ** (parts - 2) * prefFactor(a) * (1 + current / iq);
  /** Rf nearest the preferred value inside [lo, hi]: the best the preference factor can be there. */
  const prefBound = (lo: number, hi: number) => prefFactor(Math.min(Math.max(rfPref, lo), hi));

  /** The gain pair search for a given reference network and gain option. */
  const searchGain = (opt: GainOption, rth: number, aFrom: number, keep: number, fixedRef: ReferenceNetwork | null = null): PairResult => {
    const half = opt.trim / 2;
    // Non-inverting with a reference no pot can move: a gain error ε (of the ratio) moves the zero by
    // (Vq − Vref)·(G−1)·ε, ranked against the output span beside the scale's (G−1)/G·ε.
    const zeroLever = fixedRef && !fixedRef.trim && fixedRef.kind !== 'none' ? (Math.abs(front.quiescent - fixedRef.voltage) * (gAim - 1)) / outSpan : 0;
    const ratio = top === 'non-inverting' ? { cA: half, cB: rth, k: gAim - 1, m: (gAim - 1) / gAim + zeroLever } : { cA: half, cB: rs, k: gAim, m: 1 };
    const left = leftBy(table, fixedRef);
    return searchPairs(left, left, { preferredA: rfPref, floor, aMin: Math.max(opt.aMin, aFrom), aMax: opt.aMax, ratio }, keep, kitFits(left));
  };
  /**
   * The least Rf a non-inverting leg with this reference allows: the leg holds the Thevenin at least, and
   * with a zero pot at least twice it (Rg ≥ Rth), so that the pot's own ±20 % and its setting move the gain
   * little and zero and span barely interact.
   */
  const aFromRef = (opt: GainOption, ref: ReferenceNetwork) => ((ref.trim ? 2 : 1) * (gAim - 1) * ref.thevenin - opt.trim / 2) * 0.999;

  /** Builds the network of a pick, solves the zero pot's wiper for the gain realised, and scores it. */
  const finish = (opt: GainOption, ref: ReferenceNetwork, pick: PairCandidate | null, legless: Arm | null): Candidate | null => {
    const feedback = pick ? pick.a : legless;
    if (!feedback) return null;
    const gainTrim: Trimmer | null = opt.trim ? { ohms: opt.trim, setting: 0.5, need: sStack, halfSpan: gainTrimHalfSpan(opt.trim, feedback.ohms, sens), step: (opt.trim / (feedback.ohms + opt.trim / 2)) * sens * SETTABILITY } : null;
    let network: StageNetwork = { topology: top, feedback, gainTrim, leg: pick ? pick.b : null, reference: ref };
    // The wiper that gives the zero exactly: the reference wanted depends on the gain realised, which (through
    // the divider's Thevenin in a non-inverting leg) depends a little on the wiper: a contraction, solved to
    // machine precision in a few steps.
    if (ref.kind === 'divider' && ref.trim) {
      for (let i = 0; i < 8; i++) {
        // Newton on the exact transfer: the zero moves by −(G−1) (non-inverting) or (1+G) (inverting) per volt.
        const g = networkGain(network, front.sourceResistance).gain;
        const zeroErr = realised(network, ideal, front, ol).zeroError;
        const moved = resetWiper(network.reference, network.reference.voltage - zeroErr / (top === 'non-inverting' ? -(g - 1) : 1 + g));
        if (!moved) return null;
        const delta = Math.abs(moved.voltage - network.reference.voltage);
        network = { ...network, reference: moved };
        if (delta <= 1e-12 * vspan) break;
      }
    }
    const real = realised(network, ideal, front, ol);
    const parts = fixedParts(feedback) + fixedParts(network.leg) + fixedParts(ref.top) + fixedParts(ref.bottom);
    const zeroErr = ref.trim ? 0 : Math.abs(real.zeroError) / outSpan;
    const legOhms = top === 'non-inverting' ? (network.leg?.ohms ?? 0) + network.reference.thevenin : (network.leg?.ohms ?? 0) + rs;
    const current = dividerCurrent(network.reference) + outMax / (feedback.ohms + opt.trim / 2 + legOhms);
    const score = scoreOf(Math.max(Math.abs(real.scaleError), zeroErr), parts, feedback.ohms, current);
    return { network, ranked: pick ? [pick] : [], best: Math.abs(real.scaleError), chosen: 0, score, scaleError: real.scaleError, zeroError: real.zeroError };
  };

  const vref0 = referenceAimed(ideal, gAim, front, loopFactor(noiseGain(top, gAim), a0));
  const r0 = (vref0 - lo) / vspan;
  const lev = referenceLeverage(top, gAim);
  const tie = railTie(design, vref0, 1e-6 * vspan);
  const zeroAtRail = tie !== null && tie.voltage !== 0;
  // A zero at a rail (or at ground on split rails) is a wire; a zero trimmer can straddle ground but not a rail.
  // A reference at ground on split rails is a wire too when nothing but the op-amp's own offset would need
  // the trimmer (a sensor with no quiescent spread, a shunt): no divider, nothing to drift.
  const tied = tie !== null && (!target.trim.zero || zeroAtRail || front.quiescentTolerance === 0);
  const zNeedAt = (rf: number) => zeroStack(design, front, ideal, target.trim.gain ? sStack : 0, rf) / lev;

  // Every (gain option, reference network) pair with a lower bound on the score it can reach; visited best
  // bound first, stopping when no remaining pair can beat the best found (branch and bound).
  // `tight` is a second, sharper lower bound (a pot divider or a wire needs a ground leg: two gain arms at least)
  // by which a job is passed over without changing the order the others are visited in, so that among equal
  // scores the same candidate is found first as with `bound` alone.
  interface Job { opt: GainOption; ref: ReferenceNetwork | null; bound: number; tight: number }
  const jobs: Job[] = [];
  if (top === 'inverting') {
    for (const opt of options) { const bound = floor * prefBound(opt.aMin, opt.aMax); jobs.push({ opt, ref: null, bound, tight: bound }); }
  } else {
    const refs: ReferenceNetwork[] = [];
    if (tied) refs.push(tie!);
    else {
      // Thevenin grid, eight per decade, from a quarter of the smallest arm up to the most any ground leg can hold.
      const legMax = (tableMax + TRIMMER_VALUES[TRIMMER_VALUES.length - 1]! / 2) / (gAim - 1);
      const zNeed = zNeedAt(rfPref);
      const grid = (withPot: boolean) => {
        for (let e = Math.ceil(8 * Math.log10(tableMin / 4)); 10 ** (e / 8) <= legMax; e++) {
          const rth = 10 ** (e / 8);
          const made = withPot
            ? [trimmedDivider(design, singles, r0, rth, zNeed, lev, MAX_OVERSIZE), trimmedDivider(design, table, r0, rth, zNeed, lev, MAX_OVERSIZE)]
            : [fixedDivider(design, table, r0, rth, lev, floor * outSpan)];
          for (const ref of made) {
            if (ref && !refs.some((x) => x.top?.ohms === ref.top?.ohms && x.bottom?.ohms === ref.bottom?.ohms && x.trim?.ohms === ref.trim?.ohms)) refs.push(ref);
          }
        }
      };
      grid(target.trim.zero);
      // No pot can centre here (a reference within a hair of a rail): fixed dividers, and the rail itself when
      // the zero it leaves is what the scoring will judge.
      if (!refs.length && target.trim.zero) grid(false);
      if (!refs.length) {
        const near = railTie(design, vref0, 0.01 * vspan);
        if (near) refs.push(near);
      }
    }
    for (const opt of options) {
      for (const ref of refs) {
        // Rf at least (G−1)·Rth − Rt/2 (the ground leg holds the Thevenin at least), at most the band's top.
        const aLo = Math.max(aFromRef(opt, ref), opt.aMin);
        if (aLo > opt.aMax) continue;
        const bound = floor * 1.5 ** (1 + fixedParts(ref.top) + fixedParts(ref.bottom) - 2) * prefBound(aLo, opt.aMax) * (1 + dividerCurrent(ref) / iq);
        // Only a fixed divider can be the whole ground leg (one gain arm, and that arm may lie just outside
        // [aLo, aMax]): every other network's candidates come from the pair search over [aLo, aMax].
        const tight = ref.kind === 'divider' && !ref.trim ? bound : floor * 1.5 ** (2 + fixedParts(ref.top) + fixedParts(ref.bottom) - 2) * prefBound(aLo, opt.aMax) * (1 + dividerCurrent(ref) / iq);
        jobs.push({ opt, ref, bound, tight });
      }
    }
  }
  jobs.sort((x, y) => x.bound - y.bound);
  const found: { cand: Candidate | null; opt: GainOption | null } = { cand: null, opt: null };
  const consider = (cand: Candidate | null, opt: GainOption, res: PairResult | null, pick: PairCandidate | null) => {
    if (!cand || (found.cand && cand.score >= found.cand.score)) return;
    found.cand = res && pick ? { ...cand, ranked: res.ranked, chosen: res.ranked.indexOf(pick) } : cand;
    found.opt = opt;
  };
  /** Whether a candidate with these fixed gain parts, feedback arm and reference could still beat the best found (its least score). */
  const mayBeat = (gainParts: number, a: number, ref: ReferenceNetwork) =>
    !found.cand || floor * 1.5 ** (gainParts + fixedParts(ref.top) + fixedParts(ref.bottom) - 2) * prefFactor(a) * (1 + dividerCurrent(ref) / iq) < found.cand.score;
  for (const { opt, ref, bound, tight } of jobs) {
    if (found.cand && bound >= found.cand.score) break;
    if (found.cand && tight >= found.cand.score) continue;
    if (!ref) {
      // Inverting: the + input's reference does not touch the gain: the gain pair first, then the reference for
      // the gain realised, its Thevenin equal to the − input's (Rf ∥ Rin) so that the bias currents cancel.
      const res = searchGain(opt, 0, 0, 10);
      const pick = res.ranked[Math.min(target.alternative, res.ranked.length - 1)];
      if (!pick) continue;
      const rf = pick.a.ohms + opt.trim / 2, rin = pick.b.ohms + rs;
      const r = (referenceAimed(ideal, rf / rin, front, loopFactor(noiseGain(top, rf / rin), a0)) - lo) / vspan;
      const rth = (rf * rin) / (rf + rin);
      // The reference from what the gain pair leaves of a kit.
      const gainParts = partsOfArms(pick.a, pick.b);
      const restAll = kitWithout(table, gainParts), restSingles = kitWithout(singles, gainParts);
      const built = tied ? tie
        : (target.trim.zero ? trimmedDivider(design, restSingles, r, rth, zNeedAt(rf), lev, MAX_OVERSIZE) ?? trimmedDivider(design, restAll, r, rth, zNeedAt(rf), lev, MAX_OVERSIZE) ?? trimmedDivider(design, restAll, r, rth, zNeedAt(rf), lev) : railTie(design, lo + r * vspan, 1e-6 * vspan))
          ?? fixedDivider(design, restAll, r, rth, lev, floor * outSpan);
      if (built) consider(finish(opt, built, pick, null), opt, res, pick);
      continue;
    }
    const res = searchGain(opt, ref.thevenin, aFromRef(opt, ref), 10, ref);
    const pick = res.ranked[Math.min(target.alternative, res.ranked.length - 1)] ?? null;
    if (pick) consider(finish(opt, ref, pick, null), opt, res, pick);
    // With a reference no pot can move, the zero rests on the pair too: every ranked pair is scored on the
    // scale and zero it really gives (the top alternative only; a picked alternative is built as asked).
    if (!ref.trim && target.alternative === 0) for (const p of res.ranked.slice(1)) if (mayBeat(p.parts, p.a.ohms, ref)) consider(finish(opt, ref, p, null), opt, res, p);
    // A fixed divider's Thevenin may be the whole leg (no Rg): Rf = (G−1)·Rth − Rt/2.
    if (ref.kind === 'divider' && !ref.trim && target.alternative === 0) {
      const aIdeal = (gAim - 1) * ref.thevenin - opt.trim / 2;
      const near = aIdeal >= opt.aMin && aIdeal <= opt.aMax ? nearestArm(leftBy(table, ref), aIdeal) : null;
      if (near && mayBeat(fixedParts(near), near.ohms, ref)) consider(finish(opt, ref, null, near), opt, null, null);
    }
  }

  const best = found.cand, bestOpt = found.opt;
  if (!best || !bestOpt) {
    return fail('gain-unrealisable', { series: seriesLabel(target), windowLow: target.resistanceMin, windowHigh: target.resistanceMax, gain: ideal.gain, with: 'reference' });
  }
  if (Math.abs(best.scaleError) > accept) {
    return fail('scale-off-target', { series: seriesLabel(target), error: best.scaleError, accept, tolerance: tol });
  }
  if (!best.network.reference.trim && Math.abs(best.zeroError) > accept * outSpan) {
    return fail('zero-off-target', { series: seriesLabel(target), error: best.zeroError, span: outSpan, zeroTrim: target.trim.zero, networks: false });
  }
  const net = best.network;
  if (target.trim.gain && !net.gainTrim) {
    w('gain-trim-short', 'caution', { cause: 'none-fits', leverage: sens });
  } else if (net.gainTrim && !bestOpt.covers) {
    w('gain-trim-short', 'caution', { cause: 'short', halfSpan: net.gainTrim.halfSpan, coverage: COVERAGE, stack: sStack, nearUnityLeverage: top === 'non-inverting' && ideal.gain < 1.5 ? sens : null });
  }
  if (target.trim.zero && !net.reference.trim && net.reference.kind === 'rail' && net.reference.voltage === 0 && !zeroAtRail) {
    w('zero-by-wire', 'info', { offsetAtOutput: ideal.noiseGain * design.opamp.offsetVoltage });
  } else if (target.trim.zero && !net.reference.trim) {
    w('zero-trim-short', 'caution', zeroAtRail ? { cause: 'on-rail', rail: net.reference.voltage, summed: false } : { cause: 'near-rail', coverage: COVERAGE });
  } else if (net.reference.trim && Math.abs(net.reference.trim.setting - 0.5) > 0.3) {
    w('zero-trim-off-centre', 'info', { setting: net.reference.trim.setting });
  }
  const real = realised(net, ideal, front, ol);
  return { ideal, network: net, parts: partsOf(net, design), alternatives: best.ranked, chosen: Math.max(best.chosen, 0), gain: real.gain, noiseGain: networkGain(net, front.sourceResistance).noiseGain, reference: real.reference, scaleError: real.scaleError, zeroError: real.zeroError, warnings };
}
