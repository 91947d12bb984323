/**
 * The closed-loop Hall sensor alone as a SPICE netlist (Berkeley SPICE 3 syntax, plain elements): the same
 * circuit the report solves for the loop (src/circuit/closed-loop.ts), with a control block for ngspice that
 * writes the transfer V(sens)/I_p across the crossover and a step of primary current. The stage's own netlist
 * (src/present/spice.ts) carries the same sensor in front of the amplifier.
 */
import type { Design } from '../model/design.js';
import { closedLoopParts, loopFigures } from '../physics/closed-loop.js';
import { closedLoopCircuit } from '../circuit/closed-loop.js';
import { plainElementLines, spiceName, spiceNode, spiceNumber as fmt } from './spice.js';
import { spiceCommentText } from './inert.js';
import { cautionsFor } from './cautions.js';

export interface ClosedLoopSpice {
  netlist: string;
  /** The step of primary current (A) and the SPICE time it happens at (s); the run's end (s). */
  step: number;
  stepAt: number;
  stop: number;
}

/** The sensor-alone netlist, or null for another sensor type. `step` defaults to half the range end. */
export function closedLoopSpiceNetlist(design: Design, opts: { step?: number; date?: string } = {}): ClosedLoopSpice | null {
  const s = design.sensor;
  if (s.type !== 'closed-loop-hall') return null;
  const p = closedLoopParts(s, design.supply);
  const lf = loopFigures(p);
  const cc = closedLoopCircuit(s, p);
  const c = cc.circuit;
  const end = Math.max(Math.abs(design.target.range[0]), Math.abs(design.target.range[1]));
  const step = opts.step ?? end / 2;
  const fc = lf.crossover ?? lf.windingCorner;
  const tSlow = Math.max(p.inductance / p.loopResistance, s.compensation.zeroResistance * s.compensation.capacitance, 1 / (2 * Math.PI * fc));
  const t1 = Math.min(8 * tSlow, 1);
  const stepAt = t1 / 20, stop = stepAt + t1;
  const tFast = 1 / (2 * Math.PI * Math.max(fc, lf.windingCorner));
  const lines: string[] = [];
  lines.push(`* Gainwright closed-loop Hall sensor alone: ${spiceCommentText(design.title)}`);
  lines.push(`* Exported ${opts.date ?? new Date().toISOString().slice(0, 10)} (ISO 8601).`);
  lines.push('* Core: magnetising inductance LM with the primary reflected across it (ISIG = Np/Ns x primary current);');
  lines.push('* Hall sensor: HHALL controlled by LM\'s current, on its zero VHQ; compensation RI, CI, RZ; linear driver EDRV');
  lines.push('* (no swing or current limit); winding resistance RW, driver output resistance RO, measurement resistor RM to VQ.');
  lines.push(`* Output: V(sens) above the reference ${fmt(p.reference)} V. Step of ${fmt(step)} A primary at ${fmt(stepAt)} s.`);
  for (const caution of cautionsFor(design.sensor.type, ['closed-loop-open-winding'])) lines.push(`* CAUTION: ${spiceCommentText(caution, 1000)}`);
  const k = s.primaryTurns / s.compensationTurns;
  c.elements.forEach((e, i) => {
    const a = spiceNode(c.nodeNames, e.a), b = spiceNode(c.nodeNames, e.b);
    if (e.kind === 'V') lines.push(`${spiceName('V', e.name)} ${a} ${b} DC ${fmt(e.dc0 ?? 0)} AC ${fmt(e.ac ?? 0)}`);
    else if (e.kind === 'I') lines.push(`${spiceName('I', e.name)} ${a} ${b} DC 0 AC ${fmt(e.ac ?? 0)} PWL(0 0 ${fmt(stepAt)} 0 ${fmt(stepAt + tFast / 1000)} ${fmt(k * step)})`);
    else lines.push(...plainElementLines(c, i));
  });
  const out = spiceNode(c.nodeNames, cc.nodes.out);
  const f0 = Math.min(lf.windingCorner, fc) / 100, f1 = Math.max(lf.windingCorner, fc) * 100;
  lines.push('.control');
  lines.push('set wr_singlescale');
  lines.push('set wr_vecnames');
  lines.push(`ac dec 40 ${fmt(f0)} ${fmt(f1)}`);
  lines.push(`wrdata gainwright-cl-ac.txt vm(${out}) vp(${out})`);
  lines.push(`tran ${fmt(t1 / 4000)} ${fmt(stop)} 0 ${fmt(tFast / 25)}`);
  lines.push(`wrdata gainwright-cl-tran.txt v(${out})`);
  lines.push('quit');
  lines.push('.endc');
  lines.push('.end');
  return { netlist: lines.join('\n') + '\n', step, stepAt, stop };
}
