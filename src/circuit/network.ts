/**
 * The designed stage as data: which resistors sit where, which trimmers and where their wipers are. The
 * solver (src/solve) produces it, the netlist build stamps it, and the presentation layer draws and lists it.
 * Nothing here is words: a part's role and arrangement are codes, its value a number (SI units: Ω, F, V).
 */
import type { Arrangement, Topology } from '../model/design.js';
import type { SeriesName } from '../model/eseries.js';

/** One resistor arm: a single part, or two parts in series or in parallel. */
export interface Arm {
  /** Resistance of the whole arm, Ω. */
  ohms: number;
  /** The parts' values, Ω (one or two). */
  parts: number[];
  arrangement: Arrangement;
}

/** Where a part sits in the stage (the presentation layer names each role in words). */
export type PartRole =
  | 'feedback' | 'ground-leg' | 'input' | 'plus-input' | 'offset' | 'reference-top' | 'reference-bottom'
  | 'gain-trim' | 'zero-trim' | 'output-series' | 'output-capacitor'
  /** The current transformer's burden: part of the sensor, listed so that it is bought and fitted. */
  | 'burden';

export interface Trimmer {
  ohms: number;
  /** Wiper position, 0…1 (0.5 = mid). */
  setting: number;
  /** What the trim must absorb (fraction of scale for gain, volts at the output for zero). */
  need: number;
  /** What it can absorb either side of its setting, same unit. */
  halfSpan: number;
  /** Settable step, same unit. */
  step: number;
}

export interface ReferenceNetwork {
  /** none: no reference (buffer); rail: tied straight to a rail; divider: a divider with optional trimmer. */
  kind: 'none' | 'rail' | 'divider';
  /** Rails it hangs between, V. */
  railBottom: number;
  railTop: number;
  /** Which rail is the top: the battery/positive rail or the regulated one. */
  topRail: 'positive' | 'regulated';
  top: Arm | null;
  bottom: Arm | null;
  trim: Trimmer | null;
  /** Open-circuit voltage with the trimmer at its setting, V. */
  voltage: number;
  /** Thevenin resistance with the trimmer at its setting, Ω. */
  thevenin: number;
}

export interface StageNetwork {
  topology: Topology;
  /** Fixed feedback arm (null = a wire, for a unity buffer) and its series gain trimmer. */
  feedback: Arm | null;
  gainTrim: Trimmer | null;
  /**
   * Ground leg (non-inverting, may be null when the divider's Thevenin is the whole leg or for a buffer; to
   * ground in the summing non-inverting stage) or input resistor from the sensor to the − input (inverting,
   * summing inverting, difference).
   */
  leg: Arm | null;
  reference: ReferenceNetwork;
  /** Summing non-inverting: sensor to + input (R1); difference: sensor terminal to + input (R3). */
  plusArm?: Arm | null;
  /** Summing non-inverting: reference to + input (R2); summing inverting: reference to − input (Roff); difference: + input to reference (R4). */
  offsetArm?: Arm | null;
  /** Difference stage: the sensor's − terminal goes to the + input side (a negative scale). */
  swapped?: boolean;
}

/** One part of the parts list, with its place in the stage as structured fields. */
export interface Part {
  ref: string;
  role: PartRole;
  kind: 'resistor' | 'trimmer' | 'capacitor';
  ohms: number;
  farads?: number;
  series: SeriesName | 'trimmer' | 'capacitor';
  tolerance: number;
  /** How the part's arm is made: alone, or in series or parallel with the next part of the same role. */
  arrangement: Arrangement;
  /** Trimmer wiper setting (0…1). */
  setting?: number;
}
