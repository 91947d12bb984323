import { describe, expect, it } from 'vitest';
import { adjointAt, adjointReduction, compile, solveDc, transferFrom, workspace, type Element } from '../../src/circuit/mna.js';
import { analyse } from '../../src/analysis/report.js';
import { DEMOS, demoDesign } from '../../src/model/demos.js';

// Node 1 = source, 2 = + input, 3 = − input, 4 = op-amp internal, 5 = output.
function nonInverting(a0: number, rf: number, rg: number, poleHz = 0): Element[] {
  return [
    { kind: 'V', name: 'VS', a: 1, b: 0, value: 0, dc0: 0, dc1: 1, ac: 1 },
    { kind: 'R', name: 'RS', a: 1, b: 2, value: 0 },
    { kind: 'E', name: 'EOA', a: 4, b: 0, value: a0, cp: 2, cn: 3, pole: poleHz },
    { kind: 'R', name: 'ROUT', a: 4, b: 5, value: 1e-3 },
    { kind: 'R', name: 'RF', a: 5, b: 3, value: rf },
    { kind: 'R', name: 'RG', a: 3, b: 0, value: rg },
  ];
}
const names = ['0', 'src', 'inp', 'inn', 'int', 'out'];

describe('MNA against closed forms', () => {
  // Black's feedback formula (Sedra & Smith, Microelectronic Circuits, the feedback chapter; Franco, Design with
  // Operational Amplifiers and Analog Integrated Circuits, the chapter on negative feedback; both from memory):
  // closed-loop gain A/(1 + A·β) with β = Rg/(Rf + Rg).
  it('non-inverting gain with finite open-loop gain is A/(1+Aβ)', () => {
    const a0 = 1e4, rf = 9000, rg = 1000;
    const c = compile(names, nonInverting(a0, rf, rg));
    const sol = solveDc(c, [(e) => e.dc1 ?? 0])!;
    const beta = rg / (rf + rg);
    expect(sol.columns[0]![4]! / (a0 / (1 + a0 * beta))).toBeCloseTo(1, 6);
  });
  it('inverting gain with finite open-loop gain is −(Rf/Rin)·Aβ/(1+Aβ), β = Rin/(Rin+Rf)', () => {
    const a0 = 1e3, rf = 47e3, rin = 4.7e3;
    const el: Element[] = [
      { kind: 'V', name: 'VS', a: 1, b: 0, value: 0, dc0: 0, dc1: 1, ac: 1 },
      { kind: 'R', name: 'RIN', a: 1, b: 3, value: rin },
      { kind: 'E', name: 'EOA', a: 4, b: 0, value: a0, cp: 2, cn: 3 },
      { kind: 'R', name: 'ROUT', a: 4, b: 5, value: 1e-3 },
      { kind: 'R', name: 'RF', a: 5, b: 3, value: rf },
      { kind: 'R', name: 'RP', a: 2, b: 0, value: 1 },
    ];
    const c = compile(names, el);
    const g = solveDc(c, [(e) => e.dc1 ?? 0])!.columns[0]![4]!;
    const beta = rin / (rin + rf);
    expect(g / (-(rf / rin) * (a0 * beta) / (1 + a0 * beta))).toBeCloseTo(1, 6);
  });
  // Single-pole op-amp: closed-loop corner f_p·(1 + A0·β) ≈ GBW / noise gain (Sedra & Smith, Microelectronic
  // Circuits, frequency response of closed-loop amplifiers; Franco, the op-amp's frequency limitations; both from
  // memory). Derived: GBW 1 MHz / gain 10 = 100 kHz.
  it('closed-loop −3 dB corner of a gain-10 stage on a 1 MHz GBW part is 100 kHz', () => {
    const a0 = 1e5, gbw = 1e6;
    const c = compile(names, nonInverting(a0, 9000, 1000, gbw / a0));
    const ws = workspace(c);
    const mag = (f: number) => {
      adjointAt(c, 2 * Math.PI * f, 5, ws);
      const [re, im] = transferFrom(c, 0, ws);
      return Math.hypot(re, im);
    };
    const g0 = mag(1);
    const exact = (gbw / a0) * (1 + a0 * 0.1);
    expect(mag(exact) / g0).toBeCloseTo(Math.SQRT1_2, 4);
    expect(exact / 100e3).toBeCloseTo(1, 3);
  });
  // Single-pole open loop A(s) = A0/(1 + s/ωp) crosses unity at ≈ A0·ωp, the gain-bandwidth product (Sedra & Smith,
  // Microelectronic Circuits, op-amp frequency response, from memory). Derived: A0 = 1e4 with a pole at 1e3 rad/s has
  // unity gain at 1e7 rad/s (1.59 MHz).
  it('open-loop single pole crosses unity at A0·ωp (1e4 × 1e3 rad/s → 1.59 MHz)', () => {
    const el: Element[] = [
      { kind: 'V', name: 'VS', a: 1, b: 0, value: 0, dc0: 0, dc1: 1, ac: 1 },
      { kind: 'E', name: 'EOA', a: 2, b: 0, value: 1e4, cp: 1, cn: 0, pole: 1e3 / (2 * Math.PI) },
      { kind: 'R', name: 'RL', a: 2, b: 0, value: 1e3 },
    ];
    const c = compile(['0', 'in', 'out'], el);
    const ws = workspace(c);
    adjointAt(c, 1e7, 2, ws);
    const [re, im] = transferFrom(c, 0, ws);
    expect(Math.hypot(re, im)).toBeCloseTo(1, 3);
  });
  // RC low-pass: |H| = 1/√2 at f = 1/(2πRC) (any circuits text).
  it('RC low-pass is −3 dB at 1/(2πRC) with −45° phase', () => {
    const r = 1000, cap = 100e-9;
    const el: Element[] = [
      { kind: 'V', name: 'VS', a: 1, b: 0, value: 0, ac: 1 },
      { kind: 'R', name: 'R', a: 1, b: 2, value: r },
      { kind: 'C', name: 'C', a: 2, b: 0, value: cap },
    ];
    const c = compile(['0', 'in', 'out'], el);
    const ws = workspace(c);
    adjointAt(c, 1 / (r * cap), 2, ws);
    const [re, im] = transferFrom(c, 0, ws);
    expect(Math.hypot(re, im)).toBeCloseTo(Math.SQRT1_2, 9);
    expect((Math.atan2(im, re) * 180) / Math.PI).toBeCloseTo(-45, 6);
  });
  it('a current source into a resistor gives I·R (Ohm\'s law), and an inductor shorts DC', () => {
    const el: Element[] = [
      { kind: 'I', name: 'I', a: 0, b: 1, value: 0, dc0: 2e-3 },
      { kind: 'R', name: 'R', a: 1, b: 0, value: 1500 },
    ];
    expect(solveDc(compile(['0', 'n'], el), [(e) => e.dc0 ?? 0])!.columns[0]![0]).toBeCloseTo(3, 12);
    const el2: Element[] = [...el, { kind: 'L', name: 'L', a: 1, b: 0, value: 1 }];
    expect(solveDc(compile(['0', 'n'], el2), [(e) => e.dc0 ?? 0])!.columns[0]![0]).toBeCloseTo(0, 12);
    expect(solveDc(compile(['0', 'n'], el2), [(e) => e.dc0 ?? 0], true)!.columns[0]![0]).toBeCloseTo(3, 12);
  });
  it('a floating node makes the matrix singular and the solve says so (null)', () => {
    const el: Element[] = [{ kind: 'C', name: 'C', a: 1, b: 0, value: 1e-9 }];
    expect(solveDc(compile(['0', 'n'], el), [() => 0])).toBeNull();
  });

  // Closed-loop bandwidth ≈ GBW / noise gain (Sedra & Smith, Microelectronic Circuits, frequency response of
  // closed-loop amplifiers, from memory). Derived: with GBW 1 MHz a gain of 100 holds to 10 kHz.
  it('a gain-100 stage on a 1 MHz GBW part is −3 dB at 10 kHz', () => {
    const a0 = 1e5, gbw = 1e6;
    const c = compile(names, nonInverting(a0, 99e3, 1e3, gbw / a0));
    const ws = workspace(c);
    const mag = (f: number) => { adjointAt(c, 2 * Math.PI * f, 5, ws); return Math.hypot(...transferFrom(c, 0, ws)); };
    expect(mag(10e3) / mag(1)).toBeCloseTo(Math.SQRT1_2, 2);
  });
});

describe('output offset (Sivakumar, Linear Integrated Circuits, ex. 5.1 and 5.2)', () => {
  // Offset voltage in series with the + input, R1 to ground from the − input, R2 feedback; an offset has no
  // set sign, so magnitudes are compared.
  function offsetStage(r1: number, r2: number, vos: number, ib: number): number {
    const el: Element[] = [
      { kind: 'V', name: 'VOS', a: 0, b: 1, value: 0, dc0: vos },
      { kind: 'I', name: 'IBN', a: 2, b: 0, value: 0, dc0: ib },
      { kind: 'E', name: 'EOA', a: 3, b: 0, value: 1e7, cp: 1, cn: 2 },
      { kind: 'R', name: 'ROUT', a: 3, b: 4, value: 1e-3 },
      { kind: 'R', name: 'R2', a: 4, b: 2, value: r2 },
      { kind: 'R', name: 'R1', a: 2, b: 0, value: r1 },
    ];
    return solveDc(compile(['0', 'inp', 'inn', 'int', 'out'], el), [(e) => e.dc0 ?? 0])!.columns[0]![3]!;
  }
  it('ex. 5.1: V_os 4 mV with R1 5 kΩ, R2 500 kΩ gives 404 mV; 150 nA into R2 gives 75 mV', () => {
    expect(Math.abs(offsetStage(5e3, 500e3, 4e-3, 0))).toBeCloseTo(0.404, 4);
    // The − input's current flows out of the pin through R2: the output moves by I·R2 (sign by direction).
    expect(Math.abs(offsetStage(5e3, 500e3, 0, 150e-9))).toBeCloseTo(0.075, 5);
  });
  it('ex. 5.2: 2 mV with 10 kΩ and 250 kΩ gives 52 mV; 20 nA gives 5 mV', () => {
    expect(Math.abs(offsetStage(10e3, 250e3, 2e-3, 0))).toBeCloseTo(0.052, 5);
    expect(Math.abs(offsetStage(10e3, 250e3, 0, 20e-9))).toBeCloseTo(0.005, 6);
  });
});

describe('adjoint sweeps through the reduced system (block elimination; Golub & Van Loan, Matrix Computations, §3.2, from memory)', () => {
  // The reduction eliminates the frequency-independent unknowns once and solves only the Schur complement per
  // frequency: the same y as the whole LU solve, to rounding, at every frequency and for every unknown.
  const sweep = (c: ReturnType<typeof compile>, out: number, reduce: boolean) => {
    const ws = workspace(c, reduce);
    const ys: Array<[Float64Array, Float64Array]> = [];
    for (let k = 0; k <= 60; k++) {
      const f = 1e-3 * 10 ** (k * 11 / 60); // 1 mHz … 100 MHz
      expect(adjointAt(c, 2 * Math.PI * f, out, ws)).toBe(true);
      ys.push([ws.yr.slice(), ws.yi.slice()]);
    }
    return ys;
  };
  const agree = (a: Array<[Float64Array, Float64Array]>, b: Array<[Float64Array, Float64Array]>) => {
    a.forEach(([ar, ai], k) => {
      const [br, bi] = b[k]!;
      const size = Math.max(...ar.map((x, i) => Math.hypot(x, ai[i]!)));
      ar.forEach((x, i) => expect(Math.hypot(x - br[i]!, ai[i]! - bi[i]!)).toBeLessThanOrEqual(1e-9 * size));
    });
  };
  it('an op-amp stage with a dominant pole, an input RC and a load capacitance: every unknown equals the whole solve', () => {
    const el: Element[] = [
      ...nonInverting(1e5, 90e3, 10e3, 10),
      { kind: 'C', name: 'CIN', a: 2, b: 0, value: 1e-9 },
      { kind: 'R', name: 'RL', a: 5, b: 0, value: 10e3 },
      { kind: 'C', name: 'CL', a: 5, b: 0, value: 100e-12 },
      { kind: 'I', name: 'INN', a: 3, b: 0, value: 0, noise: 1e-12 },
    ];
    el[1] = { kind: 'R', name: 'RS', a: 1, b: 2, value: 1e3 };
    const c = compile(names, el);
    const red = adjointReduction(c, 5);
    expect(red).not.toBeNull();
    expect(red!.d.length).toBeLessThan(c.size);
    agree(sweep(c, 5, true), sweep(c, 5, false));
  });
  it('every demo stage circuit: a reduced sweep equals the whole solve (a circuit that cannot be reduced is solved whole)', () => {
    let reduced = 0;
    for (const d of DEMOS) {
      const r = analyse(demoDesign(d.id), { spreadTrials: 0 });
      const sc = r.circuit!;
      if (adjointReduction(sc.circuit, sc.nodes.out)) reduced++;
      agree(sweep(sc.circuit, sc.nodes.out, true), sweep(sc.circuit, sc.nodes.out, false));
    }
    expect(reduced).toBeGreaterThan(0);
  });
  it('a network of resistors and sources alone has nothing that changes with frequency: no reduction', () => {
    expect(adjointReduction(compile(names, nonInverting(1e5, 9e3, 1e3)), 5)).toBeNull();
  });
});
