/**
 * What a built network really gives: Vout = m·Vs + b at the op-amp pin, for the sensor voltage Vs (its
 * differential voltage on a difference stage), from the parts at their settings, with the op-amp's finite
 * DC open-loop gain A0 through Black's factor k = 1/(1 + NG/A0) (NG the noise gain). The closed forms are
 * those of src/physics/topology.ts with every series resistance folded in (the sensor's terminal
 * resistances, the reference network's Thevenin resistance).
 */
import type { Design } from '../model/design.js';
import type { StageNetwork } from '../circuit/network.js';
import type { SensorFront } from '../physics/sensors.js';

/** The op-amp's DC open loop as the transfer needs it: gain A0, open-loop output resistance, and the load outside the network. */
export interface OpenLoop { a0: number; rout: number; load: number }

/** The open loop of a design's op-amp into its instrument load (through the output filter's resistor). */
export function openLoopOf(design: Design): OpenLoop {
  return {
    a0: 10 ** (design.opamp.openLoopGainDb / 20),
    rout: Math.max(design.opamp.outputResistance, 1e-3),
    load: design.output.load.resistance + (design.output.filter?.resistance ?? 0),
  };
}

const par = (a: number, b: number) => (Number.isFinite(a) ? (Number.isFinite(b) ? (a * b) / (a + b) : a) : b);

export interface NetworkTransfer {
  /** Pin volts per sensor volt, signed, finite A0 included. */
  scale: number;
  /** Pin volts at zero sensor voltage, finite A0 included. */
  offset: number;
  /** Ideal-op-amp signal gain magnitude. */
  gain: number;
  noiseGain: number;
}

/** What the − input sees apart from the feedback arm, and what the + input sits at, for a sensor voltage Vs. */
interface Sides {
  /** Thevenin voltage and resistance of everything on the − input but the feedback arm (Infinity: nothing). */
  minusV: (vs: number) => number;
  minusR: number;
  plusV: (vs: number) => number;
}

function sidesOf(net: StageNetwork, front: SensorFront): Sides {
  const ref = net.reference;
  const rth = ref.kind === 'divider' ? ref.thevenin : 0;
  const vr = ref.kind === 'none' ? 0 : ref.voltage;
  const cm = front.commonMode ?? 0;
  switch (net.topology) {
    case 'non-inverting': {
      const follower = !net.feedback && !net.leg && ref.kind === 'none';
      return { minusV: () => vr, minusR: follower ? Infinity : (net.leg?.ohms ?? 0) + rth, plusV: (vs) => vs };
    }
    case 'inverting':
      return { minusV: (vs) => vs, minusR: (net.leg?.ohms ?? 0) + front.sourceResistance, plusV: () => vr };
    case 'summing-non-inverting': {
      const r1 = (net.plusArm?.ohms ?? 0) + front.sourceResistance;
      const r2 = net.offsetArm ? net.offsetArm.ohms + rth : Infinity;
      const alpha = Number.isFinite(r2) ? r2 / (r1 + r2) : 1;
      const follower = !net.feedback && !net.leg;
      return { minusV: () => 0, minusR: follower ? Infinity : (net.leg?.ohms ?? 0), plusV: (vs) => alpha * vs + (1 - alpha) * vr };
    }
    case 'summing-inverting': {
      const rin = (net.leg?.ohms ?? 0) + front.sourceResistance;
      const roff = net.offsetArm ? net.offsetArm.ohms + rth : Infinity;
      const minusR = par(rin, roff);
      return { minusV: (vs) => (Number.isFinite(roff) ? (vs * roff + vr * rin) / (rin + roff) : vs), minusR, plusV: () => 0 };
    }
    case 'difference': {
      const swapped = net.swapped === true;
      const rsPlus = swapped ? front.minusResistance : front.sourceResistance;
      const rsMinus = swapped ? front.sourceResistance : front.minusResistance;
      const r3 = (net.plusArm?.ohms ?? 0) + rsPlus, r4 = (net.offsetArm?.ohms ?? 0) + rth;
      const beta = r4 / (r3 + r4);
      // The + terminal sits at cm + Vs, the − terminal at cm; swapped, the − terminal feeds the + input.
      const atPlus = (vs: number) => (swapped ? cm : cm + vs), atMinus = (vs: number) => (swapped ? cm + vs : cm);
      return { minusV: atMinus, minusR: (net.leg?.ohms ?? 0) + rsMinus, plusV: (vs) => beta * atPlus(vs) + (1 - beta) * vr };
    }
  }
}

/**
 * The transfer of a network, solved exactly for the DC loop: the internal output Vint = A0·(V+ − V−) drives the
 * pin through R_out; the pin feeds the instrument load and the feedback arm Rf' to the − input, whose other
 * side is a Thevenin source (Vm, Rm). With β = Rm/(Rf' + Rm) and c = Vm·Rf'/(Rf' + Rm) (so V− = β·Vpin + c),
 * Kirchhoff's current law at the pin gives
 *   Vpin = [G_o·A0·(V+ − c) + Vm/(Rf' + Rm)] / [G_o·(1 + A0·β) + 1/(Rf' + Rm) + 1/R_load],  G_o = 1/R_out,
 * which for R_out → 0 is Black's formula Vpin = A0·(V+ − c)/(1 + A0·β). Scale and offset are read at Vs = 0 and 1.
 * Example: summing non-inverting, Rf = Rg (K = 2), R1 = R2 (α = ½), Vr = 5 V, ideal op-amp: scale 1, offset 5 V.
 */
export function networkTransfer(net: StageNetwork, front: SensorFront, ol: OpenLoop): NetworkTransfer {
  const rf = (net.feedback?.ohms ?? 0) + (net.gainTrim ? net.gainTrim.ohms * net.gainTrim.setting : 0);
  const sd = sidesOf(net, front);
  const follower = !Number.isFinite(sd.minusR);
  const beta = follower ? 1 : sd.minusR / (rf + sd.minusR);
  const rNet = follower ? Infinity : rf + sd.minusR;
  const go = 1 / ol.rout;
  const at = (vs: number, a0: number) => {
    const vm = sd.minusV(vs);
    const c = follower ? 0 : (vm * rf) / (rf + sd.minusR);
    const fromNet = follower ? 0 : vm / rNet;
    const den = Number.isFinite(a0) ? go * (1 + a0 * beta) + (follower ? 0 : 1 / rNet) + 1 / ol.load : beta;
    return Number.isFinite(a0) ? (go * a0 * (sd.plusV(vs) - c) + fromNet) / den : (sd.plusV(vs) - c) / den;
  };
  const v0 = at(0, ol.a0), v1 = at(1, ol.a0);
  const ideal = at(1, Infinity) - at(0, Infinity);
  return { scale: v1 - v0, offset: v0, gain: Math.abs(ideal), noiseGain: 1 / beta };
}

/**
 * Common-mode gain of a difference stage's network: how much the output moves per volt moved on both sensor
 * terminals together, k·((1+G)·β − G); zero for a matched pair (R4/R3 = Rf/Rin). Example: G = 10 with R4 1 %
 * high → about 0.0091 (Franco, §2.3: A_cm for an imbalance ε is about G·ε/(1+G)).
 */
export function commonModeGain(net: StageNetwork, front: SensorFront, ol: OpenLoop): number {
  if (net.topology !== 'difference') return 0;
  const t0 = networkTransfer(net, { ...front, commonMode: 0 }, ol);
  const t1 = networkTransfer(net, { ...front, commonMode: 1 }, ol);
  return t1.offset - t0.offset;
}
