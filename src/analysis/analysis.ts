/**
 * The analysis engine: everything the report says about a solved stage, computed from its circuit.
 * DC transfer and clipping, speed, noise, DC error budget, supply and battery, tolerance spread and
 * instrument drive. Each function is pure; `analyse` in report.ts strings them together.
 */
import type { Design } from '../model/design.js';
import type { LimitData } from '../model/findings.js';
import { buildCircuit, type StageCircuit } from '../circuit/build.js';
import { adjointAt, signalTransfer, solveDc, stampReal, luFactorReal, luSolveReal, rhs, workspace, type Element, type ElementRole } from '../circuit/mna.js';
import { integratePower, logGrid, peakToPeak } from '../physics/noise.js';
import { noiseSpectrum, type NoiseSpectrum } from '../circuit/noise.js';
import { atSensorSupply, sensorFront, type SensorFront, type SensorLimitKind } from '../physics/sensors.js';
import type { SolvedStage } from '../solve/stage.js';
import { peakRange } from '../physics/topology.js';
import { mulberry32 } from '../model/random.js';
import { HOUR, SPLITTER_CURRENT } from '../model/constants.js';
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
  /** The numbers behind the limit, for its wording (src/present/finding-words.ts). */
  data: LimitData;
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

/** The op-amp's output swing on these rails, V: outputLow above the negative rail to outputHigh below the positive. */
export function opampSwing(design: Design, positive = design.supply.positive): [number, number] {
  return [design.supply.negative + design.opamp.outputLow, positive - design.opamp.outputHigh];
}

/** Clipping: every limit as a measurand interval, then the first hit in each direction. */
export function clipping(design: Design, front: SensorFront, dc: DcPoint, positive = design.supply.positive): ClipResult {
  const neg = design.supply.negative;
  const oa = design.opamp;
  const limits: ClipLimit[] = [];
  const add = (cause: ClipCause, iv: [number, number], data: LimitData) => limits.push({ cause, low: iv[0], high: iv[1], data });
  const [swingLo, swingHi] = opampSwing(design, positive);
  add('opamp-output', within(dc.internal[0], dc.internal[1], swingLo, swingHi), { cause: 'opamp-output', low: swingLo, high: swingHi });
  add('opamp-current', within(dc.iOut[0], dc.iOut[1], -oa.outputCurrent, oa.outputCurrent), { cause: 'opamp-current', current: oa.outputCurrent });
  const inLo = neg + oa.inputLow, inHi = positive - oa.inputHigh;
  const ivP = within(dc.inP[0], dc.inP[1], inLo, inHi);
  const ivN = within(dc.inN[0], dc.inN[1], inLo, inHi);
  add('opamp-input', [Math.max(ivP[0], ivN[0]), Math.min(ivP[1], ivN[1])], { cause: 'opamp-input', low: inLo, high: inHi });
  if (Number.isFinite(front.outputMin) || Number.isFinite(front.outputMax)) {
    add('sensor', within(front.quiescent, front.sensitivity, front.outputMin, front.outputMax), { cause: 'sensor', what: 'output', low: front.outputMin, high: front.outputMax });
  }
  for (const l of front.limits) add(l.kind, [l.low, l.high], l.data);

  // The linear region is the intersection of every limit's interval. It need not contain zero: when the zero
  // itself sits outside it (a sagging rail), each side's limit is still reported.
  let xLo = -Infinity, xHi = Infinity, firstLow: ClipCause | null = null, firstHigh: ClipCause | null = null;
  let empty: ClipLimit | null = null;
  for (const l of limits) {
    if (Number.isNaN(l.low) || Number.isNaN(l.high)) { empty ??= l; continue; }
    if (l.low > xLo) { xLo = l.low; firstLow = l.cause; }
    if (l.high < xHi) { xHi = l.high; firstHigh = l.cause; }
  }
  if (!empty && xLo > xHi) empty = limits.find((l) => l.cause === (xLo > 0 ? firstLow : firstHigh)) ?? null;
  const linearAtZero = !empty && xLo <= 0 && xHi >= 0;
  if (empty) {
    // Nothing is linear anywhere: report the cause at zero measurand.
    firstLow = firstHigh = empty.cause;
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

/** An angle in degrees folded into (−180°, 180°]. `wrapDegrees(270)` → −90. */
export function wrapDegrees(deg: number): number {
  let x = deg;
  while (x > 180) x -= 360;
  while (x <= -180) x += 360;
  return x;
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

/** Gain (magnitude, V per measurand unit) and phase (degrees, unwrapped) at the output over f1…f2 Hz on a log grid of `points`. */
export function frequencyResponse(sc: StageCircuit, f1: number, f2: number, points = 200): FrequencyResponse {
  const freqs = new Float64Array(points), re = new Float64Array(points), im = new Float64Array(points);
  const ws = workspace(sc.circuit, true);
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
 * and the full-power bandwidth min(SR/(2π·Vp), BW) (the slew limit SR/(2π·Vp) is the textbook full-power
 * bandwidth, e.g. Sedra & Smith, Microelectronic Circuits, on slew rate; from memory).
 */
export function speed(design: Design, sc: StageCircuit, front: SensorFront, dc: DcPoint): Speed {
  const ws = workspace(sc.circuit, true);
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
  const phase = wrapDegrees(((Math.atan2(pi, pr) - Math.atan2(ri, rr)) * 180) / Math.PI);
  const [a, b] = peakRange(design);
  const peakSwing = Math.max(Math.abs(dc.pin[1] * a), Math.abs(dc.pin[1] * b));
  return {
    passband, lowCorner, smallSignal: bw, phaseAtCorner: phase, riseTime: Math.log(9) / (2 * Math.PI * bw),
    // A full-scale sine is limited by the slew rate and, like any signal, by the small-signal bandwidth: the
    // full-power bandwidth is the lower of the two (a slow op-amp never reaches its slew limit).
    fullPower: Math.min(peakSwing > 0 ? design.opamp.slewRate / (2 * Math.PI * peakSwing) : Infinity, bw), peakSwing,
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
  /** Each source's share of the noise power, largest first (`role` and `part` say what it is; src/present words it). */
  shares: Array<{ name: string; role?: ElementRole; part?: string; rms: number; fraction: number }>;
  /** Whether the band is the default one (`defaultBand`) rather than the design's own. */
  bandIsDefault: boolean;
  /** The 0.1–10 Hz figure that decides how far a DC reading wanders: rms and peak-to-peak at the output, V, and referred. */
  lowFrequency: { band: [number, number]; rms: number; peakToPeak: number; referredPeakToPeak: number };
}

/** The low-frequency band whose peak-to-peak noise is quoted for DC work, Hz (common practice: 0.1–10 Hz). */
const LOW_FREQUENCY_BAND: readonly [number, number] = [0.1, 10];

/**
 * Share of a single pole's noise bandwidth (π/2)·f_c that the default band's top, 100 × f_c, holds:
 * ∫₀^{100 f_c} df/(1 + (f/f_c)²) = f_c·atan(100), over (π/2)·f_c → 0.9936 (derived).
 */
export const DEFAULT_BAND_SHARE = Math.atan(100) / (Math.PI / 2);

/** The default noise band: 1 Hz (or a tenth of an AC-coupled chain's low corner) to 100 × the −3 dB frequency. */
export function defaultBand(sp: Speed): [number, number] {
  return [Math.max(1, sp.lowCorner / 10 || 1), Math.max(100 * sp.smallSignal, 10)];
}

/**
 * Output noise: the density of every source by one adjoint solve per frequency, integrated over the band
 * (the design's own, or 1 Hz … 100 × the bandwidth), rms and peak-to-peak (6.6 σ, common practice), referred to
 * the measurand, with the low-frequency wander over 0.1–10 Hz kept apart. Units: V/√Hz, V rms, measurand rms.
 */
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
    return { name: s.name, ...(s.role ? { role: s.role } : {}), ...(s.part ? { part: s.part } : {}), rms: Math.sqrt(p), fraction: power > 0 ? p / power : 0 };
  }).sort((a, b) => b.fraction - a.fraction);
  const g = Math.abs(sp.passband) || NaN;
  const lf = LOW_FREQUENCY_BAND;
  const lfFreqs = logGrid(lf[0], lf[1], 24);
  const lfRms = Math.sqrt(integratePower(lfFreqs, noiseSpectrum(sc.circuit, sc.nodes.out, lfFreqs, T).total));
  return {
    spectrum, band, densityAt1kHz: at1k, rms, peakToPeak: peakToPeak(rms), referredRms: rms / g,
    referredDensityAt1kHz: at1k / g, shares, bandIsDefault: design.analysis.noiseBand === null,
    lowFrequency: { band: [lf[0], lf[1]], rms: lfRms, peakToPeak: peakToPeak(lfRms), referredPeakToPeak: peakToPeak(lfRms) / g },
  };
}

export interface ErrorTerm {
  name: string;
  /** Error in measurand units at the range end the budget is stated at (`ErrorBudget.at`). */
  value: number;
  /** The same at the low and the high end of the range. */
  low: number;
  high: number;
  /** zero: removed by the zero trim; scale: by the gain trim; none: remains after calibration. */
  removedBy: 'zero' | 'scale' | 'both' | 'none';
  /** A term of the calibration itself (meter, trimmer resolution): it exists only after calibration. */
  calibration?: boolean;
}

export interface ErrorBudget {
  terms: ErrorTerm[];
  worstCase: number;
  rss: number;
  afterTrim: number;
  afterTrimRss: number;
  /** Measurand at which the errors are stated: the range end with the larger worst case after calibration. */
  at: number;
  /** Worst case after calibration at the low and the high range end. */
  afterTrimLow: number;
  afterTrimHigh: number;
}

/**
 * Where the span is calibrated, as a fraction of the range end (the calibration steps apply about half the
 * range end; common practice: large enough to read well, small enough for a bench supply).
 */
const SPAN_CALIBRATION_FRACTION = 0.5;

/** The stage circuit with every resistor of one part multiplied by `factor` (a copy; the circuit is untouched). */
function withPartScaled(sc: StageCircuit, part: string, factor: number): StageCircuit {
  const c = sc.circuit;
  const elements = c.elements.map((e) => (e.kind === 'R' && e.part === part ? { ...e, value: e.value * factor } : e));
  return { ...sc, circuit: { ...c, elements } };
}

/**
 * DC error budget at both range ends, in measurand units. Each resistor and trimmer is moved by its
 * tolerance alone and the scale and zero recomputed from the circuit; offsets, bias currents and rails come
 * from their own DC columns. A rail that feeds a ratiometric sensor moves the sensor's zero and sensitivity
 * with it (the sensor tracks its rail). After calibration the static terms go and what the calibration
 * itself leaves comes in: the trimmers' settable step and the meter's uncertainty, with the span taken from
 * the difference of two readings (at the zero and at the calibration point) so that a zero error does not
 * enter the span.
 */
export function errorBudget(design: Design, stage: SolvedStage, front: SensorFront, sc: StageCircuit, dc: DcPoint): ErrorBudget {
  const terms: ErrorTerm[] = [];
  const [a, b] = peakRange(design);
  const scale = dc.out[1];
  const toUnits = (volts: number) => Math.abs(volts / scale);
  // A term as an output change dz + ds·x (V), read at both ends in measurand units.
  const lin = (name: string, dz: number, ds: number, removedBy: ErrorTerm['removedBy'], calibration = false) =>
    ({ name, value: 0, low: toUnits(dz + ds * a), high: toUnits(dz + ds * b), removedBy, ...(calibration ? { calibration } : {}) });
  const add = (t: ErrorTerm) => { terms.push(t); };
  const passband = !front.passesDc;
  const zeroTrim = !!stage.network.reference.trim;
  const gainTrim = !!stage.network.gainTrim;
  const env = design.environment;
  const dT = Math.max(Math.abs(env.temperatureMax - env.temperature), Math.abs(env.temperature - env.temperatureMin));
  const o = sc.nodes.out - 1;
  const sup = design.supply;
  const oa = design.opamp;
  const sol = solveDc(sc.circuit, [
    (e) => e.extra?.vos ?? 0, (e) => (e.extra?.ibp ?? 0) + (e.extra?.ibn ?? 0), (e) => (e.kind === 'V' && (e.role === 'signal' || e.role === 'sensor-zero') ? 1 : 0),
    (e) => (e.role === 'rail-regulated' ? 1 : 0), (e) => (e.role === 'rail-positive' ? 1 : 0), (e) => (e.role === 'rail-negative' ? 1 : 0),
  ], passband);
  if (sol) {
    const [cVos, cIb, cVq, cReg, cPos, cNeg] = sol.columns.map((c) => c[o]!) as [number, number, number, number, number, number];
    add(lin('op-amp offset voltage', cVos, 0, 'zero'));
    add(lin('op-amp bias current', cIb, 0, 'zero'));
    if (front.quiescentTolerance) add(lin('sensor zero tolerance', cVq * front.quiescentTolerance, 0, 'zero'));
    const vosPerVolt = oa.offsetVoltage ? cVos / oa.offsetVoltage : 0;
    if (oa.offsetDrift) add(lin('op-amp offset drift', vosPerVolt * oa.offsetDrift * dT, 0, 'none'));
    if (front.quiescentDrift) add(lin('sensor zero drift', cVq * front.quiescentDrift * dT, 0, 'none'));
    // A relative change ε of a rail: the networks hanging from it (its column) and, for a ratiometric sensor
    // fed from it, the sensor's zero and sensitivity by the same ε.
    const railShift = (rail: 'regulated' | 'positive', column: number, volts: number, eps: number): [number, number] => {
      const tracks = !!front.ratiometricSupply && sup.sensorRail === rail;
      return [column * volts * eps + (tracks ? cVq * front.quiescent * eps : 0), tracks ? scale * eps : 0];
    };
    const reg = sup.regulated;
    if (reg && sc.rails.regulated >= 0 && (sup.referenceRail === 'regulated' || sup.sensorRail === 'regulated')) {
      add(lin(`regulated rail tolerance (±${+(reg.tolerance * 100).toPrecision(3)} %)`, ...railShift('regulated', cReg, reg.voltage, reg.tolerance), 'both'));
      if (reg.drift) add(lin(`regulated rail drift (${+(reg.drift * 1e6).toPrecision(3)} ppm/K over ±${dT.toFixed(0)} K)`, ...railShift('regulated', cReg, reg.voltage, reg.drift * dT), 'none'));
    }
    // The op-amp's supply rejection: a change ΔV across its supply moves its offset by ΔV/PSRR.
    const psrr = 10 ** (-oa.psrrDb / 20);
    if (sup.battery) {
      // A battery sags after calibration: its sweep shows the rail's own effect; the offset's share remains.
      const span = (v: number) => { const [p, n] = batteryRails(design, v); return p - n; };
      add(lin(`op-amp supply rejection over the battery's sag (${oa.psrrDb} dB)`, vosPerVolt * (span(sup.battery.fresh) - span(sup.battery.endOfLife)) * psrr, 0, 'none'));
    } else if (sup.tolerance) {
      const [dzP, dsP] = railShift('positive', cPos, sup.positive, sup.tolerance);
      const dzN = cNeg * sup.negative * sup.tolerance;
      const railTerm = { ...lin(`supply rail tolerance (±${+(sup.tolerance * 100).toPrecision(3)} %)`, dzP, dsP, 'both'), low: toUnits(dzP + dsP * a) + toUnits(dzN), high: toUnits(dzP + dsP * b) + toUnits(dzN) };
      // Nothing may hang from the bench rails (a reference and sensor on a regulator): then there is no term.
      if (Math.max(railTerm.low, railTerm.high) > 1e-9 * Math.max(Math.abs(a), Math.abs(b))) add(railTerm);
      add(lin(`op-amp supply rejection of the rail tolerance (${oa.psrrDb} dB)`, vosPerVolt * (sup.positive - sup.negative) * sup.tolerance * psrr, 0, 'zero'));
    }
  }
  if (front.sensitivityTolerance) add(lin('sensor sensitivity tolerance', 0, scale * front.sensitivityTolerance, 'scale'));
  if (front.sensitivityDrift) add(lin('sensor sensitivity drift', 0, scale * front.sensitivityDrift * dT, 'none'));
  // Resistors and trimmers: each part alone at +tolerance; zero and scale shifts from the circuit. A
  // potentiometer's halves move together (its tolerance and tempco scale the whole track).
  const base0 = dc.out[0], base1 = dc.out[1];
  const drift = { resistor: { low: 0, high: 0 }, trimmer: { low: 0, high: 0 } };
  for (const p of stage.parts) {
    if (p.kind === 'capacitor') continue;
    if (!sc.circuit.elements.some((e) => e.kind === 'R' && e.part === p.ref)) continue;
    // The same circuit with this part's resistors scaled (what buildCircuit's `scale` option builds, without
    // building the rest again: only element values change, not the nodes or the branches).
    const shift = (rel: number) => {
      const sc2 = withPartScaled(sc, p.ref, 1 + rel);
      const d2 = dcLinear(sc2, passband);
      if (!d2) return { dz: 0, ds: 0 };
      return { dz: d2.out[0] - base0, ds: d2.out[1] - base1 };
    };
    const t = shift(p.tolerance);
    add(lin(`${p.ref} tolerance (${formatEng(p.ohms, 'Ω', 3)})`, t.dz, t.ds, 'both'));
    const tc = p.kind === 'trimmer' ? design.target.trimmerTempco : design.target.tempco;
    if (tc) {
      const d = shift(Math.abs(tc) * dT);
      const acc = p.kind === 'trimmer' ? drift.trimmer : drift.resistor;
      acc.low += toUnits(d.dz + d.ds * a);
      acc.high += toUnits(d.dz + d.ds * b);
    }
  }
  if (drift.resistor.low || drift.resistor.high) add({ name: `resistor tempco (${(design.target.tempco * 1e6).toFixed(0)} ppm/K over ±${dT.toFixed(0)} K)`, value: 0, ...drift.resistor, removedBy: 'none' });
  if (drift.trimmer.low || drift.trimmer.high) add({ name: `trimmer tempco (${(design.target.trimmerTempco * 1e6).toFixed(0)} ppm/K over ±${dT.toFixed(0)} K)`, value: 0, ...drift.trimmer, removedBy: 'none' });
  // What the calibration itself leaves: the trimmers' settable step and the meter.
  if (stage.network.reference.trim) add(lin('zero trimmer resolution', stage.network.reference.trim.step, 0, 'none', true));
  if (stage.network.gainTrim) add(lin('span trimmer resolution', 0, scale * stage.network.gainTrim.step, 'none', true));
  const cal = design.calibration;
  const end = Math.max(Math.abs(a), Math.abs(b)) / (design.target.signal === 'ac-rms' ? Math.SQRT2 : 1);
  const xCal = SPAN_CALIBRATION_FRACTION * end;
  if (cal.meterRelative || cal.meterDigits) {
    // Zero: one reading of the output at zero, ±(r·|z| + d). Span: the difference of the readings at the
    // calibration point and at zero, ±(r·|s·x_cal| + 2d), against the applied measurand read to ±r, so the
    // relative span error is r + (r·|s·x_cal| + 2d)/|s·x_cal|. An AC span is one rms reading (its zero is
    // not in it): ±(r·|s·x_cal| + d).
    const ac = design.target.signal === 'ac-rms';
    add(lin('calibration meter, zero reading', cal.meterRelative * Math.abs(base0) + cal.meterDigits, 0, 'none', true));
    const rel = cal.meterRelative + (cal.meterRelative * Math.abs(scale * xCal) + (ac ? 1 : 2) * cal.meterDigits) / Math.abs(scale * xCal);
    add(lin(ac ? 'calibration meter, span (one rms reading)' : 'calibration meter, span from two readings', 0, scale * rel, 'none', true));
  }
  const removed = (t: ErrorTerm) => (t.removedBy === 'zero' && zeroTrim) || (t.removedBy === 'scale' && gainTrim) || (t.removedBy === 'both' && zeroTrim && gainTrim);
  const before = terms.filter((t) => !t.calibration);
  const after = terms.filter((t) => t.calibration || !removed(t));
  const sum = (ts: ErrorTerm[], k: 'low' | 'high') => ts.reduce((x, t) => x + t[k], 0);
  const rss = (ts: ErrorTerm[], k: 'low' | 'high') => Math.sqrt(ts.reduce((x, t) => x + t[k] ** 2, 0));
  const afterLow = sum(after, 'low'), afterHigh = sum(after, 'high');
  const k: 'low' | 'high' = afterLow > afterHigh ? 'low' : 'high';
  for (const t of terms) t.value = t[k];
  return {
    terms, worstCase: sum(before, k), rss: rss(before, k), afterTrim: Math.max(afterLow, afterHigh), afterTrimRss: rss(after, k),
    at: k === 'low' ? a : b, afterTrimLow: afterLow, afterTrimHigh: afterHigh,
  };
}

export interface SupplyResult {
  /** Current from the positive rail at zero measurand, A. */
  current: number;
  parts: Array<{ name: string; current: number }>;
  /** Running time on the battery, hours (null without a battery). */
  batteryLife: number | null;
}

/** Supply current at zero measurand, A (op-amp and sensor quiescent, what the rails deliver to the networks, the output current into the load, the regulator's own), by part, and battery life, h (capacity ÷ current). */
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
  if (design.supply.battery?.rails === 'split') parts.push({ name: 'rail splitter', current: design.supply.battery.splitterCurrent ?? SPLITTER_CURRENT });
  const current = parts.reduce((s, p) => s + p.current, 0);
  return { current, parts, batteryLife: batteryLifeAt(design, current) };
}

/** Running time on the battery at a current, hours: capacity ÷ current (null without a battery or a current). */
function batteryLifeAt(design: Design, current: number): number | null {
  const bat = design.supply.battery;
  return bat && current > 0 ? bat.capacity / current / HOUR : null;
}

/**
 * The supply with a further steady draw beside the stage's own (a range switch's dividers not in use, which
 * stay across their rail), and the battery clip's hours for it: the clip voltage is the stage's, the time to
 * reach it is the charge over the larger current.
 */
export function withExtraDraw(design: Design, sup: SupplyResult, clip: BatteryClip | null, part: string, amps: number): { supply: SupplyResult; batteryClip: BatteryClip | null } {
  if (!(amps > 0)) return { supply: sup, batteryClip: clip };
  const current = sup.current + amps;
  const supply: SupplyResult = { current, parts: [...sup.parts, { name: part, current: amps }], batteryLife: batteryLifeAt(design, current) };
  const bat = design.supply.battery;
  const batteryClip = clip && bat ? { voltage: clip.voltage, hoursToEnd: supply.batteryLife, hoursToClip: clip.voltage === null ? null : hoursToVoltage(bat, supply.batteryLife, clip.voltage) } : clip;
  return { supply, batteryClip };
}

/** Hours from a fresh battery to voltage v, the voltage taken as falling linearly with the charge drawn. */
function hoursToVoltage(bat: NonNullable<Design['supply']['battery']>, hoursToEnd: number | null, v: number): number | null {
  return hoursToEnd === null ? null : (hoursToEnd * (bat.fresh - v)) / (bat.fresh - bat.endOfLife);
}

export interface BatteryStep {
  voltage: number;
  measurandLow: number;
  measurandHigh: number;
  headroomLow: number;
  headroomHigh: number;
  zeroShift: number;
  /** Scale at this voltage, V per measurand unit (a ratiometric sensor on a regulator in dropout changes it). */
  scale: number;
  first: ClipCause | null;
  /** Whether the regulated rail (if any) still holds. */
  regulated: boolean;
}

/**
 * The stage at one positive-rail voltage: clip points, headroom, zero and scale. A regulator holds while the
 * rail exceeds its output by its dropout; below that its output follows the rail, dropout below it, and a
 * ratiometric sensor fed from it scales with it.
 */
function batteryStep(design: Design, stage: SolvedStage, front: SensorFront, zero: number, v: number): BatteryStep | null {
  const passband = !front.passesDc;
  const reg = design.supply.regulated;
  const dropout = reg?.dropout ?? 0;
  const [pos, neg] = batteryRails(design, v);
  const regulated = !reg || pos - neg >= reg.voltage + dropout;
  const regOut = reg ? (regulated ? reg.voltage : Math.max(pos - dropout - neg, 0.01)) : 0;
  const sensorSupply = design.supply.sensorRail === 'regulated' && reg ? regOut : pos;
  // A closed-loop Hall sensor's held range and mid-rail reference follow the rails (issue #20).
  const f2 = design.sensor.type === 'closed-loop-hall' ? sensorFront(design.sensor, { ...design, supply: { ...design.supply, positive: pos, negative: neg } }) : atSensorSupply(front, sensorSupply);
  const sup2 = { ...design.supply, negative: neg, ...(reg && !regulated ? { regulated: { ...reg, voltage: regOut } } : {}) };
  const d2: Design = (reg && !regulated) || neg !== design.supply.negative ? { ...design, supply: sup2 } : design;
  const sc = buildCircuit(d2, stage, front, { positive: pos, front: f2 });
  const dc = dcLinear(sc, passband);
  if (!dc) return null;
  const c = clipping(d2, f2, dc, pos);
  return { voltage: v, measurandLow: c.measurandLow, measurandHigh: c.measurandHigh, headroomLow: c.headroom.low, headroomHigh: c.headroom.high, zeroShift: dc.out[0] - zero, scale: dc.out[1], first: c.first, regulated };
}

/**
 * The rails, V, that a battery at `v` volts makes (`supply.battery.rails`): the positive rail itself over the
 * design's negative rail; one battery split about the amplifier's ground by a rail splitter (±v/2); or a
 * second, equal battery below ground (±v; both taken to sag alike, which is pessimistic for the lower one,
 * which carries less current).
 */
export function batteryRails(design: Design, v: number): [number, number] {
  const rails = design.supply.battery?.rails ?? 'positive';
  return rails === 'split' ? [v / 2, -v / 2] : rails === 'pair' ? [v, -v] : [v, design.supply.negative];
}

/** Sweep of the positive rail from a fresh battery to its end of life: clip points, headroom, zero and scale. */
export function batterySweep(design: Design, stage: SolvedStage, front: SensorFront, zero: number, steps = 9): BatteryStep[] {
  const bat = design.supply.battery;
  if (!bat) return [];
  const out: BatteryStep[] = [];
  for (let i = 0; i < steps; i++) {
    const s = batteryStep(design, stage, front, zero, bat.fresh + ((bat.endOfLife - bat.fresh) * i) / (steps - 1));
    if (s) out.push(s);
  }
  return out;
}

export interface BatteryClip {
  /** Highest battery voltage at which the output first clips inside the range, V (null: never, down to end of life). */
  voltage: number | null;
  /** Hours from a fresh battery to that voltage and to end of life (null without a current figure). */
  hoursToClip: number | null;
  hoursToEnd: number | null;
}

/**
 * Where the output first clips inside the range as the battery sags, solved exactly: the smaller headroom is
 * continuous in the rail voltage (piecewise linear), so its sign change between two sweep points is
 * bracketed to 1 µV by false position (`crossingBracket`: one or two solves on a straight piece, bisection
 * where it bends). Times assume the battery voltage falls linearly with the charge drawn at a constant
 * current (t = Q/I, Q the capacity; the straight line from fresh to end of life is our approximation, a
 * real cell's curve is flatter in the middle).
 */
export function batteryClip(design: Design, stage: SolvedStage, front: SensorFront, zero: number, sweep: BatteryStep[], sup: SupplyResult): BatteryClip {
  const bat = design.supply.battery;
  const hoursToEnd = sup.batteryLife;
  if (!bat) return { voltage: null, hoursToClip: null, hoursToEnd: null };
  const margin = (s: BatteryStep | null) => (s ? Math.min(s.headroomLow, s.headroomHigh) : -Infinity);
  const hours = (v: number) => hoursToVoltage(bat, hoursToEnd, v);
  const k = sweep.findIndex((s) => margin(s) < 0);
  if (k < 0) return { voltage: null, hoursToClip: null, hoursToEnd };
  if (k === 0) return { voltage: sweep[0]!.voltage, hoursToClip: 0, hoursToEnd };
  const v = crossingBracket(sweep[k]!.voltage, margin(sweep[k]!), sweep[k - 1]!.voltage, margin(sweep[k - 1]!), 1e-6,
    (x) => margin(batteryStep(design, stage, front, zero, x)));
  return { voltage: v, hoursToClip: hours(v), hoursToEnd };
}

/**
 * The point where a continuous function g crosses from negative (at `lo`) to non-negative (at `hi`), to within
 * `tol`: the middle of a bracket [lo, hi] no wider than `tol` with g(lo) < 0 ≤ g(hi). Each round places a
 * false-position estimate (exact on a straight piece) and probes 0.45·`tol` either side of it, which closes the
 * bracket at once when g is straight there; a round that does not halve the bracket is followed by a
 * bisection, so it never takes more rounds than bisection's doubled (Press et al., Numerical Recipes, §9.2–9.3,
 * false position and bisection; from memory).
 */
export function crossingBracket(lo: number, gLo: number, hi: number, gHi: number, tol: number, g: (x: number) => number): number {
  let bisectNext = false;
  for (let i = 0; i < 120 && hi - lo > tol; i++) {
    const width = hi - lo;
    const straight = Number.isFinite(gLo) && Number.isFinite(gHi) && gHi > gLo;
    if (bisectNext || !straight) {
      const m = (hi + lo) / 2;
      const gm = g(m);
      if (gm < 0) { lo = m; gLo = gm; } else { hi = m; gHi = gm; }
      bisectNext = false;
      continue;
    }
    const x = Math.min(Math.max(lo + (width * -gLo) / (gHi - gLo), lo + tol / 2), hi - tol / 2);
    for (const p of [x + 0.45 * tol, x - 0.45 * tol]) {
      if (!(p > lo && p < hi)) continue;
      const gp = g(p);
      if (gp < 0) { lo = p; gLo = gp; } else { hi = p; gHi = gp; }
      if (hi - lo <= tol) break;
    }
    bisectNext = hi - lo > width / 2;
  }
  return (hi + lo) / 2;
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
 * ±20 % on their whole track, both halves of a potentiometer together), the sensor's sensitivity and zero
 * uniform within theirs; seeded so runs repeat.
 */
export function spread(design: Design, front: SensorFront, sc: StageCircuit, dc: DcPoint, trials = design.analysis.spreadTrials, seed = design.analysis.spreadSeed): SpreadResult {
  const rand = mulberry32(seed);
  const c = sc.circuit;
  // Only the listed parts vary (the sensor's own resistances are its figures, not parts we choose).
  const tolOf = (e: Element): number => (e.kind !== 'R' || e.value === 0 || e.noisy === false || !e.part ? 0 : e.tolerance ?? 0);
  const nominal = c.elements.map((e) => e.value);
  const tols = c.elements.map(tolOf);
  // A potentiometer's tolerance scales its whole track: its two halves (one part) share one draw, so the
  // wiper ratio holds. Every other part draws on its own.
  const groupOf = c.elements.map((e, i) => e.part ?? `#${i}`);
  const groups = [...new Set(groupOf)];
  const groupIdx = Int32Array.from(groupOf, (g) => groups.indexOf(g));
  const draw = new Float64Array(groups.length);
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
    for (let g = 0; g < draw.length; g++) draw[g] = 2 * rand() - 1;
    for (let i = 0; i < c.elements.length; i++) {
      const tol = tols[i]!;
      if (tol) c.elements[i]!.value = nominal[i]! * (1 + tol * draw[groupIdx[i]!]!);
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
  /** Instrument probe-ratio setting that makes one displayed volt one measurand unit, or null when none fits. */
  probeRatio: number | null;
  /** Output at zero measurand at a 1 MΩ input, V: what the instrument's offset control must null. */
  probeOffset: number;
  /** The same as the instrument shows it with the probe ratio set, in measurand units (0 without a ratio). */
  probeOffsetShown: number;
  /** The scale is negative: the channel must be inverted to read the measurand with its sign. */
  probeInvert: boolean;
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
  // A probe ratio k shows volts × k: with k = 1/|scale| one displayed unit is one measurand unit, but the
  // zero is shown too (z·k at no measurand) and a negative scale reads with the wrong sign.
  const scale = Math.abs(design.target.scale);
  const ratio = 1 / scale;
  const ratios = [1, 2, 5, 10, 20, 50, 100, 200, 500, 1000, 2000, 5000, 10000];
  const probeRatio = ratios.find((r) => Math.abs(r / ratio - 1) < 1e-6) ?? null;
  const probeOffset = m1.dc?.out[0] ?? design.target.zero;
  const scaleAt1M = m1.dc?.out[1] ?? NaN;
  return {
    scaleAt1M, scaleAt50: m50.dc?.out[1] ?? NaN, drives50, isolation, probeRatio, probeOffset,
    probeOffsetShown: probeRatio ? probeOffset * probeRatio : 0, probeInvert: (Number.isFinite(scaleAt1M) ? scaleAt1M : design.target.scale) < 0,
  };
}
