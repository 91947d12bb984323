/**
 * The closed-loop (zero-flux) Hall current sensor, in closed forms. SI units throughout (V, A, Ω, H, F, T, m,
 * Hz; angles in degrees where named so).
 *
 * The loop: the primary's ampere-turns N_p·I_p magnetise the gapped core; the Hall sensor in the gap reads
 * the gap's flux density; an inverting integrator (R_i into the driver's − input, C_i with R_z in series back
 * from its output) drives, through the driver's output stage and its output resistance R_o, the compensation
 * winding (N_s turns, resistance R_w) in series with the measurement resistor R_M, whose low end sits at a
 * reference voltage. The winding is connected the way round that makes the loop negative, so at rest the
 * core's net ampere-turns are zero: N_s·I_s = N_p·I_p, and V_out = I_p·(N_p/N_s)·R_M above the reference
 * (Ampère's law round the core; the zero-flux principle).
 *
 * Referred to the compensation winding, the core is its magnetising inductance L_s = A_L·N_s² with the
 * primary reflected as a current source (N_p/N_s)·I_p across it (the transformer's equivalent circuit with
 * perfect coupling; Umans, Fitzgerald & Kingsley's Electric Machinery, 7th ed., ch. 2). The magnetising
 * current I_m = I_s − (N_p/N_s)·I_p sets the flux: the Hall sensor reads B_gap = b_gap·N_s·I_m. Hence
 *   V_d = R·I_s + s·L_s·I_m,  R = R_o + R_w + R_M,   V_d = −C(s)·k_H·b_gap·N_s·H_h(s)·I_m
 * and with the loop gain T(s) = C(s)·r·H_h(s)/(R + s·L_s), r = |k_H|·b_gap·N_s (V per ampere of I_m):
 *   I_s/((N_p/N_s)·I_p) = (s·L_s/(R + s·L_s) + T)/(1 + T)
 * the Hall path T/(1+T) and the transformer path (s·L_s/(R + s·L_s))/(1+T) (derived here; the closed loop
 * is Black's formula, any control textbook, e.g. Franklin, Powell & Emami-Naeini, Feedback Control of
 * Dynamic Systems, ch. 4 and 6, on loop gain and phase margin).
 */
import type { ClosedLoopHallSensor, Supply } from '../model/design.js';
import { gapAreaRatio, gappedCorePerAmp } from './sensors.js';
import { finding, type Finding } from '../model/findings.js';
import { nearest as nearestInSeries, neighbours, type SeriesName } from '../model/eseries.js';

/** Resistivity of annealed copper at 20 °C, Ω·m: 1/58 Ω·mm²/m (IEC 60028, the International Annealed Copper Standard). */
export const COPPER_RESISTIVITY = 1 / 58e6;

/**
 * Resistance of a winding of N turns of round copper wire of diameter d and mean turn length l_t, Ω:
 * R = ρ·N·l_t/(π·d²/4) at 20 °C (Ohm's law for a conductor; ρ from IEC 60028).
 * `windingResistanceOf(1000, 0.25e-3, 0.03)` → 10.51 Ω (derived).
 */
export function windingResistanceOf(turns: number, diameter: number, turnLength: number): number {
  return (COPPER_RESISTIVITY * turns * turnLength) / ((Math.PI * diameter * diameter) / 4);
}

/**
 * Diameter of American wire gauge n, m: d = 0.127 mm × 92^((36 − n)/39) (ASTM B258; the gauge's definition).
 * `awgDiameter(30)` → 0.2546 mm.
 */
export function awgDiameter(gauge: number): number {
  return 0.127e-3 * 92 ** ((36 - gauge) / 39);
}

/** The wire's diameter, m: as given, else from its gauge. */
export function wireDiameter(wire: { diameter?: number; gauge?: number }): number {
  return wire.diameter ?? (wire.gauge !== undefined ? awgDiameter(wire.gauge) : NaN);
}

/** A complex number as a pair, for the loop's transfer functions. */
export type Complex = [number, number];
const mul = (a: Complex, b: Complex): Complex => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const div = (a: Complex, b: Complex): Complex => { const d = b[0] * b[0] + b[1] * b[1]; return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d]; };
const add = (a: Complex, b: Complex): Complex => [a[0] + b[0], a[1] + b[1]];
const abs = (a: Complex) => Math.hypot(a[0], a[1]);

/** The loop's parts and derived constants. */
export interface ClosedLoopParts {
  primaryTurns: number;
  turns: number;
  /** Gap and core flux density per ampere-turn, T/A. */
  gapPerAmpTurn: number;
  corePerAmpTurn: number;
  /** Inductance factor of the gapped core, H/turn²: Φ per ampere-turn = B_core per ampere-turn × area. */
  inductanceFactor: number;
  /** Compensation winding's magnetising inductance A_L·N_s², H. */
  inductance: number;
  windingResistance: number;
  measurementResistance: number;
  outputResistance: number;
  /** R_o + R_w + R_M, Ω. */
  loopResistance: number;
  /** Hall volts per ampere of magnetising current in the compensation winding, V/A. */
  hallPerAmp: number;
  /** Integrator: R_i plus the Hall sensor's own output resistance, C_i, R_z. */
  inputResistance: number;
  /** The Hall sensor's own output resistance (part of inputResistance), Ω. */
  hallResistance: number;
  capacitance: number;
  zeroResistance: number;
  /** Driver op-amp: low-frequency gain (V/V) and its pole, Hz. */
  driverGain: number;
  driverPole: number;
  /** Hall sensor's own bandwidth, Hz (Infinity: none stated). */
  hallBandwidth: number;
  /** R_M's low end, V. */
  reference: number;
}

/** The derived constants of a closed-loop Hall sensor on its rails. */
export function closedLoopParts(spec: ClosedLoopHallSensor, supply: Pick<Supply, 'positive' | 'negative'>): ClosedLoopParts {
  const c = spec.core;
  const per = gappedCorePerAmp(1, c.gap, c.pathLength, c.permeability, gapAreaRatio(c));
  const al = per.core * c.area;
  const rw = spec.windingResistance ?? (spec.wire ? windingResistanceOf(spec.compensationTurns, wireDiameter(spec.wire), spec.wire.turnLength) : 0);
  const a0 = 10 ** (spec.driver.openLoopGainDb / 20);
  return {
    primaryTurns: spec.primaryTurns,
    turns: spec.compensationTurns,
    gapPerAmpTurn: per.gap,
    corePerAmpTurn: per.core,
    inductanceFactor: al,
    inductance: al * spec.compensationTurns ** 2,
    windingResistance: rw,
    measurementResistance: spec.measurementResistance,
    outputResistance: spec.driver.outputResistance,
    loopResistance: spec.driver.outputResistance + rw + spec.measurementResistance,
    hallPerAmp: Math.abs(spec.hallSensitivity) * per.gap * spec.compensationTurns,
    inputResistance: spec.compensation.inputResistance + spec.sourceResistance,
    hallResistance: spec.sourceResistance,
    capacitance: spec.compensation.capacitance,
    zeroResistance: spec.compensation.zeroResistance,
    driverGain: a0,
    driverPole: spec.driver.gbw / a0,
    hallBandwidth: spec.bandwidth < 1e8 ? spec.bandwidth : Infinity,
    reference: spec.reference ?? (supply.positive + supply.negative) / 2,
  };
}

/**
 * The compensator's gain from the Hall sensor's output to the driver's output, sign taken out (the loop's
 * inversion): the inverting amplifier with Z_f = R_z + 1/(jωC_i), Z_i = R_i and a finite op-amp gain A(jω),
 * (Z_f/Z_i)/(1 + (1 + Z_f/Z_i)/A) (the textbook inverting stage with finite open-loop gain; e.g. Franco,
 * Design with Operational Amplifiers and Analog Integrated Circuits, ch. 1; from memory). At DC (C_i open)
 * it is A itself.
 */
export function compensatorAt(p: ClosedLoopParts, f: number): Complex {
  const w = 2 * Math.PI * f;
  const a = div([p.driverGain, 0], [1, f / p.driverPole]);
  if (w === 0) return a;
  const zf: Complex = [p.zeroResistance, -1 / (w * p.capacitance)];
  const ratio: Complex = [zf[0] / p.inputResistance, zf[1] / p.inputResistance];
  return div(ratio, add([1, 0], div(add([1, 0], ratio), a)));
}

/** T(jω) = C(jω)·r·H_h(jω)/(R + jω·L_s): the loop gain, positive real for negative feedback at low frequency. */
export function loopGainAt(p: ClosedLoopParts, f: number): Complex {
  const w = 2 * Math.PI * f;
  const hall: Complex = Number.isFinite(p.hallBandwidth) ? div([1, 0], [1, f / p.hallBandwidth]) : [1, 0];
  return div(mul(mul(compensatorAt(p, f), hall), [p.hallPerAmp, 0]), [p.loopResistance, w * p.inductance]);
}

/**
 * |T(jω)|, the same arithmetic as `loopGainAt` written out in real numbers (no pair allocated per step): the
 * crossover search and the compensation's bisection evaluate it tens of thousands of times per report.
 */
export function loopGainMagnitudeAt(p: ClosedLoopParts, f: number): number {
  const w = 2 * Math.PI * f;
  // A(jω) = A0/(1 + jf/fp).
  const x = f / p.driverPole, d0 = 1 + x * x;
  const ar = p.driverGain / d0, ai = (-p.driverGain * x) / d0;
  let cr: number, ci: number;
  if (w === 0) { cr = ar; ci = ai; } else {
    // ratio = Z_f/Z_i; compensator = ratio / (1 + (1 + ratio)/A).
    const rr = p.zeroResistance / p.inputResistance, ri = -1 / (w * p.capacitance) / p.inputResistance;
    const da = ar * ar + ai * ai;
    const qr = ((1 + rr) * ar + ri * ai) / da, qi = (ri * ar - (1 + rr) * ai) / da;
    const er = 1 + qr, ei = qi, de = er * er + ei * ei;
    cr = (rr * er + ri * ei) / de; ci = (ri * er - rr * ei) / de;
  }
  // Square roots of sums of squares, not Math.hypot (slower, and its guard against overflow is not needed at
  // these magnitudes): the search calls this tens of thousands of times.
  const wl = w * p.inductance, r = p.loopResistance;
  let m = Math.sqrt(cr * cr + ci * ci) * p.hallPerAmp / Math.sqrt(r * r + wl * wl);
  if (Number.isFinite(p.hallBandwidth)) { const q = f / p.hallBandwidth; m /= Math.sqrt(1 + q * q); }
  return m;
}

/** Phase of T(jω) in degrees, unwrapped as the sum of its factors' phases (0 … −360 for this loop). */
export function loopPhaseAt(p: ClosedLoopParts, f: number): number {
  const w = 2 * Math.PI * f;
  const deg = (z: Complex) => (Math.atan2(z[1], z[0]) * 180) / Math.PI;
  const a: Complex = div([p.driverGain, 0], [1, f / p.driverPole]);
  let ph = -Math.atan2(w * p.inductance, p.loopResistance) * 180 / Math.PI;
  if (Number.isFinite(p.hallBandwidth)) ph -= Math.atan(f / p.hallBandwidth) * 180 / Math.PI;
  if (w === 0) return ph + deg(a);
  const ratio: Complex = [p.zeroResistance / p.inputResistance, -1 / (w * p.capacitance * p.inputResistance)];
  return ph + deg(ratio) - deg(add([1, 0], div(add([1, 0], ratio), a)));
}

/**
 * The whole transfer I_s·R_M per primary ampere relative to its ideal (N_p/N_s)·R_M, and its two shares:
 * the Hall path T/(1+T) and the transformer path (jωL_s/(R + jωL_s))/(1+T). 1 + 0j is a perfect sensor.
 */
export function closedLoopTransferAt(p: ClosedLoopParts, f: number): { total: Complex; hall: Complex; transformer: Complex } {
  const t = loopGainAt(p, f);
  const w = 2 * Math.PI * f;
  const tr = div([0, w * p.inductance], [p.loopResistance, w * p.inductance]);
  const one = add([1, 0], t);
  const hall = div(t, one), transformer = div(tr, one);
  return { total: add(hall, transformer), hall, transformer };
}

/** Where a positive function of log f crosses a level, by bisection in log f between fa and fb. */
function bisectLog(g: (f: number) => number, level: number, fa: number, fb: number): number {
  let a = fa, b = fb;
  const above = g(a) > level;
  for (let i = 0; i < 80; i++) {
    const m = Math.sqrt(a * b);
    if ((g(m) > level) === above) a = m; else b = m;
    if (b / a < 1 + 1e-12) break;
  }
  return Math.sqrt(a * b);
}

/** The loop's figures from its transfer functions. */
export interface LoopFigures {
  /** DC loop gain T(0) = A0·r/R and the residual error 1/(1 + T(0)) it leaves on the sensitivity. */
  dcLoopGain: number;
  residual: number;
  /** Where |T| = 1, Hz (null: no crossover between 1 mHz and 10 GHz) and the phase margin there, degrees. */
  crossover: number | null;
  phaseMargin: number | null;
  /** −3 dB frequency of the Hall path's share T/(1+T), Hz: above it the transformer path carries the signal. */
  bandwidth: number;
  /** The winding's corner R/(2π·L_s), Hz: the transformer path's low corner (as a current transformer's). */
  windingCorner: number;
  /** Largest deviation of |total| from 1 over 1 mHz … 100 × the crossover (fraction; negative: a dip), and where, Hz. */
  flatness: number;
  flatnessAt: number;
}

/**
 * Loop gain, crossover, phase margin (180° + arg T at |T| = 1; Franklin, Powell & Emami-Naeini, Feedback
 * Control of Dynamic Systems, §6.4), the Hall path's bandwidth and the flatness across the crossover.
 */
export function loopFigures(p: ClosedLoopParts): LoopFigures {
  const dcLoopGain = (p.driverGain * p.hallPerAmp) / p.loopResistance;
  const lo = 1e-3, hi = 1e10;
  const { crossover, phaseMargin } = phaseMarginOf(p);
  const hallShare = (f: number) => abs(closedLoopTransferAt(p, f).hall);
  let bandwidth = hi;
  let prev = lo;
  for (let i = 1; i <= 520; i++) {
    const f = lo * (hi / lo) ** (i / 520);
    if (hallShare(prev) >= Math.SQRT1_2 && hallShare(f) < Math.SQRT1_2) { bandwidth = bisectLog(hallShare, Math.SQRT1_2, prev, f); break; }
    prev = f;
  }
  let flatness = 0, flatnessAt = lo;
  const top = 100 * (crossover ?? bandwidth);
  for (let i = 0; i <= 600; i++) {
    const f = lo * (top / lo) ** (i / 600);
    const d = abs(closedLoopTransferAt(p, f).total) - 1;
    if (Math.abs(d) > Math.abs(flatness)) { flatness = d; flatnessAt = f; }
  }
  return {
    dcLoopGain, residual: 1 / (1 + dcLoopGain), crossover, phaseMargin, bandwidth,
    windingCorner: p.loopResistance / (2 * Math.PI * p.inductance), flatness, flatnessAt,
  };
}

/** The largest primary current held at zero flux, each way, and what limits it. */
export interface HeldRange {
  /** Largest compensation current each way, A (positive numbers). */
  upCurrent: number;
  downCurrent: number;
  /** Largest primary current each way, A (low ≤ 0 ≤ high). */
  low: number;
  high: number;
  /** What runs out first each way: the driver's voltage (swing and drops) or its current limit. */
  limitLow: 'swing' | 'current';
  limitHigh: 'swing' | 'current';
  /** Primary current at which the uncancelled ampere-turns saturate the core, and leave the Hall sensor's linear range, each way, A. */
  saturationHigh: number;
  saturationLow: number;
  hallLinearHigh: number;
  hallLinearLow: number;
}

/**
 * Where the compensation driver's output can go, V relative to the sensor's reference: from the − rail plus
 * the driver's swing loss and drop to the + rail less them (the same room `heldRange` divides by the loop's
 * resistance). Example (the closed-loop demo): ±5 V rails, swing 1 V, drop 0.7 V, reference 0 V → −3.3 … 3.3 V.
 */
export function driverRoom(spec: ClosedLoopHallSensor, supply: Pick<Supply, 'positive' | 'negative'>, reference: number): { low: number; high: number } {
  const room = spec.driver.swing + spec.driver.drop;
  return { low: supply.negative + room - reference, high: supply.positive - room - reference };
}

/**
 * The largest primary current held at zero flux: the driver's voltage room above (below) the reference,
 * rail − swing − drop − V_ref, over R_o + R_w + R_M, capped by the driver's current limit, times N_s/N_p.
 * Past it the driver sits at its limit and the uncancelled ampere-turns N_p·I_p − N_s·I_s,max magnetise the
 * core: it saturates at N_p·I_p = N_s·I_s,max + B_sat/b_core (Ampère's law as above).
 * Example (the closed-loop demo): ±5 V rails, swing 1 V, drop 0.7 V, R_M 75 Ω, R_w 33 Ω, R_o 1 Ω, 1000 turns:
 * (5 − 1.7)/109 = 30.3 mA → 30.3 A.
 */
export function heldRange(spec: ClosedLoopHallSensor, p: ClosedLoopParts, supply: Pick<Supply, 'positive' | 'negative'>): HeldRange {
  const { low, high } = driverRoom(spec, supply, p.reference);
  const vUp = Math.max(0, high);
  const vDown = Math.max(0, -low);
  const iUpV = vUp / p.loopResistance, iDownV = vDown / p.loopResistance;
  const lim = spec.driver.currentLimit;
  const up = Math.min(iUpV, lim), down = Math.min(iDownV, lim);
  const k = p.turns / p.primaryTurns;
  const sat = spec.core.saturation / p.corePerAmpTurn / p.primaryTurns;
  const lin = spec.linearField / p.gapPerAmpTurn / p.primaryTurns;
  return {
    upCurrent: up, downCurrent: down, high: up * k, low: -down * k,
    limitHigh: iUpV <= lim ? 'swing' : 'current', limitLow: iDownV <= lim ? 'swing' : 'current',
    saturationHigh: up * k + sat, saturationLow: -down * k - sat,
    hallLinearHigh: up * k + lin, hallLinearLow: -down * k - lin,
  };
}

/**
 * Current the sensor draws from the supply at primary current I (within the held range), A: the Hall
 * sensor's and the driver's quiescent currents plus the compensation current |I|·N_p/N_s, which the driver
 * takes from the rail on its side (a single supply: the positive rail either way, the reference returning it).
 */
export function supplyCurrentAt(spec: ClosedLoopHallSensor, current: number): number {
  return spec.supplyCurrent + spec.driver.quiescentCurrent + (Math.abs(current) * spec.primaryTurns) / spec.compensationTurns;
}

/**
 * Power the driver's output stage dissipates at compensation current I_s, W: the rail-to-reference voltage
 * less the drop across R_M + R_w, times I_s (the rest of the supply's power goes into R_M and R_w).
 */
export function driverDissipation(p: ClosedLoopParts, supply: Pick<Supply, 'positive' | 'negative'>, is: number): number {
  const rail = is >= 0 ? supply.positive - p.reference : p.reference - supply.negative;
  const a = Math.abs(is);
  return Math.max(0, a * (rail - a * (p.windingResistance + p.measurementResistance)));
}

/** Largest driver dissipation for compensation currents up to `maxCurrent` either way, W (the peak of a parabola). */
export function worstDriverDissipation(p: ClosedLoopParts, supply: Pick<Supply, 'positive' | 'negative'>, up: number, down: number): number {
  const r = p.windingResistance + p.measurementResistance;
  const at = (is: number) => driverDissipation(p, supply, is);
  const vertex = (rail: number, lim: number) => Math.min(lim, rail / (2 * r));
  return Math.max(at(vertex(supply.positive - p.reference, up)), at(-vertex(p.reference - supply.negative, down)));
}

/** The compensation that makes the response flat: a zero resistor for a stated dip and the zero at the winding's corner. */
export interface CompensationSuggestion {
  /** Proportional loop gain T_p = (R_z/R_i)·r/R and the dip 1/(1 + T_p) it leaves at the crossover. */
  proportionalGain: number;
  dip: number;
  inputResistance: number;
  zeroResistance: number;
  capacitance: number;
}

/**
 * With a PI compensator the closed-loop error is s·R·τ_i/(s²·L_s·τ_i + s·(R·τ_i + r·τ_z) + r) (τ_i = R_i·C_i,
 * τ_z = R_z·C_i; derived above with ideal op-amp and Hall sensor): a band-pass whose peak, at
 * ω0 = √(r/(L_s·τ_i)), is 1/(1 + T_p), T_p = (R_z/R_i)·r/R. A pure integrator (R_z = 0) leaves a notch to
 * zero there: the Hall path and the transformer path cancel. So: put the zero on the winding's corner,
 * R_z·C_i = L_s/R (pole-zero cancellation: the loop is then an integrator through the crossover, ω_c ≈ T_p·R/L_s),
 * and raise T_p (R_z = T_p·R_i·R/r) until the phase margin of the whole loop (the Hall sensor's pole and the
 * driver's closed-loop pole GBW/(1 + R_z/R_i) included) falls to the one wanted: the largest T_p, hence the
 * flattest response, that keeps the margin (bisection in log T_p; the margin falls as T_p rises). Values from
 * the series given (E24 resistors, E6 capacitors by default), R_i = 10 kΩ (common practice for an integrator's input).
 */
export function suggestCompensation(p: ClosedLoopParts, marginDeg = 60, series: SeriesName = 'E24', capSeries: SeriesName = 'E6'): CompensationSuggestion {
  const ri = nearestInSeries(10e3, series);
  const tauL = p.inductance / p.loopResistance;
  const withTp = (tp: number): ClosedLoopParts => {
    const rz = (tp * ri * p.loopResistance) / p.hallPerAmp;
    return { ...p, inputResistance: ri + p.hallResistance, zeroResistance: rz, capacitance: tauL / rz };
  };
  const margin = (tp: number) => phaseMarginOf(withTp(tp)).phaseMargin ?? -Infinity;
  let lo = 1, hi = 1e7;
  if (margin(lo) < marginDeg) hi = lo;
  else if (margin(hi) >= marginDeg) lo = hi;
  else for (let i = 0; i < 60 && hi / lo > 1.001; i++) { const m = Math.sqrt(lo * hi); if (margin(m) >= marginDeg) lo = m; else hi = m; }
  const ideal = withTp(lo);
  const rz = nearestInSeries(ideal.zeroResistance, series);
  const ci = nearestInSeries(tauL / rz, capSeries);
  const tpReal = (rz / (ri + p.hallResistance)) * p.hallPerAmp / p.loopResistance;
  return { proportionalGain: tpReal, dip: 1 / (1 + tpReal), inputResistance: ri, zeroResistance: rz, capacitance: ci };
}

/** The log grid the crossover is looked for on: 1 mHz to 10 GHz, 40 points a decade (computed once). */
const CROSSOVER_GRID = Float64Array.from({ length: 521 }, (_, i) => 1e-3 * (1e10 / 1e-3) ** (i / 520));

/** The crossover (|T| = 1, the first fall through 1 between 1 mHz and 10 GHz) and the phase margin there. */
export function phaseMarginOf(p: ClosedLoopParts): { crossover: number | null; phaseMargin: number | null } {
  const mag = (f: number) => loopGainMagnitudeAt(p, f);
  const grid = CROSSOVER_GRID;
  let prev = grid[0]!, mPrev = mag(prev);
  for (let i = 1; i < grid.length; i++) {
    const f = grid[i]!;
    const m = mag(f);
    if (mPrev >= 1 && m < 1) {
      const fc = bisectLog(mag, 1, prev, f);
      return { crossover: fc, phaseMargin: 180 + loopPhaseAt(p, fc) };
    }
    prev = f; mPrev = m;
  }
  return { crossover: null, phaseMargin: null };
}

/** One row of the turns trade: what N_s turns give on this supply for this range. */
export interface TurnsOption {
  turns: number;
  measurementResistance: number;
  /** V/A at R_M. */
  sensitivity: number;
  windingResistance: number;
  inductance: number;
  /** Sensor's supply current at the range end, A. */
  supplyCurrent: number;
  /** Largest current held at zero flux (the smaller way), A. */
  maxCurrent: number;
  windingCorner: number;
  /** Time constant of the slow tail a step leaves, L_s/R, s. */
  tail: number;
  compensation: CompensationSuggestion;
  crossover: number | null;
  phaseMargin: number | null;
  /** Whether it holds the range with the driver's current limit and voltage room. */
  fits: boolean;
}

/** Round turn counts the trade is shown over (ours). */
export const TURNS_CHOICES = [100, 200, 300, 500, 700, 1000, 1500, 2000, 3000, 5000] as const;

/**
 * The trade of the compensation turns for the wanted range: for each turn count, the largest R_M (E24, at or
 * below what keeps the range end plus 20 % headroom inside the driver's voltage room; the 20 % is ours), the
 * winding's resistance (from the wire, or the given resistance scaled by turns), the supply current at the range
 * end, the inductance and the loop compensated as `suggestCompensation`. More turns: less supply current and
 * less drop per R_M ohm, but more inductance (∝ N_s²), a lower winding corner and a slower tail.
 */
export function turnsTrade(spec: ClosedLoopHallSensor, supply: Pick<Supply, 'positive' | 'negative'>, rangeEnd: number): TurnsOption[] {
  const base = closedLoopParts(spec, supply);
  const perTurnR = base.windingResistance / spec.compensationTurns;
  return TURNS_CHOICES.map((n) => {
    const rw = spec.wire ? windingResistanceOf(n, wireDiameter(spec.wire), spec.wire.turnLength) : perTurnR * n;
    const is = (1.2 * Math.abs(rangeEnd) * spec.primaryTurns) / n;
    const room = Math.min(supply.positive - base.reference, base.reference - supply.negative) - spec.driver.swing - spec.driver.drop;
    const rmMax = room / is - rw - spec.driver.outputResistance;
    const rm = rmMax > 0 ? largestAtMost(rmMax, 'E24') : 0;
    const trial: ClosedLoopHallSensor = { ...spec, compensationTurns: n, windingResistance: rw, wire: null, measurementResistance: rm > 0 ? rm : 1 };
    const p = closedLoopParts(trial, supply);
    const comp = suggestCompensation(p);
    const withComp = { ...p, inputResistance: comp.inputResistance + spec.sourceResistance, zeroResistance: comp.zeroResistance, capacitance: comp.capacitance };
    const lf = phaseMarginOf(withComp);
    const held = heldRange(trial, p, supply);
    const maxCurrent = Math.min(held.high, -held.low);
    return {
      turns: n, measurementResistance: rm, sensitivity: (spec.primaryTurns / n) * rm, windingResistance: rw, inductance: p.inductance,
      supplyCurrent: supplyCurrentAt(trial, rangeEnd), maxCurrent, windingCorner: p.loopResistance / (2 * Math.PI * p.inductance), tail: p.inductance / p.loopResistance,
      compensation: comp, crossover: lf.crossover, phaseMargin: lf.phaseMargin,
      fits: rm > 0 && maxCurrent >= Math.abs(rangeEnd) && is <= spec.driver.currentLimit,
    };
  });
}

/**
 * The proposal from the trade: among the turn counts that hold the range with at least 45° of margin, the
 * fewest whose supply current at the range end is within twice the least any of them draws (ours: beyond
 * that, more turns buy little current for an inductance that grows as N² and a longer hand-over tail);
 * null when none holds the range.
 */
export function proposeTurns(options: TurnsOption[]): TurnsOption | null {
  const fits = options.filter((o) => o.fits && (o.phaseMargin ?? 0) >= 45);
  if (!fits.length) return null;
  const least = Math.min(...fits.map((o) => o.supplyCurrent));
  return fits.filter((o) => o.supplyCurrent <= 2 * least).reduce((b, o) => (o.turns < b.turns ? o : b));
}

function largestAtMost(x: number, series: SeriesName): number {
  const [below, above] = neighbours(x, series);
  return above <= x ? above : below;
}

/** Everything the closed-loop sensor's physics says, as numbers and codes. */
export interface ClosedLoopFigures {
  parts: ClosedLoopParts;
  loop: LoopFigures;
  held: HeldRange;
  /** (N_p/N_s)·R_M·T0/(1+T0), V/A. */
  sensitivity: number;
  idealSensitivity: number;
  supplyAtZero: number;
  supplyAtRangeEnd: number;
  dissipationAtRangeEnd: number;
  worstDissipation: number;
  suggestion: CompensationSuggestion;
  findings: Finding[];
}

/** The closed-loop sensor's figures for a range end (the largest |measurand| asked for, in peak amperes). */
export function closedLoopFigures(spec: ClosedLoopHallSensor, supply: Pick<Supply, 'positive' | 'negative'>, rangeEnd: number): ClosedLoopFigures {
  const p = closedLoopParts(spec, supply);
  const loop = loopFigures(p);
  const held = heldRange(spec, p, supply);
  const ideal = (spec.primaryTurns / spec.compensationTurns) * spec.measurementResistance;
  const isEnd = (rangeEnd * spec.primaryTurns) / spec.compensationTurns;
  const suggestion = suggestCompensation(p);
  const findings: Finding[] = [];
  const pm = loop.phaseMargin;
  const comp = { inputResistance: suggestion.inputResistance, capacitance: suggestion.capacitance, zeroResistance: suggestion.zeroResistance };
  if (pm === null || pm <= 0) findings.push(finding('closed-loop-unstable', 'fail', { phaseMargin: pm, crossover: loop.crossover, ...comp }));
  // Below 30° a fail, below 45° a caution (ours; 45°–60° is the usual target of control texts).
  else if (pm < 45) findings.push(finding('closed-loop-margin', pm < 30 ? 'fail' : 'caution', { phaseMargin: pm, crossover: loop.crossover ?? 0, ...comp }));
  // A step beyond 1 % (ours) is a caution when the suggested compensation would take a fifth of it away;
  // otherwise it is about what this Hall sensor's and driver's speed allow at a 60° margin, and is said so.
  if (Math.abs(loop.flatness) > 0.01) {
    if (suggestion.dip < 0.8 * Math.abs(loop.flatness)) findings.push(finding('closed-loop-flatness', 'caution', { flatness: loop.flatness, at: loop.flatnessAt, ...comp, dip: suggestion.dip }));
    else findings.push(finding('closed-loop-flatness-limit', 'info', { flatness: loop.flatness, at: loop.flatnessAt }));
  }
  findings.push(finding('closed-loop-overload', 'info', { high: held.high, low: held.low, saturationHigh: held.saturationHigh, saturationLow: held.saturationLow, limitHigh: held.limitHigh, limitLow: held.limitLow, measurand: spec.measurand }));
  findings.push(finding('closed-loop-residual', 'info', { dcLoopGain: loop.dcLoopGain, residual: loop.residual }));
  findings.push(finding('closed-loop-polarity', 'info', {}));
  findings.push(finding('closed-loop-unmodelled', 'info', {}));
  if (Math.abs(isEnd) > spec.driver.currentLimit) findings.push(finding('closed-loop-driver-current', 'fail', { need: Math.abs(isEnd), limit: spec.driver.currentLimit }));
  return {
    parts: p, loop, held, sensitivity: ideal * loop.dcLoopGain / (1 + loop.dcLoopGain), idealSensitivity: ideal,
    supplyAtZero: supplyCurrentAt(spec, 0), supplyAtRangeEnd: supplyCurrentAt(spec, rangeEnd),
    dissipationAtRangeEnd: driverDissipation(p, supply, Math.min(Math.abs(isEnd), held.upCurrent)),
    worstDissipation: worstDriverDissipation(p, supply, held.upCurrent, held.downCurrent),
    suggestion, findings,
  };
}
