/**
 * The single-op-amp stages Gainwright designs, as ideal closed forms, and the choice between them. Every
 * stage gives Vout = m·Vs + b for a sensor voltage Vs (the four sign cases of m and b taught for
 * single-supply design, e.g. Mancini (ed.), Op Amps for Everyone, Newnes 2003, ch. 4; and the difference
 * stage, Franco, Design with Operational Amplifiers and Analog Integrated Circuits, 4th ed., §2.3):
 *
 * Non-inverting, reference Vref at the foot of the ground leg (m > 0, b < 0 on a single supply):
 *   Vout = G·Vs − (G−1)·Vref,                 G = 1 + Rf/Rleg
 * Inverting, reference Vp at the + input (m < 0, b > 0):
 *   Vout = (1+G)·Vp − G·Vs,                   G = Rf/Rin
 * Summing non-inverting: sensor through R1 and reference Vr through R2 into the + input (m > 0, b > 0):
 *   Vout = K·(α·Vs + (1−α)·Vr),               K = 1 + Rf/Rg, α = R2/(R1 + R2)
 * Summing inverting: sensor through Rin and reference Vr through Roff into the − input, + input grounded
 * (m < 0, b < 0):
 *   Vout = −(Rf/Rin)·Vs − (Rf/Roff)·Vr
 * Difference: sensor + terminal through R3 to the + input, R4 from there to Vref; − terminal through Rin to
 * the − input, Rf feedback; with R4/R3 = Rf/Rin = G:
 *   Vout = G·(V+ − V−) + Vref
 * Noise gain is 1 + Rf/(everything from the − input to a fixed voltage) (Franco, Design with Operational Amplifiers and Analog Integrated Circuits, 4th ed., ch. 6, from memory):
 * G (non-inverting), 1 + G (inverting, difference), K (summing non-inverting), 1 + Rf/Rin +
 * Rf/Roff (summing inverting). Resistances include the sensor's source resistance and the reference
 * network's Thevenin resistance where they sit in series.
 */
import { TOPOLOGIES, type Design, type Topology } from '../model/design.js';
import type { SensorFront } from './sensors.js';
import type { StageGuidance, StageReason } from '../model/findings.js';

export interface IdealStage {
  topology: Topology;
  /** Magnitude of the signal gain from sensor to op-amp output (G above). */
  gain: number;
  noiseGain: number;
  /** Reference voltage: at the foot of the ground leg (non-inverting) or at the + input (inverting), V. */
  reference: number;
  /** Whether the reference is needed at all (a unity buffer needs none). */
  needsReference: boolean;
  /** Scale and zero wanted at the op-amp output pin (the load divider already undone). */
  pinScale: number;
  pinZero: number;
  /** Signed scale this topology delivers at the load (may differ in sign from the target for AC targets). */
  deliveredScale: number;
  feasible: boolean;
  /** Why this topology does or does not fit, in plain words. */
  reasons: StageReason[];
  /** The offset b of Vout = m·Vs + b wanted at the pin, V. */
  offset: number;
  /** How far the output moves per volt at the reference (magnitude, ideal op-amp). */
  leverage: number;
  /** d(scale)/scale per dRf/Rf: how hard a feedback trimmer pulls the scale. */
  feedbackSensitivity: number;
  /** The feedback pair's ratio: Rf/Rleg (non-inverting), K − 1 = Rf/Rg (summing non-inverting), Rf/Rin (the others). */
  feedbackRatio: number;
  /** The second ratio: α = R2/(R1+R2) (summing non-inverting), Rf/Roff (summing inverting), R4/R3 (difference); NaN otherwise. */
  split: number;
  /** Difference stage: the sensor's terminals enter swapped (− terminal to the + input) for a negative scale. */
  swapped: boolean;
}

/** Non-inverting output for a sensor voltage: Vout = G·Vs − (G−1)·Vref. */
export function nonInvertingOutput(gain: number, vs: number, vref: number): number {
  return gain * vs - (gain - 1) * vref;
}

/** Inverting output for a sensor voltage: Vout = (1+G)·Vp − G·Vs. */
export function invertingOutput(gain: number, vs: number, vp: number): number {
  return (1 + gain) * vp - gain * vs;
}

/**
 * The reference that puts the zero where wanted, from the two closed forms above solved for it:
 * non-inverting Vref = (G·Vq − zero)/(G − 1), inverting Vp = (zero + G·Vq)/(1 + G).
 */
export function referenceFor(topology: Topology, gain: number, quiescent: number, zero: number): number {
  return topology === 'non-inverting' ? (gain * quiescent - zero) / (gain - 1) : (zero + gain * quiescent) / (1 + gain);
}

/**
 * Noise gain of the stage for a signal gain G: 1 + Rf/Rleg = G (non-inverting) or 1 + Rf/Rin = 1 + G
 * (inverting), the same expression 1 + Rf/R for both (Franco, Design with Operational Amplifiers and Analog Integrated Circuits, 4th ed., ch. 6, from memory). Example: inverting G = 4 → 5.
 */
export function noiseGain(topology: Topology, gain: number): number {
  return topology === 'non-inverting' ? gain : 1 + gain;
}

/**
 * How much a change of the reference moves the output: G − 1 at the foot of a non-inverting ground leg,
 * 1 + G at an inverting stage's + input (from the closed forms above). Example: non-inverting G = 8 → 7.
 */
export function referenceLeverage(topology: Topology, gain: number): number {
  return topology === 'non-inverting' ? gain - 1 : 1 + gain;
}

/**
 * The ideal-op-amp gain that gives the closed-loop gain `gain` with a finite DC open-loop gain A0, from
 * Black's feedback formula G_cl = G_i / (1 + NG/A0) with NG the noise gain: non-inverting G_i = G/(1 − G/A0);
 * inverting G_i = G(1 + 1/A0)/(1 − G/A0). Example: non-inverting 100 with A0 = 10⁵ → 100.1001.
 */
export function aimedGain(topology: Topology, gain: number, a0: number): number {
  if (!(a0 > 0) || !Number.isFinite(a0)) return gain;
  const d = 1 - gain / a0;
  if (!(d > 0)) return NaN;
  return topology === 'non-inverting' ? gain / d : (gain * (1 + 1 / a0)) / d;
}

/** Black's factor 1/(1 + NG/A0) by which a finite open-loop gain shrinks the ideal closed forms. Example: NG 100, A0 10⁵ → 0.999. */
export function loopFactor(noiseGainValue: number, a0: number): number {
  return !(a0 > 0) || !Number.isFinite(a0) ? 1 : 1 / (1 + noiseGainValue / a0);
}

/** The part of the op-amp output voltage that reaches the load through an output series resistor. */
export function loadFactor(design: Pick<Design, 'output'>): number {
  const rl = design.output.load.resistance;
  const rs = design.output.filter?.resistance ?? 0;
  return rl / (rl + rs);
}

/** Rails the reference divider can hang between: [bottom, top], V. */
export function referenceRails(design: Pick<Design, 'supply'>): [number, number] {
  const top = design.supply.referenceRail === 'regulated' && design.supply.regulated
    ? design.supply.negative + design.supply.regulated.voltage
    : design.supply.positive;
  return [design.supply.negative, top];
}

const EPS_UNITY = 1e-6;

/** Whether a stage keeps the sensor's polarity (+1), flips it (−1), or can do either (0: the difference stage, by swapping its inputs). */
function naturalSign(topology: Topology): number {
  return topology === 'non-inverting' || topology === 'summing-non-inverting' ? 1 : topology === 'difference' ? 0 : -1;
}

/** The ideal stage of one topology for this design, with the reasons it is or is not feasible. */
export function idealStage(topology: Topology, design: Design, front: SensorFront): IdealStage {
  const k = loadFactor(design);
  const acFree = design.target.signal === 'ac-rms';
  const reasons: StageReason[] = [];
  const sens = front.sensitivity;
  let pinScale = design.target.scale / k;
  let delivered = design.target.scale;
  const pinZero = design.target.zero / k;
  const vq = front.quiescent;
  const [railLo, railHi] = referenceRails(design);
  const inLo = design.supply.negative + design.opamp.inputLow;
  const inHi = design.supply.positive - design.opamp.inputHigh;
  const [xLo, xHi] = peakRange(design);
  const natural = naturalSign(topology) * Math.sign(sens);
  const out = (o: Partial<IdealStage> & Pick<IdealStage, 'gain' | 'noiseGain' | 'reference' | 'feasible'>): IdealStage => ({
    topology, needsReference: true, pinScale, pinZero, deliveredScale: delivered, reasons,
    offset: NaN, leverage: NaN, feedbackSensitivity: 1, feedbackRatio: NaN, split: NaN, swapped: false, ...o,
  });
  const infeasible = (why: StageReason, gain = NaN) => { reasons.push(why); return out({ gain, noiseGain: NaN, reference: NaN, needsReference: false, feasible: false }); };
  if (natural !== 0 && Math.sign(pinScale) !== natural) {
    if (acFree) {
      pinScale = -pinScale;
      delivered = -delivered;
      reasons.push({ code: 'polarity-inverted-ac' });
    } else {
      return infeasible({ code: 'polarity-wrong', keeps: natural === Math.sign(sens) });
    }
  }
  if (front.commonMode !== null && topology !== 'difference') {
    return infeasible({ code: 'differential-needs-difference' });
  }
  // Vout = m·Vs + b at the pin, for the sensor voltage Vs (its differential voltage for the difference stage).
  const m = pinScale / sens;
  const b = pinZero - m * vq;
  const cm = front.commonMode ?? 0;
  /** The sensor voltage (at the terminal named) over the range's ends. */
  const vsAt = (x: number) => vq + sens * x;
  /** Input voltages over the range for an input that follows f(Vs); a reason when they leave the op-amp's input range. */
  const checkInputs = (f: (vs: number) => number, what: Extract<StageReason, { code: 'inputs-outside' }>['what']): boolean => {
    const v1 = f(vsAt(xLo)), v2 = f(vsAt(xHi)), v0 = f(vq);
    const lo = Math.min(v1, v2, v0), hi = Math.max(v1, v2, v0);
    if (lo < inLo - 1e-9 || hi > inHi + 1e-9) {
      reasons.push({ code: 'inputs-outside', what, low: lo, high: hi, inputLow: inLo, inputHigh: inHi });
      return false;
    }
    return true;
  };
  const outsideRails = (v: number) => v < railLo - 1e-9 || v > railHi + 1e-9;

  switch (topology) {
    case 'non-inverting': {
      const g = m;
      if (g < 1 - EPS_UNITY) return infeasible({ code: 'cannot-attenuate', gain: g }, g);
      const unity = Math.abs(g - 1) < EPS_UNITY;
      let reference = NaN;
      let feasible = true;
      if (unity) {
        if (Math.abs(pinZero - vq) > 1e-3) { feasible = false; reasons.push({ code: 'buffer-zero-fixed', sensorZero: vq, wanted: pinZero }); }
      } else {
        reference = referenceFor('non-inverting', g, vq, pinZero);
        if (outsideRails(reference)) { feasible = false; reasons.push({ code: 'reference-outside', node: 'reference', voltage: reference, railLow: railLo, railHigh: railHi }); }
      }
      feasible = checkInputs((vs) => vs, 'follow-sensor') && feasible;
      if (feasible) reasons.push({ code: 'fits', how: unity ? 'unity-buffer' : 'non-inverting' });
      return out({ gain: g, noiseGain: g, reference, needsReference: !unity, feasible, offset: b, leverage: g - 1, feedbackSensitivity: (g - 1) / g, feedbackRatio: g - 1 });
    }
    case 'inverting': {
      const g = -m;
      const vp = referenceFor('inverting', g, vq, pinZero);
      let feasible = true;
      if (outsideRails(vp)) { feasible = false; reasons.push({ code: 'reference-outside', node: 'plus-input', voltage: vp, railLow: railLo, railHigh: railHi }); }
      feasible = checkInputs(() => vp, 'sit') && feasible;
      if (feasible) reasons.push({ code: 'fits', how: g < 1 ? 'inverting-attenuates' : 'inverting' });
      return out({ gain: g, noiseGain: 1 + g, reference: vp, feasible, offset: b, leverage: 1 + g, feedbackRatio: g });
    }
    case 'summing-non-inverting': {
      // Vout = K·(α·Vs + (1−α)·Vr): the reference comes from the rail on the side of b (a wire when it can),
      // K = m + b/Vr ≥ 1. When that would need K < 1 (an attenuating stage), Vr is lowered to give K = 1.25 − m/4.
      if (Math.abs(b) < 1e-9 * Math.max(1, Math.abs(pinZero))) {
        if (m >= 1 - EPS_UNITY) return infeasible({ code: 'no-offset', plain: 'non-inverting' });
        const kk = 1;
        return finishSni(kk, m / kk, 0);
      }
      const rail = b > 0 ? railHi : railLo;
      if (!(Math.sign(rail) === Math.sign(b)) || rail === 0) return infeasible({ code: 'no-rail-for-offset', offset: b, polarity: b > 0 ? 'positive' : 'negative' });
      let vr = rail;
      let kk = m + b / vr;
      if (kk < 1 + 1e-3) { kk = 1.25 - m / 4; vr = b / (kk - m); }
      return finishSni(kk, m / kk, vr);
    }
    case 'summing-inverting': {
      // Vout = −G1·Vs − G2·Vr with the + input grounded: Vr from the rail on the other side of b.
      const g1 = -m;
      if (Math.abs(b) < 1e-9 * Math.max(1, Math.abs(pinZero))) return infeasible({ code: 'no-offset', plain: 'inverting' });
      const rail = b < 0 ? railHi : railLo;
      if (!(Math.sign(rail) === -Math.sign(b)) || rail === 0) return infeasible({ code: 'no-rail-for-offset', offset: b, polarity: b < 0 ? 'positive' : 'negative' });
      const g2 = -b / rail;
      let feasible = checkInputs(() => 0, 'sit-ground');
      if (feasible) reasons.push({ code: 'fits', how: 'summing-inverting' });
      return out({ gain: g1, noiseGain: 1 + g1 + g2, reference: rail, feasible, offset: b, leverage: g2, feedbackRatio: g1, split: g2 });
    }
    case 'difference': {
      const g = Math.abs(m);
      const swapped = m < 0;
      const vref = b;
      let feasible = true;
      if (g < EPS_UNITY) return infeasible({ code: 'no-gain' });
      if (outsideRails(vref)) { feasible = false; reasons.push({ code: 'reference-outside', node: 'reference', voltage: vref, railLow: railLo, railHigh: railHi }); }
      // The + input sits at (G·V(terminal at R3) + Vref)/(1 + G); that terminal is + (cm + Vs) or, swapped, − (cm).
      feasible = checkInputs((vs) => (g * (swapped ? cm : cm + vs) + vref) / (1 + g), 'sit') && feasible;
      if (feasible) reasons.push({ code: 'fits', how: front.commonMode !== null ? 'difference-differential' : 'difference' });
      return out({ gain: g, noiseGain: 1 + g, reference: vref, feasible, offset: b, leverage: 1, feedbackRatio: g, split: g, swapped });
    }
  }

  function finishSni(kk: number, alpha: number, vr: number): IdealStage {
    let feasible = checkInputs((vs) => alpha * vs + (1 - alpha) * vr, 'follow-sum');
    if (feasible) reasons.push({ code: 'fits', how: m < 1 ? 'summing-attenuates' : 'summing-non-inverting' });
    return out({ gain: m, noiseGain: kk, reference: vr, needsReference: vr !== 0, feasible, offset: b, leverage: kk * (1 - alpha), feedbackSensitivity: (kk - 1) / kk, feedbackRatio: kk - 1, split: alpha });
  }
}

/** Range of measurand peaks: √2 × an rms range for AC targets (sine), else the range itself. */
export function peakRange(design: Pick<Design, 'target'>): [number, number] {
  const [a, b] = design.target.range;
  if (design.target.signal !== 'ac-rms') return [a, b];
  const m = Math.max(Math.abs(a), Math.abs(b)) * Math.SQRT2;
  return [-m, m];
}

export interface TopologyChoiceResult {
  chosen: IdealStage | null;
  considered: IdealStage[];
  /** Guidance when none fits (why each stage was or was not taken is in each one's `reasons`). */
  guidance: StageGuidance[];
}

/**
 * Picks the topology: the one the user asked for, or with `auto` the non-inverting stage when it fits
 * (it does not load the sensor), else the inverting one.
 */
export function chooseTopology(design: Design, front: SensorFront): TopologyChoiceResult {
  const order: Topology[] = design.target.topology === 'auto'
    ? (front.commonMode !== null ? ['difference'] : [...TOPOLOGIES])
    : [design.target.topology];
  const considered = order.map((t) => idealStage(t, design, front));
  const chosen = considered.find((s) => s.feasible) ?? null;
  const guidance: StageGuidance[] = [];
  if (!chosen) {
    const same = Math.sign(design.target.scale) === Math.sign(front.sensitivity);
    const g = Math.abs(design.target.scale / front.sensitivity);
    // The sign a stage gives (naturalSign): kept, flipped, or either; an rms reading has none.
    const wrongSign = (t: Topology) => design.target.signal !== 'ac-rms' && naturalSign(t) !== 0 && naturalSign(t) !== (same ? 1 : -1);
    const other: Partial<Record<Topology, Topology>> = {
      'non-inverting': 'inverting', inverting: 'non-inverting', 'summing-non-inverting': 'summing-inverting', 'summing-inverting': 'summing-non-inverting',
    };
    const m = front.measurand;
    if (design.target.topology !== 'auto' && wrongSign(design.target.topology)) {
      const t = design.target.topology;
      const rises = naturalSign(t) * Math.sign(front.sensitivity) > 0;
      guidance.push({ code: 'polarity-cause', topology: t, rises, other: other[t] ?? 'other', measurand: m });
    }
    if (same && g < 1) guidance.push({ code: 'attenuate-same-polarity' });
    // The rails and input range are worth a look only when a stage failed for them, not for its sign or for attenuating.
    const railBound = considered.some((c) => !c.feasible && !wrongSign(c.topology) && !(c.topology === 'non-inverting' && c.gain < 1 - EPS_UNITY));
    if (railBound) guidance.push({ code: 'check-rails' });
  }
  return { chosen, considered, guidance };
}
