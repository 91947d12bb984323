/**
 * Builds the designed stage as a circuit: the sensor as a source with its resistance (and bandwidth), the
 * gain and reference networks part by part (trimmers as two halves at their setting), the op-amp
 * macromodel (input offset and noise source, finite open-loop gain with one dominant pole at GBW/A_ol,
 * output resistance), the optional output RC, and the instrument's input as the load.
 */
import type { Design } from '../model/design.js';
import { compile, type Circuit, type Element } from './mna.js';
import type { SensorFront } from '../physics/sensors.js';
import type { Arm, Part, StageNetwork } from './network.js';
import { closedLoopNetlist } from './closed-loop.js';
import { closedLoopParts } from '../physics/closed-loop.js';

export interface StageCircuit {
  circuit: Circuit;
  /** Node indices of interest. */
  nodes: { sensor: number; inP: number; inN: number; internal: number; pin: number; out: number; ref: number; source: number };
  /** Element index of the op-amp's gain block (its branch current is the output current, negated). */
  opampIndex: number;
  /** Element index of the sensor's signal source. */
  signalIndex: number;
  /** Rails as element indices, for battery sweeps. */
  rails: { positive: number; negative: number; regulated: number };
}

export interface CircuitOptions {
  /** Override the positive rail (battery sweep), V. */
  positive?: number;
  /** Resistor values by element name, for Monte Carlo and sensitivity runs. */
  scale?: Record<string, number>;
  /** Sensor front to use (ratiometric sensors at another supply). */
  front?: SensorFront;
}

/** Small node-name registry with wires merging nodes (union-find). */
class NodeMap {
  private parent = new Map<string, string>();
  find(n: string): string {
    let p = this.parent.get(n) ?? n;
    if (p !== n) { p = this.find(p); this.parent.set(n, p); }
    return p;
  }
  wire(a: string, b: string): void {
    const ra = this.find(a), rb = this.find(b);
    if (ra === rb) return;
    // Ground always wins so that node 0 stays ground.
    if (rb === '0') this.parent.set(ra, rb); else this.parent.set(rb, ra);
  }
}

/** The parts of a solved stage that the circuit needs: its network and its parts list. */
export interface StageParts { network: StageNetwork; parts: Part[] }

/** The solved stage as an MNA circuit: sensor source, networks part by part, op-amp macromodel, output RC and load. Node numbers in `nodes`. */
export function buildCircuit(design: Design, stage: StageParts, front: SensorFront, opts: CircuitOptions = {}): StageCircuit {
  const f = opts.front ?? front;
  const nm = new NodeMap();
  const pending: Array<Omit<Element, 'a' | 'b'> & { na: string; nb: string; cpn?: string; cnn?: string; ctrlName?: string }> = [];
  const el = (e: Omit<Element, 'a' | 'b'> & { na: string; nb: string; cpn?: string; cnn?: string; ctrlName?: string }) => pending.push(e);
  const scaleOf = (name: string) => opts.scale?.[name] ?? 1;
  const R = (name: string, na: string, nb: string, ohms: number, noisy = true, extra: Pick<Element, 'role' | 'part' | 'tolerance'> = {}) => {
    if (ohms === 0) { nm.wire(na, nb); return; }
    el({ kind: 'R', name, na, nb, value: ohms * scaleOf(name), noisy, ...extra });
  };
  /** A resistor that realises a listed part. */
  const RP = (p: Part, name: string, na: string, nb: string, ohms: number) => R(name, na, nb, ohms, true, { part: p.ref, tolerance: p.tolerance });

  const positive = opts.positive ?? design.supply.positive;
  const negative = design.supply.negative;
  el({ kind: 'V', name: 'VPOS', role: 'rail-positive', na: 'vpos', nb: '0', value: 0, dc0: positive, dc1: 0, ac: 0 });
  if (negative !== 0) el({ kind: 'V', name: 'VNEG', role: 'rail-negative', na: 'vneg', nb: '0', value: 0, dc0: negative, dc1: 0, ac: 0 });
  else nm.wire('vneg', '0');
  const reg = design.supply.regulated;
  if (reg) el({ kind: 'V', name: 'VREG', role: 'rail-regulated', na: 'vreg', nb: 'vneg', value: 0, dc0: reg.voltage, dc1: 0, ac: 0 });

  // Sensor.
  const spec = design.sensor;
  if (spec.type === 'current-transformer') {
    el({ kind: 'V', name: 'VQ', role: 'sensor-zero', na: 'sq', nb: '0', value: 0, dc0: f.quiescent, dc1: 0, ac: 0 });
    const ratio = spec.primaryTurns / spec.secondaryTurns;
    el({ kind: 'I', name: 'ISIG', role: 'signal', na: 'sq', nb: 'sm', value: 0, dc0: 0, dc1: ratio, ac: ratio });
    el({ kind: 'L', name: 'LM', na: 'sm', nb: 'sq', value: spec.inductanceFactor * spec.secondaryTurns ** 2 });
    R('RW', 'sm', 'sens', spec.windingResistance);
    R('RB', 'sens', 'sq', spec.burden, true, { role: 'burden' });
  } else if (spec.type === 'closed-loop-hall') {
    // The whole loop (core, Hall sensor, compensation, driver, winding, R_M) is part of the stage's circuit.
    // On a battery sweep the rails move, and with them a mid-rail reference (a rail splitter follows the battery).
    const net = closedLoopNetlist(spec, closedLoopParts(spec, { positive, negative: design.supply.negative }), false, scaleOf);
    for (const e of net.elements) el(e);
    for (const [a, b] of net.wires) nm.wire(a, b);
  } else if (spec.type === 'shunt') {
    if (f.commonMode !== null) {
      // High side: the supply end at the common-mode voltage is the + terminal; the load end, I·R below it, the −.
      el({ kind: 'V', name: 'VCM', na: 'sens', nb: '0', value: 0, dc0: f.commonMode, dc1: 0, ac: 0 });
      el({ kind: 'I', name: 'ISIG', role: 'signal', na: 'sensn', nb: '0', value: 0, dc0: 0, dc1: 1, ac: 1 });
      R('RSH', 'sens', 'sensn', spec.resistance, true, { role: 'shunt' });
    } else {
      el({ kind: 'I', name: 'ISIG', role: 'signal', na: '0', nb: 'sens', value: 0, dc0: 0, dc1: 1, ac: 1 });
      R('RSH', 'sens', '0', spec.resistance, true, { role: 'shunt' });
    }
  } else {
    // A differential output: its − terminal at the common-mode voltage, the signal on top of it.
    const low = f.commonMode !== null ? 'cm' : '0';
    if (f.commonMode !== null) {
      el({ kind: 'V', name: 'VCM', na: 'cm', nb: '0', value: 0, dc0: f.commonMode, dc1: 0, ac: 0 });
      R('RSN', 'cm', 'sensn', f.minusResistance, f.sourceNoisy);
    }
    el({ kind: 'V', name: 'VSIG', role: 'signal', na: 'src', nb: low, value: 0, dc0: f.quiescent, dc1: f.sensitivity, ac: f.sensitivity, noise: f.noiseDensity });
    let node = 'src';
    if (f.bandwidth < 1e8) {
      // Sensor bandwidth as a noiseless RC followed by a unity buffer, so the source resistance stays as given.
      R('RSP', 'src', 'sp', 1000, false);
      el({ kind: 'C', name: 'CSP', na: 'sp', nb: low, value: 1 / (2 * Math.PI * 1000 * f.bandwidth) });
      el({ kind: 'E', name: 'ESP', na: 'sb', nb: low, value: 1, cpn: 'sp', cnn: low });
      node = 'sb';
    }
    R('RS', node, 'sens', f.sourceResistance, f.sourceNoisy, { role: 'sensor-source' });
  }
  // A single-ended sensor's − terminal is the ground.
  if (f.commonMode === null) nm.wire('sensn', '0');

  // Op-amp macromodel: VOS (offset, voltage noise) in series with the + input, bias and current noise at both inputs.
  const oa = design.opamp;
  const a0 = 10 ** (oa.openLoopGainDb / 20);
  el({ kind: 'V', name: 'VOS', role: 'opamp-offset', na: 'inp', nb: 'inpi', value: 0, dc0: 0, dc1: 0, ac: 0, extra: { vos: oa.offsetVoltage }, noise: oa.voltageNoise, noiseCorner: oa.voltageNoiseCorner });
  el({ kind: 'I', name: 'IBP', role: 'opamp-bias-positive', na: 'inpi', nb: '0', value: 0, dc0: 0, dc1: 0, ac: 0, extra: { ibp: oa.biasCurrent }, noise: oa.currentNoise, noiseCorner: oa.currentNoiseCorner });
  el({ kind: 'I', name: 'IBN', role: 'opamp-bias-negative', na: 'inn', nb: '0', value: 0, dc0: 0, dc1: 0, ac: 0, extra: { ibn: oa.biasCurrent }, noise: oa.currentNoise, noiseCorner: oa.currentNoiseCorner });
  el({ kind: 'E', name: 'EOA', role: 'opamp-gain', na: 'int', nb: '0', value: a0, pole: oa.gbw / a0, cpn: 'inpi', cnn: 'inn' });
  R('ROUT', 'int', 'pin', Math.max(oa.outputResistance, 1e-3), false);

  // Networks.
  const net = stage.network;
  const parts = stage.parts;
  const partsFor = (role: Part['role']) => parts.filter((p) => p.role === role);
  const arm = (a: Arm | null, role: Part['role'], from: string, to: string) => {
    if (!a) { nm.wire(from, to); return; }
    const ps = partsFor(role);
    if (a.arrangement === 'series' && ps.length === 2) {
      RP(ps[0]!, ps[0]!.ref, from, `${ps[0]!.ref}_${ps[1]!.ref}`, ps[0]!.ohms);
      RP(ps[1]!, ps[1]!.ref, `${ps[0]!.ref}_${ps[1]!.ref}`, to, ps[1]!.ohms);
    } else {
      for (const p of ps) RP(p, p.ref, from, to, p.ohms);
    }
  };
  const trimRheostat = (role: Part['role'], from: string, to: string) => {
    const t = partsFor(role)[0];
    if (!t) { nm.wire(from, to); return; }
    const s = t.setting ?? 0.5;
    RP(t, t.ref, from, to, t.ohms * s);
  };

  const feedbackPath = () => {
    arm(net.feedback, 'feedback', 'pin', 'fbt');
    trimRheostat('gain-trim', 'fbt', 'inn');
  };
  switch (net.topology) {
    case 'non-inverting':
      nm.wire('sens', 'inp');
      if (!net.feedback && !net.leg && net.reference.kind === 'none') {
        nm.wire('pin', 'inn');
      } else {
        feedbackPath();
        arm(net.leg, 'ground-leg', 'inn', 'ref');
      }
      break;
    case 'inverting':
      arm(net.leg, 'input', 'sens', 'inn');
      feedbackPath();
      nm.wire('inp', 'ref');
      break;
    case 'summing-non-inverting':
      arm(net.plusArm ?? null, 'plus-input', 'sens', 'inp');
      if (net.offsetArm) arm(net.offsetArm, 'offset', 'ref', 'inp');
      // K = 1 is a follower of the summed + input.
      if (!net.feedback && !net.leg) nm.wire('pin', 'inn');
      else { feedbackPath(); arm(net.leg, 'ground-leg', 'inn', '0'); }
      break;
    case 'summing-inverting':
      arm(net.leg, 'input', 'sens', 'inn');
      if (net.offsetArm) arm(net.offsetArm, 'offset', 'ref', 'inn');
      feedbackPath();
      nm.wire('inp', '0');
      break;
    case 'difference': {
      const [toPlus, toMinus] = net.swapped ? ['sensn', 'sens'] : ['sens', 'sensn'];
      arm(net.plusArm ?? null, 'plus-input', toPlus, 'inp');
      arm(net.offsetArm ?? null, 'offset', 'inp', 'ref');
      arm(net.leg, 'input', toMinus, 'inn');
      feedbackPath();
      break;
    }
  }
  const ref = net.reference;
  const railNode = (v: 'top' | 'bottom') => v === 'bottom' ? 'vneg' : ref.topRail === 'regulated' ? 'vreg' : 'vpos';
  if (ref.kind === 'rail') {
    // A tie goes to the rail (or, on split rails, the ground) the reference sits on.
    const ties: Array<[number, string]> = [[ref.railBottom, railNode('bottom')], [ref.railTop, railNode('top')], [0, '0']];
    nm.wire('ref', ties.reduce((b, t) => (Math.abs(ref.voltage - t[0]) < Math.abs(ref.voltage - b[0]) ? t : b))[1]);
  } else if (ref.kind === 'divider') {
    arm(ref.top, 'reference-top', railNode('top'), 'rpt');
    const t = partsFor('zero-trim')[0];
    if (t) {
      const s = t.setting ?? 0.5;
      RP(t, `${t.ref}A`, 'rpt', 'ref', t.ohms * (1 - s));
      RP(t, `${t.ref}B`, 'ref', 'rpb', t.ohms * s);
    } else {
      nm.wire('rpt', 'ref'); nm.wire('ref', 'rpb');
    }
    arm(ref.bottom, 'reference-bottom', 'rpb', railNode('bottom'));
  }

  // Output: optional series R and C, then the instrument load.
  const filt = design.output.filter;
  if (filt) {
    const rPart = partsFor('output-series')[0];
    if (rPart) RP(rPart, rPart.ref, 'pin', 'out', filt.resistance);
    else R('RFIL', 'pin', 'out', filt.resistance);
    if (filt.capacitance > 0) el({ kind: 'C', name: 'C1', na: 'out', nb: '0', value: filt.capacitance });
  } else {
    nm.wire('pin', 'out');
  }
  R('RLOAD', 'out', '0', design.output.load.resistance, true, { role: 'load' });
  if (design.output.load.capacitance > 0) el({ kind: 'C', name: 'CLOAD', na: 'out', nb: '0', value: design.output.load.capacitance });

  // Resolve node names to indices.
  const names = ['0'];
  const index = new Map<string, number>([['0', 0]]);
  const idx = (n: string) => {
    const r = nm.find(n);
    let i = index.get(r);
    if (i === undefined) { i = names.length; names.push(r); index.set(r, i); }
    return i;
  };
  // Each pending element becomes an element with node indices, written out field by field (an object rest
  // here was a tenth of a report's time: the circuit is rebuilt for every battery voltage); wires that join a
  // resistor's two ends drop it. Nodes are numbered in the order they are met, as before.
  const elements: Element[] = [];
  const ctrlNames: Array<[Element, string]> = [];
  for (const p of pending) {
    const a = idx(p.na), b = idx(p.nb);
    const e: Element = {
      kind: p.kind, name: p.name, role: p.role, part: p.part, tolerance: p.tolerance, a, b, value: p.value,
      dc0: p.dc0, dc1: p.dc1, ac: p.ac, extra: p.extra, noisy: p.noisy, noise: p.noise, noiseCorner: p.noiseCorner,
      cp: p.cpn !== undefined ? idx(p.cpn) : p.cp, cn: p.cnn !== undefined ? idx(p.cnn) : p.cn, pole: p.pole, ctrl: p.ctrl,
    };
    if (p.kind === 'R' && a === b) continue;
    elements.push(e);
    if (p.ctrlName !== undefined) ctrlNames.push([e, p.ctrlName]);
  }
  // A current-controlled source names its controlling element; its index is known only now.
  for (const [e, name] of ctrlNames) e.ctrl = elements.findIndex((x) => x.name === name);
  const circuit = compile(names, elements);
  const find = (role: Element['role']) => elements.findIndex((e) => e.role === role);
  return {
    circuit,
    nodes: {
      sensor: idx('sens'), inP: idx('inpi'), inN: idx('inn'), internal: idx('int'), pin: idx('pin'), out: idx('out'), ref: idx('ref'),
      source: idx('src'),
    },
    opampIndex: find('opamp-gain'),
    signalIndex: find('signal'),
    rails: { positive: find('rail-positive'), negative: find('rail-negative'), regulated: find('rail-regulated') },
  };
}
