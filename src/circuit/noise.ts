/**
 * Noise of a whole circuit: the output density of every noisy element by one adjoint solve per frequency
 * (the adjoint network method: one solve gives the transfer from every source to the output; Vlach &
 * Singhal, Computer Methods for Circuit Analysis and Design, 1983, ch. on sensitivity and noise).
 */
import { BOLTZMANN } from '../model/constants.js';
import { adjointAt, signalTransfer, transferFrom, workspace, type Circuit, type ElementRole } from './mna.js';

export interface NoiseSourceShare {
  /** The element's netlist name (the first of a part's elements). */
  name: string;
  /** What it stands for, and the part it belongs to: the words for it are chosen from these (src/present). */
  role?: ElementRole;
  part?: string;
  /** Output noise density of this source alone, V/√Hz, at each frequency. */
  density: Float64Array;
}

export interface NoiseSpectrum {
  freqs: Float64Array;
  /** Total output density, V/√Hz. */
  total: Float64Array;
  sources: NoiseSourceShare[];
  /** The signal transfer (measurand to output) at the same frequencies, from the same adjoint solves. */
  signalRe: Float64Array;
  signalIm: Float64Array;
}

/**
 * Output noise density at node `out` of every noisy element: resistors (4kT/R as a parallel current),
 * voltage sources with a density (op-amp e_n, sensor noise) and current sources with a density (op-amp i_n).
 * A source with a 1/f corner f_c has density² = white²·(1 + f_c/f) (the usual flicker-plus-white form;
 * Motchenbacher & Connelly, Low-Noise Electronic System Design, 1993, ch. 1). Sources are uncorrelated and
 * add in power; the elements of one part (a trimmer's two halves) are one source.
 */
export function noiseSpectrum(c: Circuit, out: number, freqs: Float64Array, kelvin: number): NoiseSpectrum {
  const ws = workspace(c, true);
  const noisy: Array<{ i: number; psd: number; corner: number; share: number }> = [];
  const shares: NoiseSourceShare[] = [];
  const shareOf = new Map<string, number>();
  c.elements.forEach((e, i) => {
    const psd = e.kind === 'R' && e.value > 0 && e.noisy !== false ? (4 * BOLTZMANN * kelvin) / e.value
      : (e.kind === 'V' || e.kind === 'I') && e.noise && e.noise > 0 ? e.noise ** 2 : 0;
    if (!(psd > 0)) return;
    const key = e.part ?? `#${e.name}`;
    let share = shareOf.get(key);
    if (share === undefined) {
      share = shares.length;
      shareOf.set(key, share);
      shares.push({ name: e.name, ...(e.role ? { role: e.role } : {}), ...(e.part ? { part: e.part } : {}), density: new Float64Array(freqs.length) });
    }
    noisy.push({ i, psd, corner: e.kind === 'R' ? 0 : e.noiseCorner ?? 0, share });
  });
  const power = new Float64Array(shares.length);
  const total = new Float64Array(freqs.length);
  const signalRe = new Float64Array(freqs.length), signalIm = new Float64Array(freqs.length);
  for (let k = 0; k < freqs.length; k++) {
    if (!adjointAt(c, 2 * Math.PI * freqs[k]!, out, ws)) continue;
    [signalRe[k], signalIm[k]] = signalTransfer(c, ws);
    let sum = 0;
    power.fill(0);
    for (let s = 0; s < noisy.length; s++) {
      const [hr, hi] = transferFrom(c, noisy[s]!.i, ws);
      const src = noisy[s]!;
      const p = src.psd * (src.corner > 0 ? 1 + src.corner / freqs[k]! : 1) * (hr * hr + hi * hi);
      power[src.share]! += p;
      sum += p;
    }
    for (let s = 0; s < shares.length; s++) shares[s]!.density[k] = Math.sqrt(power[s]!);
    total[k] = Math.sqrt(sum);
  }
  return { freqs, total, sources: shares, signalRe, signalIm };
}

