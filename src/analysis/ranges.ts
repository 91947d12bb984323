/**
 * A range switch (issue 19): one stage, two to four scales chosen by a switch. The first position is the
 * design's own target, solved by the stage solver as usual; each further position keeps the stage's leg (and,
 * with a single pole, its reference) and switches in its own feedback arm with its own span trimmer, sized
 * and picked here from the same arm tables the solver uses, each pick scored on the exact DC transfer
 * (src/solve/transfer.ts). Two wirings:
 *
 * - single pole: only the feedback arm is switched. The zero then moves with the gain, by the closed forms
 *   of the stage (ideal op-amp, at the pin): non-inverting z = G·Vq − (G − 1)·Vref, so Δz = (G_i − G_1)·(Vq − Vref);
 *   inverting z = (1 + G)·Vp − G·Vq, so Δz = (G_i − G_1)·(Vp − Vq). The zero trimmer is shared and set on the
 *   first range; the residual it leaves on the others is stated.
 * - two poles: the second pole switches the reference network too, each position's divider (and zero
 *   trimmer) solved together with its feedback arm so the zero holds on every position.
 *
 * Each position is then analysed as a single-range design built with exactly the parts the switch puts in
 * (`analyse` with the position's stage). SI units; numbers and codes only (words in src/present/ranges.ts).
 *
 * On a resistor kit with counts every part of the switch is on the board at once: each further position's
 * own parts are picked, position by position, from what the first position and the positions before it left
 * of the kit (src/solve/kit.ts, `kitWithout`); with two poles, its divider first, then its feedback arm from
 * what the divider leaves.
 */
import type { Design, RangeSwitchWiring, Topology } from '../model/design.js';
import type { Arm, Part, ReferenceNetwork, StageNetwork, Trimmer } from '../circuit/network.js';
import type { SensorFront } from '../physics/sensors.js';
import { idealStage, loadFactor, noiseGain, referenceLeverage } from '../physics/topology.js';
import { armAt, lowerBound, type ArmTable } from '../solve/search.js';
import { kitWithout, partsOfArms, targetArmTable } from '../solve/kit.js';
import { WIPER_MAX, WIPER_MIN, fixedDivider, railTie, referenceSpan, resetWiper, trimmedDivider } from '../solve/reference.js';
import { SETTABILITY, feedbackSensitivity, gainTrimHalfSpan, standardTrimmer } from '../solve/trimmers.js';
import { networkTransfer, openLoopOf } from '../solve/transfer.js';
import { partsOf, type SolvedStage } from '../solve/stage.js';
import type { AnalyseOptions, Report } from './report.js';
import { finding, type Finding } from '../model/findings.js';

/** Topologies a range switch is designed for: the two whose gain is one arm's ratio. */
export const RANGE_TOPOLOGIES: readonly Topology[] = ['non-inverting', 'inverting'];

/** One position of the switch: its target, the network it builds, and that build analysed. */
export interface RangePosition {
  /** 0 for the design's own target, 1… for `target.ranges`. */
  index: number;
  scale: number;
  range: [number, number];
  network: StageNetwork;
  /** The position's parts with the references of the whole switch's parts list. */
  parts: Part[];
  /** The position analysed as a single-range design built with these parts (null: it could not be built). */
  report: Report | null;
  /** Zero at the instrument relative to the first position's, V (0 for the first). */
  zeroShift: number;
  /** The same from the stage's ideal closed form (single pole; null with two poles, where it is held). */
  zeroShiftClosedForm: number | null;
  /**
   * Single pole only: the zero error, V at the output, that the shared zero trimmer (set on the first
   * range) leaves on this range: each zero term's effect here less the trimmer's correction carried over.
   */
  sharedTrimResidual: number;
  /** Why this position could not be built (a code), or null. */
  unbuilt: string | null;
}

export interface RangeSwitch {
  wiring: RangeSwitchWiring;
  /**
   * How the wiring was decided: asked for in the design; or automatically, a single pole because the zero
   * moves less than the limit (`zero-holds`), two poles because it moves more (`zero-moves`), or a single
   * pole because no reference within the rails holds the zero on some position (`zero-unreachable`).
   */
  decidedBy: 'asked' | 'zero-holds' | 'zero-moves' | 'zero-unreachable';
  /** Largest |zero shift| a single pole gives over the positions, V at the instrument. */
  singlePoleShift: number;
  /** The limit the automatic choice holds the shift to, V (analysis.zeroLimit). */
  shiftLimit: number;
  poles: 1 | 2;
  throws: number;
  positions: RangePosition[];
  /** Every part of the switched stage: the shared ones and each position's own, with unique references. */
  parts: Part[];
  /** The switch's reference in the parts list. */
  switchRef: string;
  /** Current the reference networks not in use still draw (two poles: each divider stays on its rail), A: the most over the positions. */
  idleCurrent: number;
  /** The same with position 1 in (the design's own range), which the top-level battery life counts, A. */
  idleAtFirst: number;
}

/** The supply part a range switch's idle dividers are listed as. */
export const IDLE_DIVIDERS = 'reference dividers of the ranges not in use';

export type RangeSwitchResult = { ok: true; value: RangeSwitch } | { ok: false; code: 'range-stage'; topology: Topology | null; buffer: boolean };

type Analyse = (design: Design, opts: AnalyseOptions) => Report;

/** The design for one position: that range's scale and range, the same stage, no further ranges. */
export function designForRange(design: Design, index: number, topology?: Topology): Design {
  const r = index === 0 ? { scale: design.target.scale, range: design.target.range } : design.target.ranges![index - 1]!;
  const target = { ...design.target, scale: r.scale, range: [r.range[0], r.range[1]] as [number, number], ...(topology ? { topology } : {}) };
  delete target.ranges;
  delete target.rangeSwitch;
  return { ...design, target };
}

/** The exact zero at the instrument for a network, V (DC transfer at the pin, load divider applied). */
function zeroOf(net: StageNetwork, front: SensorFront, design: Design): number {
  const t = networkTransfer(net, front, openLoopOf(design));
  return (t.scale * front.quiescent + t.offset) * loadFactor(design);
}

/** The exact scale at the instrument, V per measurand unit. */
function scaleOf(net: StageNetwork, front: SensorFront, design: Design): number {
  return networkTransfer(net, front, openLoopOf(design)).scale * front.sensitivity * loadFactor(design);
}

/** The arms of a table around `ohms`: the four nearest, for an exact pick among them. */
function armsNear(table: ArmTable, ohms: number): Arm[] {
  const j = lowerBound(table.value, ohms);
  const out: Arm[] = [];
  for (let k = j - 2; k <= j + 1; k++) if (k >= 0 && k < table.size) out.push(armAt(table, k));
  return out;
}

/**
 * The feedback arm and span trimmer for one position: the ideal resistance from the position's aimed gain
 * with everything else of `base` held, then the arm near it whose exact scale is closest to the target.
 * The span trimmer keeps the first position's share of the feedback arm (so its relative reach is alike).
 */
function feedbackFor(base: StageNetwork, first: StageNetwork, design: Design, front: SensorFront, table: ArmTable): StageNetwork | null {
  const ideal = idealStage(base.topology, design, front);
  const want = design.target.scale;
  // Series resistance the feedback works against: leg and Thevenin (non-inverting) or input and source (inverting).
  const against = base.topology === 'non-inverting' ? (base.leg?.ohms ?? 0) + (base.reference.kind === 'divider' ? base.reference.thevenin : 0) : (base.leg?.ohms ?? 0) + front.sourceResistance;
  const ratio = base.topology === 'non-inverting' ? ideal.gain - 1 : ideal.gain;
  if (!(ratio > 0) || !(against > 0)) return null;
  const total = ratio * against;
  const t1 = first.gainTrim, f1 = first.feedback?.ohms ?? 0;
  const potOhms = t1 && f1 > 0 ? standardTrimmer((t1.ohms * total) / (f1 + t1.ohms / 2)) : 0;
  let best: StageNetwork | null = null, bestErr = Infinity;
  // Two rounds: the first aims with the ideal op-amp, the second corrects for what the exact transfer gave.
  let aim = total - potOhms / 2;
  for (let round = 0; round < 2 && aim > 0; round++) {
    for (const arm of armsNear(table, aim)) {
      const sens = feedbackSensitivity(base.topology, ideal.gain);
      const gainTrim: Trimmer | null = t1 ? { ohms: potOhms, setting: 0.5, need: t1.need, halfSpan: gainTrimHalfSpan(potOhms, arm.ohms, sens), step: (potOhms / (arm.ohms + potOhms / 2)) * sens * SETTABILITY } : null;
      const net: StageNetwork = { ...base, feedback: arm, gainTrim };
      const err = Math.abs(scaleOf(net, front, design) / want - 1);
      if (err < bestErr) { bestErr = err; best = net; }
    }
    if (!best) return null;
    // The scale goes as the ideal gain: the gain that would have hit the target, and the arm for it.
    const g = networkTransfer(best, front, openLoopOf(design)).gain * (want / scaleOf(best, front, design));
    aim = (base.topology === 'non-inverting' ? g - 1 : g) * against - potOhms / 2;
  }
  return best;
}

/**
 * The reference network that holds the first position's zero for a position whose feedback arm is `net`'s:
 * the same kind as the first position's, its voltage solved from the exact transfer (zero linear in the
 * reference voltage), and the feedback arm picked again for the new Thevenin: both networks together.
 */
function holdZero(net: StageNetwork, first: StageNetwork, design: Design, front: SensorFront, table: ArmTable, zero: number): StageNetwork | null {
  let cur: StageNetwork = net;
  const ref1 = first.reference;
  const lev1 = referenceLeverage(first.topology, networkTransfer(first, front, openLoopOf(design)).gain) || 1;
  const { lo, hi } = referenceSpan(design);
  for (let round = 0; round < 3; round++) {
    // The zero is linear in the reference voltage: two evaluations give the voltage that holds it.
    const v0 = cur.reference.kind === 'none' ? 0 : cur.reference.voltage;
    const z0 = zeroOf(cur, front, design);
    const z1 = zeroOf({ ...cur, reference: { ...cur.reference, voltage: v0 + 0.01 } }, front, design);
    const slope = (z1 - z0) / 0.01;
    if (!(Math.abs(slope) > 0)) return null;
    const v = v0 + (zero - z0) / slope;
    if (!(v >= lo && v <= hi)) return null;
    const lev = Math.abs(slope) / loadFactor(design);
    let ref: ReferenceNetwork | null;
    if (cur.reference.kind === 'divider' && cur.reference.trim && round > 0) ref = resetWiper(cur.reference, v);
    else if (ref1.kind === 'divider' && ref1.trim) ref = trimmedDivider(design, table, (v - lo) / (hi - lo), ref1.thevenin, ref1.trim.need / lev1, lev);
    else if (ref1.kind === 'divider') ref = fixedDivider(design, table, (v - lo) / (hi - lo), ref1.thevenin, lev, design.target.tolerance * 1e-3);
    else ref = railTie(design, v, 1e-6 * (hi - lo)) ?? trimmedDivider(design, table, (v - lo) / (hi - lo), Math.max((cur.leg?.ohms ?? 1e4) / 10, table.value[0]!), design.analysis.zeroLimit, lev);
    if (!ref) return null;
    // The feedback arm from what this position's divider leaves of a kit.
    const next = feedbackFor({ ...cur, reference: ref }, first, design, front, ref.kind === 'divider' ? kitWithout(table, partsOfArms(ref.top, ref.bottom)) : table);
    if (!next) return null;
    cur = next;
  }
  // Last, the zero trimmer's wiper set for the arm picked, by bisection on the wiper itself: the zero is
  // monotone in it, and its Thevenin (part of the gain) moves with it, so the voltage alone will not do.
  const ref = cur.reference;
  if (ref.kind === 'divider' && ref.trim) {
    const at = (x: number): StageNetwork => ({ ...cur, reference: withArms({ ...ref, trim: { ...ref.trim!, setting: x } }, ref.top, ref.bottom) });
    const f = (x: number) => zeroOf(at(x), front, design) - zero;
    let a = WIPER_MIN, b = WIPER_MAX;
    if (f(a) * f(b) <= 0) {
      for (let k = 0; k < 60; k++) { const m = (a + b) / 2; if (f(a) * f(m) <= 0) b = m; else a = m; }
      const set = resetWiper(ref, at((a + b) / 2).reference.voltage);
      if (set) cur = { ...cur, reference: set };
    }
  }
  return cur;
}

/** The first position's zero terms' effect and the zero trimmer's leverage on a network, for the residual. */
function zeroTerms(net: StageNetwork, front: SensorFront, design: Design): { terms: number[]; leverage: number } {
  const base = zeroOf(net, front, design);
  const tol = design.target.tolerance;
  const terms: number[] = [];
  const bump = (a: Arm | null | undefined, put: (x: Arm) => StageNetwork) => { if (a) terms.push(zeroOf(put({ ...a, ohms: a.ohms * (1 + tol) }), front, design) - base); };
  bump(net.leg, (x) => ({ ...net, leg: x }));
  bump(net.feedback, (x) => ({ ...net, feedback: x }));
  const ref = net.reference;
  if (ref.kind === 'divider') {
    bump(ref.top, (x) => ({ ...net, reference: withArms(ref, x, ref.bottom) }));
    bump(ref.bottom, (x) => ({ ...net, reference: withArms(ref, ref.top, x) }));
  }
  const t = networkTransfer(net, front, openLoopOf(design));
  // The sensor's zero tolerance through the signal gain; the op-amp's offset through the noise gain.
  terms.push(t.scale * front.quiescentTolerance * loadFactor(design));
  terms.push(noiseGain(net.topology, t.gain) * design.opamp.offsetVoltage * loadFactor(design));
  const leverage = ref.kind === 'divider' && ref.trim ? zeroOf({ ...net, reference: moveWiper(ref, 0.01) }, front, design) - base : 0;
  return { terms, leverage };
}

/** A divider with other fixed arms, its voltage and Thevenin recomputed (wiper where it is). */
function withArms(ref: ReferenceNetwork, top: Arm | null, bottom: Arm | null): ReferenceNetwork {
  const t = top?.ohms ?? 0, b = bottom?.ohms ?? 0, p = ref.trim?.ohms ?? 0, s = ref.trim?.setting ?? 0;
  const up = t + (1 - s) * p, dn = b + s * p;
  return { ...ref, top, bottom, voltage: ref.railBottom + (ref.railTop - ref.railBottom) * (dn / (up + dn)), thevenin: (up * dn) / (up + dn) };
}

/** A trimmed divider with its wiper moved by `ds` of the travel. */
function moveWiper(ref: ReferenceNetwork, ds: number): ReferenceNetwork {
  const trim = { ...ref.trim!, setting: ref.trim!.setting + ds };
  return withArms({ ...ref, trim }, ref.top, ref.bottom);
}

/** The references the switch's own parts get: shared parts keep the first position's; each position's own continue the count. */
function numberParts(nets: StageNetwork[], design: Design, wiring: RangeSwitchWiring): { all: Part[]; per: Part[][] } {
  const first = partsOf(nets[0]!, design);
  let r = Math.max(0, ...first.filter((p) => /^R\d+$/.test(p.ref)).map((p) => Number(p.ref.slice(1))));
  let rv = Math.max(0, ...first.filter((p) => /^RV\d+$/.test(p.ref)).map((p) => Number(p.ref.slice(2))));
  const switched = (p: Part) => p.role === 'feedback' || p.role === 'gain-trim' || (wiring === 'two-pole' && (p.role === 'reference-top' || p.role === 'reference-bottom' || p.role === 'zero-trim'));
  const all = [...first];
  const per: Part[][] = [first];
  for (const net of nets.slice(1)) {
    const own = partsOf(net, design).map((p) => {
      if (!switched(p)) return first.find((q) => q.role === p.role && q.ohms === p.ohms) ?? p;
      const ref = p.kind === 'trimmer' ? `RV${++rv}` : `R${++r}`;
      const q = { ...p, ref };
      all.push(q);
      return q;
    });
    per.push(own);
  }
  return { all, per };
}

/**
 * Designs the range switch of a design whose first position has been solved (`first`), and analyses each
 * position with `analyse`. Not for the summing and difference stages (`range-stage`).
 */
export function rangeSwitch(design: Design, first: Report, analyse: Analyse, opts: AnalyseOptions = {}): RangeSwitchResult {
  const s1 = first.stage;
  const top = s1?.ideal.topology ?? null;
  if (!s1 || !top || !RANGE_TOPOLOGIES.includes(top) || !s1.network.feedback) return { ok: false, code: 'range-stage', topology: top, buffer: !!s1 && !s1.network.feedback };
  const front = first.front;
  // The further ranges' parts come from the same place as the first range's: the kit (less every part of the
  // first position), or the series.
  const taken = (net: StageNetwork) => partsOf(net, design).filter((p) => p.kind === 'resistor' && p.role !== 'burden').map((p) => p.ohms);
  const table = targetArmTable(design.target, design.target.arrangements, taken(s1.network));
  const count = 1 + (design.target.ranges?.length ?? 0);
  const designs = Array.from({ length: count }, (_, i) => designForRange(design, i, top));
  const net1 = s1.network;
  const zero1 = zeroOf(net1, front, designs[0]!);
  // Each position's own arm from what the positions before it left.
  let leftSingle = table;
  const single = designs.map((d, i) => {
    if (i === 0) return net1;
    const n = feedbackFor(net1, net1, d, front, leftSingle);
    if (n) leftSingle = kitWithout(leftSingle, partsOfArms(n.feedback));
    return n;
  });
  const singleShift = Math.max(0, ...single.map((n) => (n ? Math.abs(zeroOf(n, front, designs[0]!) - zero1) : Infinity)));
  const asked = design.target.rangeSwitch && design.target.rangeSwitch !== 'auto' ? design.target.rangeSwitch : null;
  const limit = design.analysis.zeroLimit;
  const held = (): Array<StageNetwork | null> => {
    let left = table;
    return designs.map((d, i) => {
      if (i === 0) return net1;
      const n = single[i] ? holdZero(single[i]!, net1, d, front, left, zero1) : null;
      if (n) left = kitWithout(left, partsOfArms(n.feedback, n.reference.top, n.reference.bottom));
      return n;
    });
  };
  let wiring: RangeSwitchWiring = asked ?? (singleShift <= limit ? 'single-pole' : 'two-pole');
  let decidedBy: RangeSwitch['decidedBy'] = asked ? 'asked' : wiring === 'single-pole' ? 'zero-holds' : 'zero-moves';
  let nets = wiring === 'single-pole' ? single : held();
  // Two poles that cannot hold the zero on some position (its reference would lie beyond the rails) fall back
  // to one pole when that builds every position.
  if (!asked && wiring === 'two-pole' && nets.some((n) => !n) && single.every((n) => n)) { wiring = 'single-pole'; decidedBy = 'zero-unreachable'; nets = single; }
  const built = nets.map((n) => n ?? net1);
  const { all, per } = numberParts(built, design, wiring);
  // Two poles: every divider stays on its rail whichever position is in; the ones not in use still draw, and
  // each position's battery life counts them (`idleAt`).
  const { lo, hi } = referenceSpan(design);
  const dividerCurrent = (n: StageNetwork) => (n.reference.kind === 'divider' ? (hi - lo) / ((n.reference.top?.ohms ?? 0) + (n.reference.trim?.ohms ?? 0) + (n.reference.bottom?.ohms ?? 0)) : 0);
  const allDividers = built.reduce((a, n) => a + dividerCurrent(n), 0);
  const idleAt = (i: number) => (wiring === 'two-pole' ? allDividers - dividerCurrent(built[i]!) : 0);
  const first1 = zeroTerms(net1, front, designs[0]!);
  const [vq, vref1] = [front.quiescent, net1.reference.voltage];
  const g1 = networkTransfer(net1, front, openLoopOf(design)).gain;
  const positions: RangePosition[] = designs.map((given, i) => {
    const net = nets[i];
    const zeroShift = net ? zeroOf(net, front, given) - zero1 : NaN;
    // With one pole the position's zero is where the shared reference puts it: analysed as that target.
    const d = wiring === 'single-pole' && net ? { ...given, target: { ...given.target, zero: given.target.zero + zeroShift } } : given;
    const tr = net ? networkTransfer(net, front, openLoopOf(d)) : null;
    const gi = tr ? tr.gain : NaN;
    // The ideal closed forms (src/physics/topology.ts): Δz = (G_i − G_1)·(Vq − Vref) or (G_i − G_1)·(Vp − Vq), at the instrument.
    const closed = wiring === 'single-pole' ? (gi - g1) * (top === 'non-inverting' ? vq - vref1 : vref1 - vq) * loadFactor(d) : null;
    let residual = 0;
    if (wiring === 'single-pole' && i > 0 && net && first1.leverage !== 0) {
      const here = zeroTerms(net, front, d);
      const k = here.leverage / first1.leverage;
      residual = here.terms.reduce((acc, a, j) => acc + Math.abs(a - k * (first1.terms[j] ?? 0)), 0);
    }
    // The position's stage as the solver would state it: its ideal, the realised gain and errors at the pin.
    const ideal = idealStage(top, d, front);
    const stage: SolvedStage | null = net && tr ? {
      ...s1, ideal, network: net, parts: per[i]!, alternatives: [], chosen: 0, gain: gi, noiseGain: tr.noiseGain, reference: net.reference.voltage,
      scaleError: (tr.scale * front.sensitivity) / ideal.pinScale - 1, zeroError: tr.scale * front.quiescent + tr.offset - ideal.pinZero, warnings: [],
    } : null;
    const report = i === 0 ? first : stage ? analyse(d, { ...opts, stage, trade: false, extraDraw: { part: IDLE_DIVIDERS, amps: idleAt(i) } }) : null;
    const unbuilt = net ? null : wiring === 'two-pole' ? 'range-zero-unreachable' : 'range-gain-unreachable';
    // The shift as the circuit solver gives it (a CT's DC path runs through its winding, which the closed
    // transfer folds into the burden): what the report states at each position.
    const solved = report?.dc && first.dc ? report.dc.out[0] - first.dc.out[0] : zeroShift;
    return { index: i, scale: d.target.scale, range: d.target.range, network: net ?? net1, parts: per[i]!, report, zeroShift: solved, zeroShiftClosedForm: closed, sharedTrimResidual: residual, unbuilt };
  });
  // The most the dividers not in use draw, over the positions (the finding's figure).
  const idle = Math.max(...built.map((_, i) => idleAt(i)));
  return {
    ok: true,
    value: {
      wiring, decidedBy, singlePoleShift: singleShift, shiftLimit: limit,
      poles: wiring === 'single-pole' ? 1 : 2, throws: count, positions, parts: all, switchRef: 'SW1', idleCurrent: idle, idleAtFirst: idleAt(0),
    },
  };
}

/** One position's figures as the report states them (measurand units unless said). */
export interface PositionFigures {
  index: number;
  scale: number | null;
  zero: number | null;
  range: [number, number];
  clip: { measurandLow: number; measurandHigh: number; first: string | null } | null;
  bandwidth: number | null;
  noiseReferred: number | null;
  /** Worst-case error after calibration; with one pole, the shared zero trimmer's residual on this range added. */
  afterTrim: number | null;
  zeroShift: number | null;
  zeroShiftClosedForm: number | null;
  sharedTrimResidual: number;
  unbuilt: string | null;
}

export function positionFigures(p: RangePosition): PositionFigures {
  const r = p.report;
  const fin = (x: number | null | undefined) => (x === null || x === undefined || !Number.isFinite(x) ? null : x);
  const scale = fin(r?.dc?.out[1]);
  const residual = scale ? p.sharedTrimResidual / Math.abs(scale) : 0;
  return {
    index: p.index, scale, zero: fin(r?.dc?.out[0]), range: p.range,
    clip: r?.clip ? { measurandLow: r.clip.measurandLow, measurandHigh: r.clip.measurandHigh, first: r.clip.first } : null,
    bandwidth: fin(r?.speed?.smallSignal), noiseReferred: fin(r?.noise ? Math.abs(r.noise.referredRms) : null),
    afterTrim: fin(r?.errors ? r.errors.afterTrim + residual : null),
    zeroShift: fin(p.zeroShift), zeroShiftClosedForm: fin(p.zeroShiftClosedForm), sharedTrimResidual: p.sharedTrimResidual, unbuilt: p.unbuilt,
  };
}

/** What the range switch found, as data: its wiring and why, ranges it cannot build, zeros that move. */
export function rangeFindings(rs: RangeSwitchResult, measurand: string): Finding[] {
  if (!rs.ok) return [finding('range-stage', 'fail', { topology: rs.topology, buffer: rs.buffer })];
  const v = rs.value;
  const out: Finding[] = [finding('range-wiring', 'info', { wiring: v.wiring, decidedBy: v.decidedBy, singlePoleShift: v.singlePoleShift, limit: v.shiftLimit, throws: v.throws, idleCurrent: v.idleCurrent })];
  for (const p of v.positions) {
    if (p.unbuilt) out.push(finding('range-unbuilt', 'fail', { position: p.index + 1, scale: p.scale, cause: p.unbuilt === 'range-zero-unreachable' ? 'zero-unreachable' : 'gain-unreachable', measurand }));
    else if (v.wiring === 'single-pole' && p.index > 0 && Math.abs(p.zeroShift) > 1e-6) {
      out.push(finding('range-zero-shift', 'info', { position: p.index + 1, scale: p.scale, shift: p.zeroShift, zero: p.report?.dc?.out[0] ?? NaN, residual: p.sharedTrimResidual, measurand }));
    }
  }
  return out;
}
