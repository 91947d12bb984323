/**
 * The report: a pure function of the design. Solves the stage, builds its circuit and runs every analysis.
 * The app, the CLI and the tests all read this one object.
 */
import type { Design, MeasurandWaveform } from '../model/design.js';
import { sensorFrontAtRail, type SensorFront } from '../physics/sensors.js';
import { chooseTopology, type TopologyChoiceResult } from '../physics/topology.js';
import { kitFindings, switchKitFindings } from './kit.js';
import { solveStage, type SolvedStage } from '../solve/stage.js';
import { commonModeGain, openLoopOf } from '../solve/transfer.js';
import { buildCircuit, type StageCircuit } from '../circuit/build.js';
import {
  batteryClip, batterySweep, clipping, withExtraDraw, dcLinear, defaultBand, errorBudget, frequencyResponse, responseFromSpectrum, instrumentDrive, nodeLinear, noise, speed, spread, supply, transferAt, transferCurve, wrapDegrees,
  type BatteryClip, type BatteryStep, type ClipCause, type ClipResult, type DcPoint, type ErrorBudget, type FrequencyResponse, type InstrumentDrive, type NoiseResult,
  type Speed, type SpreadResult, type SupplyResult,
} from './analysis.js';
import { stepOverRange, waveform, type WaveformResult } from './waveform.js';
import { finding, type Finding } from '../model/findings.js';
import { closedLoopSummary, type ClosedLoopSummary } from './closed-loop.js';
import { frontWithReadings, sensorFromReadings, type SensorFromReadings } from './sensor-readings.js';
import { trimFromReadings, type TrimResult } from './trim.js';
import { tradeSweep, type TradeResult } from './trade.js'; // issue 19
import { IDLE_DIVIDERS, rangeFindings, rangeSwitch, type RangeSwitchResult } from './ranges.js'; // issue 19

export interface Report {
  design: Design;
  front: SensorFront;
  choice: TopologyChoiceResult;
  stage: SolvedStage | null;
  circuit: StageCircuit | null;
  dc: DcPoint | null;
  clip: ClipResult | null;
  transfer: ReturnType<typeof transferCurve> | null;
  response: FrequencyResponse | null;
  speed: Speed | null;
  noise: NoiseResult | null;
  errors: ErrorBudget | null;
  supply: SupplyResult | null;
  battery: BatteryStep[];
  /** Where and when the output first clips inside the range as the battery sags (null without a battery). */
  batteryClip: BatteryClip | null;
  spread: SpreadResult | null;
  drive: InstrumentDrive | null;
  /** The output for the measurand waveform (the design's, or a step over the range when asked for). */
  waveform: WaveformResult | null;
  /** The measurand waveform solved, or null. */
  waveformSpec: MeasurandWaveform | null;
  /** The fit of the sensor's bench readings and what the design took from it (null: no readings). */
  readings: SensorFromReadings | null;
  /** The trim solved from the built probe's readings (design.probeReadings; null: none given). */
  trim: TrimResult | null;
  /** Issue 19: the turns / gap (or turns / burden) trade sweep, when asked for (`AnalyseOptions.trade`) and the sensor has one. */
  trade: TradeResult | null;
  /** Issue 19: the range switch (design.target.ranges), each position analysed with its own parts; null without one. */
  ranges: RangeSwitchResult | null;
  /** What was found, as data (codes and numbers); src/present/finding-words.ts words them. */
  warnings: Finding[];
  /** Figures that could not be computed, with the reason. */
  absent: Record<string, string>;
  /** A closed-loop Hall sensor's step, supply at the range end and turns trade (issue #20; absent otherwise). */
  closedLoop?: ClosedLoopSummary | null;
}

export interface AnalyseOptions {
  /** Skip the Monte Carlo (for quick edits and batch runs); trials otherwise from the design. */
  spreadTrials?: number;
  /** Points of the AC plot. */
  acPoints?: number;
  /** When the design names no waveform, solve a step over the wanted range (the app's starting point). */
  defaultWaveform?: boolean;
  /** Samples of the waveform (default 2000). */
  waveformSamples?: number;
  /** Issue 19: run the trade sweep (a stage solve per point, so only where it is shown). */
  trade?: boolean;
  /**
   * A steady draw beside the stage's own, counted in the supply current and battery life (a range switch's
   * dividers not in use, for one position's report).
   */
  extraDraw?: { part: string; amps: number };
  /**
   * Issue 19: analyse these parts instead of solving the stage (a range switch's position, built with the
   * parts the switch puts in). The design's chosen stage must be the one they were built for.
   */
  stage?: SolvedStage;
}

/** Analyses a (validated) design. Never throws for a valid design: what cannot be computed is in `absent`. */
export function analyse(given: Design, opts: AnalyseOptions = {}): Report {
  // A sensor "from readings" is analysed with the fit's sensitivity and zero in place of its own figures.
  const fromReadings = sensorFromReadings(given);
  const design = fromReadings.design;
  const front = frontWithReadings(sensorFrontAtRail(design.sensor, design), fromReadings.readings, design.sensor.measurand);
  const choice = chooseTopology(design, front);
  const warnings: Finding[] = [...front.warnings, ...fromReadings.warnings, ...sensorSupplyFindings(design)];
  const absent: Record<string, string> = {};
  // Issue 19: the trade is worth most when the design itself fails, so it is run before any early return.
  const trade = opts.trade ? tradeSweep(given) : null;
  const empty: Report = {
    design, front, choice, stage: null, circuit: null, dc: null, clip: null, transfer: null, response: null, speed: null, noise: null,
    errors: null, supply: null, battery: [], batteryClip: null, spread: null, drive: null, waveform: null, waveformSpec: null, readings: fromReadings.readings, trim: null, trade, ranges: null, warnings, absent,
  };
  // The gain the target asks of the stage: a ratio that is not a finite, non-zero number cannot be built.
  const needed = design.target.scale / front.sensitivity;
  if (!Number.isFinite(needed) || needed === 0 || !Number.isFinite(front.sensitivity)) {
    warnings.push(finding('gain-not-computable', 'fail', {}));
    absent.all = 'the gain cannot be computed from the wanted scale and the sensor\'s sensitivity';
    return { ...empty, choice: { ...choice, chosen: null, considered: [], guidance: [] } };
  }
  if (!choice.chosen) {
    warnings.push(finding('no-topology', 'fail', { considered: choice.considered.map((c) => ({ topology: c.topology, reasons: c.reasons })) }));
    for (const g of choice.guidance) warnings.push(finding('guidance', 'info', g));
    absent.all = 'no topology can reach the target on these rails';
    return empty;
  }
  const stage = opts.stage ?? solveStage(design, front, choice.chosen);
  // A resistor kit: a value used beyond the kit's count, or how close the kit gets and the value to buy.
  warnings.push(...stage.warnings, ...kitFindings(design, front, choice.chosen, stage));
  if (stage.warnings.some((w) => w.level === 'fail') || !Number.isFinite(stage.gain)) {
    absent.all = 'the resistor solver found no realisation';
    return { ...empty, stage };
  }
  const circuit = buildCircuit(design, stage, front);
  const passband = !front.passesDc;
  const dc = dcLinear(circuit, passband);
  if (!dc) {
    absent.all = 'the circuit could not be solved (singular network)';
    warnings.push(finding('singular', 'fail', {}));
    return { ...empty, stage, circuit };
  }
  // Every figure is checked before it is reported: one that did not come out as a finite number is left out,
  // with the reason, instead of reaching a page as NaN or Infinity (the last guard behind the file's bounds).
  const clip = finiteOr(clipping(design, front, dc), 'clip', 'the clipping points', absent, ['limits']);
  const transfer = clip ? finiteOr(transferCurve(dc, clip), 'transfer', 'the transfer curve', absent) : null;
  const sp = finiteOr(plausibleSpeed(speed(design, circuit, front, dc), dc, front, absent), 'speed', 'the bandwidth', absent);
  // One sweep gives the noise and, over the default band, the frequency response from the same solves.
  const nz = sp ? finiteOr(noise(design, circuit, sp, opts.acPoints ? Math.max(opts.acPoints | 1, 21) : 201), 'noise', 'the noise', absent) : null;
  if (!sp) absent.noise = 'the noise cannot be computed, because the bandwidth it is integrated over cannot';
  const response = !sp ? null : design.analysis.noiseBand === null
    ? (nz ? finiteOr(responseFromSpectrum(nz.spectrum), 'response', 'the frequency response', absent) : null)
    : finiteOr(frequencyResponse(circuit, defaultBand(sp)[0], defaultBand(sp)[1], opts.acPoints ?? 200), 'response', 'the frequency response', absent);
  const errors = finiteOr(errorBudget(design, stage, front, circuit, dc), 'errors', 'the error budget', absent);
  const sup0 = finiteOr(supply(design, front, circuit, dc), 'supply', 'the supply current', absent);
  const battery = finiteOr(batterySweep(design, stage, front, dc.out[0]), 'battery', 'the battery sweep', absent) ?? [];
  const bClip0 = design.supply.battery && sup0 ? finiteOr(batteryClip(design, stage, front, dc.out[0], battery, sup0), 'batteryClip', 'the battery life to the first clip', absent) : null;
  const { supply: sup, batteryClip: bClip } = sup0 && opts.extraDraw ? withExtraDraw(design, sup0, bClip0, opts.extraDraw.part, opts.extraDraw.amps) : { supply: sup0, batteryClip: bClip0 };
  const trials = opts.spreadTrials ?? design.analysis.spreadTrials;
  const spr = trials > 0 ? finiteOr(spread(design, front, circuit, dc, trials), 'spread', 'the tolerance spread', absent) : null;
  if (!spr && !absent.spread) absent.spread = 'the tolerance spread was not run';
  const drive = sp ? finiteOr(instrumentDrive(design, stage, front, sp.smallSignal), 'drive', 'the instrument drive', absent) : null;
  const waveformSpec = design.analysis.waveform ?? (opts.defaultWaveform ? stepOverRange(design) : null);
  const wave = waveformSpec && clip && sp ? waveform(design, waveformSpec, circuit, front, dc, clip, sp, opts.waveformSamples ?? 2000) : null;
  if (waveformSpec && !wave) absent.waveform = clip && sp ? 'the time-domain solve did not finish (a singular network, or more than 400 000 steps)' : 'the waveform cannot be computed, because the clipping points or the bandwidth cannot';
  const report: Report = {
    design, front, choice, stage, circuit, dc, clip, transfer, response, speed: sp, noise: nz, errors, supply: sup, battery, batteryClip: bClip, spread: spr, drive,
    waveform: wave, waveformSpec: wave ? waveformSpec : null, readings: fromReadings.readings, trim: null, trade, ranges: null, warnings, absent,
  };
  // Issue 19: a range switch's further positions, each analysed as a single-range design with its own parts.
  if (design.target.ranges?.length && !opts.stage) {
    report.ranges = rangeSwitch(design, report, analyse, { spreadTrials: 0, acPoints: opts.acPoints });
    warnings.push(...rangeFindings(report.ranges, design.sensor.measurand));
    // Two poles: the other positions' dividers stay on their rail and draw from the battery too.
    if (report.ranges.ok && report.supply) Object.assign(report, withExtraDraw(design, report.supply, report.batteryClip, IDLE_DIVIDERS, report.ranges.value.idleAtFirst));
    // Issue 18: the whole switch from one resistor kit.
    if (report.ranges.ok) warnings.push(...switchKitFindings(design, report.ranges.value.parts, stage.parts));
  }
  if (design.probeReadings?.length) report.trim = trimFromReadings({ design, front, stage }, design.probeReadings, design.probeSettings ?? []);
  // --- closed-loop Hall sensor (issue #20) ---
  if (design.sensor.type === 'closed-loop-hall') report.closedLoop = closedLoopSummary(design, sup?.current ?? front.supplyCurrent);
  // --- end closed-loop Hall sensor ---
  warnings.push(...findings(report));
  return report;
}

/**
 * The first number in a figure that is not finite, as a path (`.smallSignal`, `.x[3]`), or null. `skip` names
 * keys whose infinities mean "no limit" on purpose (a clip limit that never binds).
 */
export function firstNonFinite(x: unknown, skip: readonly string[] = [], path = ''): string | null {
  if (typeof x === 'number') return Number.isFinite(x) ? null : path || '(value)';
  if (ArrayBuffer.isView(x) && !(x instanceof DataView)) {
    const a = x as unknown as ArrayLike<number>;
    for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i]!)) return `${path}[${i}]`;
    return null;
  }
  if (Array.isArray(x)) {
    for (let i = 0; i < x.length; i++) { const p = firstNonFinite(x[i], skip, `${path}[${i}]`); if (p) return p; }
    return null;
  }
  if (x && typeof x === 'object') {
    for (const [k, v] of Object.entries(x)) {
      if (skip.includes(k)) continue;
      const p = firstNonFinite(v, skip, `${path}.${k}`);
      if (p) return p;
    }
  }
  return null;
}

/** The figure when every number in it is finite; otherwise null, with "cannot be computed, because …" in `absent`. */
function finiteOr<T>(figure: T, key: string, what: string, absent: Record<string, string>, skip: readonly string[] = []): T | null {
  const at = firstNonFinite(figure, skip);
  if (at === null) return figure;
  absent[key] = `${what} cannot be computed, because a value it depends on came out ${Number.isNaN(pick(figure, at)) ? 'undefined' : 'infinite'} (${key}${at}): the design's figures are beyond what the arithmetic can hold; check them for a slipped prefix or exponent`;
  return null;
}

/**
 * A bandwidth search starts at 1 mHz: a chain that already reads less than half its DC scale there has its
 * corner below the search (or passes nothing), and the corner found would be the search's floor, not the
 * chain's. Such a speed is left out with the reason.
 */
function plausibleSpeed(sp: Speed, dc: DcPoint, front: SensorFront, absent: Record<string, string>): Speed | null {
  if (!(sp.passband > 0) || (front.passesDc && sp.passband < 0.5 * Math.abs(dc.out[1]))) {
    absent.speed = 'the bandwidth cannot be computed, because the chain already reads less than half its DC scale at 1 mHz, the lowest frequency searched: check the op-amp\'s GBW and the sensor\'s bandwidth';
    return null;
  }
  return sp;
}

/** The number at a path written by firstNonFinite (for the wording of the reason only). */
function pick(x: unknown, path: string): number {
  let o: unknown = x;
  for (const m of path.matchAll(/\.([^.[\]]+)|\[(\d+)\]/g)) o = (o as Record<string, unknown>)?.[m[1] ?? m[2]!];
  return typeof o === 'number' ? o : NaN;
}

/** What the figures say, as findings (codes and numbers). */
function findings(r: Report): Finding[] {
  const w: Finding[] = [];
  const d = r.design;
  const m = d.sensor.measurand;
  const clip = r.clip, sp = r.speed;
  if (!clip) return w;
  const [a, b] = clip.rangePeak;
  const limitOf = (cause: ClipCause | null) => clip.limits.find((l) => l.cause === cause)?.data ?? null;
  if (d.target.signal === 'ac-rms') w.push(finding('ac-peak', 'info', { peak: Math.max(Math.abs(a), Math.abs(b)), measurand: m }));
  if (!clip.linear) {
    w.push(finding('not-linear-at-zero', 'fail', { measurand: m, limit: limitOf(clip.first) }));
  } else {
    const covers = clip.measurandLow <= a && clip.measurandHigh >= b;
    if (!clip.linearAtZero) w.push(finding('zero-outside-linear', covers ? 'info' : 'caution', { low: clip.measurandLow, high: clip.measurandHigh, coversRange: covers, measurand: m }));
    if (clip.measurandLow > a) w.push(finding('clips-in-range-low', 'fail', { at: clip.measurandLow, wanted: a, measurand: m, limit: limitOf(clip.firstLow) }));
    if (clip.measurandHigh < b) w.push(finding('clips-in-range-high', 'fail', { at: clip.measurandHigh, wanted: b, measurand: m, limit: limitOf(clip.firstHigh) }));
  }
  if (sp && d.target.bandwidth > 0 && sp.smallSignal < d.target.bandwidth) {
    w.push(finding('bandwidth-short', 'fail', { bandwidth: sp.smallSignal, wanted: d.target.bandwidth }));
  }
  if (sp && d.target.bandwidth > 0 && sp.fullPower < d.target.bandwidth) {
    w.push(finding('slew-limited', 'caution', { fullPower: sp.fullPower, wanted: d.target.bandwidth }));
  }
  // An AC-coupled sensor at mains frequency (50 Hz, the lower of the two in use; common practice): how far
  // below its passband scale it reads there, from the circuit itself.
  if (!r.front.passesDc && r.circuit && r.speed) {
    const mains = 50;
    const [hr, hi] = transferAt(r.circuit, mains);
    const short = 1 - Math.hypot(hr, hi) / Math.abs(r.speed.passband);
    const [pr, pi] = transferAt(r.circuit, Math.sqrt(r.speed.lowCorner * r.speed.smallSignal));
    w.push(finding('ac-low-frequency', short > 0.01 ? 'caution' : 'info', { shortfall: short, leadDegrees: wrapDegrees(((Math.atan2(hi, hr) - Math.atan2(pi, pr)) * 180) / Math.PI), lowCorner: r.speed.lowCorner, frequency: mains }));
  }
  // What the amplifier's input network draws from the sensor's output (through its source resistance).
  if (r.circuit && (d.sensor.type === 'voltage-output' || d.sensor.type === 'hall-gap-core')) {
    const draw = sensorDraw(r);
    if (draw !== null && r.front.outputDrive > 0 && draw > r.front.outputDrive) w.push(finding('sensor-drive', 'fail', { draw, drive: r.front.outputDrive }));
    else if (draw !== null && draw > 1e-6) w.push(finding('sensor-load', 'info', { draw, drive: r.front.outputDrive }));
  }
  if (r.noise && ((d.opamp.voltageNoise > 0 && !d.opamp.voltageNoiseCorner) || (d.opamp.currentNoise > 0 && !d.opamp.currentNoiseCorner))) {
    w.push(finding('flicker-not-given', 'info', { voltage: !d.opamp.voltageNoiseCorner, current: !d.opamp.currentNoiseCorner, from: r.noise.lowFrequency.band[0] }));
  }
  // The difference stage's common-mode rejection: what the built pair passes of the sensor's common-mode
  // voltage, and the worst case its resistors' tolerance allows, A_cm ≈ G/(1+G)·4t (Franco, Design with
  // Operational Amplifiers, §2.3, for four resistors each ±t; from memory), both referred to the measurand.
  if (r.stage && r.stage.ideal.topology === 'difference' && r.front.commonMode !== null) {
    const g = r.stage.gain;
    const acm = Math.abs(commonModeGain(r.stage.network, r.front, openLoopOf(d)));
    const worst = (g / (1 + g)) * 4 * d.target.tolerance;
    const cm = Math.abs(r.front.commonMode);
    const scale = Math.abs(r.dc?.out[1] ?? d.target.scale) || 1;
    const level = (acm + worst) * cm / scale > 0.01 * Math.max(Math.abs(a), Math.abs(b)) ? 'caution' : 'info';
    w.push(finding('common-mode', level, { commonMode: r.front.commonMode, passed: acm * cm, passedReferred: acm * cm / scale, worst: worst * cm, worstReferred: worst * cm / scale, worstGain: worst, tolerance: d.target.tolerance, measurand: m }));
  }
  if (r.drive?.probeRatio) {
    const dr = r.drive;
    w.push(finding('probe-ratio', 'info', { ratio: dr.probeRatio!, offset: dr.probeOffset, offsetShown: dr.probeOffsetShown, invert: dr.probeInvert, ac: d.target.signal === 'ac-rms', measurand: m }));
  }
  if (r.drive) {
    if (!r.drive.drives50) w.push(finding('no-50-ohm', 'info', {}));
    if (r.drive.isolation > 0) w.push(finding('capacitive-load', 'caution', { isolation: r.drive.isolation }));
  }
  if (r.stage && !r.stage.network.reference.trim && d.target.trim.zero && r.stage.network.reference.kind !== 'none') {
    w.push(finding('no-zero-trim', 'info', {}));
  }
  if (r.battery.length) {
    const bc = r.batteryClip;
    const eol = r.battery[r.battery.length - 1]!;
    if (bc && bc.voltage !== null) {
      w.push(finding('battery-clips', 'caution', { voltage: bc.voltage, endOfLife: eol.voltage, low: eol.measurandLow, high: eol.measurandHigh, hoursToClip: bc.hoursToClip, hoursToEnd: bc.hoursToEnd, measurand: m }));
    }
    const reg = d.supply.regulated;
    const s0 = r.battery[0]!.scale;
    const worst = r.battery.reduce((x, s) => (Math.abs(s.scale / s0 - 1) > Math.abs(x.scale / s0 - 1) ? s : x), r.battery[0]!);
    if (reg && Math.abs(worst.scale / s0 - 1) > d.analysis.scaleLimit) {
      w.push(finding('battery-scale-shift', 'caution', { below: d.supply.negative + reg.voltage + reg.dropout, dropout: reg.dropout, voltage: worst.voltage, scale: worst.scale, change: worst.scale / s0 - 1, measurand: m }));
    }
    const shift = Math.max(...r.battery.map((s) => Math.abs(s.zeroShift)));
    if (shift > d.analysis.zeroLimit) {
      const dropout = r.battery.find((s) => !s.regulated);
      const cause = d.supply.referenceRail !== 'regulated' || !reg ? 'reference-on-battery'
        : r.front.ratiometricSupply && d.supply.sensorRail !== 'regulated' ? 'ratiometric-sensor'
        : dropout ? 'regulator-dropout' : 'battery-fed';
      w.push(finding('battery-zero-shift', 'caution', { shift, cause, regulated: reg?.voltage ?? null, dropsOutBelow: dropout?.voltage ?? null }));
    }
  }
  return w;
}

/** Lowest and highest voltage the sensor is fed with (from 0 V): the regulated rail within its tolerance, or the positive rail over the battery's life. */
function sensorSupplyRange(d: Design): [number, number] {
  const reg = d.supply.regulated;
  // Issue 18: with the whole front end on the regulator, the positive rail is the regulator's output too.
  if ((d.supply.sensorRail === 'regulated' || d.supply.battery?.rails === 'regulated') && reg) return [reg.voltage * (1 - reg.tolerance), reg.voltage * (1 + reg.tolerance)];
  const bat = d.supply.battery;
  return [Math.min(d.supply.positive, bat?.endOfLife ?? Infinity), Math.max(d.supply.positive, bat?.fresh ?? -Infinity)];
}

/** The sensor's supply against the range it is specified for (sensor.supplyMin / supplyMax, when stated). */
function sensorSupplyFindings(d: Design): Finding[] {
  if (d.sensor.type !== 'voltage-output' && d.sensor.type !== 'hall-gap-core') return [];
  const [lo, hi] = sensorSupplyRange(d);
  const from = d.supply.sensorRail === 'regulated' && d.supply.regulated ? 'regulated' : d.supply.battery ? 'battery' : 'positive';
  const w: Finding[] = [];
  const { supplyMin, supplyMax } = d.sensor;
  if (typeof supplyMax === 'number' && hi > supplyMax) w.push(finding('sensor-over-voltage', 'fail', { high: hi, rated: supplyMax, from }));
  if (typeof supplyMin === 'number' && lo < supplyMin) w.push(finding('sensor-under-voltage', 'caution', { low: lo, rated: supplyMin, from }));
  return w;
}

/** Largest current the sensor output delivers over the range, A (null when the circuit has no source resistor). */
function sensorDraw(r: Report): number | null {
  const sc = r.circuit;
  if (!sc || !r.clip || !r.dc) return null;
  // The sensor output node and the amplifier input node: the current in between is what the sensor drives.
  const rsIdx = sc.circuit.elements.findIndex((e) => e.role === 'sensor-source');
  const [a, b] = r.clip.rangePeak;
  let worst = 0;
  if (rsIdx >= 0) {
    const e = sc.circuit.elements[rsIdx]!;
    const [a0, a1] = nodeLinear(r.dc, e.a), [b0, b1] = nodeLinear(r.dc, e.b);
    for (const x of [a, 0, b]) worst = Math.max(worst, Math.abs((a0 - b0 + (a1 - b1) * x) / e.value));
    return worst;
  }
  // No source resistance: the sensor drives the input network directly; the current is the source's own.
  const k = sc.circuit.branch[sc.signalIndex]!;
  if (k < 0) return null;
  for (const x of [a, 0, b]) worst = Math.max(worst, Math.abs(r.dc.c0[k]! + r.dc.c1[k]! * x));
  return worst;
}
