import { describe, expect, it } from 'vitest';
import { enbwSinglePole, integratePower, logGrid, nonInvertingNoise, peakToPeak, thermalNoise } from '../../src/physics/noise.js';
import { noiseSpectrum } from '../../src/circuit/noise.js';
import { compile, type Element } from '../../src/circuit/mna.js';
import { BOLTZMANN } from '../../src/model/constants.js';

describe('thermal noise (Johnson 1928, Nyquist 1928: e = √(4kTR), k exact per SI 2019)', () => {
  it('uses the exact Boltzmann constant 1.380649e-23 J/K (SI Brochure, 9th ed.)', () => {
    expect(BOLTZMANN).toBe(1.380649e-23);
  });
  // Derived from √(4kTR): 1 kΩ → 4.0019 nV/√Hz at 290 K, 4.0578 at 298.15 K, 4.0704 at 300 K; 10 kΩ at 300 K → 12.872.
  it.each([[1000, 290, 4.0019e-9], [1000, 298.15, 4.0578e-9], [1000, 300, 4.0704e-9], [10000, 300, 12.872e-9]])('%d Ω at %d K → %d V/√Hz', (r, t, e) => {
    expect(thermalNoise(r, t) / e).toBeCloseTo(1, 4);
  });
});

describe('noise bandwidth and peak-to-peak', () => {
  // Motchenbacher & Connelly 1993 §1.4: ENBW of one pole is (π/2)·f_c.
  it('integrating a single-pole density reproduces ENBW = (π/2)·f_c', () => {
    const fc = 1000;
    const el: Element[] = [
      { kind: 'V', name: 'VN', a: 1, b: 0, value: 0, noise: 1 },
      { kind: 'R', name: 'R', a: 1, b: 2, value: 1000, noisy: false },
      { kind: 'C', name: 'C', a: 2, b: 0, value: 1 / (2 * Math.PI * 1000 * fc) },
    ];
    const c = compile(['0', 'in', 'out'], el);
    const f = logGrid(1e-3, 1e9, 24);
    const s = noiseSpectrum(c, 2, f, 300);
    expect(integratePower(f, s.total) / enbwSinglePole(fc)).toBeCloseTo(1, 4);
  });
  it('peak-to-peak is 6.6 × rms (±3.3σ; common practice)', () => {
    expect(peakToPeak(1e-3)).toBeCloseTo(6.6e-3, 12);
  });
});

describe('output noise of a non-inverting stage (Motchenbacher & Connelly §3.4 form)', () => {
  // Derived example: e_n 10 nV/√Hz, i_n 1 pA/√Hz, Rg 1 k, Rf 9 k, Rs 0, 300 K → 107.57 nV/√Hz at the output.
  it('closed form gives 107.57 nV/√Hz', () => {
    expect(nonInvertingNoise({ en: 10e-9, in: 1e-12, rf: 9000, rg: 1000, rs: 0, kelvin: 300 }) / 107.57e-9).toBeCloseTo(1, 4);
  });
  it('the circuit solver reproduces it source by source, and with GBW 1 MHz gives 42.63 µV rms', () => {
    const a0 = 1e6;
    const el: Element[] = [
      { kind: 'V', name: 'VS', a: 1, b: 0, value: 0 },
      { kind: 'V', name: 'VEN', a: 1, b: 2, value: 0, noise: 10e-9 },
      { kind: 'I', name: 'INP', a: 2, b: 0, value: 0, noise: 1e-12 },
      { kind: 'I', name: 'INN', a: 3, b: 0, value: 0, noise: 1e-12 },
      { kind: 'E', name: 'EOA', a: 4, b: 0, value: a0, cp: 2, cn: 3, pole: 1e6 / a0 },
      { kind: 'R', name: 'ROUT', a: 4, b: 5, value: 1e-3, noisy: false },
      { kind: 'R', name: 'RF', a: 5, b: 3, value: 9000 },
      { kind: 'R', name: 'RG', a: 3, b: 0, value: 1000 },
    ];
    const c = compile(['0', 'src', 'inp', 'inn', 'int', 'out'], el);
    const low = noiseSpectrum(c, 5, Float64Array.of(10), 300).total[0]!;
    expect(low / 107.57e-9).toBeCloseTo(1, 3);
    // Derived: f_c = 100 kHz, ENBW 157.08 kHz → 107.57 nV × √157080 = 42.63 µV rms.
    const f = logGrid(1e-2, 1e11, 24);
    const rms = Math.sqrt(integratePower(f, noiseSpectrum(c, 5, f, 300).total));
    expect(rms / 42.63e-6).toBeCloseTo(1, 2);
  });
});

describe('output noise of an inverting stage (same §3.4 form: noise gain 1 + Rf/Rin, resistors as Rf ∥ Rin)', () => {
  // Motchenbacher & Connelly §3.4 applied to the inverting stage with its + input grounded:
  // e_no² = (1+Rf/Rin)²·[e_n² + 4kT·(Rf‖Rin) + i_n²·(Rf‖Rin)²]; with Rg → Rin this is the non-inverting
  // expression at Rs = 0, since both stages have the same noise gain (ECEN 457 eq. 2).
  it('the circuit solver reproduces it for Rin 1 k, Rf 9 k', () => {
    const el: Element[] = [
      { kind: 'V', name: 'VS', a: 1, b: 0, value: 0 },
      { kind: 'R', name: 'RIN', a: 1, b: 3, value: 1000 },
      { kind: 'V', name: 'VEN', a: 0, b: 2, value: 0, noise: 10e-9 },
      { kind: 'I', name: 'INP', a: 2, b: 0, value: 0, noise: 1e-12 },
      { kind: 'I', name: 'INN', a: 3, b: 0, value: 0, noise: 1e-12 },
      { kind: 'E', name: 'EOA', a: 4, b: 0, value: 1e6, cp: 2, cn: 3, pole: 1 },
      { kind: 'R', name: 'ROUT', a: 4, b: 5, value: 1e-3, noisy: false },
      { kind: 'R', name: 'RF', a: 5, b: 3, value: 9000 },
    ];
    const c = compile(['0', 'src', 'inp', 'inn', 'int', 'out'], el);
    const low = noiseSpectrum(c, 5, Float64Array.of(10), 300).total[0]!;
    expect(low / nonInvertingNoise({ en: 10e-9, in: 1e-12, rf: 9000, rg: 1000, rs: 0, kelvin: 300 })).toBeCloseTo(1, 3);
    expect(low / 107.57e-9).toBeCloseTo(1, 3);
  });
});
