/**
 * The closed-loop Hall sensor on its own, in time: a step of primary current solved on the sensor's circuit
 * (src/circuit/closed-loop.ts) with the time-domain solver (BDF2, src/circuit/transient.ts), the driver
 * held within its voltage room. SI units. What a scope on R_M shows: the transformer path carries the edge at
 * once; the Hall path takes over as the winding's current decays through L_s/R, and a well-compensated loop
 * hands over with a small, unrippled sag.
 */
import type { ClosedLoopHallSensor, Design, Supply } from '../model/design.js';
import { HOUR } from '../model/constants.js';
import { closedLoopParts, driverRoom, loopFigures, proposeTurns, turnsTrade, type TurnsOption } from '../physics/closed-loop.js';
import { closedLoopCircuit } from '../circuit/closed-loop.js';
import { transient } from '../circuit/transient.js';
import { edgeFigures } from './waveform.js';

export interface ClosedLoopStep {
  /** Times from the step (s) and the voltage across R_M above the reference (V). */
  t: Float64Array;
  output: Float64Array;
  /** The step asked for, A of primary current, and the ideal output step (N_p/N_s)·R_M·step, V. */
  step: number;
  ideal: number;
  /** Largest excursion beyond the settled value, fraction of the edge. */
  overshoot: number;
  /** Largest departure below the settled value after the edge (the hand-over sag), fraction of the edge. */
  sag: number;
  /** Last time the output is more than 1 % of the edge from its settled value, s (null: never settles in view). */
  settlingTime: number | null;
  /** Largest departure from the settled value over the last quarter of the view, fraction of the edge. */
  tailRipple: number;
  /** Times the output crosses its settled value after the edge (a sustained ringing crosses it again and again). */
  crossings: number;
}

/**
 * A step of primary current from 0 to `step` at t = 0 on the sensor alone. The view: 8 × the slowest of the
 * winding's L_s/R, the compensation's R_z·C_i and 1/(2π·f_crossover) (at most 1 s).
 */
export function closedLoopStep(spec: ClosedLoopHallSensor, supply: Pick<Supply, 'positive' | 'negative'>, step: number): ClosedLoopStep | null {
  const p = closedLoopParts(spec, supply);
  const lf = loopFigures(p);
  const cc = closedLoopCircuit(spec, p);
  const fc = lf.crossover ?? lf.windingCorner;
  const tFast = 1 / (2 * Math.PI * Math.max(fc, lf.windingCorner));
  const tSlow = Math.max(p.inductance / p.loopResistance, spec.compensation.zeroResistance * spec.compensation.capacitance, 1 / (2 * Math.PI * fc));
  const t1 = Math.min(8 * tSlow, 1);
  const drv = cc.index('EDRV');
  const room = driverRoom(spec, supply, p.reference);
  const plan = {
    measurand: (t: number, left: boolean) => (t > 0 || (t === 0 && !left) ? step : 0),
    t0: -t1 / 20, t1, breakpoints: [0],
    hMin: tFast / 400, hFine: tFast / 25, hMax: t1 / 4000, hMaxWarm: t1 / 200, fineFor: 20 * tFast, recordFrom: -t1 / 20,
    nodes: [cc.nodes.out],
    // The driver's output, relative to the reference, within its voltage room (no slew limit is stated for it).
    limits: [{ index: drv, low: room.low, high: room.high, slew: Infinity }],
  };
  const tr = transient(cc.circuit, plan);
  if (!tr) return null;
  const out = tr.v[0]!.map((v) => v - p.reference);
  const ideal = (spec.primaryTurns / spec.compensationTurns) * spec.measurementResistance * step;
  const fig = edgeFigures(tr.t, out, 0, t1);
  const settled = out[out.length - 1]!;
  let sag = 0, tail = 0, crossings = 0;
  let firstAbove = -1;
  for (let k = 0; k < out.length; k++) {
    if (tr.t[k]! <= 0) continue;
    const e = (out[k]! - settled) / ideal;
    if (firstAbove < 0 && Math.abs(out[k]!) >= 0.5 * Math.abs(ideal)) firstAbove = k;
    if (firstAbove >= 0) sag = Math.max(sag, -e * Math.sign(ideal));
    if (tr.t[k]! >= 0.75 * t1) tail = Math.max(tail, Math.abs(e));
    if (k > 0 && firstAbove >= 0 && k > firstAbove && Math.sign(out[k]! - settled) !== Math.sign(out[k - 1]! - settled) && Math.abs(out[k]! - settled) > 1e-6 * Math.abs(ideal)) crossings++;
  }
  return { t: tr.t, output: out, step, ideal, overshoot: fig.overshoot ?? 0, sag, settlingTime: fig.settlingTime, tailRipple: tail, crossings };
}

/** What the report adds for a closed-loop sensor: the step, the supply at the range end, the turns trade. */
export interface ClosedLoopSummary {
  /** A step of primary current from 0 to half the range end, on the sensor alone. */
  step: ClosedLoopStep | null;
  /** The whole probe's supply current at zero and at the range end, A, and the battery life at each, hours (null: no battery). */
  supplyAtZero: number;
  supplyAtRangeEnd: number;
  batteryLifeAtZero: number | null;
  batteryLifeAtRangeEnd: number | null;
  /** The turns trade for this range and supply, and the proposal from it (null: no turn count fits). */
  trade: TurnsOption[];
  proposal: TurnsOption | null;
}

/**
 * The closed-loop sensor's summary for a report: `stageCurrent` is the whole probe's supply current at zero
 * measurand (the stage's analysis, which already counts the sensor's quiescent currents); the compensation
 * current |I|·N_p/N_s comes on top at primary current I, so the battery life depends on what is measured.
 */
export function closedLoopSummary(design: Design, stageCurrent: number): ClosedLoopSummary | null {
  const s = design.sensor;
  if (s.type !== 'closed-loop-hall') return null;
  const peak = design.target.signal === 'ac-rms' ? Math.SQRT2 : 1;
  const end = Math.max(Math.abs(design.target.range[0]), Math.abs(design.target.range[1])) * peak;
  // An AC range draws its compensation current's average, 2/π of the peak, from a supply (derived for a sine).
  const drawn = design.target.signal === 'ac-rms' ? (2 / Math.PI) * end : end;
  const atEnd = stageCurrent + (drawn * s.primaryTurns) / s.compensationTurns;
  const bat = design.supply.battery;
  const life = (i: number) => (bat && i > 0 ? bat.capacity / i / HOUR : null);
  const trade = turnsTrade(s, design.supply, end);
  return {
    step: closedLoopStep(s, design.supply, end / 2),
    supplyAtZero: stageCurrent, supplyAtRangeEnd: atEnd, batteryLifeAtZero: life(stageCurrent), batteryLifeAtRangeEnd: life(atEnd),
    trade, proposal: proposeTurns(trade),
  };
}
