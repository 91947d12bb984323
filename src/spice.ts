/**
 * SPICE netlist export (Berkeley SPICE 3 syntax) of the designed circuit, element for element as the
 * report analyses it, so a user can check the design in any simulator.
 *
 * The op-amp is a generic behavioural model: a transconductance into an RC sets the open-loop gain A0 and
 * the dominant pole GBW/A0, a unity buffer and the output resistance follow. Its noise generators are the
 * thermal noise of 1 kΩ resistors scaled by noiseless controlled sources; resistors that are not physical
 * parts (the model's own) carry `noisy=0`.
 */
import { BOLTZMANN } from './constants.js';
import type { Report } from './report.js';

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
  const names = c.nodeNames;
  const d = r.design;
  const T = d.environment.temperature;
  const tempC = T - 273.15;
  const rn = 1000;
  const enRef = Math.sqrt(4 * BOLTZMANN * T * rn);
  const lines: string[] = [];
  const date = opts.date ?? new Date().toISOString().slice(0, 10);
  const title = d.title.replace(/[\r\n]+/g, ' ').slice(0, 120);
  lines.push(`* Gainwright netlist: ${title}`);
  lines.push(`* Exported ${date} (ISO 8601). Topology: ${r.stage?.ideal.topology ?? 'none'}.`);
  lines.push('* Model assumptions: linear small-signal op-amp (single pole at GBW/A0, open-loop output resistance),');
  lines.push('* no output clipping or slew limit (the report applies those separately), offsets and bias currents omitted,');
  lines.push('* trimmers as two resistors at their settings, sensor as an ideal source with its resistance and bandwidth.');
  lines.push(`* Measurand ${d.sensor.measurand}: the signal source is ${c.elements[sc.signalIndex]?.name ?? '?'}; its value is quiescent + sensitivity x measurand.`);
  lines.push(`* Output node: ${node(names, sc.nodes.out)}. Temperature ${fmt(tempC)} C.`);
  lines.push('*');
  lines.push(`.temp ${fmt(tempC)}`);
  let aux = 0;
  const noiseGen = (label: string, density: number): string => {
    // Node driven only by a 1 kΩ resistor's thermal noise: sqrt(4kTR) V/sqrt(Hz), scaled by the caller.
    const n = `nz_${label}`;
    lines.push(`RNZ_${label} ${n} 0 ${rn}`);
    void density;
    return n;
  };
  c.elements.forEach((e) => {
    const a = node(names, e.a), b = node(names, e.b);
    switch (e.kind) {
      case 'R':
        lines.push(`${spiceName('R', e.name)} ${a} ${b} ${fmt(e.value)}${e.noisy === false ? ' noisy=0' : ''}`);
        break;
      case 'C':
        lines.push(`${spiceName('C', e.name)} ${a} ${b} ${fmt(e.value)}`);
        break;
      case 'L':
        lines.push(`${spiceName('L', e.name)} ${a} ${b} ${fmt(e.value)}`);
        break;
      case 'V': {
        if (e.noise && e.noise > 0) {
          const mid = `${a}_nz${aux++}`;
          const nz = noiseGen(e.name, e.noise);
          lines.push(`${spiceName('V', e.name)} ${mid} ${b} DC ${fmt(e.dc0 ?? 0)} AC ${fmt(e.ac ?? 0)}`);
          lines.push(`${spiceName('E', `${e.name}_N`)} ${a} ${mid} ${nz} 0 ${fmt(e.noise / enRef)}`);
        } else {
          lines.push(`${spiceName('V', e.name)} ${a} ${b} DC ${fmt(e.dc0 ?? 0)} AC ${fmt(e.ac ?? 0)}`);
        }
        break;
      }
      case 'I': {
        if (e.noise && e.noise > 0) {
          const nz = noiseGen(e.name, e.noise);
          lines.push(`${spiceName('G', `${e.name}_N`)} ${a} ${b} ${nz} 0 ${fmt(e.noise / enRef)}`);
        }
        if ((e.dc0 ?? 0) !== 0 || (e.ac ?? 0) !== 0 || (e.dc1 ?? 0) !== 0) lines.push(`${spiceName('I', e.name)} ${a} ${b} DC ${fmt(e.dc0 ?? 0)} AC ${fmt(e.ac ?? 0)}`);
        break;
      }
      case 'E': {
        const cp = node(names, e.cp ?? 0), cn = node(names, e.cn ?? 0);
        if (e.pole && e.pole > 0) {
          // A0/(1 + s/ωp): gm = A0 / Rp into Rp ∥ Cp with Rp·Cp = 1/(2π·fp).
          const rp = 1e6, cp2 = 1 / (2 * Math.PI * e.pole * rp);
          const p = `${a}_pole`;
          lines.push(`${spiceName('G', `${e.name}_GM`)} 0 ${p} ${cp} ${cn} ${fmt(e.value / rp)}`);
          lines.push(`${spiceName('R', `${e.name}_RP`)} ${p} 0 ${fmt(rp)} noisy=0`);
          lines.push(`${spiceName('C', `${e.name}_CP`)} ${p} 0 ${fmt(cp2)}`);
          lines.push(`${spiceName('E', e.name)} ${a} ${b} ${p} 0 1`);
        } else {
          lines.push(`${spiceName('E', e.name)} ${a} ${b} ${cp} ${cn} ${fmt(e.value)}`);
        }
        break;
      }
    }
  });
  const sig = c.elements[sc.signalIndex];
  const fTop = Math.max(r.speed.smallSignal * 100, 1e3);
  lines.push('*');
  lines.push('.op');
  lines.push(`.ac dec 40 1 ${fmt(fTop)}`);
  if (sig) lines.push(`.noise v(${node(names, sc.nodes.out)}) ${spiceName(sig.kind, sig.name)} dec 40 1 ${fmt(fTop)}`);
  lines.push(`.print ac vm(${node(names, sc.nodes.out)}) vp(${node(names, sc.nodes.out)})`);
  if (sig) lines.push('.print noise onoise_spectrum');
  lines.push('.end');
  return lines.join('\n') + '\n';
}

/** SPICE wants the first letter to be the element type. */
function spiceName(kind: string, name: string): string {
  const clean = name.replace(/[^A-Za-z0-9_]/g, '_');
  return clean.toUpperCase().startsWith(kind) ? clean : `${kind}_${clean}`;
}
