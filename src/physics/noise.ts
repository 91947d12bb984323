/**
 * Noise: the textbook densities, and the output noise of a circuit from every source via one adjoint solve
 * per frequency.
 */
import { BOLTZMANN } from '../model/constants.js';

/**
 * Johnson–Nyquist thermal noise voltage density of a resistor, V/√Hz: e = √(4kTR)
 * (Johnson 1928, Nyquist 1928, Phys. Rev. 32). `thermalNoise(1000, 300)` → 4.0704e-9.
 */
export function thermalNoise(ohms: number, kelvin: number): number {
  return Math.sqrt(4 * BOLTZMANN * kelvin * ohms);
}

/** Equivalent noise bandwidth of a single pole at f_c: (π/2)·f_c (Motchenbacher & Connelly 1993, §1.4). */
export function enbwSinglePole(fc: number): number {
  return (Math.PI / 2) * fc;
}

/** Peak-to-peak estimate of Gaussian noise: 6.6 × rms (±3.3σ, exceeded 0.1 % of the time; common practice). */
export function peakToPeak(rms: number): number {
  return 6.6 * rms;
}

/**
 * Output noise density of a non-inverting amplifier with source resistance Rs (Motchenbacher & Connelly,
 * Low-Noise Electronic System Design, 1993, §3.4 form):
 *   e_no² = (1+Rf/Rg)²·[e_n² + 4kT·Rs + i_n²·Rs² + 4kT·(Rf‖Rg) + i_n²·(Rf‖Rg)²]
 */
export function nonInvertingNoise(p: { en: number; in: number; rf: number; rg: number; rs: number; kelvin: number }): number {
  const g = 1 + p.rf / p.rg;
  const rp = (p.rf * p.rg) / (p.rf + p.rg);
  const k4t = 4 * BOLTZMANN * p.kelvin;
  return g * Math.sqrt(p.en ** 2 + k4t * p.rs + (p.in * p.rs) ** 2 + k4t * rp + (p.in * rp) ** 2);
}

/** Log-spaced frequencies, `perDecade` points per decade (or exactly `count`, made odd), f1 and f2 included. */
export function logGrid(f1: number, f2: number, perDecade: number, count?: number): Float64Array {
  const decades = Math.log10(f2 / f1);
  let n = count ?? Math.max(2, Math.ceil(decades * perDecade) + 1);
  if (n % 2 === 0) n++; // odd count for Simpson's rule
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = f1 * 10 ** ((decades * i) / (n - 1));
  out[n - 1] = f2;
  return out;
}

/**
 * ∫ S(f) df over a log grid with Simpson's rule in ln f (S·f is smooth in ln f): the integrated noise power.
 * `density` is in V/√Hz; returns V².
 */
export function integratePower(freqs: Float64Array, density: Float64Array): number {
  const n = freqs.length;
  if (n < 3) return 0;
  const h = Math.log(freqs[n - 1]! / freqs[0]!) / (n - 1);
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const y = density[i]! ** 2 * freqs[i]!;
    const w = i === 0 || i === n - 1 ? 1 : i % 2 === 1 ? 4 : 2;
    sum += w * y;
  }
  return (sum * h) / 3;
}
