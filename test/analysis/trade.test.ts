import { describe, expect, it } from 'vitest';
import { adoptTradePoint, tradeSweep, type CtTradePoint, type HallTradePoint } from '../../src/analysis/trade.js';
import { tradeJson } from '../../src/present/trade.js';
import { analyse } from '../../src/analysis/report.js';
import { designFrom, nonFinitePaths } from '../helpers.js';

const hall = (patch: (d: any) => void = () => {}) => tradeSweep(designFrom('bench-clamp', patch))!;

describe('tradeSweep on a Hall sensor in a gapped core', () => {
  const t = hall((d) => { d.sensor.core.width = 0.01; d.sensor.core.depth = 0.008; });
  if (t.kind !== 'hall-gap-core') throw new Error('expected a Hall trade');
  const turns = t.points.filter((p) => p.sweep === 'turns');
  const gaps = t.points.filter((p) => p.sweep === 'gap');
  const one = turns.find((p) => p.turns === 1)!;

  it('sweeps turns 1…10 at the design\'s gap and five gaps at its turns, the design\'s point marked in each', () => {
    expect(turns.map((p) => p.turns)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    expect(turns.every((p) => p.gap === 1.5e-3)).toBe(true);
    expect(gaps.length).toBe(5);
    expect(gaps.map((p) => p.gap)).toEqual([...gaps.map((p) => p.gap)].sort((a, b) => a - b));
    expect(turns.filter((p) => p.current).map((p) => p.turns)).toEqual([1]);
    expect(gaps.filter((p) => p.current).map((p) => p.gap)).toEqual([1.5e-3]);
  });
  // Ampère's law round the gapped core (Umans, Fitzgerald & Kingsley's Electric Machinery, 7th ed., §1.1):
  // B = μ0·N·I/(g + l/μr), so the field per ampere, hence the sensitivity, goes as N and every current at which
  // a flux density limit is reached goes as 1/N.
  it('sensitivity is proportional to turns; the saturation and linear-range currents inversely so', () => {
    for (const p of turns) {
      expect(p.sensitivity / one.sensitivity).toBeCloseTo(p.turns, 10);
      expect(p.coreSaturation * p.turns / one.coreSaturation).toBeCloseTo(1, 10);
      expect(p.sensorLinear * p.turns / one.sensorLinear).toBeCloseTo(1, 10);
    }
  });
  it('the gain needed is the target scale over the sensitivity, so it falls as 1/N', () => {
    for (const p of turns) expect(p.gain * p.sensitivity).toBeCloseTo(0.1, 12);
  });
  // L = μ0·N²·A/(g/F + l/μr) (Umans ch. 1, L = N²/R_tot): N² at a fixed gap.
  it('the inserted inductance goes as N²', () => {
    for (const p of turns) expect(p.insertionInductance! / one.insertionInductance!).toBeCloseTo(p.turns ** 2, 9);
  });
  it('a longer gap lowers the sensitivity and raises the saturation current', () => {
    for (let i = 1; i < gaps.length; i++) {
      expect(gaps[i]!.sensitivity).toBeLessThan(gaps[i - 1]!.sensitivity);
      expect(gaps[i]!.coreSaturation).toBeGreaterThan(gaps[i - 1]!.coreSaturation);
    }
  });
  it('the design\'s own point reproduces the report: sensitivity, limits, bandwidth and noise', () => {
    const r = analyse(designFrom('bench-clamp', (d) => { d.sensor.core.width = 0.01; d.sensor.core.depth = 0.008; }), { spreadTrials: 0 });
    expect(one.sensitivity / r.front.sensitivity).toBeCloseTo(1, 12);
    expect(one.coreSaturation / r.front.limits.find((l) => l.kind === 'core')!.high).toBeCloseTo(1, 12);
    expect(one.sensorLinear / r.front.limits.find((l) => l.kind === 'sensor')!.high).toBeCloseTo(1, 12);
    expect(one.bandwidth! / r.speed!.smallSignal).toBeCloseTo(1, 9);
    // Fewer noise points than the report (61 against 201): the integral agrees to well within a per cent.
    expect(Math.abs(one.noiseReferred! / Math.abs(r.noise!.referredRms) - 1)).toBeLessThan(0.01);
  });
  it('more turns need less gain, so the chain is wider and quieter in amperes', () => {
    const ten = turns.find((p) => p.turns === 10)!;
    expect(ten.unbuilt).toBeNull();
    expect(ten.noiseReferred!).toBeLessThan(one.noiseReferred!);
  });
  it('adopting a point sets the turns and the gap together', () => {
    expect(adoptTradePoint(turns[3]!)).toEqual([{ path: 'sensor.turns', value: 4 }, { path: 'sensor.core.gap', value: 1.5e-3 }]);
  });
  it('JSON rows carry the issue\'s fields, finite or null', () => {
    const rows = tradeJson(t);
    expect(rows.length).toBe(t.points.length);
    for (const k of ['turns', 'sensitivity', 'coreSaturation', 'sensorLinear', 'gain', 'bandwidth', 'noiseReferred', 'insertionInductance']) expect(rows[0]).toHaveProperty(k);
    expect(nonFinitePaths(rows)).toEqual([]);
  });
});

describe('tradeSweep edge cases', () => {
  it('without the core\'s cross-section the inductance is null, not a guess', () => {
    const t = hall();
    expect(t.kind === 'hall-gap-core' && t.points.every((p) => (p as HallTradePoint).insertionInductance === null)).toBe(true);
  });
  it('a design with more than ten turns keeps its own turns in the sweep', () => {
    const t = hall((d) => { d.sensor.turns = 25; d.target.scale = 2.5; d.target.range = [-0.8, 0.8]; });
    expect(t.points.filter((p) => p.sweep === 'turns').map((p) => p.turns)).toContain(25);
  });
  it('a point no stage can build says why, with no bandwidth or noise', () => {
    // One turn of a 1.5 mm gap cannot reach 100 V/A from a 9 V rail without clipping… but it still builds; a
    // non-inverting stage asked to attenuate cannot: ten turns with a tiny scale.
    const t = hall((d) => { d.target.topology = 'non-inverting'; d.target.scale = 0.01; });
    const ten = t.points.find((p) => p.sweep === 'turns' && p.turns === 10)!;
    expect(ten.unbuilt).not.toBeNull();
    expect(ten.bandwidth).toBeNull();
    expect(ten.noiseReferred).toBeNull();
    expect(nonFinitePaths(tradeJson(t))).toEqual([]);
  });
  it('a shunt or a voltage-output sensor has no trade', () => {
    expect(tradeSweep(designFrom('generic-sensor'))).toBeNull();
  });
});

describe('tradeSweep on a current transformer', () => {
  const t = tradeSweep(designFrom('appliance-ct', (d) => { d.sensor.core = { width: 0.01, depth: 0.01, saturation: 0.3 }; }))!;
  if (t.kind !== 'current-transformer') throw new Error('expected a CT trade');
  const turns = t.points.filter((p) => p.sweep === 'turns') as CtTradePoint[];
  const burdens = t.points.filter((p) => p.sweep === 'burden') as CtTradePoint[];
  it('sweeps ¼…4 × the secondary turns and the burden, at 50 Hz unless told', () => {
    expect(turns.map((p) => p.turns)).toEqual([500, 1000, 1414, 2000, 2828, 4000, 8000]);
    expect(burdens.map((p) => p.burden)).toEqual([8.2, 16, 24, 33, 47, 68, 130]);
    expect(t.lowestFrequency).toBe(50);
  });
  // Kusko & Thompson, Power Quality in Electrical Systems, ch. 14: V = I_p·R_B/N.
  it('sensitivity is N_p·R_B/N_s', () => {
    for (const p of t.points) expect(p.sensitivity).toBeCloseTo(p.burden / p.turns, 12);
  });
  // The transformer equation (Umans ch. 2), V_rms = 4.44·f·N·A·B, with V = I_s·(R_B + R_w) and I_s = I_p/N_s:
  // I_p,sat = 4.44·f·N_s²·A·B/(R_B + R_w). By hand for the design's point (N_s 2000, R_B 33 Ω, R_w 60 Ω, 1 cm²,
  // 0.3 T, 50 Hz): 4.44·50·2000²·1e-4·0.3/93 = 286.45 A rms (to the rounding of 4.44).
  it('the core saturates at 4.44·f·N_s²·A·B/(R_B + R_w): 286 A rms for the design\'s point', () => {
    const own = turns.find((p) => p.current)!;
    expect(Math.abs(own.coreSaturation! / 286.45 - 1)).toBeLessThan(1e-3);
    for (const p of t.points) expect(p.coreSaturation! * (p.burden + 60) / p.turns ** 2).toBeCloseTo(own.coreSaturation! * 93 / 2000 ** 2, 6);
  });
  it('the low corner is (R_B + R_w)/(2π·A_L·N²), and the burden power falls as 1/N²', () => {
    for (const p of turns) expect(p.lowCorner).toBeCloseTo(93 / (2 * Math.PI * 3e-6 * p.turns ** 2), 9);
    const own = turns.find((p) => p.current)!;
    for (const p of turns) expect(p.burdenPower * p.turns ** 2).toBeCloseTo(own.burdenPower * 2000 ** 2, 9);
  });
  it('without the core\'s figures the saturation current is null', () => {
    const u = tradeSweep(designFrom('appliance-ct'))!;
    expect(u.points.every((p) => (p as CtTradePoint).coreSaturation === null)).toBe(true);
    expect(nonFinitePaths(tradeJson(u))).toEqual([]);
  });
  it('a lower frequency of interest saturates the core sooner, in proportion', () => {
    const u = tradeSweep(designFrom('appliance-ct', (d) => { d.sensor.core = { width: 0.01, depth: 0.01, saturation: 0.3 }; d.sensor.lowestFrequency = 25; }))!;
    const own = (x: typeof u) => (x.points.find((p) => p.current) as CtTradePoint).coreSaturation!;
    expect(own(u) / own(t)).toBeCloseTo(0.5, 12);
  });
  it('adopting a point sets the secondary turns and the burden together', () => {
    expect(adoptTradePoint(burdens[0]!)).toEqual([{ path: 'sensor.secondaryTurns', value: 2000 }, { path: 'sensor.burden', value: 8.2 }]);
  });
});
