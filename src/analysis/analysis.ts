/**
 * The analysis engine: everything the report says about a solved stage, computed from its circuit.
 * DC transfer and clipping, speed, noise, DC error budget, supply and battery, tolerance spread and
 * instrument drive. Each function is pure; `analyse` in report.ts strings them together.
 */
import { REGULATOR_HEADROOM, type Design } from '../model/design.js';
import { buildCircuit, type StageCircuit } from '../circuit/build.js';
import { adjointAt, signalTransfer, solveDc, stampReal, luFactorReal, luSolveReal, rhs, workspace, type Element } from '../circuit/mna.js';
import { integratePower, logGrid, peakToPeak } from '../physics/noise.js';
import { noiseSpectrum, type NoiseSpectrum } from '../circuit/noise.js';
import { atSensorSupply, type SensorFront, type SensorLimitKind } from '../physics/sensors.js';
import type { SolvedStage } from '../solve/stage.js';
import { peakRange } from '../physics/topology.js';
import { mulberry32 } from '../model/random.js';
import { HOUR } from '../model/constants.js';
import { formatEng } from '../model/units.js';

export type ClipCause = 'opamp-output' | 'opamp-current' | 'opamp-input' | SensorLimitKind;

export interface DcPoint {
  /** Linear part: node voltage = v0 + v1·x. */
  out: [number, number];
  pin: [number, number];
  internal: [number, number];
  inP: [number, number];
  inN: [number, number];
  /** Op-amp output current (out of the pin), A. */
  iOut: [number, number];
  source: [number, number];
  /** The whole solution, by unknown: c0 at zero measurand, c1 per unit of measurand. */
  c0: Float64Array;
  c1: Float64Array;
}

/** Voltage of any node as [at zero measurand, per unit of measurand] from a DC point. */
export const nodeLinear = (dc: DcPoint, node: number): [number, number] => lin(dc.c0, dc.c1, node);

const lin = (c0: Float64Array, c1: Float64Array, node: number): [number, number] => (node > 0 ? [c0[node - 1]!, c1[node - 1]!] : [0, 0]);

/** DC solution of the stage, linear in the measurand, with inductors open for AC-coupled sensors. */
export function dcLinear(sc: StageCircuit, passband: boolean): DcPoint | null {
  // The zero is a true DC operating point (inductors shorted); the scale of an AC-coupled sensor is its
  // passband value (inductors open), which is what an rms reading sees.
  const sol = solveDc(sc.circuit, [(e) => e.dc0 ?? 0, (e) => e.dc1 ?? 0], false);
  if (!sol) return null;
  const c0 = sol.columns[0]!;
  let c1 = sol.columns[1]!;
  if (passband) {
    const pb = solveDc(sc.circuit, [(e) => e.dc1 ?? 0], true);
    if (!pb) return null;
    c1 = pb.columns[0]!;
  }
  const n = sc.nodes;
  const k = sc.circuit.branch[sc.opampIndex]!;
  // Branch current of the gain block flows from its + terminal into the source: the pin current is its negative.
  return {
    out: lin(c0, c1, n.out), pin: lin(c0, c1, n.pin), internal: lin(c0, c1, n.internal), inP: lin(c0, c1, n.inP), inN: lin(c0, c1, n.inN),
    iOut: [-c0[k]!, -c1[k]!], source: n.source > 0 ? lin(c0, c1, n.source) : [0, 0], c0, c1,
  };
}

export interface ClipLimit {
  cause: ClipCause;
  low: number;
  high: number;
  why: string;
}

export interface ClipResult {
  /** Measurand at which the output first saturates going down and going up. */
  measurandLow: number;
  measurandHigh: number;
  /** Output at the load at those points, V. */
  outputLow: number;
  outputHigh: number;
  firstLow: ClipCause | null;
  firstHigh: ClipCause | null;
  /** What saturates first overall (at the smaller |measurand|, relative to the range end on that side). */
  first: ClipCause | null;
  limits: ClipLimit[];
  /** The range is peaks (√2 × rms for an AC target). */
  rangePeak: [number, number];
  headroom: { low: number; high: number; lowPercent: number; highPercent: number };
  /** Outputs at the range ends, V. */
  rangeOutput: [number, number];
  /** Whether zero measurand lies inside the linear region. */
  linearAtZero: boolean;
  /** Whether any measurand is linear at all (false: measurandLow = measurandHigh = 0, named by the failing limit). */
  linear: boolean;
}

/** Interval of x where a + b·x stays within [lo, hi]. */
function within(a: number, b: number, lo: number, hi: number): [number, number] {
  if (Math.abs(b) < 1e-300) return a >= lo - 1e-12 && a <= hi + 1e-12 ? [-Infinity, Infinity] : [NaN, NaN];
  const x1 = (lo - a) / b, x2 = (hi - a) / b;
  return [Math.min(x1, x2), Math.max(x1, x2)];
}

/** Clipping: every limit as a measurand interval, then the first hit in each direction. */
export function clipping(design: Design, front: SensorFront, dc: DcPoint, positive = design.supply.positive): ClipResult {
  const neg = design.supply.negative;
  const oa = design.opamp;
  const limits: ClipLimit[] = [];
  const add = (cause: ClipCause, iv: [number, number], why: string) => limits.push({ cause, low: iv[0], high: iv[1], why });
  add('opamp-output', within(dc.internal[0], dc.internal[1], neg + oa.outputLow, positive - oa.outputHigh), `the op-amp output swings only from ${+(neg + oa.outputLow).toFixed(3)} V to ${+(positive - oa.outputHigh).toFixed(3)} V`);
  add('opamp-current', within(dc.iOut[0], dc.iOut[1], -oa.outputCurrent, oa.outputCurrent), `the op-amp can drive only ±${oa.outputCurrent * 1e3} mA into the feedback network and load`);
  const inLo = neg + oa.inputLow, inHi = positive - oa.inputHigh;
  const ivP = within(dc.inP[0], dc.inP[1], inLo, inHi);
  const ivN = within(dc.inN[0], dc.inN[1], inLo, inHi);
  add('opamp-input', [Math.max(ivP[0], ivN[0]), Math.min(ivP[1], ivN[1])], `the op-amp inputs must stay within ${+inLo.toFixed(3)} V … ${+inHi.toFixed(3)} V`);
  if (Number.isFinite(front.outputMin) || Number.isFinite(front.outputMax)) {
    add('sensor', within(front.quiescent, front.sensitivity, front.outputMin, front.outputMax), `the sensor's output reaches its ${front.outputMin}…${front.outputMax} V limits`);
  }
  for (const l of front.limits) add(l.kind, [l.low, l.high], l.why);

  // The linear region is where every limit holds at once: the intersection of their intervals, whether or not
  // it contains zero (a one-sided range such as 0.1…10 A with the output at a rail at zero is a normal design).
  let xLo = -Infinity, xHi = Infinity, firstLow: ClipCause | null = null, firstHigh: ClipCause | null = null;
  let empty = false;
  for (const l of limits) {
    if (Number.isNaN(l.low) || Number.isNaN(l.high)) { empty = true; firstLow = firstHigh = l.cause; continue; }
    if (l.low > xLo) { xLo = l.low; firstLow = l.cause; }
    if (l.high < xHi) { xHi = l.high; firstHigh = l.cause; }
  }
  if (!empty && xLo > xHi) empty = true;
  const linearAtZero = !empty && xLo <= 0 && xHi >= 0;
  if (empty) {
    // No measurand keeps every limit: the region is a point, at zero, named after the limit that fails there.
    const bad = limits.find((l) => Number.isNaN(l.low) || l.low > 0 || l.high < 0) ?? limits.find((l) => l.cause === firstLow)!;
    firstLow = firstHigh = bad.cause;
    xLo = xHi = 0;
  }
  const rangePeak = peakRange(design);
  const outAt = (x: number) => dc.out[0] + dc.out[1] * x;
  const yA = outAt(rangePeak[0]), yB = outAt(rangePeak[1]);
  const cA = outAt(xLo), cB = outAt(xHi);
  const oLo = Math.min(cA, cB), oHi = Math.max(cA, cB);
  const yMin = Math.min(yA, yB), yMax = Math.max(yA, yB);
  const span = Math.max(yMax - yMin, 1e-12);
  // Headroom between the (unclipped, linear) output at each end of the range and the level where it
  // saturates; negative when the output clips inside the range. Linear outputs make one formula serve both.
  const lowFix = yMin - oLo;
  const hHigh = oHi - yMax;
  let first: ClipCause | null = null;
  const relLo = rangePeak[0] < 0 ? xLo / rangePeak[0] : Infinity;
  const relHi = rangePeak[1] > 0 ? xHi / rangePeak[1] : Infinity;
  first = relLo <= relHi ? firstLow : firstHigh;
  return {
    measurandLow: xLo, measurandHigh: xHi, outputLow: oLo, outputHigh: oHi, firstLow, firstHigh, first, limits, rangePeak,
    headroom: { low: lowFix, high: hHigh, lowPercent: (lowFix / span) * 100, highPercent: (hHigh / span) * 100 },
    rangeOutput: [yA, yB], linearAtZero, linear: !empty,
  };
}

/** Output at the load for a measurand value, with every clip applied (the plotted transfer curve). */
export function transferCurve(dc: DcPoint, clip: ClipResult, points = 200): { x: Float64Array; y: Float64Array; clipped: Uint8Array } {
  const [a, b] = clip.rangePeak;
  const w = b - a;
  const x0 = a - 0.5 * w, x1 = b + 0.5 * w;
  const x = new Float64Array(points), y = new Float64Array(points), clipped = new Uint8Array(points);
  for (let i = 0; i < points; i++) {
    const xi = x0 + ((x1 - x0) * i) / (points - 1);
    const xc = Math.min(Math.max(xi, clip.measurandLow), clip.measurandHigh);
    x[i] = xi;
    y[i] = dc.out[0] + dc.out[1] * xc;
    clipped[i] = xi < clip.measurandLow || xi > clip.measurandHigh ? 1 : 0;
  }
  return { x, y, clipped };
}

export interface FrequencyResponse {
  freqs: Float64Array;
  /** |H| in V per measurand unit, and phase in degrees. */
  magnitude: Float64Array;
  phase: Float64Array;
}

/** Signal transfer from the measurand to the output at one frequency. */
export function transferAt(sc: StageCircuit, f: number, ws = workspace(sc.circuit)): [number, number] {
  if (!adjointAt(sc.circuit, 2 * Math.PI * f, sc.nodes.out, ws)) return [NaN, NaN];
  return signalTransfer(sc.circuit, ws);
}

/** Magnitude and phase from complex transfers; the phase unwrapped so it runs on smoothly past ±180°. */
function responseOf(freqs: Float64Array, re: Float64Array, im: Float64Array): FrequencyResponse {
  const n = freqs.length;
  const magnitude = new Float64Array(n), phase = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    magnitude[i] = Math.hypot(re[i]!, im[i]!);
    let ph = (Math.atan2(im[i]!, re[i]!) * 180) / Math.PI;
    if (i > 0) { while (ph - phase[i - 1]! > 180) ph -= 360; while (ph - phase[i - 1]! < -180) ph += 360; }
    phase[i] = ph;
  }
  return { freqs, magnitude, phase };
}

/** The frequency response read from a noise sweep's signal transfer (same adjoint solves, no extra work). */
export function responseFromSpectrum(s: NoiseSpectrum): FrequencyResponse {
  return responseOf(s.freqs, s.signalRe, s.signalIm);
}

export function frequencyResponse(sc: StageCircuit, f1: number, f2: number, points = 200): FrequencyResponse {
  const freqs = new Float64Array(points), re = new Float64Array(points), im = new Float64Array(points);
  const ws = workspace(sc.circuit);
  for (let i = 0; i < points; i++) {
    freqs[i] = f1 * (f2 / f1) ** (i / (points - 1));
    [re[i], im[i]] = transferAt(sc, freqs[i]!, ws);
  }
  return responseOf(freqs, re, im);
}

export interface Speed {
  /** Reference passband gain, V per measurand unit. */
  passband: number;
  /** −3 dB corners, Hz (low is 0 for a DC-coupled chain). */
  lowCorner: number;
  smallSignal: number;
  phaseAtCorner: number;
  riseTime: number;
  fullPower: number;
  /** Largest output swing about the zero over the range, V. */
  peakSwing: number;
}

/** Finds where |H| crosses `level` between f1 (above) and f2 (below) by bisection in log f. */
function crossing(sc: StageCircuit, level: number, f1: number, f2: number, ws: ReturnType<typeof workspace>): number {
  let a = f1, b = f2;
  for (let i = 0; i < 60; i++) {
    const m = Math.sqrt(a * b);
    const [re, im] = transferAt(sc, m, ws);
    if (Math.hypot(re, im) > level) a = m; else b = m;
    // Either direction: a may sit above b (the low corner of an AC-coupled chain is searched downwards).
    if (Math.abs(Math.log(b / a)) < 1e-9) break;
  }
  return Math.sqrt(a * b);
}

/**
 * Small-signal bandwidth of the whole chain, rise time 0.35/BW (single-pole step, ln 9/2π; common practice)
 * and the slew-limited full-power bandwidth SR/(2π·Vp) (NPTEL 117107094, lecture 7).
 */
export function speed(design: Design, sc: StageCircuit, front: SensorFront, dc: DcPoint): Speed {
  const ws = workspace(sc.circuit);
  const gbw = design.opamp.gbw;
  const fHi = Math.max(gbw, front.bandwidth < 1e8 ? front.bandwidth : 0) * 100;
  let passband: number;
  let lowCorner = 0;
  let fRef: number;
  if (front.passesDc) {
    fRef = 1e-3;
    passband = Math.hypot(...transferAt(sc, fRef, ws));
  } else {
    // An AC-coupled chain: its passband scale is the peak of |H|, found on a coarse log grid between the
    // sensor's own corner and far above; both corners are then bisected from that peak.
    const f0 = Math.max(front.lowCorner, 1e-3), f1 = fHi;
    fRef = f0; passband = 0;
    for (let i = 0; i <= 80; i++) {
      const f = f0 * (f1 / f0) ** (i / 80);
      const m = Math.hypot(...transferAt(sc, f, ws));
      if (m > passband) { passband = m; fRef = f; }
    }
    lowCorner = crossing(sc, passband / Math.SQRT2, fRef, front.lowCorner / 1000 || 1e-3, ws);
  }
  const level = passband / Math.SQRT2;
  let bw = crossing(sc, level, fRef, fHi, ws);
  if (Math.hypot(...transferAt(sc, fHi, ws)) > level) bw = fHi;
  const [pr, pi] = transferAt(sc, bw, ws);
  const [rr, ri] = transferAt(sc, fRef, ws);
  let phase = ((Math.atan2(pi, pr) - Math.atan2(ri, rr)) * 180) / Math.PI;
  while (phase > 180) phase -= 360;
  while (phase < -180) phase += 360;
  const [a, b] = peakRange(design);
  const peakSwing = Math.max(Math.abs(dc.pin[1] * a), Math.abs(dc.pin[1] * b));
  return {
    passband, lowCorner, smallSignal: bw, phaseAtCorner: phase, riseTime: Math.log(9) / (2 * Math.PI * bw),
    fullPower: peakSwing > 0 ? design.opamp.slewRate / (2 * Math.PI * peakSwing) : Infinity, peakSwing,
  };
}

export interface NoiseResult {
  spectrum: NoiseSpectrum;
  band: [number, number];
  densityAt1kHz: number;
  rms: number;
  peakToPeak: number;
  referredRms: number;
  referredDensityAt1kHz: number;
  /** Each source's share of the integrated noise power. */
  shares: Array<{ name: string; rms: number; fraction: number }>;
}

/** The default noise band: 1 Hz (or a tenth of an AC-coupled chain's low corner) to 100 × the −3 dB frequency. */
export function defaultBand(sp: Speed): [number, number] {
  return [Math.max(1, sp.lowCorner / 10 || 1), Math.max(100 * sp.smallSignal, 10)];
}

export function noise(design: Design, sc: StageCircuit, sp: Speed, points = 201): NoiseResult {
  const T = design.environment.temperature;
  const band: [number, number] = design.analysis.noiseBand ?? defaultBand(sp);
  const freqs = logGrid(band[0], band[1], 24, points);
  const spectrum = noiseSpectrum(sc.circuit, sc.nodes.out, freqs, T);
  const power = integratePower(freqs, spectrum.total);
  const at1k = noiseSpectrum(sc.circuit, sc.nodes.out, Float64Array.of(1000), T).total[0]!;
  const rms = Math.sqrt(power);
  const shares = spectrum.sources.map((s) => {
    const p = integratePower(freqs, s.density);
    return { name: s.name, rms: Math.sqrt(p), fraction: power > 0 ? p / power : 0 };
  }).sort((a, b) => b.fraction - a.fraction);
  const g = Math.abs(sp.passband) || NaN;
  return {
    spectrum, band, densityAt1kHz: at1k, rms, peakToPeak: peakToPeak(rms), referredRms: rms / g,
    referredDensityAt1kHz: at1k / g, shares,
  };
}

export interface ErrorTerm {
  name: string;
  /** Error in measurand units at the range end. */
  value: number;
  /** zero: removed by the zero trim; scale: by the gain trim; none: remains after calibration. */
  removedBy: 'zero' | 'scale' | 'both' | 'none';
}

export interface ErrorBudget {
  terms: ErrorTerm[];
  worstCase: number;
  rss: number;
  afterTrim: number;
  afterTrimRss: number;
  /** Measurand at which the errors are stated (the range end with the larger magnitude). */
  at: number;
}

/**
 * DC error budget at the range end, in measurand units. Each resistor is moved by its tolerance alone and
 * the scale and zero recomputed from the circuit; offsets and bias currents come from their own DC columns.
 */
export function errorBudget(design: Design, stage: SolvedStage, front: SensorFront, sc: StageCircuit, dc: DcPoint): ErrorBudget {
  const terms: ErrorTerm[] = [];
  const [a, b] = peakRange(design);
  const xEnd = Math.abs(a) > Math.abs(b) ? a : b;
  const scale = dc.out[1];
  const toUnits = (volts: number) => Math.abs(volts / scale);
  const passband = !front.passesDc;
  const zeroTrim = !!stage.network.reference.trim;
  const gainTrim = !!stage.network.gainTrim;
  const dT = Math.max(Math.abs(design.environment.temperatureMax - design.environment.temperature), Math.abs(design.environment.temperature - design.environment.temperatureMin));
  const sol = solveDc(sc.circuit, [(e) => e.extra?.vos ?? 0, (e) => (e.extra?.ibp ?? 0) + (e.extra?.ibn ?? 0), (e) => (e.name === 'VSIG' || e.name === 'VQ' ? 1 : 0)], passband);
  if (sol) {
    const o = sc.nodes.out - 1;
    const [cVos, cIb, cVq] = sol.columns as [Float64Array, Float64Array, Float64Array];
    terms.push({ name: 'op-amp offset voltage', value: toUnits(cVos[o]!), removedBy: 'zero' });
    terms.push({ name: 'op-amp bias current', value: toUnits(cIb[o]!), removedBy: 'zero' });
    if (front.quiescentTolerance) terms.push({ name: 'sensor zero tolerance', value: toUnits(cVq[o]! * front.quiescentTolerance), removedBy: 'zero' });
    const vosPerVolt = Math.abs(cVos[o]! / (design.opamp.offsetVoltage || 1));
    if (design.opamp.offsetDrift) terms.push({ name: 'op-amp offset drift', value: toUnits(vosPerVolt * design.opamp.offsetDrift * dT), removedBy: 'none' });
    if (front.quiescentDrift) terms.push({ name: 'sensor zero drift', value: toUnits(cVq[o]! * front.quiescentDrift * dT), removedBy: 'none' });
  }
  if (front.sensitivityTolerance) terms.push({ name: 'sensor sensitivity tolerance', value: Math.abs(xEnd) * front.sensitivityTolerance, removedBy: 'scale' });
  if (front.sensitivityDrift) terms.push({ name: 'sensor sensitivity drift', value: Math.abs(xEnd * front.sensitivityDrift * dT), removedBy: 'none' });
  // Resistors: each part alone at +tolerance; zero and scale shifts from the circuit.
  const base0 = dc.out[0], base1 = dc.out[1];
  let driftSum = 0;
  for (const p of stage.parts) {
    if (p.kind === 'capacitor') continue;
    const names = sc.circuit.elements.filter((e) => e.kind === 'R' && (e.name === p.ref || e.name === `${p.ref}A` || e.name === `${p.ref}B`)).map((e) => e.name);
    if (!names.length) continue;
    const shift = (rel: number) => {
      const sc2 = buildCircuit(design, stage, front, { scale: Object.fromEntries(names.map((n) => [n, 1 + rel])) });
      const d2 = dcLinear(sc2, passband);
      if (!d2) return { dz: 0, ds: 0 };
      return { dz: d2.out[0] - base0, ds: d2.out[1] - base1 };
    };
    const t = shift(p.tolerance);
    const removed = p.kind === 'trimmer' ? 'both' : 'both';
    terms.push({ name: `${p.ref} tolerance (${formatEng(p.ohms, 'Ω', 3)})`, value: toUnits(t.dz + t.ds * xEnd), removedBy: removed });
    if (design.target.tempco && p.kind === 'resistor') {
      const d = shift(Math.abs(design.target.tempco) * dT);
      const v = toUnits(d.dz + d.ds * xEnd);
      driftSum += v;
    }
  }
  if (driftSum > 0) terms.push({ name: `resistor tempco (${(design.target.tempco * 1e6).toFixed(0)} ppm/K over ±${dT.toFixed(0)} K)`, value: driftSum, removedBy: 'none' });
  const reg = design.supply.regulated;
  if (reg && design.supply.referenceRail === 'regulated' && sc.rails.regulated >= 0) {
    const sol2 = solveDc(sc.circuit, [(e) => (e.name === 'VREG' ? reg.voltage * reg.tolerance : 0)], passband);
    if (sol2) terms.push({ name: 'regulated rail tolerance', value: toUnits(sol2.columns[0]![sc.nodes.out - 1]!), removedBy: 'zero' });
  }
  // What the trims leave: their settable step.
  const removedFlag = (t: ErrorTerm) => (t.removedBy === 'zero' && zeroTrim) || (t.removedBy === 'scale' && gainTrim) || (t.removedBy === 'both' && zeroTrim && gainTrim);
  const after: number[] = terms.filter((t) => !removedFlag(t)).map((t) => t.value);
  if (stage.network.reference.trim) after.push(toUnits(stage.network.reference.trim.step));
  if (stage.network.gainTrim) after.push(Math.abs(xEnd) * stage.network.gainTrim.step);
  const wc = terms.reduce((s, t) => s + t.value, 0);
  const rss = Math.sqrt(terms.reduce((s, t) => s + t.value ** 2, 0));
  return {
    terms, worstCase: wc, rss, afterTrim: after.reduce((s, v) => s + v, 0), afterTrimRss: Math.sqrt(after.reduce((s, v) => s + v * v, 0)), at: xEnd,
  };
}

export interface SupplyResult {
  /** Current from the positive rail at zero measurand, A. */
  current: number;
  parts: Array<{ name: string; current: number }>;
  /** Running time on the battery, hours (null without a battery). */
  batteryLife: number | null;
}

export function supply(design: Design, front: SensorFront, sc: StageCircuit, dc: DcPoint): SupplyResult {
  const parts: Array<{ name: string; current: number }> = [{ name: 'op-amp quiescent', current: design.opamp.supplyCurrent }];
  if (front.supplyCurrent) parts.push({ name: 'sensor', current: front.supplyCurrent });
  // Rail currents at zero measurand are branch currents of the DC operating point already solved.
  const col = dc.c0;
  // A rail source's branch current flows into its + node from the circuit: the current it supplies is its negative.
  const railNets = -col[sc.circuit.branch[sc.rails.positive]!]!;
  if (Math.abs(railNets) > 1e-12) parts.push({ name: 'reference divider and networks on the positive rail', current: Math.max(railNets, 0) });
  if (sc.rails.regulated >= 0) {
    const r = -col[sc.circuit.branch[sc.rails.regulated]!]!;
    if (r > 1e-12) parts.push({ name: 'networks on the regulated rail', current: r });
  }
  const iout = dc.iOut[0];
  if (iout > 0) parts.push({ name: 'op-amp output current into the load at zero', current: iout });
  if (design.supply.regulated?.quiescentCurrent) parts.push({ name: 'regulator quiescent', current: design.supply.regulated.quiescentCurrent });
  const current = parts.reduce((s, p) => s + p.current, 0);
  const bat = design.supply.battery;
  return { current, parts, batteryLife: bat && current > 0 ? bat.capacity / current / HOUR : null };
}

export interface BatteryStep {
  voltage: number;
  measurandLow: number;
  measurandHigh: number;
  headroomLow: number;
  headroomHigh: number;
  zeroShift: number;
  first: ClipCause | null;
  /** Whether the regulated rail (if any) still holds. */
  regulated: boolean;
}

/** Sweep of the positive rail from a fresh battery to its end of life: clip points, headroom, zero shift. */
export function batterySweep(design: Design, stage: SolvedStage, front: SensorFront, zero: number, steps = 9): BatteryStep[] {
  const bat = design.supply.battery;
  if (!bat) return [];
  const out: BatteryStep[] = [];
  const passband = !front.passesDc;
  const reg = design.supply.regulated;
  for (let i = 0; i < steps; i++) {
    const v = bat.fresh + ((bat.endOfLife - bat.fresh) * i) / (steps - 1);
    // A regulator holds while it has its headroom (REGULATOR_HEADROOM, common practice for a low-dropout part).
    const regulated = !reg || v - design.supply.negative >= reg.voltage + REGULATOR_HEADROOM;
    const sensorSupply = design.supply.sensorRail === 'regulated' && reg ? (regulated ? reg.voltage : v - REGULATOR_HEADROOM) : v;
    const f2 = atSensorSupply(front, sensorSupply);
    const d2: Design = reg && !regulated ? { ...design, supply: { ...design.supply, regulated: { ...reg, voltage: Math.max(v - REGULATOR_HEADROOM - design.supply.negative, 0.01) } } } : design;
    const sc = buildCircuit(d2, stage, front, { positive: v, front: f2 });
    const dc = dcLinear(sc, passband);
    if (!dc) continue;
    const c = clipping(d2, f2, dc, v);
    out.push({ voltage: v, measurandLow: c.measurandLow, measurandHigh: c.measurandHigh, headroomLow: c.headroom.low, headroomHigh: c.headroom.high, zeroShift: dc.out[0] - zero, first: c.first, regulated });
  }
  return out;
}

export interface SpreadResult {
  trials: number;
  scaleMean: number;
  scaleStd: number;
  zeroMean: number;
  zeroStd: number;
  /** Fraction of builds within the limits before trimming. */
  yield: number;
  /** Histogram of relative scale error (bins of equal width). */
  histogram: { edges: Float64Array; counts: Uint32Array };
}

/**
 * Monte Carlo over part tolerances: each resistor uniform within ±tolerance (trimmers at their setting with
 * ±20 % on their total), the sensor's sensitivity and zero uniform within theirs; seeded so runs repeat.
 */
export function spread(design: Design, front: SensorFront, sc: StageCircuit, dc: DcPoint, trials = design.analysis.spreadTrials, seed = design.analysis.spreadSeed): SpreadResult {
  const rand = mulberry32(seed);
  const c = sc.circuit;
  const tolOf = (e: Element): number => {
    if (e.kind !== 'R' || e.value === 0 || e.noisy === false) return 0;
    if (/^RV\d+/.test(e.name)) return 0.2;
    if (/^R\d+$/.test(e.name)) return design.target.tolerance;
    return 0;
  };
  const nominal = c.elements.map((e) => e.value);
  const tols = c.elements.map(tolOf);
  const sigIdx = sc.signalIndex;
  const sig = c.elements[sigIdx]!;
  const n = c.size;
  const A = new Float64Array(n * n);
  const piv = new Int32Array(n);
  const scratch = new Float64Array(n);
  const scales = new Float64Array(trials), zeros = new Float64Array(trials);
  const o = sc.nodes.out - 1;
  const passband = !front.passesDc;
  // Right-hand sides: only the signal source's entries change between trials, so patch them in place.
  const base0 = rhs(c, (e) => e.dc0 ?? 0), base1 = rhs(c, (e) => e.dc1 ?? 0);
  const b0 = new Float64Array(n), b1 = new Float64Array(n);
  const sigRow = sig.kind === 'V' ? c.branch[sigIdx]! : -1;
  let pass = 0;
  const s0 = dc.out[1], z0 = dc.out[0];
  for (let t = 0; t < trials; t++) {
    for (let i = 0; i < c.elements.length; i++) {
      const tol = tols[i]!;
      if (tol) c.elements[i]!.value = nominal[i]! * (1 + tol * (2 * rand() - 1));
    }
    b0.set(base0); b1.set(base1);
    const kq = sig.kind === 'V' ? front.quiescentTolerance * (2 * rand() - 1) : 0;
    const ks = 1 + front.sensitivityTolerance * (2 * rand() - 1);
    if (sigRow >= 0) { b0[sigRow]! += kq; b1[sigRow] = base1[sigRow]! * ks; }
    else for (let i = 0; i < n; i++) b1[i] = base1[i]! * ks; // a current source: its whole column scales
    stampReal(c, A, false);
    if (!luFactorReal(A, n, piv)) { scales[t] = NaN; zeros[t] = NaN; continue; }
    luSolveReal(A, n, piv, b0, scratch);
    if (passband) {
      // An AC-coupled sensor's scale is its passband value (inductors open): a second factorisation.
      stampReal(c, A, true);
      if (!luFactorReal(A, n, piv)) { scales[t] = NaN; zeros[t] = NaN; continue; }
    }
    luSolveReal(A, n, piv, b1, scratch);
    scales[t] = b1[o]!; zeros[t] = b0[o]!;
    if (Math.abs(b1[o]! / s0 - 1) <= design.analysis.scaleLimit && Math.abs(b0[o]! - z0) <= design.analysis.zeroLimit) pass++;
  }
  // Restore the nominal circuit.
  c.elements.forEach((e, i) => { e.value = nominal[i]!; });
  const mean = (a: Float64Array) => a.reduce((s, v) => s + v, 0) / a.length;
  const std = (a: Float64Array, m: number) => Math.sqrt(a.reduce((s, v) => s + (v - m) ** 2, 0) / (a.length - 1));
  const sm = mean(scales), zm = mean(zeros);
  const bins = 24;
  const rel = scales.map((s) => s / s0 - 1);
  let lo = Infinity, hi = -Infinity;
  for (const r of rel) { if (r < lo) lo = r; if (r > hi) hi = r; }
  if (!(hi > lo)) { lo -= 1e-6; hi += 1e-6; }
  const edges = new Float64Array(bins + 1).map((_, i) => lo + ((hi - lo) * i) / bins);
  const counts = new Uint32Array(bins);
  for (const r of rel) counts[Math.min(bins - 1, Math.floor(((r - lo) / (hi - lo)) * bins))]!++;
  return { trials, scaleMean: sm, scaleStd: std(scales, sm), zeroMean: zm, zeroStd: std(zeros, zm), yield: pass / trials, histogram: { edges, counts } };
}

export interface InstrumentDrive {
  /** Scale seen at a 1 MΩ input and at a 50 Ω input, V per measurand unit. */
  scaleAt1M: number;
  scaleAt50: number;
  /** Whether the op-amp can drive a 50 Ω input over the range without current limiting. */
  drives50: boolean;
  /** Recommended series isolation resistor, Ω (0 when one is fitted already). */
  isolation: number;
  /** Instrument probe-ratio setting that reads the measurand directly, or null when none fits. */
  probeRatio: number | null;
}

/** How the stage drives the instrument: 1 MΩ and 50 Ω inputs, isolation from capacitance, probe ratio. */
export function instrumentDrive(design: Design, stage: SolvedStage, front: SensorFront, bandwidth: number): InstrumentDrive {
  const passband = !front.passesDc;
  const at = (r: number) => {
    const d2: Design = { ...design, output: { ...design.output, load: { ...design.output.load, resistance: r } } };
    const sc = buildCircuit(d2, stage, front);
    const dc = dcLinear(sc, passband);
    return { dc, clip: dc ? clipping(d2, front, dc) : null };
  };
  const m1 = at(1e6), m50 = at(50);
  const [a, b] = peakRange(design);
  const drives50 = !!m50.clip && m50.clip.measurandLow <= a && m50.clip.measurandHigh >= b;
  const cLoad = design.output.load.capacitance + (design.output.filter?.capacitance ?? 0);
  let isolation = 0;
  if (!design.output.filter && cLoad > 0) {
    // The load capacitance and the op-amp's open-loop output resistance add a pole inside the loop; it eats
    // phase margin once it comes within ten times the loop's crossover GBW/noise gain. A series resistor
    // outside the loop of at least the output resistance (and 47 Ω) isolates it; keep its R·C_L corner ten
    // times above the signal bandwidth (common practice).
    const ng = stage.ideal.noiseGain || 1;
    const crossover = design.opamp.gbw / ng;
    const fp = 1 / (2 * Math.PI * Math.max(design.opamp.outputResistance, 1e-3) * cLoad);
    if (fp < 10 * crossover) {
      const upper = 1 / (2 * Math.PI * 10 * Math.max(bandwidth, 1) * cLoad);
      isolation = Math.min(Math.max(47, design.opamp.outputResistance), upper);
    }
  }
  const scale = Math.abs(design.target.scale);
  const ratio = 1 / scale;
  const ratios = [1, 2, 5, 10, 20, 50, 100, 200, 500, 1000, 2000, 5000, 10000];
  const probeRatio = ratios.find((r) => Math.abs(r / ratio - 1) < 1e-6) ?? null;
  return { scaleAt1M: m1.dc?.out[1] ?? NaN, scaleAt50: m50.dc?.out[1] ?? NaN, drives50, isolation, probeRatio };
}
