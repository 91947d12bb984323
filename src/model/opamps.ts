/**
 * Generic op-amp archetypes: typical figures of a kind of part, not of any product (typical, from memory).
 * PSRR at DC and the 1/f corners follow the kind: bipolar inputs have low voltage-noise corners (a few to
 * tens of hertz) and current-noise corners in the hundreds; CMOS inputs have voltage-noise corners near a
 * kilohertz and negligible current noise; a chopper has no 1/f region (typical, from memory).
 * Edit any figure from the datasheet in hand; these only give a starting point.
 */
import type { OpAmpSpec } from './design.js';

export interface OpAmpArchetype {
  id: string;
  label: string;
  summary: string;
  spec: OpAmpSpec;
}

const base = { outputResistance: 50, outputCurrent: 0.02, offsetDrift: 5e-6 };

export const OPAMP_ARCHETYPES: readonly OpAmpArchetype[] = [
  {
    id: 'bipolar-general',
    label: 'General-purpose bipolar (input stops short of the + rail)',
    summary: 'Cheap, everywhere; its input range stops about 1.5 V below the positive rail and its output about 1.5 V short of it.',
    spec: { name: 'general-purpose bipolar (typical, from memory)', gbw: 1e6, slewRate: 0.5e6, openLoopGainDb: 100, inputLow: 0, inputHigh: 1.5, outputLow: 0.05, outputHigh: 1.5, voltageNoise: 35e-9, currentNoise: 0.1e-12, offsetVoltage: 3e-3, biasCurrent: 50e-9, supplyCurrent: 0.5e-3, ...base, offsetDrift: 7e-6, psrrDb: 90, voltageNoiseCorner: 20, currentNoiseCorner: 200 },
  },
  {
    id: 'cmos-rail-to-rail',
    label: 'Rail-to-rail CMOS',
    summary: 'Inputs and output reach both rails; tiny bias current; modest noise; low supply voltage limit.',
    spec: { name: 'rail-to-rail CMOS (typical, from memory)', gbw: 1e6, slewRate: 0.6e6, openLoopGainDb: 100, inputLow: -0.1, inputHigh: -0.1, outputLow: 0.02, outputHigh: 0.02, voltageNoise: 25e-9, currentNoise: 0.6e-15, offsetVoltage: 2e-3, biasCurrent: 1e-12, supplyCurrent: 0.1e-3, ...base, offsetDrift: 2e-6, psrrDb: 80, voltageNoiseCorner: 1000, currentNoiseCorner: 0 },
  },
  {
    id: 'low-noise-bipolar',
    label: 'Low-noise bipolar',
    summary: 'Very low voltage noise for low-impedance sources; higher bias current and supply current.',
    spec: { name: 'low-noise bipolar (typical, from memory)', gbw: 10e6, slewRate: 2.8e6, openLoopGainDb: 120, inputLow: 2, inputHigh: 2, outputLow: 1.5, outputHigh: 1.5, voltageNoise: 3.5e-9, currentNoise: 0.5e-12, offsetVoltage: 50e-6, biasCurrent: 100e-9, supplyCurrent: 4e-3, ...base, offsetDrift: 0.5e-6, psrrDb: 110, voltageNoiseCorner: 3, currentNoiseCorner: 150 },
  },
  {
    id: 'fast-cmos',
    label: 'Fast rail-to-rail CMOS',
    summary: 'Tens of MHz of GBW for wide-band probes; more supply current.',
    spec: { name: 'fast rail-to-rail CMOS (typical, from memory)', gbw: 50e6, slewRate: 30e6, openLoopGainDb: 100, inputLow: -0.1, inputHigh: -0.1, outputLow: 0.05, outputHigh: 0.05, voltageNoise: 8e-9, currentNoise: 5e-15, offsetVoltage: 1e-3, biasCurrent: 3e-12, supplyCurrent: 6e-3, ...base, outputCurrent: 0.05, offsetDrift: 3e-6, psrrDb: 80, voltageNoiseCorner: 2000, currentNoiseCorner: 0 },
  },
  {
    id: 'zero-drift',
    label: 'Zero-drift (chopper) CMOS',
    summary: 'Microvolt offset and almost no drift for DC accuracy; low bandwidth.',
    spec: { name: 'zero-drift CMOS (typical, from memory)', gbw: 2e6, slewRate: 1e6, openLoopGainDb: 130, inputLow: -0.1, inputHigh: -0.1, outputLow: 0.03, outputHigh: 0.03, voltageNoise: 60e-9, currentNoise: 100e-15, offsetVoltage: 5e-6, biasCurrent: 50e-12, supplyCurrent: 1e-3, ...base, offsetDrift: 20e-9, psrrDb: 120, voltageNoiseCorner: 0, currentNoiseCorner: 0 },
  },
];

/** The built-in archetype with this id, or undefined: `archetype('bipolar-general')?.spec.gbw` → 1e6. */
export function archetype(id: string): OpAmpArchetype | undefined {
  return OPAMP_ARCHETYPES.find((a) => a.id === id);
}
