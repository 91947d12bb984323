/**
 * The report: a pure function of the design. Solves the stage, builds its circuit and runs every analysis.
 * The app, the CLI and the tests all read this one object.
 */
import type { Design, MeasurandWaveform, Topology } from '../model/design.js';
import { sensorFrontAtRail, type SensorFront } from '../physics/sensors.js';
import { chooseTopology, peakRange, type TopologyChoiceResult } from '../physics/topology.js';
import { solveStage, type SolvedStage } from '../solve/stage.js';
import { commonModeGain, openLoopOf } from '../solve/transfer.js';
import type { Part } from '../circuit/network.js';
import { buildCircuit, type StageCircuit } from '../circuit/build.js';
import {
  DEFAULT_BAND_SHARE, batteryClip, batterySweep, clipping, dcLinear, defaultBand, errorBudget, frequencyResponse, responseFromSpectrum, instrumentDrive, noise, speed, spread, supply, transferAt, transferCurve,
  type BatteryClip, type BatteryStep, type ClipCause, type ClipResult, type DcPoint, type ErrorBudget, type FrequencyResponse, type InstrumentDrive, type NoiseResult,
  type Speed, type SpreadResult, type SupplyResult,
} from './analysis.js';
import { stepOverRange, waveform, type WaveformResult } from './waveform.js';
import type { Warning } from '../model/findings.js';
import { formatEng, rkmCode } from '../model/units.js';
import { significantFigures } from '../model/eseries.js';
import { calibrationSteps, type CalibrationStep } from '../present/calibration.js';
import { frontWithReadings, sensorFromReadings, type SensorFromReadings } from './sensor-readings.js';
import { trimFromReadings, type TrimResult } from './trim.js';
import { tradeJson, tradeSweep, type TradeResult } from './trade.js'; // issue 19
import { rangeSwitch, rangesJson, type RangeSwitchResult } from './ranges.js'; // issue 19

export interface Verdict {
  level: 'pass' | 'caution' | 'fail';
  title: string;
  detail: string;
}

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
  calibration: CalibrationStep[];
  /** The fit of the sensor's bench readings and what the design took from it (null: no readings). */
  readings: SensorFromReadings | null;
  /** The trim solved from the built probe's readings (design.probeReadings; null: none given). */
  trim: TrimResult | null;
  /** Issue 19: the turns / gap (or turns / burden) trade sweep, when asked for (`AnalyseOptions.trade`) and the sensor has one. */
  trade: TradeResult | null;
  /** Issue 19: the range switch (design.target.ranges), each position analysed with its own parts; null without one. */
  ranges: RangeSwitchResult | null;
  warnings: Warning[];
  verdicts: Verdict[];
  /** Figures that could not be computed, with the reason. */
  absent: Record<string, string>;
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
  const warnings: Warning[] = [...front.warnings, ...fromReadings.warnings, ...sensorSupplyFindings(design)];
  const absent: Record<string, string> = {};
  // Issue 19: the trade is worth most when the design itself fails, so it is run before any early return.
  const trade = opts.trade ? tradeSweep(given) : null;
  const empty: Report = {
    design, front, choice, stage: null, circuit: null, dc: null, clip: null, transfer: null, response: null, speed: null, noise: null,
    errors: null, supply: null, battery: [], batteryClip: null, spread: null, drive: null, waveform: null, waveformSpec: null, calibration: [], readings: fromReadings.readings, trim: null, trade, ranges: null, warnings, verdicts: [], absent,
  };
  // The gain the target asks of the stage: a ratio that is not a finite, non-zero number cannot be built.
  const needed = design.target.scale / front.sensitivity;
  if (!Number.isFinite(needed) || needed === 0 || !Number.isFinite(front.sensitivity)) {
    warnings.push({ code: 'gain-not-computable', level: 'fail', message: 'The gain cannot be computed, because the wanted scale divided by the sensor\'s sensitivity is beyond any number: check both for a slipped prefix or exponent.' });
    absent.all = 'the gain cannot be computed from the wanted scale and the sensor\'s sensitivity';
    const r = { ...empty, choice: { ...choice, chosen: null, why: 'no stage: the gain cannot be computed', considered: [], guidance: [] } };
    r.verdicts = verdictsOf(r);
    return r;
  }
  if (!choice.chosen) {
    warnings.push({ code: 'no-topology', level: 'fail', message: `No stage fits: ${choice.why}.` });
    for (const g of choice.guidance) warnings.push({ code: 'guidance', level: 'info', message: g });
    absent.all = 'no topology can reach the target on these rails';
    empty.verdicts = verdictsOf(empty);
    return empty;
  }
  const stage = opts.stage ?? solveStage(design, front, choice.chosen);
  warnings.push(...stage.warnings);
  if (stage.warnings.some((w) => w.level === 'fail') || !Number.isFinite(stage.gain)) {
    absent.all = 'the resistor solver found no realisation';
    const r = { ...empty, stage };
    r.verdicts = verdictsOf(r);
    return r;
  }
  const circuit = buildCircuit(design, stage, front);
  const passband = !front.passesDc;
  const dc = dcLinear(circuit, passband);
  if (!dc) {
    absent.all = 'the circuit could not be solved (singular network)';
    warnings.push({ code: 'singular', level: 'fail', message: 'The circuit has no unique solution; check for a part of zero or infinite value.' });
    const r = { ...empty, stage, circuit };
    r.verdicts = verdictsOf(r);
    return r;
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
  const sup = finiteOr(supply(design, front, circuit, dc), 'supply', 'the supply current', absent);
  const battery = finiteOr(batterySweep(design, stage, front, dc.out[0]), 'battery', 'the battery sweep', absent) ?? [];
  const bClip = design.supply.battery && sup ? finiteOr(batteryClip(design, stage, front, dc.out[0], battery, sup), 'batteryClip', 'the battery life to the first clip', absent) : null;
  const trials = opts.spreadTrials ?? design.analysis.spreadTrials;
  const spr = trials > 0 ? finiteOr(spread(design, front, circuit, dc, trials), 'spread', 'the tolerance spread', absent) : null;
  if (!spr && !absent.spread) absent.spread = 'the tolerance spread was not run';
  const drive = sp ? finiteOr(instrumentDrive(design, stage, front, sp.smallSignal), 'drive', 'the instrument drive', absent) : null;
  const waveformSpec = design.analysis.waveform ?? (opts.defaultWaveform ? stepOverRange(design) : null);
  const wave = waveformSpec && clip && sp ? waveform(design, waveformSpec, circuit, front, dc, clip, sp, opts.waveformSamples ?? 2000) : null;
  if (waveformSpec && !wave) absent.waveform = clip && sp ? 'the time-domain solve did not finish (a singular network, or more than 400 000 steps)' : 'the waveform cannot be computed, because the clipping points or the bandwidth cannot';
  const report: Report = {
    design, front, choice, stage, circuit, dc, clip, transfer, response, speed: sp, noise: nz, errors, supply: sup, battery, batteryClip: bClip, spread: spr, drive,
    waveform: wave, waveformSpec: wave ? waveformSpec : null, calibration: [], readings: fromReadings.readings, trim: null, trade, ranges: null, warnings, verdicts: [], absent,
  };
  // Issue 19: a range switch's further positions, each analysed as a single-range design with its own parts.
  if (design.target.ranges?.length && !opts.stage) report.ranges = rangeSwitch(design, report, analyse, { spreadTrials: 0, acPoints: opts.acPoints });
  if (design.probeReadings?.length) report.trim = trimFromReadings({ design, front, stage }, design.probeReadings, design.probeSettings ?? []);
  // Findings first: the calibration steps repeat the instrument advice found there.
  warnings.push(...findings(report));
  report.calibration = calibrationSteps(report);
  report.verdicts = verdictsOf(report);
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

const f3 = (x: number, unit = '') => formatEng(x, unit, 3);

/** Findings in plain words from the figures. */
function findings(r: Report): Warning[] {
  const w: Warning[] = [];
  const d = r.design;
  const m = d.sensor.measurand;
  const clip = r.clip, sp = r.speed;
  if (!clip) return w;
  const [a, b] = clip.rangePeak;
  if (d.target.signal === 'ac-rms') w.push({ code: 'ac-peak', level: 'info', message: `The range is rms: headroom is checked at the sine peak, ±${f3(Math.max(Math.abs(a), Math.abs(b)), m)} (√2 × rms).` });
  if (!clip.linear) {
    w.push({ code: 'not-linear-at-zero', level: 'fail', message: `No ${m} value keeps the stage linear: ${clip.limits.find((l) => l.cause === clip.first)?.why ?? 'a limit is exceeded'}.` });
  } else {
    if (!clip.linearAtZero) w.push({ code: 'zero-outside-linear', level: clip.measurandLow <= a && clip.measurandHigh >= b ? 'info' : 'caution', message: `At zero ${m} the stage sits outside its linear region, which runs from ${f3(clip.measurandLow, m)} to ${f3(clip.measurandHigh, m)}${clip.measurandLow <= a && clip.measurandHigh >= b ? ' and covers the range' : ''}.` });
    const fix = (cause: string | null) => cause === 'opamp-output' || cause === 'opamp-current'
      ? ' To fit, move the zero towards the middle of the swing, lower the scale, use a split supply, or an op-amp whose output swings closer to the rails.'
      : cause === 'opamp-input' ? ' An op-amp whose input range includes the rail, a lower sensor offset, or the inverting stage (its inputs sit still) would fit.'
      : cause === 'core' ? ' Fewer turns or a longer gap raise the core\'s limit.'
      : cause === 'sensor' ? ' The sensor itself runs out first: fewer turns, a longer gap, or a sensor with a wider range.' : '';
    if (clip.measurandLow > a) w.push({ code: 'clips-in-range-low', level: 'fail', message: `The output saturates at ${f3(clip.measurandLow, m)}, inside the wanted range (${f3(a, m)}): ${why(clip, clip.firstLow)}.${fix(clip.firstLow)}` });
    if (clip.measurandHigh < b) w.push({ code: 'clips-in-range-high', level: 'fail', message: `The output saturates at ${f3(clip.measurandHigh, m)}, inside the wanted range (${f3(b, m)}): ${why(clip, clip.firstHigh)}.${fix(clip.firstHigh)}` });
  }
  if (sp && d.target.bandwidth > 0 && sp.smallSignal < d.target.bandwidth) {
    w.push({ code: 'bandwidth-short', level: 'fail', message: `The chain's bandwidth is ${f3(sp.smallSignal, 'Hz')}, below the ${f3(d.target.bandwidth, 'Hz')} wanted.` });
  }
  if (sp && d.target.bandwidth > 0 && sp.fullPower < d.target.bandwidth) {
    w.push({ code: 'slew-limited', level: 'caution', message: `Full-scale signals are slew-limited above ${f3(sp.fullPower, 'Hz')} (SR/(2π·Vpeak)); the wanted range and ${f3(d.target.bandwidth, 'Hz')} cannot both be had.` });
  }
  // An AC-coupled sensor at mains frequency (50 Hz, the lower of the two in use; common practice): how far
  // below its passband scale it reads there, from the circuit itself.
  if (!r.front.passesDc && r.circuit && r.speed) {
    const [hr, hi] = transferAt(r.circuit, 50);
    const short = 1 - Math.hypot(hr, hi) / Math.abs(r.speed.passband);
    const [pr, pi] = transferAt(r.circuit, Math.sqrt(r.speed.lowCorner * r.speed.smallSignal));
    let lead = ((Math.atan2(hi, hr) - Math.atan2(pi, pr)) * 180) / Math.PI;
    while (lead > 180) lead -= 360;
    while (lead < -180) lead += 360;
    w.push({
      code: 'ac-low-frequency', level: short > 0.01 ? 'caution' : 'info',
      message: `At 50 Hz the reading is ${(short * 100).toFixed(2)} % below the passband scale and leads by ${lead.toFixed(1)}° (low corner ${f3(r.speed.lowCorner, 'Hz')}); below about ${f3(r.speed.lowCorner * 7, 'Hz')} it reads more than 1 % low.`,
    });
  }
  // What the amplifier's input network draws from the sensor's output (through its source resistance).
  const sc = r.circuit;
  if (sc && (d.sensor.type === 'voltage-output' || d.sensor.type === 'hall-gap-core')) {
    const draw = sensorDraw(r);
    if (draw !== null && r.front.outputDrive > 0 && draw > r.front.outputDrive) {
      w.push({ code: 'sensor-drive', level: 'fail', message: `The amplifier's input network draws up to ${f3(draw, 'A')} from the sensor, more than the ${f3(r.front.outputDrive, 'A')} it can drive.` });
    } else if (draw !== null && draw > 1e-6) {
      w.push({ code: 'sensor-load', level: 'info', message: `The input network draws up to ${f3(draw, 'A')} from the sensor's output${r.front.outputDrive > 0 ? ` (it can drive ${f3(r.front.outputDrive, 'A')})` : '; check that the sensor can drive it'}.` });
    }
  }
  if (r.noise && ((d.opamp.voltageNoise > 0 && !d.opamp.voltageNoiseCorner) || (d.opamp.currentNoise > 0 && !d.opamp.currentNoiseCorner))) {
    w.push({ code: 'flicker-not-given', level: 'info', message: `The op-amp's 1/f noise corner${!d.opamp.voltageNoiseCorner && !d.opamp.currentNoiseCorner ? 's are' : ' is'} not given (0 Hz): its noise is taken as white down to ${f3(r.noise.lowFrequency.band[0], 'Hz')}, right for a chopper, optimistic for most other kinds. Give the op-amp's voltage and current noise 1/f corners from its noise curve.` });
  }
  // The difference stage's common-mode rejection: what the built pair passes of the sensor's common-mode
  // voltage, and the worst case its resistors' tolerance allows, A_cm ≈ G/(1+G)·4t (Franco, Design with
  // Operational Amplifiers, §2.3, for four resistors each ±t; from memory), both referred to the measurand.
  if (r.stage && r.stage.ideal.topology === 'difference' && r.front.commonMode !== null) {
    const g = r.stage.gain;
    const acm = commonModeGain(r.stage.network, r.front, openLoopOf(d));
    const worst = (g / (1 + g)) * 4 * d.target.tolerance;
    const cm = Math.abs(r.front.commonMode);
    const scale = Math.abs(r.dc?.out[1] ?? d.target.scale) || 1;
    w.push({ code: 'common-mode', level: (Math.abs(acm) + worst) * cm / scale > 0.01 * Math.max(Math.abs(clip.rangePeak[0]), Math.abs(clip.rangePeak[1])) ? 'caution' : 'info', message: `The sensor's ${f3(r.front.commonMode, 'V')} common mode: the built pair passes ${f3(Math.abs(acm) * cm, 'V')} of it (${f3(Math.abs(acm) * cm / scale, m)}), and ${(d.target.tolerance * 100).toFixed(1)} % resistors can pass up to ${f3(worst * cm, 'V')} (${f3(worst * cm / scale, m)}, a common-mode gain of ${worst.toPrecision(2)}): the zero trim removes it at this common mode; a common mode that moves moves the zero by as much.` });
  }
  const advice = r.drive ? probeAdvice(r.drive, m, d.target.signal === 'ac-rms') : null;
  if (advice) w.push({ code: 'probe-ratio', level: 'info', message: advice });
  if (r.drive) {
    if (!r.drive.drives50) w.push({ code: 'no-50-ohm', level: 'info', message: 'Do not switch the instrument to its 50 Ω input: the op-amp cannot drive it over the range.' });
    if (r.drive.isolation > 0) w.push({ code: 'capacitive-load', level: 'caution', message: `The instrument and cable capacitance sits on the op-amp output unisolated: fit a series resistor of about ${f3(r.drive.isolation, 'Ω')} (the output series resistor).` });
  }
  if (r.stage && !r.stage.network.reference.trim && d.target.trim.zero && r.stage.network.reference.kind !== 'none') {
    w.push({ code: 'no-zero-trim', level: 'info', message: 'No zero trimmer could be fitted; the zero depends on part tolerances.' });
  }
  if (r.battery.length) {
    const bc = r.batteryClip;
    const eol = r.battery[r.battery.length - 1]!;
    if (bc && bc.voltage !== null) {
      const hours = bc.hoursToClip !== null && bc.hoursToEnd !== null ? ` A fresh battery gets there after about ${bc.hoursToClip.toFixed(1)} h, of ${bc.hoursToEnd.toFixed(1)} h to end of life (voltage taken as falling linearly with the charge drawn).` : '';
      w.push({ code: 'battery-clips', level: 'caution', message: `Once the battery is down to ${f3(bc.voltage, 'V')} the output clips inside the range; end of life is ${f3(eol.voltage, 'V')}, where it is linear only from ${f3(eol.measurandLow, m)} to ${f3(eol.measurandHigh, m)}.${hours}` });
    }
    const reg = d.supply.regulated;
    const s0 = r.battery[0]!.scale;
    const worst = r.battery.reduce((x, s) => (Math.abs(s.scale / s0 - 1) > Math.abs(x.scale / s0 - 1) ? s : x), r.battery[0]!);
    if (reg && Math.abs(worst.scale / s0 - 1) > d.analysis.scaleLimit) {
      w.push({ code: 'battery-scale-shift', level: 'caution', message: `Below ${f3(d.supply.negative + reg.voltage + reg.dropout, 'V')} the regulator drops out (${f3(reg.dropout, 'V')} dropout) and the ratiometric sensor on it scales with its falling output: at ${f3(worst.voltage, 'V')} the scale is ${f3(worst.scale, `V/${m}`)}, ${((worst.scale / s0 - 1) * 100).toFixed(1)} % off.` });
    }
    const shift = Math.max(...r.battery.map((s) => Math.abs(s.zeroShift)));
    if (shift > d.analysis.zeroLimit) {
      // Say the cause that applies: advice to regulate what is already regulated helps nobody.
      const reg = d.supply.regulated;
      const dropout = r.battery.find((s) => !s.regulated);
      const cause = d.supply.referenceRail !== 'regulated' || !reg
        ? 'because the reference is taken from it; feed the reference from a regulated rail'
        : r.front.ratiometricSupply && d.supply.sensorRail !== 'regulated'
          ? 'because the ratiometric sensor is fed from it and its zero follows its supply; feed the sensor from the regulated rail too'
          : dropout
            ? `because the ${f3(reg.voltage, 'V')} regulator loses regulation below about ${f3(dropout.voltage, 'V')}; a lower regulated voltage keeps it in regulation to the end`
            : 'through what is still fed from the battery';
      w.push({ code: 'battery-zero-shift', level: 'caution', message: `The zero moves by up to ${f3(shift, 'V')} as the battery sags, ${cause}.` });
    }
  }
  return w;
}

/** Lowest and highest voltage the sensor is fed with (from 0 V): the regulated rail within its tolerance, or the positive rail over the battery's life. */
export function sensorSupplyRange(d: Design): [number, number] {
  const reg = d.supply.regulated;
  if (d.supply.sensorRail === 'regulated' && reg) return [reg.voltage * (1 - reg.tolerance), reg.voltage * (1 + reg.tolerance)];
  const bat = d.supply.battery;
  return [Math.min(d.supply.positive, bat?.endOfLife ?? Infinity), Math.max(d.supply.positive, bat?.fresh ?? -Infinity)];
}

/** The sensor's supply against the range it is specified for (sensor.supplyMin / supplyMax, when stated). */
function sensorSupplyFindings(d: Design): Warning[] {
  if (d.sensor.type !== 'voltage-output' && d.sensor.type !== 'hall-gap-core') return [];
  const [lo, hi] = sensorSupplyRange(d);
  const from = d.supply.sensorRail === 'regulated' && d.supply.regulated ? 'the regulated rail' : d.supply.battery ? 'the battery' : 'the positive rail';
  const w: Warning[] = [];
  const { supplyMin, supplyMax } = d.sensor;
  if (typeof supplyMax === 'number' && hi > supplyMax) {
    w.push({ code: 'sensor-over-voltage', level: 'fail', message: `The sensor is fed up to ${f3(hi, 'V')} from ${from}, above the ${f3(supplyMax, 'V')} it is specified for: it may be damaged. Feed it from a regulated rail (Supply: regulated rail, sensor fed from it) or use a sensor specified for this supply.` });
  }
  if (typeof supplyMin === 'number' && lo < supplyMin) {
    w.push({ code: 'sensor-under-voltage', level: 'caution', message: `The sensor is fed down to ${f3(lo, 'V')} from ${from}, below the ${f3(supplyMin, 'V')} it is specified for: its output is not specified there.` });
  }
  return w;
}

/**
 * How to make the instrument read the measurand: the probe ratio, the offset to null (the zero is displayed
 * as z × ratio at no measurand) and the sign. Null when no standard ratio fits.
 */
function probeAdvice(dr: InstrumentDrive, m: string, ac: boolean): string | null {
  if (!dr.probeRatio) return null;
  const k = dr.probeRatio;
  const invert = dr.probeInvert ? ` The scale is negative: switch on the channel's invert so that a positive ${m} reads positive.` : '';
  // A zero below a thousandth of a displayed unit needs no nulling.
  if (Math.abs(dr.probeOffsetShown) < 1e-3) return `Set the instrument's probe ratio to ${k}×: with the zero at 0 V it then reads ${m} directly.${invert}`;
  const coupling = ac ? ' For an AC reading, AC coupling removes it as well.' : '';
  return `With the probe ratio at ${k}× one displayed unit is one ${m}, but the zero of ${f3(dr.probeOffset, 'V')} shows as ${f3(dr.probeOffsetShown, m)} when nothing is measured. Null it before reading: set the channel's offset to ${f3(-dr.probeOffsetShown, m)} on screen (${f3(-dr.probeOffset, 'V')} at its input), or subtract a reference channel that sees the probe's zero (its output at zero ${m}, or a ${f3(dr.probeOffset, 'V')} source).${coupling}${invert}`;
}

/** Largest current the sensor output delivers over the range, A (null when the circuit has no source resistor). */
export function sensorDraw(r: Report): number | null {
  const sc = r.circuit;
  if (!sc || !r.clip || !r.dc) return null;
  // The sensor output node and the amplifier input node: the current in between is what the sensor drives.
  const { c0, c1 } = r.dc;
  const rsIdx = sc.circuit.elements.findIndex((e) => e.name === 'RS' && e.kind === 'R');
  const [a, b] = r.clip.rangePeak;
  let worst = 0;
  if (rsIdx >= 0) {
    const e = sc.circuit.elements[rsIdx]!;
    const v = (col: Float64Array, n: number) => (n > 0 ? col[n - 1]! : 0);
    for (const x of [a, 0, b]) worst = Math.max(worst, Math.abs((v(c0, e.a) - v(c0, e.b) + (v(c1, e.a) - v(c1, e.b)) * x) / e.value));
    return worst;
  }
  // No source resistance: the sensor drives the input network directly; the current is the source's own.
  const k = sc.circuit.branch[sc.signalIndex]!;
  if (k < 0) return null;
  for (const x of [a, 0, b]) worst = Math.max(worst, Math.abs(c0[k]! + c1[k]! * x));
  return worst;
}

function why(clip: ClipResult, cause: string | null): string {
  return clip.limits.find((l) => l.cause === cause)?.why ?? 'a limit is reached';
}

/** Each limit's plain name, for the verdict lines. */
const LIMIT_NAMES: Record<ClipCause, string> = {
  'opamp-output': 'the op-amp output reaches its swing',
  'opamp-current': 'the op-amp output current limit',
  'opamp-input': 'the op-amp inputs leave their range',
  sensor: 'the sensor reaches its limit',
  core: 'the core saturates',
  burden: 'the burden or shunt reaches its power rating',
};

/** The short pass / caution / fail list a person reads first. */
export function verdictsOf(r: Report): Verdict[] {
  const v: Verdict[] = [];
  const d = r.design;
  const m = d.sensor.measurand;
  if (!r.clip || !r.stage || !r.dc) {
    v.push({ level: 'fail', title: 'No design', detail: r.warnings.filter((w) => w.level === 'fail').map((w) => w.message).join(' ') || (r.absent.all ?? r.absent.clip ?? 'not computed') });
    return v;
  }
  // A figure that could not be computed is said so, with the reason, in place of its verdict.
  const missing = (key: string, title: string) => v.push({ level: 'caution', title, detail: `${r.absent[key] ?? 'It cannot be computed.'}` });
  const c = r.clip;
  const [a, b] = c.rangePeak;
  const inRange = c.linear && c.measurandLow <= a && c.measurandHigh >= b;
  v.push({
    level: inRange ? (Math.min(c.headroom.lowPercent, c.headroom.highPercent) < 5 ? 'caution' : 'pass') : 'fail',
    title: inRange ? 'Covers the range without clipping' : 'Clips inside the range',
    detail: `Linear from ${f3(c.measurandLow, m)} to ${f3(c.measurandHigh, m)} (low end: ${c.firstLow ? LIMIT_NAMES[c.firstLow] : '—'}; high end: ${c.firstHigh ? LIMIT_NAMES[c.firstHigh] : '—'}); headroom ${f3(c.headroom.low, 'V')} low, ${f3(c.headroom.high, 'V')} high.`,
  });
  const inputLimit = c.limits.find((l) => l.cause === 'opamp-input')!;
  const inputOk = inputLimit.low <= a && inputLimit.high >= b;
  v.push({ level: inputOk ? 'pass' : 'fail', title: inputOk ? 'Op-amp inputs stay in their range' : 'Op-amp input range is violated', detail: inputLimit.why + (inputOk ? '.' : `: leaves it at ${f3(Math.max(inputLimit.low, a), m)} / ${f3(Math.min(inputLimit.high, b), m)}.`) });
  const se = r.stage.scaleError;
  v.push({ level: Math.abs(se) < d.target.tolerance ? 'pass' : 'caution', title: `Scale ${f3(r.dc!.out[1], `V/${m}`)} before trim`, detail: `${((Math.abs(se) < 5e-6 ? 0 : se) * 100).toFixed(3)} % from the target with the trimmers at mid; zero ${f3(r.dc!.out[0], 'V')}.` });
  if (r.speed) {
    const bwOk = !(d.target.bandwidth > 0) || r.speed.smallSignal >= d.target.bandwidth;
    const bwShort = bwOk ? '' : `${r.warnings.find((w) => w.code === 'bandwidth-short')?.message ?? ''} `;
    v.push({ level: bwOk ? 'pass' : 'fail', title: `Bandwidth ${f3(r.speed.smallSignal, 'Hz')}`, detail: `${bwShort}Rise time ${f3(r.speed.riseTime, 's')}; full-power bandwidth ${f3(r.speed.fullPower, 'Hz')}.` });
  } else missing('speed', 'Bandwidth cannot be computed');
  // Our own thresholds, against the range end: noise peak-to-peak within 1 % passes, within 5 % is a
  // caution; DC error after calibration within 1 % passes, within 5 % is a caution (a home-built probe
  // calibrated with a bench meter lands in between; common practice).
  const end = Math.max(Math.abs(a), Math.abs(b)) || 1;
  if (r.noise && r.speed) {
    const pp = r.noise.peakToPeak / (Math.abs(r.speed.passband) || 1);
    const lf = r.noise.lowFrequency;
    const ppWorst = Math.max(pp, lf.referredPeakToPeak);
    const bandWhy = r.noise.bandIsDefault
      ? ` (the default band: from 1 Hz, below which noise counts as drift, to 100 × the −3 dB bandwidth, which holds ${(DEFAULT_BAND_SHARE * 100).toFixed(1)} % of a single pole's noise bandwidth)`
      : ' (the design\'s own band)';
    v.push({
      level: ppWorst <= 0.01 * end ? 'pass' : ppWorst <= 0.05 * end ? 'caution' : 'fail', title: `Noise ${f3(r.noise.referredRms, `${m} rms`)}`,
      detail: `${f3(r.noise.rms, 'V rms')} at the output over ${f3(r.noise.band[0], 'Hz')}…${f3(r.noise.band[1], 'Hz')}${bandWhy}, about ${f3(r.noise.peakToPeak, 'V')} (${f3(pp, m)}) peak-to-peak, ${((pp / end) * 100).toFixed(2)} % of the range end. From ${f3(lf.band[0], 'Hz')} to ${f3(lf.band[1], 'Hz')}, how far a ${r.front.passesDc ? 'DC' : 'slow'} reading wanders: ${f3(lf.peakToPeak, 'V')} (${f3(lf.referredPeakToPeak, m)}) peak-to-peak.`,
    });
  } else missing('noise', 'Noise cannot be computed');
  if (!r.errors) missing('errors', 'Error budget cannot be computed');
  if (r.errors) {
    const e = r.errors.afterTrim / end;
    v.push({ level: e <= 0.01 ? 'pass' : e <= 0.05 ? 'caution' : 'fail', title: `Error ±${f3(r.errors.afterTrim, m)} after calibration`, detail: `${(e * 100).toFixed(2)} % of the range end, worst case (RSS ±${f3(r.errors.afterTrimRss, m)}), mostly ${r.errors.terms.filter((t) => t.removedBy === 'none').sort((x, y) => y.value - x.value)[0]?.name ?? 'nothing'}; before trimming ±${f3(r.errors.worstCase, m)} (RSS ±${f3(r.errors.rss, m)}) at ${f3(r.errors.at, m)}.` });
  }
  if (!r.supply) missing('supply', 'Supply current cannot be computed');
  if (r.supply) {
    const life = r.supply.batteryLife;
    const bc = r.batteryClip;
    const clipNote = bc && bc.voltage !== null && bc.hoursToClip !== null ? ` The output first clips inside the range after about ${bc.hoursToClip.toFixed(1)} h (at ${f3(bc.voltage, 'V')}; voltage taken as falling linearly with the charge drawn).` : '';
    v.push({ level: life !== null && life < 4 ? 'caution' : 'pass', title: life !== null ? `Battery life about ${life.toFixed(1)} h to end of life` : `Supply current ${f3(r.supply.current, 'A')}`, detail: `Draws ${f3(r.supply.current, 'A')} in total.${clipNote}` });
  }
  const titles: Record<string, string> = {
    'battery-clips': 'Clips as the battery runs down', 'battery-scale-shift': 'Scale moves as the regulator drops out', 'battery-zero-shift': 'Zero moves with the battery', 'capacitive-load': 'Capacitive load on the op-amp output',
    'slew-limited': 'Slew-limited at full scale', 'gap-critical': 'Gap is critical', 'burden-power': 'Burden overloaded', 'shunt-power': 'Shunt overloaded',
    'ct-no-dc': 'A current transformer passes no DC',
    'gain-trim-short': 'Span trimmer cannot cover the spread', 'zero-trim-short': 'Zero trimmer cannot cover the spread',
    'sensor-drive': 'Sensor cannot drive the input', 'ac-low-frequency': 'Reads low at 50 Hz',
    'readings-too-few': 'Too few sensor readings to fit', 'readings-implausible': 'Sensor readings do not fit this core',
    'sensor-over-voltage': 'Sensor fed above its rated supply', 'sensor-under-voltage': 'Sensor fed below its rated supply',
  };
  for (const w of r.warnings.filter((x) => (x.level === 'fail' || x.level === 'caution') && !x.code.startsWith('clips-in-range') && x.code !== 'bandwidth-short')) {
    v.push({ level: w.level === 'fail' ? 'fail' : 'caution', title: titles[w.code] ?? w.code, detail: w.message });
  }
  // Worst first.
  const rank = { fail: 0, caution: 1, pass: 2 } as const;
  v.sort((a, b) => rank[a.level] - rank[b.level]);
  return v;
}

/** Cautions printed on every parts list and shown in the app. */
export const SAFETY_CAUTIONS: readonly string[] = [
  'Clamp only onto insulated conductors. Never fit a probe to a bare or damaged conductor.',
  'A home-built probe has no measurement-category (CAT) rating: do not rely on it for protection from mains voltages.',
  'De-energise the circuit before fitting or removing the probe, and re-check before switching on.',
  'Follow local electrical codes and defer to a licensed electrician for work on fixed installations.',
];

/** The report as the CLI's JSON object ("gainwright-report", version 1). Non-finite numbers become null. */
export function reportJson(r: Report): Record<string, unknown> {
  const num = (x: number | null | undefined) => (x === null || x === undefined || !Number.isFinite(x) ? null : x);
  const s = r.stage;
  const part = (p: Part) => ({ ref: p.ref, role: p.role, ohms: p.kind === 'capacitor' ? null : p.ohms, ...(p.farads ? { farads: p.farads } : {}), series: p.series, tolerance: p.tolerance, arrangement: p.arrangement, code: p.kind === 'capacitor' ? '' : rkmCode(p.ohms, p.series === 'trimmer' || p.series === 'capacitor' ? 2 : significantFigures(p.series)), ...(p.setting !== undefined ? { setting: p.setting } : {}) });
  return {
    format: 'gainwright-report',
    version: 1,
    title: r.design.title,
    topology: (s?.ideal.topology ?? null) as Topology | null,
    topologyWhy: r.choice.why,
    parts: s ? s.parts.map(part) : [],
    gain: num(s?.gain),
    noiseGain: num(s?.noiseGain),
    scale: num(r.dc?.out[1]),
    scaleError: num(s?.scaleError),
    zero: num(r.dc?.out[0]),
    reference: num(s?.reference),
    clip: r.clip ? { outputLow: num(r.clip.outputLow), outputHigh: num(r.clip.outputHigh), measurandLow: num(r.clip.measurandLow), measurandHigh: num(r.clip.measurandHigh), first: r.clip.first, firstLow: r.clip.firstLow, firstHigh: r.clip.firstHigh } : null,
    headroom: r.clip ? { low: num(r.clip.headroom.low), high: num(r.clip.headroom.high) } : null,
    bandwidth: r.speed ? { smallSignal: num(r.speed.smallSignal), fullPower: num(r.speed.fullPower), lowCorner: num(r.speed.lowCorner), riseTime: num(r.speed.riseTime), phaseAtCorner: num(r.speed.phaseAtCorner) } : null,
    noise: r.noise ? {
      densityAt1kHz: num(r.noise.densityAt1kHz), rms: num(r.noise.rms), band: r.noise.band, bandIsDefault: r.noise.bandIsDefault, referredRms: num(r.noise.referredRms), peakToPeak: num(r.noise.peakToPeak),
      lowFrequency: { band: r.noise.lowFrequency.band, rms: num(r.noise.lowFrequency.rms), peakToPeak: num(r.noise.lowFrequency.peakToPeak), referredPeakToPeak: num(r.noise.lowFrequency.referredPeakToPeak) },
    } : null,
    errors: r.errors ? { worstCase: num(r.errors.worstCase), rss: num(r.errors.rss), afterTrim: num(r.errors.afterTrim), afterTrimLow: num(r.errors.afterTrimLow), afterTrimHigh: num(r.errors.afterTrimHigh), at: num(r.errors.at) } : null,
    supply: r.supply ? { current: num(r.supply.current), batteryLife: num(r.supply.batteryLife) } : null,
    spread: r.spread ? { scaleStd: num(r.spread.scaleStd), zeroStd: num(r.spread.zeroStd), yield: num(r.spread.yield), trials: r.spread.trials } : null,
    drive: r.drive ? { scaleAt1M: num(r.drive.scaleAt1M), scaleAt50: num(r.drive.scaleAt50), drives50: r.drive.drives50, isolation: num(r.drive.isolation), probeRatio: r.drive.probeRatio, probeOffset: num(r.drive.probeOffset), probeOffsetShown: num(r.drive.probeOffsetShown), probeInvert: r.drive.probeInvert } : null,
    waveform: r.waveform ? {
      t: Array.from(r.waveform.t), measurand: Array.from(r.waveform.measurand), output: Array.from(r.waveform.output), ideal: Array.from(r.waveform.ideal),
      riseTime: num(r.waveform.riseTime), overshoot: num(r.waveform.overshoot), settlingTime: num(r.waveform.settlingTime), droop: num(r.waveform.droop),
      slewLimited: r.waveform.slewLimited, clipped: r.waveform.clipped,
    } : null,
    sensor: { sensitivity: num(r.front.sensitivity), figures: r.front.figures.map((f) => ({ key: f.key, label: f.label, value: num(f.value), unit: f.unit })) },
    battery: r.battery.map((b) => ({ voltage: b.voltage, measurandLow: num(b.measurandLow), measurandHigh: num(b.measurandHigh), headroomLow: num(b.headroomLow), headroomHigh: num(b.headroomHigh), zeroShift: num(b.zeroShift), scale: num(b.scale), regulated: b.regulated })),
    batteryClip: r.batteryClip ? { voltage: num(r.batteryClip.voltage), hoursToClip: num(r.batteryClip.hoursToClip), hoursToEnd: num(r.batteryClip.hoursToEnd) } : null,
    alternatives: s ? s.alternatives.map((a, i) => ({ index: i, feedback: a.a.parts, leg: a.b.parts, error: num(a.error), parts: a.parts })) : [],
    calibration: r.calibration.map((c) => c.text),
    trade: tradeJson(r.trade), // issue 19: [] unless asked for and the sensor has turns to choose
    ...rangesJson(r.ranges), // issue 19: `ranges` (each position, the first = the figures above) and `rangeSwitch`
    warnings: r.warnings.map((w) => ({ code: w.code, level: w.level, message: w.message })),
    cautions: [...SAFETY_CAUTIONS, ...r.front.cautions],
    absent: r.absent,
  };
}

export { peakRange };
