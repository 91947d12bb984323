/**
 * What the scope will show: the stage's output for a measurand waveform (step, sine, square, triangle),
 * solved in time on the same circuit as every other figure (src/circuit/transient.ts), with the op-amp's
 * large-signal limits (slew rate, output swing) and the sensor's own limits on the measurand.
 * Seconds, volts, measurand units.
 */
import type { Design, MeasurandWaveform } from '../model/design.js';
import type { SensorFront } from '../physics/sensors.js';
import type { StageCircuit } from '../circuit/build.js';
import { interpolate, transient, type BlockLimit, type TransientTrace } from '../circuit/transient.js';
import { closedLoopParts, driverRoom } from '../physics/closed-loop.js';

export { interpolate };
import { opampSwing, type ClipResult, type DcPoint, type Speed } from './analysis.js';
import { peakRange } from '../physics/topology.js';

/** The report's waveform: samples and the figures a scope user reads off the screen. */
export interface WaveformResult {
  /** Sample times, s (a step at t = 0; a periodic wave over two periods from t = 0). */
  t: Float64Array;
  /** The measurand at those times (as asked for, before any sensor limit). */
  measurand: Float64Array;
  /** Output at the instrument, V. */
  output: Float64Array;
  /** The stage's DC transfer applied without delay or limits, V. */
  ideal: Float64Array;
  /** 10–90 % rise time of the (first rising) edge, s; null for a sine or triangle. */
  riseTime: number | null;
  /** Overshoot past the settled value as a fraction of the edge; null for a sine or triangle. */
  overshoot: number | null;
  /** Time from the edge until the output stays within 1 % of the edge of its settled value, s; null if it does not. */
  settlingTime: number | null;
  /** Square wave: fraction of the flat top (from the output at zero measurand) lost over the half-period. */
  droop: number | null;
  slewLimited: boolean;
  clipped: boolean;
}

/** How the waveform is solved: the run, the steps and the samples (the SPICE export uses the same plan). */
export interface WaveformPlan {
  spec: MeasurandWaveform;
  /** Start of the run (the circuit sits at its DC point there), start and end of the recorded window, s. */
  t0: number;
  recordFrom: number;
  t1: number;
  /** Periods run before the recorded two, for a periodic wave. */
  warmPeriods: number;
  samples: number;
  hMin: number;
  hFine: number;
  hMax: number;
  hMaxWarm: number;
  fineFor: number;
  breakpoints: number[];
  /** Closed-loop time constant 1/(2π f−3dB), s, and the slew time of the full edge at the op-amp output, s. */
  tau: number;
  slewTime: number;
}

/**
 * The measurand at time t (`left`: the value just before t). Step: low before 0, high from 0. Sine: about the
 * middle, rising through it at t = 0. Square: high for duty·T from each k·T, low otherwise. Triangle: rises
 * from low at k·T to high at (k + duty)·T and falls back by (k + 1)·T.
 */
export function measurandAt(w: MeasurandWaveform, t: number, left = false): number {
  const { low, high } = w;
  if (w.shape === 'step') return (left ? t > 0 : t >= 0) ? high : low;
  const T = 1 / w.frequency;
  if (w.shape === 'sine') return (low + high) / 2 + ((high - low) / 2) * Math.sin(2 * Math.PI * w.frequency * t);
  let ph = t / T - Math.floor(t / T);
  // Where t sits exactly on a period boundary, the left value belongs to the end of the previous period.
  if (left && ph < 1e-12) ph = 1;
  if (w.shape === 'square') return (left ? ph > 0 && ph <= w.duty : ph < w.duty) ? high : low;
  return ph <= w.duty ? low + ((high - low) * ph) / w.duty : high - ((high - low) * (ph - w.duty)) / (1 - w.duty);
}

/** A step over the wanted range (peaks for an AC range): the app's starting point. */
export function stepOverRange(design: Design): MeasurandWaveform {
  const [a, b] = peakRange(design);
  return { shape: 'step', low: a, high: b, frequency: 0, duty: 0.5 };
}

/**
 * Chooses the run from the circuit's time constants and the waveform. The step near an edge is τ/20 of
 * the chain's closed-loop time constant (τ = 1/2πf−3dB), or a twentieth of the edge's slew time if that is
 * shorter (but at most 4000 steps per edge), for the slew time plus 12τ; elsewhere it is the
 * sample spacing (and T/200 while a periodic wave settles). A step's window is 1.2 × (slew time + 10τ)
 * after a tenth of it at rest; a periodic wave runs until its slowest time constant (the low corner of an
 * AC-coupled chain, or τ) has died away six times over (at most 60 periods), then records two periods.
 */
export function waveformPlan(spec: MeasurandWaveform, sp: Speed, dc: DcPoint, design: Design, samples = 2000): WaveformPlan {
  const n = Math.max(16, Math.floor(samples));
  const tau = 1 / (2 * Math.PI * Math.max(sp.smallSignal, 1e-12));
  const edge = Math.abs(dc.internal[1] * (spec.high - spec.low));
  const slewTime = edge / design.opamp.slewRate;
  const fineFor = slewTime + 12 * tau;
  if (spec.shape === 'step') {
    const w = 1.2 * (slewTime + 10 * tau);
    const pre = 0.1 * w;
    const hMax = (w + pre) / (n - 1);
    const hFine = Math.min(Math.max(Math.min(tau / 20, slewTime / 20 || Infinity), fineFor / 4000), hMax);
    return { spec, t0: -pre, recordFrom: -pre, t1: w, warmPeriods: 0, samples: n, hMin: hFine / 16, hFine, hMax, hMaxWarm: hMax, fineFor, breakpoints: [0], tau, slewTime };
  }
  const T = 1 / spec.frequency;
  const slow = sp.lowCorner > 0 ? 1 / (2 * Math.PI * sp.lowCorner) : tau;
  const warmPeriods = Math.min(60, Math.max(1, Math.ceil((6 * slow) / T)));
  const hMax = Math.min((2 * T) / (n - 1), T / 200);
  // At most 4000 fine steps per edge: a slew that lasts far longer than τ is a straight ramp.
  const hFine = Math.min(Math.max(Math.min(tau / 20, slewTime / 20 || Infinity), fineFor / 4000), hMax);
  const breakpoints: number[] = [];
  for (let k = -warmPeriods; k <= 2; k++) {
    breakpoints.push(k * T);
    if (spec.shape !== 'sine' && k < 2) breakpoints.push((k + spec.duty) * T);
  }
  return {
    spec, t0: -warmPeriods * T, recordFrom: 0, t1: 2 * T, warmPeriods, samples: n, hMin: hFine / 16, hFine, hMax, hMaxWarm: T / 200,
    fineFor: spec.shape === 'sine' ? 0 : fineFor, breakpoints, tau, slewTime,
  };
}

/** The measurand interval the sensor itself can follow (its output limits, a core's saturation). */
function sensorInterval(clip: ClipResult): [number, number] {
  let lo = -Infinity, hi = Infinity;
  for (const l of clip.limits) {
    if (l.cause === 'opamp-output' || l.cause === 'opamp-current' || l.cause === 'opamp-input') continue;
    if (Number.isFinite(l.low) || l.low === -Infinity) lo = Math.max(lo, l.low);
    if (Number.isFinite(l.high) || l.high === Infinity) hi = Math.min(hi, l.high);
  }
  return [lo, hi];
}

/** Figures of one edge in a trace: from the value at `te` to the value at `tEnd`. */
export interface EdgeFigures { riseTime: number | null; overshoot: number | null; settlingTime: number | null }

/**
 * 10–90 % rise time, overshoot (fraction of the edge) and 1 % settling time of the edge at `te`, read from a
 * trace (t ascending) by linear interpolation. The settled value is the trace's value at `tEnd`.
 */
export function edgeFigures(t: ArrayLike<number>, v: ArrayLike<number>, te: number, tEnd: number): EdgeFigures {
  const at = (x: number) => interpolate(t, v, x);
  const v0 = at(te), v1 = at(tEnd);
  const dv = v1 - v0;
  const none = { riseTime: null, overshoot: null, settlingTime: null };
  if (!(Math.abs(dv) > 1e-9)) return none;
  let i = 0;
  while (i < t.length && t[i]! < te) i++;
  const rel = (k: number) => (v[k]! - v0) / dv;
  const cross = (level: number): number | null => {
    for (let k = Math.max(i, 1); k < t.length && t[k - 1]! <= tEnd; k++) {
      if (rel(k) >= level && t[k]! > te) {
        const r0 = rel(k - 1), r1 = rel(k);
        return t[k - 1]! + ((level - r0) / (r1 - r0 || 1)) * (t[k]! - t[k - 1]!);
      }
    }
    return null;
  };
  const t10 = cross(0.1), t90 = cross(0.9);
  let peak = 0, last = te, outside = false;
  for (let k = i; k < t.length && t[k]! <= tEnd; k++) {
    const r = rel(k);
    peak = Math.max(peak, r - 1);
    if (Math.abs(r - 1) > 0.01) { outside = true; last = t[k]!; }
    else if (outside && k > 0 && Math.abs(rel(k - 1) - 1) > 0.01) {
      // Interpolate where it came inside the band.
      const r0 = Math.abs(rel(k - 1) - 1), r1 = Math.abs(r - 1);
      last = t[k - 1]! + ((r0 - 0.01) / (r0 - r1 || 1)) * (t[k]! - t[k - 1]!);
    }
  }
  const settledAtEnd = Math.abs(rel(Math.min(t.length - 1, lastIndexAtOrBefore(t, tEnd))) - 1) <= 0.01;
  return {
    riseTime: t10 !== null && t90 !== null ? t90 - t10 : null,
    overshoot: peak,
    settlingTime: settledAtEnd && last < tEnd ? last - te : null,
  };
}

function lastIndexAtOrBefore(t: ArrayLike<number>, x: number): number {
  let k = t.length - 1;
  while (k > 0 && t[k]! > x) k--;
  return k;
}

/**
 * Droop of a square wave's flat tops: over each half-period, (peak − end)/(peak − v_zero) with v_zero the
 * output at zero measurand; the half whose top stands further from v_zero is reported. A first-order
 * high-pass with time constant τ_L gives 1 − exp(−t_half/τ_L).
 */
export function squareDroop(t: ArrayLike<number>, v: ArrayLike<number>, T: number, duty: number, vZero: number): number {
  const half = (a: number, b: number) => {
    const ends = interpolate(t, v, b - 1e-9 * T);
    let peak = interpolate(t, v, a), k = 0;
    const dir = Math.sign(ends - vZero) || 1;
    while (k < t.length && t[k]! < a) k++;
    for (; k < t.length && t[k]! < b; k++) if ((v[k]! - peak) * dir > 0) peak = v[k]!;
    const top = peak - vZero;
    return { top: Math.abs(top), droop: Math.abs(top) > 1e-12 ? (peak - ends) / top : 0 };
  };
  const hi = half(0, duty * T), lo = half(duty * T, T);
  return (hi.top >= lo.top ? hi : lo).droop;
}

/**
 * The large-signal limits of the stage's gain blocks in the time domain: the op-amp's output swing and slew
 * rate, and a closed-loop sensor's compensation driver held within its voltage room (`driverRoom`; no slew
 * rate is stated for it, and its current limit is not modelled in time).
 */
export function blockLimits(design: Design, sc: StageCircuit): BlockLimit[] {
  const [low, high] = opampSwing(design);
  const out: BlockLimit[] = sc.opampIndex >= 0 ? [{ index: sc.opampIndex, low, high, slew: design.opamp.slewRate }] : [];
  const drv = sc.circuit.elements.findIndex((e) => e.role === 'driver');
  if (drv >= 0 && design.sensor.type === 'closed-loop-hall') {
    const room = driverRoom(design.sensor, design.supply, closedLoopParts(design.sensor, design.supply).reference);
    out.push({ index: drv, low: room.low, high: room.high, slew: Infinity });
  }
  return out;
}

/**
 * The waveform at the instrument. Example: the demo Hall clamp with a step over its range shows a 10–90 %
 * rise close to ln 9/(2π f−3dB) when the edge is small enough not to slew.
 */
export function waveform(design: Design, spec: MeasurandWaveform, sc: StageCircuit, front: SensorFront, dc: DcPoint, clip: ClipResult, sp: Speed, samples = 2000): WaveformResult | null {
  const plan = waveformPlan(spec, sp, dc, design, samples);
  const [sLo, sHi] = sensorInterval(clip);
  let sensorHeld = false;
  const xOf = (t: number, left: boolean) => {
    const x = measurandAt(spec, t, left);
    return Math.min(Math.max(x, sLo), sHi);
  };
  const trace = transient(sc.circuit, {
    measurand: xOf, t0: plan.t0, t1: plan.t1, breakpoints: plan.breakpoints, hMin: plan.hMin, hFine: plan.hFine, hMax: plan.hMax,
    hMaxWarm: plan.hMaxWarm, fineFor: plan.fineFor, recordFrom: plan.recordFrom, nodes: [sc.nodes.out], limits: blockLimits(design, sc),
  });
  if (!trace || trace.t.length < 2) return null;
  return figuresOf(plan, trace, dc, front, (t) => {
    const x = measurandAt(spec, t);
    if (x < sLo || x > sHi) sensorHeld = true;
    return x;
  }, () => sensorHeld);
}

function figuresOf(plan: WaveformPlan, tr: TransientTrace, dc: DcPoint, front: SensorFront, x: (t: number) => number, sensorHeld: () => boolean): WaveformResult {
  const { spec, samples: n } = plan;
  const t = new Float64Array(n), measurand = new Float64Array(n), output = new Float64Array(n), ideal = new Float64Array(n);
  const out = tr.v[0]!;
  for (let k = 0; k < n; k++) {
    const tk = plan.recordFrom + ((plan.t1 - plan.recordFrom) * k) / (n - 1);
    t[k] = tk;
    measurand[k] = x(tk);
    output[k] = interpolate(tr.t, out, tk);
    ideal[k] = dc.out[0] + dc.out[1] * measurand[k]!;
  }
  let slewLimited = false, clipped = sensorHeld();
  for (let k = 0; k < tr.mode.length; k++) { if (tr.mode[k]! & 1) slewLimited = true; if (tr.mode[k]! & 2) clipped = true; }
  let edge: EdgeFigures = { riseTime: null, overshoot: null, settlingTime: null };
  let droop: number | null = null;
  if (spec.shape === 'step') edge = edgeFigures(tr.t, out, 0, plan.t1);
  else if (spec.shape === 'square') {
    const T = 1 / spec.frequency;
    edge = edgeFigures(tr.t, out, 0, spec.duty * T - 1e-9 * T);
    droop = front.passesDc ? 0 : squareDroop(tr.t, out, T, spec.duty, dc.out[0]);
  }
  // A falling step (low above high) is an edge too: the figures are signed by the edge's direction.
  return { t, measurand, output, ideal, ...edge, droop, slewLimited, clipped };
}
