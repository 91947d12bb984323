/**
 * The closed-loop Hall sensor as circuit elements, for the stage's circuit and on its own (loop gain, closed
 * loop transfer, step). SI units.
 *
 * The core, referred to the compensation winding (the transformer's equivalent circuit with perfect
 * coupling; Umans, Fitzgerald & Kingsley's Electric Machinery, 7th ed., ch. 2): the magnetising inductance
 * LM = A_L·N_s² between the winding's ends, with the primary reflected across it as the current source ISIG =
 * (N_p/N_s)·I_p. LM's current is the magnetising current, the core's net ampere-turns over N_s. The Hall
 * sensor is the current-controlled source HHALL = r·I(LM) on its zero VHQ (r = |k_H|·B_gap per ampere-turn
 * ·N_s), through its own bandwidth (a noiseless RC and unity buffer, as the stage's sensor) and its output
 * resistance RHS. The compensation: RI into the driver's − input, CI and RZ back from its output; the driver
 * EDRV (gain A0, one pole at GBW/A0, output referred to the reference so that its output rests there) with its
 * + input at VHREF, the Hall sensor's nominal zero; its output resistance RO, the winding's resistance RW,
 * the winding (LM), the measurement resistor RM from the output node `sens` to the reference VQ.
 */
import type { ClosedLoopHallSensor } from '../model/design.js';
import type { ClosedLoopParts } from '../physics/closed-loop.js';
import { adjointAt, compile, signalTransfer, transferFrom, workspace, type Circuit, type Element } from './mna.js';

/** An element with node names, before the names are numbered; `ctrlName` names an H's controlling element. */
export type NamedElement = Omit<Element, 'a' | 'b' | 'cp' | 'cn' | 'ctrl'> & { na: string; nb: string; cpn?: string; cnn?: string; ctrlName?: string };

export interface ClosedLoopNetlist {
  elements: NamedElement[];
  /** Pairs of node names joined by a wire (a zero resistance). */
  wires: Array<[string, string]>;
}

/**
 * The sensor's elements. The output node is `sens`, ground `0`; every other node starts with `cl`. With
 * `breakLoop` the compensation's input is fed by the test source VTEST (AC 1) instead of the Hall sensor,
 * whose output `clhsrc` is left unloaded: then the loop gain is T = −V(clhsrc)/V(VTEST), exactly, since the
 * Hall sensor is an ideal controlled source and RHS stays in the compensation's path.
 */
export function closedLoopNetlist(spec: ClosedLoopHallSensor, p: ClosedLoopParts, breakLoop = false, scale: (name: string) => number = () => 1): ClosedLoopNetlist {
  const elements: NamedElement[] = [];
  const wires: Array<[string, string]> = [];
  const R = (name: string, na: string, nb: string, ohms: number, noisy = true) => {
    if (ohms === 0) wires.push([na, nb]);
    else elements.push({ kind: 'R', name, na, nb, value: ohms * scale(name), noisy });
  };
  const k = p.primaryTurns / p.turns;
  // The reference R_M returns to: the sensor's zero.
  elements.push({ kind: 'V', name: 'VQ', role: 'sensor-zero', na: 'clref', nb: '0', value: 0, dc0: p.reference, dc1: 0, ac: 0 });
  // Core: the reflected primary across the magnetising inductance (I_m = I_s − (N_p/N_s)·I_p).
  elements.push({ kind: 'I', name: 'ISIG', role: 'signal', na: 'clwa', nb: 'sens', value: 0, dc0: 0, dc1: k, ac: breakLoop ? 0 : k });
  elements.push({ kind: 'L', name: 'LM', na: 'clwa', nb: 'sens', value: p.inductance });
  R('RM', 'sens', 'clref', p.measurementResistance);
  // Hall sensor: its zero, the flux-controlled part, its bandwidth and output resistance.
  elements.push({ kind: 'V', name: 'VHQ', na: 'clhq', nb: '0', value: 0, dc0: spec.quiescent, dc1: 0, ac: 0, noise: spec.noiseDensity });
  elements.push({ kind: 'H', name: 'HHALL', na: 'clhraw', nb: 'clhq', value: p.hallPerAmp, ctrlName: 'LM' });
  if (Number.isFinite(p.hallBandwidth)) {
    R('RHB', 'clhraw', 'clhp', 1000, false);
    elements.push({ kind: 'C', name: 'CHB', na: 'clhp', nb: '0', value: 1 / (2 * Math.PI * 1000 * p.hallBandwidth) });
    elements.push({ kind: 'E', name: 'EHB', na: 'clhsrc', nb: '0', value: 1, cpn: 'clhp', cnn: '0' });
  } else {
    wires.push(['clhraw', 'clhsrc']);
  }
  if (breakLoop) elements.push({ kind: 'V', name: 'VTEST', na: 'clhin', nb: '0', value: 0, dc0: spec.quiescent, dc1: 0, ac: 1 });
  else wires.push(['clhsrc', 'clhin']);
  R('RHS', 'clhin', 'clhall', spec.sourceResistance);
  // Compensation and driver.
  R('RI', 'clhall', 'cldn', spec.compensation.inputResistance);
  elements.push({ kind: 'C', name: 'CI', na: 'cldn', nb: 'clz', value: spec.compensation.capacitance });
  R('RZ', 'clz', 'cldo', spec.compensation.zeroResistance);
  elements.push({ kind: 'V', name: 'VHREF', na: 'cldp', nb: '0', value: 0, dc0: spec.quiescent, dc1: 0, ac: 0 });
  elements.push({ kind: 'E', name: 'EDRV', role: 'driver', na: 'cldo', nb: 'clref', value: p.driverGain, pole: p.driverPole, cpn: 'cldp', cnn: 'cldn' });
  R('RO', 'cldo', 'clo', p.outputResistance, false);
  R('RW', 'clo', 'clwa', p.windingResistance);
  return { elements, wires };
}

/** The sensor alone as a circuit: node numbers of its output, the Hall sensor's output and the driver's. */
export interface ClosedLoopCircuit {
  circuit: Circuit;
  nodes: { out: number; hall: number; driver: number };
  index: (name: string) => number;
}

/** Numbers a netlist's nodes (wires merged) and compiles it, resolving each H's controlling element. */
export function compileNetlist(net: ClosedLoopNetlist, extra: NamedElement[] = []): { circuit: Circuit; node: (n: string) => number } {
  const parent = new Map<string, string>();
  const find = (n: string): string => { const q = parent.get(n) ?? n; if (q === n) return n; const r = find(q); parent.set(n, r); return r; };
  for (const [a, b] of net.wires) {
    const ra = find(a), rb = find(b);
    if (ra !== rb) { if (rb === '0') parent.set(ra, rb); else parent.set(rb, ra); }
  }
  const names = ['0'];
  const index = new Map<string, number>([['0', 0]]);
  const node = (n: string) => {
    const r = find(n);
    let i = index.get(r);
    if (i === undefined) { i = names.length; names.push(r); index.set(r, i); }
    return i;
  };
  const all = [...net.elements, ...extra];
  const elements: Element[] = all.map(({ na, nb, cpn, cnn, ctrlName: _c, ...rest }) => {
    const e: Element = { ...rest, a: node(na), b: node(nb) };
    if (cpn !== undefined) e.cp = node(cpn);
    if (cnn !== undefined) e.cn = node(cnn);
    return e;
  });
  all.forEach((e, i) => { if (e.ctrlName) elements[i]!.ctrl = all.findIndex((x) => x.name === e.ctrlName); });
  return { circuit: compile(names, elements), node };
}

/** The sensor alone, closed or with its loop broken at the compensation's input. */
export function closedLoopCircuit(spec: ClosedLoopHallSensor, p: ClosedLoopParts, breakLoop = false): ClosedLoopCircuit {
  const net = closedLoopNetlist(spec, p, breakLoop);
  const { circuit, node } = compileNetlist(net);
  return { circuit, nodes: { out: node('sens'), hall: node('clhsrc'), driver: node('cldo') }, index: (name) => circuit.elements.findIndex((e) => e.name === name) };
}

/**
 * The loop gain T(jω) solved on the broken loop's circuit: −V(hall)/V(test). Agrees with the closed form
 * `loopGainAt` (src/physics/closed-loop.ts) when both describe the same parts.
 */
export function circuitLoopGainAt(broken: ClosedLoopCircuit, f: number): [number, number] {
  const ws = workspace(broken.circuit);
  if (!adjointAt(broken.circuit, 2 * Math.PI * f, broken.nodes.hall, ws)) return [NaN, NaN];
  const [re, im] = transferFrom(broken.circuit, broken.index('VTEST'), ws);
  return [-re, -im];
}

/** V(sens) per primary ampere at f, solved on the closed loop's circuit, V/A. */
export function circuitTransferAt(closed: ClosedLoopCircuit, f: number): [number, number] {
  const ws = workspace(closed.circuit);
  if (!adjointAt(closed.circuit, 2 * Math.PI * f, closed.nodes.out, ws)) return [NaN, NaN];
  return signalTransfer(closed.circuit, ws);
}
