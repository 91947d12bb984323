/**
 * The two single-op-amp stages Gainwright designs, as ideal closed forms, and the choice between them.
 *
 * Non-inverting with a reference Vref at the foot of the ground leg (removes the sensor's offset):
 *   Vout = G·Vs − (G−1)·Vref,   G = 1 + Rf/Rleg
 * Inverting with a reference Vp at the non-inverting input:
 *   Vout = (1+G)·Vp − G·Vs,     G = Rf/Rin
 * Noise gain is 1 + Rf/Rleg (non-inverting) and 1 + Rf/Rin (inverting), the same expression for both
 * (Texas A&M ECEN 457 notes, eqs. 1–2). Rleg includes the reference network's Thevenin resistance and
 * Rin includes the sensor's source resistance.
 */
import type { Design, Topology } from '../model/design.js';
import type { SensorFront } from './sensors.js';

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
  reasons: string[];
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
 * (inverting), the same expression 1 + Rf/R for both (Texas A&M ECEN 457 notes, eqs. 1–2). Example: inverting G = 4 → 5.
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

/** The ideal stage of one topology for this design, with the reasons it is or is not feasible. */
export function idealStage(topology: Topology, design: Design, front: SensorFront): IdealStage {
  const k = loadFactor(design);
  const acFree = design.target.signal === 'ac-rms';
  const reasons: string[] = [];
  const sens = front.sensitivity;
  const natural = topology === 'non-inverting' ? Math.sign(sens) : -Math.sign(sens);
  let pinScale = design.target.scale / k;
  let delivered = design.target.scale;
  if (Math.sign(pinScale) !== natural) {
    if (acFree) {
      pinScale = -pinScale;
      delivered = -delivered;
      reasons.push('the output is inverted (180° phase), which does not matter for an rms reading');
    } else {
      reasons.push(topology === 'non-inverting'
        ? 'a non-inverting stage keeps the sensor\'s polarity, and the target asks for the opposite sign'
        : 'an inverting stage flips the sensor\'s polarity, and the target asks for the same sign');
      return { topology, gain: NaN, noiseGain: NaN, reference: NaN, needsReference: false, pinScale, pinZero: design.target.zero / k, deliveredScale: delivered, feasible: false, reasons };
    }
  }
  const pinZero = design.target.zero / k;
  const vq = front.quiescent;
  const [railLo, railHi] = referenceRails(design);
  const inLo = design.supply.negative + design.opamp.inputLow;
  const inHi = design.supply.positive - design.opamp.inputHigh;
  if (topology === 'non-inverting') {
    const g = pinScale / sens;
    if (g < 1 - EPS_UNITY) {
      reasons.push(`a non-inverting stage cannot attenuate: the target needs a gain of ${g.toPrecision(3)}`);
      return { topology, gain: g, noiseGain: g, reference: NaN, needsReference: false, pinScale, pinZero, deliveredScale: delivered, feasible: false, reasons };
    }
    const unity = Math.abs(g - 1) < EPS_UNITY;
    let reference = NaN;
    let feasible = true;
    if (unity) {
      if (Math.abs(pinZero - vq) > 1e-3) {
        feasible = false;
        reasons.push(`a unity-gain buffer keeps the sensor's ${vq} V zero and cannot move it to ${pinZero.toPrecision(4)} V`);
      }
    } else {
      reference = referenceFor('non-inverting', g, vq, pinZero);
      if (reference < railLo - 1e-9 || reference > railHi + 1e-9) {
        feasible = false;
        reasons.push(`the reference would have to be ${reference.toPrecision(3)} V, outside the ${railLo}…${railHi} V it can be taken from`);
      }
    }
    // Both inputs follow the sensor's output.
    const [xLo, xHi] = peakRange(design);
    const vsLo = vq + sens * xLo;
    const vsHi = vq + sens * xHi;
    const vMin = Math.min(vsLo, vsHi);
    const vMax = Math.max(vsLo, vsHi);
    if (vMin < inLo - 1e-9 || vMax > inHi + 1e-9) {
      feasible = false;
      reasons.push(`the inputs follow the sensor from ${vMin.toPrecision(3)} to ${vMax.toPrecision(3)} V, outside the op-amp's input range ${inLo.toPrecision(3)}…${inHi.toPrecision(3)} V`);
    }
    if (feasible) reasons.push(unity ? 'a unity buffer: the target equals the sensor\'s own scale and zero' : 'keeps the sensor\'s polarity with a gain of at least 1 and loads the sensor only with the op-amp input');
    return { topology, gain: g, noiseGain: g, reference, needsReference: !unity, pinScale, pinZero, deliveredScale: delivered, feasible, reasons };
  }
  const g = -pinScale / sens;
  const vp = referenceFor('inverting', g, vq, pinZero);
  let feasible = true;
  if (vp < railLo - 1e-9 || vp > railHi + 1e-9) {
    feasible = false;
    reasons.push(`the + input would have to sit at ${vp.toPrecision(3)} V, outside the ${railLo}…${railHi} V it can be taken from`);
  }
  if (vp < inLo - 1e-9 || vp > inHi + 1e-9) {
    feasible = false;
    reasons.push(`the inputs sit at ${vp.toPrecision(3)} V, outside the op-amp's input range ${inLo.toPrecision(3)}…${inHi.toPrecision(3)} V`);
  }
  if (feasible) reasons.push(g < 1 ? 'an inverting stage can attenuate, which the target needs' : 'an inverting stage gives the opposite polarity the target asks for, with its inputs at a fixed voltage');
  return { topology, gain: g, noiseGain: 1 + g, reference: vp, needsReference: true, pinScale, pinZero, deliveredScale: delivered, feasible, reasons };
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
  /** One sentence on why the chosen topology (or none) was taken. */
  why: string;
  /** Guidance when neither fits. */
  guidance: string[];
}

/**
 * Picks the topology: the one the user asked for, or with `auto` the non-inverting stage when it fits
 * (it does not load the sensor), else the inverting one.
 */
export function chooseTopology(design: Design, front: SensorFront): TopologyChoiceResult {
  const order: Topology[] = design.target.topology === 'auto'
    ? ['non-inverting', 'inverting']
    : [design.target.topology];
  const considered = order.map((t) => idealStage(t, design, front));
  const chosen = considered.find((s) => s.feasible) ?? null;
  const guidance: string[] = [];
  if (!chosen) {
    const same = Math.sign(design.target.scale) === Math.sign(front.sensitivity);
    const g = Math.abs(design.target.scale / front.sensitivity);
    // The sign a stage gives: non-inverting keeps the sensor's, inverting flips it (an rms reading has none).
    const wrongSign = (t: Topology) => design.target.signal !== 'ac-rms' && (t === 'non-inverting') !== same;
    const other = (t: Topology): Topology => (t === 'non-inverting' ? 'inverting' : 'non-inverting');
    const m = front.measurand;
    if (design.target.topology !== 'auto' && wrongSign(design.target.topology)) {
      const t = design.target.topology;
      guidance.push(`The polarity is the cause, not the rails: a ${t} stage gives an output that ${(t === 'non-inverting') === (front.sensitivity > 0) ? 'rises' : 'falls'} as the ${m} rises, and the wanted scale asks for the opposite sign. Reverse the conductor through the sensor (or turn the sensor round) to flip its sign, change the scale's sign, or choose the ${other(t)} stage (or let Gainwright choose).`);
    }
    if (same && g < 1) guidance.push('The target needs attenuation with the sensor\'s own polarity: reverse the conductor through the sensor (or swap the sensor\'s orientation) to flip its sign, then an inverting stage can attenuate.');
    // The rails and input range are worth a look only when a stage failed for them, not for its sign or for attenuating.
    const railBound = considered.some((c) => !wrongSign(c.topology) && !(c.topology === 'non-inverting' && c.gain < 1 - EPS_UNITY));
    if (railBound) guidance.push('Check that the rails leave room for the reference and for the op-amp\'s input range; a rail-to-rail input op-amp or a wider supply may be needed.');
  }
  const why = chosen
    ? `${chosen.topology}: ${chosen.reasons.join('; ')}`
    : `no single-stage topology fits: ${considered.map((c) => `${c.topology}: ${c.reasons.join('; ')}`).join(' | ')}`;
  return { chosen, considered, why, guidance };
}
