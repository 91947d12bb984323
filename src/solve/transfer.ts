/**
 * What a built network really gives: Vout = m·Vs + b at the op-amp pin, for the sensor voltage Vs (its
 * differential voltage on a difference stage), from the parts at their settings, with the op-amp's finite
 * DC open-loop gain A0 through Black's factor k = 1/(1 + NG/A0) (NG the noise gain). The closed forms are
 * those of src/physics/topology.ts with every series resistance folded in (the sensor's terminal
 * resistances, the reference network's Thevenin resistance).
 */
import type { StageNetwork } from '../circuit/network.js';
import type { SensorFront } from '../physics/sensors.js';
import { loopFactor } from '../physics/topology.js';

export interface NetworkTransfer {
  /** Pin volts per sensor volt, signed, finite A0 included. */
  scale: number;
  /** Pin volts at zero sensor voltage, finite A0 included. */
  offset: number;
  /** Ideal-op-amp signal gain magnitude. */
  gain: number;
  noiseGain: number;
}

/**
 * The transfer of a network. Example: summing non-inverting, Rf = Rg (K = 2), R1 = R2 (α = ½), Vr = 5 V,
 * ideal op-amp: scale 1, offset 5 V.
 */
export function networkTransfer(net: StageNetwork, front: SensorFront, a0: number): NetworkTransfer {
  const rf = (net.feedback?.ohms ?? 0) + (net.gainTrim ? net.gainTrim.ohms * net.gainTrim.setting : 0);
  const ref = net.reference;
  const rth = ref.kind === 'divider' ? ref.thevenin : 0;
  const vr = ref.kind === 'none' ? 0 : ref.voltage;
  switch (net.topology) {
    case 'non-inverting': {
      if (!net.leg && ref.kind === 'none') return { scale: loopFactor(1, a0), offset: 0, gain: 1, noiseGain: 1 };
      const g = 1 + rf / ((net.leg?.ohms ?? 0) + rth);
      const k = loopFactor(g, a0);
      return { scale: k * g, offset: -k * (g - 1) * vr, gain: g, noiseGain: g };
    }
    case 'inverting': {
      const g = rf / ((net.leg?.ohms ?? 0) + front.sourceResistance);
      const k = loopFactor(1 + g, a0);
      return { scale: -k * g, offset: k * (1 + g) * vr, gain: g, noiseGain: 1 + g };
    }
    case 'summing-non-inverting': {
      const kk = net.feedback || net.leg ? 1 + rf / (net.leg?.ohms ?? 0) : 1;
      const r1 = (net.plusArm?.ohms ?? 0) + front.sourceResistance;
      const r2 = net.offsetArm ? net.offsetArm.ohms + rth : Infinity;
      const alpha = Number.isFinite(r2) ? r2 / (r1 + r2) : 1;
      const k = loopFactor(kk, a0);
      return { scale: k * kk * alpha, offset: k * kk * (1 - alpha) * vr, gain: kk * alpha, noiseGain: kk };
    }
    case 'summing-inverting': {
      const g1 = rf / ((net.leg?.ohms ?? 0) + front.sourceResistance);
      const g2 = net.offsetArm ? rf / (net.offsetArm.ohms + rth) : 0;
      const k = loopFactor(1 + g1 + g2, a0);
      return { scale: -k * g1, offset: -k * g2 * vr, gain: g1, noiseGain: 1 + g1 + g2 };
    }
    case 'difference': {
      // + input: β·V(terminal at R3) + (1−β)·Vref; Vout = k·((1+G)·V+ − G·V(terminal at Rin)).
      const swapped = net.swapped === true;
      const rsPlus = swapped ? front.minusResistance : front.sourceResistance;
      const rsMinus = swapped ? front.sourceResistance : front.minusResistance;
      const g = rf / ((net.leg?.ohms ?? 0) + rsMinus);
      const r3 = (net.plusArm?.ohms ?? 0) + rsPlus, r4 = (net.offsetArm?.ohms ?? 0) + rth;
      const beta = r4 / (r3 + r4);
      const k = loopFactor(1 + g, a0);
      const cm = front.commonMode ?? 0;
      // The terminal voltages are cm + Vs (the + terminal) and cm (the − terminal).
      const scale = swapped ? -k * g : k * (1 + g) * beta;
      const offset = k * ((1 + g) * (1 - beta) * vr + ((1 + g) * beta - g) * cm);
      return { scale, offset, gain: g, noiseGain: 1 + g };
    }
  }
}

/**
 * Common-mode gain of a difference stage's network: how much the output moves per volt moved on both sensor
 * terminals together, k·((1+G)·β − G); zero for a matched pair (R4/R3 = Rf/Rin). Example: G = 10 with R4 1 %
 * high → about 0.0091 (Franco, §2.3: A_cm for an imbalance ε is about G·ε/(1+G)).
 */
export function commonModeGain(net: StageNetwork, front: SensorFront, a0: number): number {
  if (net.topology !== 'difference') return 0;
  const t0 = networkTransfer(net, { ...front, commonMode: 0 }, a0);
  const t1 = networkTransfer(net, { ...front, commonMode: 1 }, a0);
  return t1.offset - t0.offset;
}
