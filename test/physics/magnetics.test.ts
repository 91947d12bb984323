import { describe, expect, it } from 'vitest';
import { TRANSFORMER_EMF_FACTOR, coreCrossSection, ctSaturationCurrent, gappedCoreInductance } from '../../src/physics/magnetics.js';

// CODATA 2022 μ0, written out here so that the check does not lean on the constant it checks.
const MU0_CODATA_2022 = 1.25663706127e-6;

describe('gappedCoreInductance: L = μ0·N²·A/(g + l/μr) (Umans, Fitzgerald & Kingsley 7th ed., ch. 1: L = N²/R_tot)', () => {
  // Worked by hand from the formula with CODATA 2022 μ0, on the core of Umans's Example 1.1 (A = 9 cm²,
  // g = 0.050 cm, l_c = 30 cm, μr = 70 000, N = 500; numbers from memory, see REFERENCES):
  //   g + l/μr = 5e-4 + 0.3/70000 = 5.0428571e-4 m;  μ0·N²·A = 1.25663706127e-6 × 250000 × 9e-4 = 2.8274334e-4
  //   L = 2.8274334e-4 / 5.0428571e-4 = 0.56068 H.
  it('Example 1.1 core with N = 500 gives 0.56068 H', () => {
    expect(gappedCoreInductance(500, 0.05e-2, 0.30, 70000, 1, 9e-4)).toBeCloseTo(0.56068, 5);
  });
  // By hand: one pass through a 10 mm × 10 mm ferrite ring (l 60 mm, μr 2000) with a 1.5 mm gap:
  //   L = 1.25663706127e-6 × 1 × 1e-4 / (1.5e-3 + 0.06/2000) = 1.25663706127e-10 / 1.53e-3 = 82.133 nH.
  it('one pass through a 1 cm² ring with a 1.5 mm gap adds 82.133 nH', () => {
    expect(gappedCoreInductance(1, 1.5e-3, 0.06, 2000, 1, 1e-4) / 1e-9).toBeCloseTo(82.133, 3);
  });
  it('goes as N² and agrees with the closed form at CODATA μ0 to 1e-12', () => {
    for (const n of [1, 2, 7, 10]) {
      const l = gappedCoreInductance(n, 1e-3, 0.05, 3000, 1, 5e-5);
      expect(l / ((MU0_CODATA_2022 * n * n * 5e-5) / (1e-3 + 0.05 / 3000)) - 1).toBeLessThan(1e-12);
    }
  });
  // Fringing (F = A_g/A_c) lowers the gap's reluctance g/(μ0·F·A_c): a gap-dominated core's L grows almost by F.
  it('a fringing factor lowers the gap reluctance: L = μ0·N²·A/(g/F + l/μr)', () => {
    const plain = gappedCoreInductance(1, 1e-3, 1e-9, 1, 1, 1e-4);
    expect(gappedCoreInductance(1, 1e-3, 1e-9, 1, 1.21, 1e-4) / plain).toBeCloseTo(1.21, 5);
  });
});

describe('coreCrossSection', () => {
  it('coreCrossSection({ width: 0.01, depth: 0.008 }) is 8e-5 m²; one side alone is a square; none is null', () => {
    expect(coreCrossSection({ width: 0.01, depth: 0.008 })).toBeCloseTo(8e-5, 15);
    expect(coreCrossSection({ width: 0.01 })).toBeCloseTo(1e-4, 15);
    expect(coreCrossSection({})).toBeNull();
  });
});

describe('ctSaturationCurrent: the transformer equation V_rms = 4.44·f·N·A·B (Umans, Fitzgerald & Kingsley 7th ed., ch. 2)', () => {
  it('the constant is √2·π, which textbooks round to 4.44', () => {
    expect(TRANSFORMER_EMF_FACTOR).toBeCloseTo(4.44, 2);
    expect(TRANSFORMER_EMF_FACTOR).toBeCloseTo((2 * Math.PI) / Math.SQRT2, 14);
  });
  // By hand with the textbook's 4.44: N_s = 1000, A = 1 cm², B_sat = 0.3 T, 50 Hz → V = 4.44·50·1000·1e-4·0.3 = 6.66 V
  // rms; through R_B + R_w = 120 Ω that is 55.5 mA in the secondary, so 55.5 A in one primary turn.
  it('N 1000, 1 cm², 0.3 T, 50 Hz, 100 Ω + 20 Ω: 55.5 A rms (to the rounding of 4.44)', () => {
    const i = ctSaturationCurrent({ secondaryTurns: 1000, primaryTurns: 1, burden: 100, windingResistance: 20, area: 1e-4, saturation: 0.3, frequency: 50 });
    expect(Math.abs(i / 55.5 - 1)).toBeLessThan(1e-3);
  });
  it('halves with the frequency, doubles with the area, goes as N_s² and as 1/N_p', () => {
    const base = { secondaryTurns: 500, primaryTurns: 1, burden: 10, windingResistance: 5, area: 2e-5, saturation: 0.4, frequency: 60 };
    const i = ctSaturationCurrent(base);
    expect(ctSaturationCurrent({ ...base, frequency: 30 }) / i).toBeCloseTo(0.5, 12);
    expect(ctSaturationCurrent({ ...base, area: 4e-5 }) / i).toBeCloseTo(2, 12);
    expect(ctSaturationCurrent({ ...base, secondaryTurns: 1500 }) / i).toBeCloseTo(9, 12);
    expect(ctSaturationCurrent({ ...base, primaryTurns: 4 }) / i).toBeCloseTo(0.25, 12);
  });
});
