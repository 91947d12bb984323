/**
 * The report: a pure function of the design. Solves the stage, builds its circuit and runs every analysis.
 * The app, the CLI and the tests all read this one object.
 */
import type { Design, Topology } from '../model/design.js';
import { sensorFrontAtRail, type SensorFront } from '../physics/sensors.js';
import { chooseTopology, peakRange, type TopologyChoiceResult } from '../physics/topology.js';
import { solveStage, type SolvedStage } from '../solve/stage.js';
import type { Part } from '../circuit/network.js';
import { buildCircuit, type StageCircuit } from '../circuit/build.js';
import {
  batterySweep, clipping, dcLinear, defaultBand, errorBudget, frequencyResponse, responseFromSpectrum, instrumentDrive, noise, speed, spread, supply, transferAt, transferCurve,
  type BatteryStep, type ClipResult, type DcPoint, type ErrorBudget, type FrequencyResponse, type InstrumentDrive, type NoiseResult,
  type Speed, type SpreadResult, type SupplyResult,
} from './analysis.js';
import type { Warning } from '../model/findings.js';
import { formatEng, rkmCode } from '../model/units.js';
import { significantFigures } from '../model/eseries.js';
import { calibrationSteps, type CalibrationStep } from '../present/calibration.js';

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
  spread: SpreadResult | null;
  drive: InstrumentDrive | null;
  calibration: CalibrationStep[];
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
}

/** Analyses a (validated) design. Never throws for a valid design: what cannot be computed is in `absent`. */
export function analyse(design: Design, opts: AnalyseOptions = {}): Report {
  const front = sensorFrontAtRail(design.sensor, design);
  const choice = chooseTopology(design, front);
  const warnings: Warning[] = [...front.warnings, ...sensorSupplyFindings(design)];
  const absent: Record<string, string> = {};
  const empty: Report = {
    design, front, choice, stage: null, circuit: null, dc: null, clip: null, transfer: null, response: null, speed: null, noise: null,
    errors: null, supply: null, battery: [], spread: null, drive: null, calibration: [], warnings, verdicts: [], absent,
  };
  if (!choice.chosen) {
    warnings.push({ code: 'no-topology', level: 'fail', message: `No stage fits: ${choice.why}.` });
    for (const g of choice.guidance) warnings.push({ code: 'guidance', level: 'info', message: g });
    absent.all = 'no topology can reach the target on these rails';
    empty.verdicts = verdictsOf(empty);
    return empty;
  }
  const stage = solveStage(design, front, choice.chosen);
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
  const clip = clipping(design, front, dc);
  const transfer = transferCurve(dc, clip);
  const sp = speed(design, circuit, front, dc);
  // One sweep gives the noise and, over the default band, the frequency response from the same solves.
  const nz = noise(design, circuit, sp, opts.acPoints ? Math.max(opts.acPoints | 1, 21) : 201);
  const response = design.analysis.noiseBand === null
    ? responseFromSpectrum(nz.spectrum)
    : frequencyResponse(circuit, defaultBand(sp)[0], defaultBand(sp)[1], opts.acPoints ?? 200);
  const errors = errorBudget(design, stage, front, circuit, dc);
  const sup = supply(design, front, circuit, dc);
  const battery = batterySweep(design, stage, front, dc.out[0]);
  const trials = opts.spreadTrials ?? design.analysis.spreadTrials;
  const spr = trials > 0 ? spread(design, front, circuit, dc, trials) : null;
  if (!spr) absent.spread = 'the tolerance spread was not run';
  const drive = instrumentDrive(design, stage, front, sp.smallSignal);
  const report: Report = {
    design, front, choice, stage, circuit, dc, clip, transfer, response, speed: sp, noise: nz, errors, supply: sup, battery, spread: spr, drive,
    calibration: [], warnings, verdicts: [], absent,
  };
  report.calibration = calibrationSteps(report);
  warnings.push(...findings(report));
  report.verdicts = verdictsOf(report);
  return report;
}

const f3 = (x: number, unit = '') => formatEng(x, unit, 3);

/** Findings in plain words from the figures. */
function findings(r: Report): Warning[] {
  const w: Warning[] = [];
  const d = r.design;
  const m = d.sensor.measurand;
  const clip = r.clip!, sp = r.speed!;
  const [a, b] = clip.rangePeak;
  if (d.target.signal === 'ac-rms') w.push({ code: 'ac-peak', level: 'info', message: `The range is rms: headroom is checked at the sine peak, ±${f3(Math.max(Math.abs(a), Math.abs(b)), m)} (√2 × rms).` });
  if (!clip.linear) {
    w.push({ code: 'not-linear-at-zero', level: 'fail', message: `No ${m} value keeps the stage linear: ${clip.limits.find((l) => l.cause === clip.first)?.why ?? 'a limit is exceeded'}.` });
  } else {
    if (!clip.linearAtZero) w.push({ code: 'zero-outside-linear', level: clip.measurandLow <= a && clip.measurandHigh >= b ? 'info' : 'caution', message: `At zero ${m} the stage sits outside its linear region, which runs from ${f3(clip.measurandLow, m)} to ${f3(clip.measurandHigh, m)}${clip.measurandLow <= a && clip.measurandHigh >= b ? ' and covers the range' : ''}.` });
    const fix = (cause: string | null) => cause === 'opamp-output' || cause === 'opamp-current'
      ? ' To fit, move the zero (target.zero) towards the middle of the swing, lower the scale, use a split supply, or an op-amp whose output swings closer to the rails.'
      : cause === 'opamp-input' ? ' An op-amp whose input range includes the rail, a lower sensor offset, or the inverting stage (its inputs sit still) would fit.'
      : cause === 'core' ? ' Fewer turns or a longer gap raise the core\'s limit.'
      : cause === 'sensor' ? ' The sensor itself runs out first: fewer turns, a longer gap, or a sensor with a wider range.' : '';
    if (clip.measurandLow > a) w.push({ code: 'clips-in-range-low', level: 'fail', message: `The output saturates at ${f3(clip.measurandLow, m)}, inside the wanted range (${f3(a, m)}): ${why(clip, clip.firstLow)}.${fix(clip.firstLow)}` });
    if (clip.measurandHigh < b) w.push({ code: 'clips-in-range-high', level: 'fail', message: `The output saturates at ${f3(clip.measurandHigh, m)}, inside the wanted range (${f3(b, m)}): ${why(clip, clip.firstHigh)}.${fix(clip.firstHigh)}` });
  }
  if (d.target.bandwidth > 0 && sp.smallSignal < d.target.bandwidth) {
    w.push({ code: 'bandwidth-short', level: 'fail', message: `The chain's bandwidth is ${f3(sp.smallSignal, 'Hz')}, below the ${f3(d.target.bandwidth, 'Hz')} wanted.` });
  }
  if (d.target.bandwidth > 0 && sp.fullPower < d.target.bandwidth) {
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
  if (r.drive) {
    if (!r.drive.drives50) w.push({ code: 'no-50-ohm', level: 'info', message: 'Do not switch the instrument to its 50 Ω input: the op-amp cannot drive it over the range.' });
    if (r.drive.isolation > 0) w.push({ code: 'capacitive-load', level: 'caution', message: `The instrument and cable capacitance sits on the op-amp output unisolated: fit a series resistor of about ${f3(r.drive.isolation, 'Ω')} (output.filter).` });
  }
  if (r.stage && !r.stage.network.reference.trim && d.target.trim.zero && r.stage.network.reference.kind !== 'none') {
    w.push({ code: 'no-zero-trim', level: 'info', message: 'No zero trimmer could be fitted; the zero depends on part tolerances.' });
  }
  if (r.battery.length) {
    const firstBad = r.battery.find((s) => s.measurandLow > a || s.measurandHigh < b);
    if (firstBad) w.push({ code: 'battery-clips', level: 'caution', message: `Once the battery is down to ${f3(firstBad.voltage, 'V')} the output clips inside the range (linear only from ${f3(firstBad.measurandLow, m)} to ${f3(firstBad.measurandHigh, m)}); end of life is ${f3(r.battery[r.battery.length - 1]!.voltage, 'V')}.` });
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

/** The short pass / caution / fail list a person reads first. */
export function verdictsOf(r: Report): Verdict[] {
  const v: Verdict[] = [];
  const d = r.design;
  const m = d.sensor.measurand;
  if (!r.clip || !r.speed || !r.noise || !r.stage) {
    v.push({ level: 'fail', title: 'No design', detail: r.warnings.filter((w) => w.level === 'fail').map((w) => w.message).join(' ') || (r.absent.all ?? 'not computed') });
    return v;
  }
  const c = r.clip;
  const [a, b] = c.rangePeak;
  const inRange = c.linear && c.measurandLow <= a && c.measurandHigh >= b;
  v.push({
    level: inRange ? (Math.min(c.headroom.lowPercent, c.headroom.highPercent) < 5 ? 'caution' : 'pass') : 'fail',
    title: inRange ? 'Covers the range without clipping' : 'Clips inside the range',
    detail: `Linear from ${f3(c.measurandLow, m)} to ${f3(c.measurandHigh, m)} (${c.firstLow ?? '—'} / ${c.firstHigh ?? '—'} first); headroom ${f3(c.headroom.low, 'V')} low, ${f3(c.headroom.high, 'V')} high.`,
  });
  const inputLimit = c.limits.find((l) => l.cause === 'opamp-input')!;
  const inputOk = inputLimit.low <= a && inputLimit.high >= b;
  v.push({ level: inputOk ? 'pass' : 'fail', title: inputOk ? 'Op-amp inputs stay in their range' : 'Op-amp input range is violated', detail: inputLimit.why + (inputOk ? '.' : `: leaves it at ${f3(Math.max(inputLimit.low, a), m)} / ${f3(Math.min(inputLimit.high, b), m)}.`) });
  const se = r.stage.scaleError;
  v.push({ level: Math.abs(se) < d.target.tolerance ? 'pass' : 'caution', title: `Scale ${f3(r.dc!.out[1], `V/${m}`)} before trim`, detail: `${(se * 100).toFixed(3)} % from the target with the trimmers at mid; zero ${f3(r.dc!.out[0], 'V')}.` });
  const bwOk = !(d.target.bandwidth > 0) || r.speed.smallSignal >= d.target.bandwidth;
  const bwShort = bwOk ? '' : `${r.warnings.find((w) => w.code === 'bandwidth-short')?.message ?? ''} `;
  v.push({ level: bwOk ? 'pass' : 'fail', title: `Bandwidth ${f3(r.speed.smallSignal, 'Hz')}`, detail: `${bwShort}Rise time ${f3(r.speed.riseTime, 's')}; full-power bandwidth ${f3(r.speed.fullPower, 'Hz')}.` });
  // Our own thresholds, against the range end: noise peak-to-peak within 1 % passes, within 5 % is a
  // caution; DC error after calibration within 1 % passes, within 3 % is a caution.
  const end = Math.max(Math.abs(a), Math.abs(b)) || 1;
  const pp = r.noise.peakToPeak / (Math.abs(r.speed.passband) || 1);
  v.push({ level: pp <= 0.01 * end ? 'pass' : pp <= 0.05 * end ? 'caution' : 'fail', title: `Noise ${f3(r.noise.referredRms, `${m} rms`)}`, detail: `${f3(r.noise.rms, 'V rms')} at the output over ${f3(r.noise.band[0], 'Hz')}…${f3(r.noise.band[1], 'Hz')}, about ${f3(r.noise.peakToPeak, 'V')} (${f3(pp, m)}) peak-to-peak, ${((pp / end) * 100).toFixed(2)} % of the range end.` });
  if (r.errors) {
    const e = r.errors.afterTrim / end;
    v.push({ level: e <= 0.01 ? 'pass' : e <= 0.03 ? 'caution' : 'fail', title: `Error ±${f3(r.errors.afterTrim, m)} after calibration`, detail: `${(e * 100).toFixed(2)} % of the range end, worst case, mostly ${r.errors.terms.filter((t) => t.removedBy === 'none').sort((x, y) => y.value - x.value)[0]?.name ?? 'trim resolution'}; before trimming ±${f3(r.errors.worstCase, m)} (RSS ±${f3(r.errors.rss, m)}) at ${f3(r.errors.at, m)}.` });
  }
  if (r.supply) {
    const life = r.supply.batteryLife;
    v.push({ level: life !== null && life < 4 ? 'caution' : 'pass', title: life !== null ? `Battery life about ${life.toFixed(1)} h` : `Supply current ${f3(r.supply.current, 'A')}`, detail: `Draws ${f3(r.supply.current, 'A')} in total.` });
  }
  const titles: Record<string, string> = {
    'battery-clips': 'Clips as the battery runs down', 'battery-zero-shift': 'Zero moves with the battery', 'capacitive-load': 'Capacitive load on the op-amp output',
    'slew-limited': 'Slew-limited at full scale', 'gap-critical': 'Gap is critical', 'burden-power': 'Burden overloaded', 'shunt-power': 'Shunt overloaded',
    'ct-no-dc': 'A current transformer passes no DC',
    'gain-trim-short': 'Span trimmer cannot cover the spread', 'zero-trim-short': 'Zero trimmer cannot cover the spread',
    'sensor-drive': 'Sensor cannot drive the input', 'ac-low-frequency': 'Reads low at 50 Hz',
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
    noise: r.noise ? { densityAt1kHz: num(r.noise.densityAt1kHz), rms: num(r.noise.rms), band: r.noise.band, referredRms: num(r.noise.referredRms), peakToPeak: num(r.noise.peakToPeak) } : null,
    errors: r.errors ? { worstCase: num(r.errors.worstCase), rss: num(r.errors.rss), afterTrim: num(r.errors.afterTrim), at: num(r.errors.at) } : null,
    supply: r.supply ? { current: num(r.supply.current), batteryLife: num(r.supply.batteryLife) } : null,
    spread: r.spread ? { scaleStd: num(r.spread.scaleStd), zeroStd: num(r.spread.zeroStd), yield: num(r.spread.yield), trials: r.spread.trials } : null,
    drive: r.drive ? { scaleAt1M: num(r.drive.scaleAt1M), scaleAt50: num(r.drive.scaleAt50), drives50: r.drive.drives50, isolation: num(r.drive.isolation), probeRatio: r.drive.probeRatio } : null,
    sensor: { sensitivity: num(r.front.sensitivity), figures: r.front.figures.map((f) => ({ key: f.key, label: f.label, value: num(f.value), unit: f.unit })) },
    battery: r.battery.map((b) => ({ voltage: b.voltage, measurandLow: num(b.measurandLow), measurandHigh: num(b.measurandHigh), headroomLow: num(b.headroomLow), headroomHigh: num(b.headroomHigh), zeroShift: num(b.zeroShift) })),
    alternatives: s ? s.alternatives.map((a, i) => ({ index: i, feedback: a.a.parts, leg: a.b.parts, error: num(a.error), parts: a.parts })) : [],
    calibration: r.calibration.map((c) => c.text),
    warnings: r.warnings.map((w) => ({ code: w.code, level: w.level, message: w.message })),
    cautions: [...SAFETY_CAUTIONS, ...r.front.cautions],
    absent: r.absent,
  };
}

export { peakRange };
