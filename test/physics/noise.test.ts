import { describe, expect, it } from 'vitest';
import { enbwSinglePole, integratePower, logGrid, nonInvertingNoise, peakToPeak, thermalNoise } from '../../src/physics/noise.js';
import { noiseSpectrum } from '../../src/circuit/noise.js';
import { compile, type Element } from '../../src/circuit/mna.js';
import { BOLTZMANN } from '../../src/model/constants.js';
import { analyse } from '../../src/analysis/report.js';
import { designFrom } from '../helpers.js';
import { verdictsOf } from '../../src/present/verdicts.js';

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
  // expression at Rs = 0, since both stages have the same noise gain 1 + Rf/Rin
  // (Franco, Design with Operational Amplifiers, the noise chapter, from memory).
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

describe('1/f noise (density² = white²·(1 + f_c/f); Motchenbacher & Connelly 1993, ch. 1)', () => {
  // ∫ e²·(1 + f_c/f) df from f1 to f2 = e²·[(f2 − f1) + f_c·ln(f2/f1)]: over 0.1–10 Hz with e = 10 nV/√Hz
  // and f_c = 100 Hz, e·√(9.9 + 100·ln 100) = 216.9 nV rms (derived).
  it('a source with a 100 Hz corner integrates to e·√((f2 − f1) + f_c·ln(f2/f1)) over 0.1–10 Hz', () => {
    const c = compile(['0', 'n'], [{ kind: 'V', name: 'VN', a: 1, b: 0, value: 0, noise: 10e-9, noiseCorner: 100 }, { kind: 'R', name: 'RL', a: 1, b: 0, value: 1e3, noisy: false }]);
    const f = logGrid(0.1, 10, 24);
    const rms = Math.sqrt(integratePower(f, noiseSpectrum(c, 1, f, 300).total));
    expect(rms / (10e-9 * Math.sqrt(9.9 + 100 * Math.log(100)))).toBeCloseTo(1, 6);
    expect(rms).toBeCloseTo(216.9e-9, 10);
  });
  // The op-amp's e_n sits in series with the + input: at 0.1–10 Hz, far below the corner, it reaches the
  // output times the noise gain 1 + Rf/Rg (Franco, Design with Operational Amplifiers, the noise chapter, from
  // memory), so its share there is NG·e_n·√(9.9 + f_c·ln 100).
  it('the op-amp\'s voltage-noise corner reaches the 0.1–10 Hz figure times the noise gain', () => {
    const r = analyse(designFrom('generic-sensor', (x) => { x.opamp.voltageNoiseCorner = 100; x.opamp.currentNoise = 0; x.sensor.noiseDensity = 0; }), { spreadTrials: 0 });
    const f = logGrid(0.1, 10, 24);
    const s = noiseSpectrum(r.circuit!.circuit, r.circuit!.nodes.out, f, r.design.environment.temperature);
    const vos = s.sources.find((x) => x.name === 'VOS')!;
    const expected = r.stage!.gain * 35e-9 * Math.sqrt(9.9 + 100 * Math.log(100));
    expect(Math.sqrt(integratePower(f, vos.density)) / expected).toBeCloseTo(1, 3);
    // The report's 0.1–10 Hz figure is that band's total, and its peak-to-peak 6.6 × rms (common practice).
    const lf = r.noise!.lowFrequency;
    expect(lf.band).toEqual([0.1, 10]);
    expect(lf.rms / Math.sqrt(integratePower(f, s.total))).toBeCloseTo(1, 6);
    expect(lf.peakToPeak).toBeCloseTo(6.6 * lf.rms, 15);
    expect(lf.referredPeakToPeak).toBeCloseTo(lf.peakToPeak / Math.abs(r.speed!.passband), 12);
    const white = analyse(designFrom('generic-sensor', (x) => { x.opamp.currentNoise = 0; x.sensor.noiseDensity = 0; }), { spreadTrials: 0 });
    expect(lf.rms).toBeGreaterThan(3 * white.noise!.lowFrequency.rms);
    expect(white.warnings.map((w) => w.code)).toContain('flicker-not-given');
  });
  it('the noise verdict explains the default band and quotes the 0.1–10 Hz figure', () => {
    const r = analyse(designFrom('bench-clamp'), { spreadTrials: 0 });
    const line = verdictsOf(r).find((v) => v.title.startsWith('Noise'))!;
    expect(line.detail).toMatch(/default band/);
    expect(line.detail).toMatch(/100 mHz/);
    expect(r.noise!.bandIsDefault).toBe(true);
  });
});
