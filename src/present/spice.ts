/**
 * SPICE netlist export (Berkeley SPICE 3 syntax) of the designed circuit, element for element as the
 * report analyses it, so a user can check the design in any simulator.
 *
 * The op-amp is a generic behavioural model: a transconductance into an RC sets the open-loop gain A0 and
 * the dominant pole GBW/A0, a unity buffer and the output resistance follow. The current into the RC is
 * limited to ±SR·C (slew rate) and the pole node is held at the output swing (so it recovers at once), the
 * large-signal model the report's waveform uses. Its noise generators are the
 * thermal noise of 1 kΩ resistors scaled by noiseless controlled sources; a generator with a 1/f corner f_c
 * adds the resistor's flicker noise (ngspice's resistor model: S_i = KF·I^AF/f with 1 mA through it, read
 * against a noiseless twin carrying the same current so that no DC leaks in), KF set so that the density is
 * √(4kTR·(1 + f_c/f)); resistors that are not physical parts (the model's own) carry `noisy=0`.
 */
import { BOLTZMANN } from '../model/constants.js';
import type { Circuit } from '../circuit/mna.js';
import type { Report } from '../analysis/report.js';
import { spiceCommentText } from './inert.js';
import { blockLimits, waveformPlan } from '../analysis/waveform.js';
import { cautionsFor } from './cautions.js';

/** SPICE's largest transient step is the report's sample spacing divided by this (see the `tran` line). */
export const TRAN_STEP_DIVISOR = 10;

const fmt = (x: number) => (Number.isFinite(x) ? Number(x.toPrecision(9)).toString() : '0');
const node = (names: string[], i: number) => (i === 0 ? '0' : names[i]!.replace(/[^A-Za-z0-9_]/g, '_'));

export interface SpiceOptions {
  /** Date written in the header (ISO 8601); defaults to today. */
  date?: string;
}

/** The netlist text, or null when the report has no circuit. */
export function spiceNetlist(r: Report, opts: SpiceOptions = {}): string | null {
  const sc = r.circuit;
  if (!sc || !r.speed) return null;
  const c = sc.circuit;
  const limits = blockLimits(r.design, sc);
  // A value that is not a finite number has no netlist: none is written rather than a silent 0.
  if (!c.elements.every((e) => [e.value, e.dc0 ?? 0, e.dc1 ?? 0, e.ac ?? 0].every(Number.isFinite))) return null;
  const names = c.nodeNames;
  const d = r.design;
  const T = d.environment.temperature;
  const tempC = T - 273.15;
  const rn = 1000;
  const enRef = Math.sqrt(4 * BOLTZMANN * T * rn);
  const lines: string[] = [];
  const date = opts.date ?? new Date().toISOString().slice(0, 10);
  // Every text from the design reaches the netlist only inside a comment line, reduced to one line.
  const title = spiceCommentText(d.title);
  const measurand = spiceCommentText(d.sensor.measurand, 16);
  lines.push(`* Gainwright netlist: ${title}`);
  lines.push(`* Exported ${date} (ISO 8601). Topology: ${r.stage?.ideal.topology ?? 'none'}.`);
  lines.push('* Model assumptions: behavioural op-amp with a single pole at GBW/A0, open-loop output resistance, and its');
  lines.push('* internal output limited to the swing (outputLow above the - rail, outputHigh below the + rail) and its slew');
  lines.push('* rate; no output current limit, offsets and bias currents omitted; trimmers as two resistors at their settings;');
  if (d.sensor.type === 'closed-loop-hall') {
    lines.push('* Closed-loop Hall sensor: the core as the magnetising inductance LM with the primary reflected across it (ISIG =');
    lines.push('* Np/Ns x measurand), the Hall sensor as HHALL controlled by LM\'s current, the compensation (RI, CI, RZ) and a');
    lines.push('* driver EDRV held within its voltage room (the rails less its swing and drop), no current limit: the report\'s largest held current is not in the netlist.');
  } else {
    lines.push('* sensor as an ideal source with its resistance and bandwidth (its own output limits are not modelled).');
  }
  lines.push(`* Measurand ${measurand}: the signal source is ${c.elements[sc.signalIndex]?.name ?? '?'}; its value is quiescent + sensitivity x measurand.`);
  lines.push(`* Output node: ${node(names, sc.nodes.out)}. Temperature ${fmt(tempC)} C.`);
  for (const caution of cautionsFor(d.sensor.type, r.front.cautions)) lines.push(`* CAUTION: ${spiceCommentText(caution, 1000)}`);
  lines.push('*');
  lines.push(`.temp ${fmt(tempC)}`);
  const sigIdx = sc.signalIndex;
  const wave = r.waveformSpec && r.dc ? waveformPlan(r.waveformSpec, r.speed, r.dc, d) : null;
  /** The transient function of the signal source for the waveform: its value is dc0 + dc1·x(t). */
  const tranOf = (i: number): string => {
    if (!wave || i !== sigIdx) return '';
    const e = c.elements[i]!;
    const v = (x: number) => fmt((e.dc0 ?? 0) + (e.dc1 ?? 0) * x);
    const w = wave.spec;
    // SPICE time runs from the start of the solve (t0 in the report's time).
    // Edges far shorter than anything the circuit resolves, but not below what SPICE can step over the run.
    const edge = Math.max(wave.hFine / 50, (wave.t1 - wave.t0) * 1e-8);
    if (w.shape === 'step') return ` PWL(0 ${v(w.low)} ${fmt(-wave.t0)} ${v(w.low)} ${fmt(-wave.t0 + edge)} ${v(w.high)})`;
    const T = 1 / w.frequency;
    if (w.shape === 'sine') return ` SIN(${v((w.low + w.high) / 2)} ${fmt((e.dc1 ?? 0) * (w.high - w.low) / 2)} ${fmt(w.frequency)} 0 0 0)`;
    if (w.shape === 'square') return ` PULSE(${v(w.low)} ${v(w.high)} 0 ${fmt(edge)} ${fmt(edge)} ${fmt(w.duty * T - edge)} ${fmt(T)})`;
    // SPICE reads a zero pulse width as "not given" (a default): give it one edge's worth, taken from the fall.
    return ` PULSE(${v(w.low)} ${v(w.high)} 0 ${fmt(w.duty * T)} ${fmt((1 - w.duty) * T - edge)} ${fmt(edge)} ${fmt(T)})`;
  };
  let aux = 0;
  const noiseGen = (label: string, corner = 0): string => {
    // Node driven only by a 1 kΩ resistor's thermal noise: sqrt(4kTR) V/sqrt(Hz), scaled by the caller.
    const n = `nz_${label}`;
    if (!(corner > 0)) {
      lines.push(`RNZ_${label} ${n} 0 ${rn}`);
      return `${n} 0`;
    }
    // With flicker: KF·I²/f·R² = 4kTR·f_c/f at I = 1 mA; the twin node carries the same DC, noiselessly.
    const iDc = 1e-3;
    const kf = (4 * BOLTZMANN * T * corner) / (rn * iDc * iDc);
    lines.push(`.model RFLK_${label} R(kf=${fmt(kf)} af=2)`);
    lines.push(`INZ_${label} 0 ${n} DC ${fmt(iDc)}`);
    lines.push(`RNZ_${label} ${n} 0 ${rn} RFLK_${label}`);
    lines.push(`INZT_${label} 0 ${n}_t DC ${fmt(iDc)}`);
    lines.push(`RNZT_${label} ${n}_t 0 ${rn} noisy=0`);
    return `${n} ${n}_t`;
  };
  c.elements.forEach((e, i) => {
    const a = node(names, e.a), b = node(names, e.b);
    switch (e.kind) {
      case 'R': case 'C': case 'L': case 'H':
        lines.push(...plainElementLines(c, i));
        break;
      case 'V': {
        if (e.noise && e.noise > 0) {
          const mid = `${a}_nz${aux++}`;
          const nz = noiseGen(e.name, e.noiseCorner);
          lines.push(`${spiceName('V', e.name)} ${mid} ${b} DC ${fmt(e.dc0 ?? 0)} AC ${fmt(e.ac ?? 0)}${tranOf(i)}`);
          lines.push(`${spiceName('E', `${e.name}_N`)} ${a} ${mid} ${nz} ${fmt(e.noise / enRef)}`);
        } else {
          lines.push(`${spiceName('V', e.name)} ${a} ${b} DC ${fmt(e.dc0 ?? 0)} AC ${fmt(e.ac ?? 0)}${tranOf(i)}`);
        }
        break;
      }
      case 'I': {
        if (e.noise && e.noise > 0) {
          const nz = noiseGen(e.name, e.noiseCorner);
          lines.push(`${spiceName('G', `${e.name}_N`)} ${a} ${b} ${nz} ${fmt(e.noise / enRef)}`);
        }
        if ((e.dc0 ?? 0) !== 0 || (e.ac ?? 0) !== 0 || (e.dc1 ?? 0) !== 0) lines.push(`${spiceName('I', e.name)} ${a} ${b} DC ${fmt(e.dc0 ?? 0)} AC ${fmt(e.ac ?? 0)}${tranOf(i)}`);
        break;
      }
      case 'E': {
        const cp = node(names, e.cp ?? 0), cn = node(names, e.cn ?? 0);
        // The same large-signal limits the report's time-domain solve gives the blocks (`blockLimits`).
        const limit = e.pole && e.pole > 0 ? limits.find((l) => l.index === i) : undefined;
        if (!limit) {
          lines.push(...plainElementLines(c, i));
        } else {
          // A0/(1 + s/ωp): a current gm·v_d − V(p)/Rp (gm = A0/Rp) into Cp, Rp·Cp = 1/(2π·fp), which is
          // τ·dV(p)/dt + V(p) = A0·v_d. The current is limited to ±SR·Cp, so V(p) slews at most at SR (a
          // block with no slew rate stated, the closed-loop driver, is not limited there).
          const rp = 1e6, cp2 = 1 / (2 * Math.PI * e.pole! * rp);
          const p = `${a}_pole`;
          const [lo, hi] = [limit.low, limit.high];
          const ilim = limit.slew * cp2;
          const gm = `${fmt(e.value / rp)}*(V(${cp})-V(${cn})) - V(${p})/${fmt(rp)}`;
          lines.push(`${spiceName('B', `${e.name}_GM`)} 0 ${p} I=${Number.isFinite(ilim) ? `max(-(${fmt(ilim)}), min(${fmt(ilim)}, ${gm}))` : gm}`);
          // A leak of 1 TΩ keeps the pole node a DC path while the current sits at its slew limit (where the node
          // would otherwise float and the operating-point search meet a singular matrix); it moves A0 by 1 ppm.
          lines.push(`${spiceName('R', `${e.name}_LEAK`)} ${p} 0 1e12 noisy=0`);
          lines.push(`${spiceName('C', `${e.name}_CP`)} ${p} 0 ${fmt(cp2)}`);
          // The pole node is held at the swing (a stiff conductance past each limit), so it does not wind up.
          lines.push(`${spiceName('B', `${e.name}_HOLD`)} ${p} 0 I=${fmt(1e4)}*(max(V(${p})-(${fmt(hi)}), 0) + min(V(${p})-(${fmt(lo)}), 0))`);
          // The internal output clips at the swing limits, as the report's clipping analysis assumes.
          lines.push(`${spiceName('B', e.name)} ${a} ${b} V=max(${fmt(lo)}, min(${fmt(hi)}, V(${p})))`);
        }
        break;
      }
    }
  });
  const sig = c.elements[sc.signalIndex];
  const band = r.noise?.band ?? [1, Math.max(r.speed.smallSignal * 100, 1e3)];
  const out = node(names, sc.nodes.out);
  const sigName = sig ? spiceName(sig.kind, sig.name) : '';
  // Start Newton at the operating point the report found: the behavioural limiter makes a cold start hard.
  const op = r.dc ? nodesetLine(r) : null;
  lines.push('*');
  if (op) lines.push(op);
  lines.push('* Analyses (ngspice .control block): results go to gainwright-*.txt as plain columns in the working folder.');
  lines.push('* For another simulator replace the block with its own .dc/.ac/.noise lines.');
  lines.push('.control');
  lines.push('set wr_singlescale');
  lines.push('set wr_vecnames');
  lines.push('op');
  lines.push(`wrdata gainwright-op.txt v(${out})`);
  if (sig && r.front.passesDc && r.transfer) {
    // DC sweep of the signal source across the range and half a range beyond each end (the transfer plot's span).
    const x0 = r.transfer.x[0]!, x1 = r.transfer.x[r.transfer.x.length - 1]!;
    const v = (x: number) => (sig.dc0 ?? 0) + (sig.dc1 ?? 0) * x;
    lines.push(`* source value = ${fmt(sig.dc0 ?? 0)} + ${fmt(sig.dc1 ?? 0)} x measurand, from ${fmt(x0)} to ${fmt(x1)} ${measurand}`);
    lines.push(`dc ${sigName} ${fmt(v(x0))} ${fmt(v(x1))} ${fmt((v(x1) - v(x0)) / 400)}`);
    lines.push(`wrdata gainwright-dc.txt v(${out})`);
  }
  lines.push(`ac dec 40 ${fmt(Math.min(band[0], 1))} ${fmt(Math.max(band[1], r.speed.smallSignal * 10))}`);
  lines.push(`wrdata gainwright-ac.txt vm(${out}) vp(${out})`);
  if (wave) {
    // The waveform: the signal source carries it; SPICE time 0 is the report's t0 (the solve's start).
    const w = wave.spec;
    lines.push(`* waveform: ${w.shape} from ${fmt(w.low)} to ${fmt(w.high)} ${d.sensor.measurand}${w.shape === 'step' ? '' : ` at ${fmt(w.frequency)} Hz, duty ${fmt(w.duty)}`}; report time t = SPICE time + ${fmt(wave.t0)} s`);
    // SPICE's largest step a tenth of the report's (TMAX): its points are then close enough that reading them
    // between points does not cut the corner where a slewing output levels off (with TMAX equal to the sample
    // spacing that alone reads up to about 2 % of the span off at a corner).
    lines.push(`* SPICE's largest time step is a tenth of the sample spacing, so that slew corners are resolved.`);
    lines.push(`tran ${fmt((wave.t1 - wave.recordFrom) / (wave.samples - 1))} ${fmt(wave.t1 - wave.t0)} ${fmt(wave.recordFrom - wave.t0)} ${fmt(wave.hMax / TRAN_STEP_DIVISOR)}`);
    lines.push(`wrdata gainwright-tran.txt v(${out})`);
  }
  if (sig) {
    lines.push(`noise v(${out}) ${sigName} dec 40 ${fmt(band[0])} ${fmt(band[1])}`);
    lines.push('setplot noise1');
    lines.push('wrdata gainwright-noise.txt onoise_spectrum');
  }
  lines.push('quit');
  lines.push('.endc');
  lines.push('.end');
  return lines.join('\n') + '\n';
}

/** `.nodeset` of every node at zero measurand, from the report's own DC solution. */
function nodesetLine(r: Report): string | null {
  const sc = r.circuit!;
  if (!r.dc) return null;
  const col = r.dc.c0;
  const names = sc.circuit.nodeNames;
  const parts: string[] = [];
  for (let i = 1; i < names.length; i++) parts.push(`V(${node(names, i)})=${fmt(col[i - 1]!)}`);
  // Each limited block's pole node sits at its output, V(a) − V(b) (the op-amp's internal output; the
  // closed-loop driver's output above its reference).
  const v = (k: number) => (k > 0 ? col[k - 1]! : 0);
  for (const l of blockLimits(r.design, sc)) {
    const e = sc.circuit.elements[l.index];
    if (e) parts.push(`V(${node(names, e.a)}_pole)=${fmt(v(e.a) - v(e.b))}`);
  }
  return `.nodeset ${parts.join(' ')}`;
}

/**
 * The SPICE lines of one element that needs no design-wide model: a resistor, capacitor, inductor (with a
 * 0 V source in series when a current-controlled source reads its current), a current-controlled voltage
 * source, or a gain block: without a pole an E; with one (any amplifier but the stage's op-amp, which carries
 * its large-signal model) linear, A0/(1 + s/ωp) as a transconductance A0/Rp into Rp ∥ Cp (Rp·Cp = 1/(2π·fp))
 * and a unity buffer. Null for the other kinds.
 */
export function plainElementLines(c: Circuit, i: number): string[] {
  const names = c.nodeNames;
  const e = c.elements[i]!;
  const a = node(names, e.a), b = node(names, e.b);
  switch (e.kind) {
    case 'R':
      return [`${spiceName('R', e.name)} ${a} ${b} ${fmt(e.value)}${e.noisy === false ? ' noisy=0' : ''}`];
    case 'C':
      return [`${spiceName('C', e.name)} ${a} ${b} ${fmt(e.value)}`];
    case 'L':
      if (c.elements.some((h) => h.kind === 'H' && h.ctrl === i)) {
        return [`${spiceName('L', e.name)} ${a} ${a}_${e.name}_s ${fmt(e.value)}`, `${spiceName('V', `${e.name}_SENSE`)} ${a}_${e.name}_s ${b} DC 0`];
      }
      return [`${spiceName('L', e.name)} ${a} ${b} ${fmt(e.value)}`];
    case 'H': {
      const ce = c.elements[e.ctrl ?? -1];
      return ce ? [`${spiceName('H', e.name)} ${a} ${b} ${spiceName('V', `${ce.name}_SENSE`)} ${fmt(e.value)}`] : [];
    }
    case 'E': {
      const cp = node(names, e.cp ?? 0), cn = node(names, e.cn ?? 0);
      if (!(e.pole && e.pole > 0)) return [`${spiceName('E', e.name)} ${a} ${b} ${cp} ${cn} ${fmt(e.value)}`];
      const rp = 1e6, cp2 = 1 / (2 * Math.PI * e.pole * rp);
      const p = `${a}_pole`;
      return [
        `${spiceName('G', `${e.name}_GM`)} 0 ${p} ${cp} ${cn} ${fmt(e.value / rp)}`,
        `${spiceName('R', `${e.name}_RP`)} ${p} 0 ${fmt(rp)} noisy=0`,
        `${spiceName('C', `${e.name}_CP`)} ${p} 0 ${fmt(cp2)}`,
        `${spiceName('E', e.name)} ${a} ${b} ${p} 0 1`,
      ];
    }
    default:
      return [];
  }
}

/** A number as SPICE text (nine significant figures; 0 for a non-finite value), and a node's SPICE name. */
export { fmt as spiceNumber, node as spiceNode };

/** SPICE wants the first letter to be the element type. */
export function spiceName(kind: string, name: string): string {
  const clean = name.replace(/[^A-Za-z0-9_]/g, '_');
  return clean.toUpperCase().startsWith(kind) ? clean : `${kind}_${clean}`;
}
