/**
 * The bench calibration procedure for a solved design: which trimmer sets the zero and which the span, in
 * which order, what to apply and what to expect, and how close each step should land.
 */
import type { Report } from '../analysis/report.js';
import { formatEng } from '../model/units.js';
import { peakRange } from '../physics/topology.js';
import { ROLE_NAMES } from './parts.js';
import { closedLoopCalibrationSteps } from './closed-loop.js';
import { sayFinding } from './finding-words.js';

export interface CalibrationStep {
  /** What to do, in plain words. */
  text: string;
  /** Expected output at the instrument, V, when the step has one. */
  expect?: number;
  /** How close it should land, V. */
  within?: number;
  trimmer?: string;
}

/** Bench current a person can easily set and measure (common practice for a small bench supply). */
const BENCH_CURRENT_MAX = 2;
const TURN_CHOICES = [1, 2, 5, 10, 20, 50];

/** Turns and bench current that reach about half of the range end: returns [turns, current]. */
export function calibrationCurrent(rangeEnd: number): [number, number] {
  const want = Math.abs(rangeEnd) * 0.5;
  for (const n of TURN_CHOICES) {
    const i = want / n;
    if (i <= BENCH_CURRENT_MAX) return [n, Number(i.toPrecision(2))];
  }
  const n = TURN_CHOICES[TURN_CHOICES.length - 1]!;
  return [n, Number((want / n).toPrecision(2))];
}

/** How a known calibration measurand is applied, for this sensor and signal, and what it amounts to. */
interface Applied { text: string; x: number }

/**
 * Where the calibration measurand comes from, safely: DC from a current-limited bench supply; AC (and always
 * for a current transformer, which passes no DC) from the secondary of an isolating low-voltage transformer
 * through a series power resistor, read with an rms meter (common practice for a bench AC current source).
 */
function applied(r: Report, hi: number): Applied {
  const d = r.design;
  const m = d.sensor.measurand;
  const ac = d.target.signal === 'ac-rms' || d.sensor.type === 'current-transformer';
  const f = (x: number, u: string) => formatEng(x, u, 4);
  const end = hi / (d.target.signal === 'ac-rms' ? Math.SQRT2 : 1);
  const acSource = `at mains frequency from the secondary of an isolating low-voltage transformer (6–12 V AC) through a series power resistor, read with an rms-reading meter in series`;
  const dcSource = 'from a current-limited bench supply through a series power resistor, read with a meter in series';
  if (m !== 'A') {
    const x = Number((hi * 0.5).toPrecision(2));
    return { text: `apply a known ${f(x, m)}${ac ? ' rms' : ''} to the sensor`, x };
  }
  if (d.sensor.type === 'shunt' || d.sensor.type === 'voltage-output') {
    // No turns to multiply: the current goes through the shunt (or the sensor's own current path) itself.
    const i = Number(Math.min(Math.abs(end) * 0.5, BENCH_CURRENT_MAX).toPrecision(2));
    const path = d.sensor.type === 'shunt' ? 'the shunt' : 'the sensor\'s current path';
    return { text: `drive ${f(i, 'A')}${ac ? ' rms' : ''} through ${path} ${ac ? acSource : dcSource}`, x: i };
  }
  const [n, i] = calibrationCurrent(end);
  const x = n * i;
  const through = d.sensor.type === 'current-transformer' ? 'the current transformer\'s window' : 'the core';
  const wind = n === 1 ? `pass one insulated wire once through ${through}` : `wind ${n} turns of insulated wire through ${through}`;
  const dcNote = d.sensor.type === 'current-transformer' ? ' (never a DC supply: a current transformer passes no DC)' : '';
  return { text: `${wind} and drive ${f(i, 'A')}${ac ? ' rms' : ''} through it ${ac ? acSource : dcSource} (${n} × ${f(i, 'A')} = ${f(x, 'A')}${n > 1 ? '; the turns multiply a small bench current' : ''})${dcNote}`, x };
}

/** The safety step, worded for the sensor at hand (the full caution list is on every sheet: SAFETY_CAUTIONS). */
function safetyStep(r: Report): string {
  const d = r.design;
  const load = `connect the output to the instrument or ADC it will feed (designed for a ${formatEng(d.output.load.resistance, 'Ω')} input${d.target.signal === 'dc' ? '; on a scope use DC coupling' : ''})`;
  switch (d.sensor.type) {
    case 'hall-gap-core': return `Safety first: de-energise the circuit under test; fit the probe only to an insulated conductor; ${load}.`;
    case 'closed-loop-hall': return `Safety first: de-energise the circuit under test; clamp only round an insulated conductor; power the probe before clamping it on and keep it powered until it is off the conductor (an unpowered or open compensation winding is a current transformer's open secondary); ${load}.`;
    case 'current-transformer': return `Safety first: de-energise the circuit under test; pass only an insulated conductor through the current transformer; keep the burden soldered across the secondary (never open it while the primary carries current); ${load}.`;
    case 'shunt': return `Safety first: de-energise the circuit under test; wire the shunt into its return path with the power off (it sits at the amplifier's ground, so the measured circuit must share that ground); ${load}.`;
    default: return `Safety first: de-energise the circuit under test before connecting the sensor; ${load}.`;
  }
}

/**
 * The bench procedure: trimmer start positions, span from the difference of two readings (so the zero's
 * setting does not enter it: zero and span do not interact), then the zero, the reversal check where the
 * supply allows the other polarity, and sealing. Worded for the sensor type, the signal, the instrument and
 * the polarity the supply allows.
 */
export function calibrationSteps(r: Report): CalibrationStep[] {
  const steps: CalibrationStep[] = [];
  const d = r.design;
  const stage = r.stage;
  const dc = r.dc;
  if (!stage || !dc) return steps;
  const m = d.sensor.measurand;
  const ac = d.target.signal === 'ac-rms' || d.sensor.type === 'current-transformer';
  const scale = dc.out[1], zero = dc.out[0];
  const span = Math.abs(scale * (d.target.range[1] - d.target.range[0]));
  const zeroTrim = stage.parts.find((p) => p.role === 'zero-trim');
  const gainTrim = stage.parts.find((p) => p.role === 'gain-trim');
  const zeroWithin = Math.max(stage.network.reference.trim?.step ?? 0, span * 1e-3);
  // Below a nanovolt a zero is zero (what is left is rounding in the solve).
  const f = (x: number, u: string) => formatEng(Math.abs(x) < 1e-9 ? 0 : x, u, 4);
  steps.push({ text: safetyStep(r) });
  const trims = stage.parts.filter((p) => p.kind === 'trimmer' && p.setting !== undefined);
  if (trims.length) steps.push({ text: `Before power: set ${trims.map((p) => `${p.ref} (${ROLE_NAMES[p.role]}) to ${(p.setting! * 100).toFixed(0)} % of its travel`).join(' and ')}, measured across it with an ohmmeter.` });
  steps.push({ text: 'Power the probe and let it settle for a minute (the op-amp and sensor warm up).' });
  // --- closed-loop Hall sensor (issue #20): polarity and the loop's own zero before the stage's ---
  for (const text of closedLoopCalibrationSteps(r)) steps.push({ text });
  const zeroCond = d.sensor.type === 'hall-gap-core' || d.sensor.type === 'closed-loop-hall'
    ? `with no current in the conductor, the core closed, in the place and orientation where it will be used (the Earth's field and nearby steel shift the zero)`
    : `with zero ${m} applied`;
  const [, hi] = peakRange(d);
  const a = applied(r, hi);
  const x = a.x;
  const delta = Math.abs(scale) * x;
  const spanWithin = Math.max((stage.network.gainTrim?.step ?? 0) * delta, delta * 1e-3);
  const deltaText = ac
    ? `the output's AC rms reading is ${f(delta, 'V rms')}`
    : `the output rises by ${f(scale * x, 'V')} from the reading with nothing applied (${f(zero, 'V')} + ${f(scale * x, 'V')} = ${f(zero + scale * x, 'V')} once the zero is set)`;
  const why = ac
    ? 'An AC rms reading leaves the DC zero out, so zero and span do not interact.'
    : 'The span is set from the difference of two readings, so wherever the zero sits it does not enter: zero and span do not interact.';
  if (gainTrim) {
    steps.push({ text: `Span: ${ac ? '' : `${zeroCond}, read the output; then `}${a.text}; turn ${gainTrim.ref} (${ROLE_NAMES['gain-trim']}) until ${deltaText}, within ±${f(spanWithin, 'V')}. ${why}`, expect: ac ? delta : scale * x, within: spanWithin, trimmer: gainTrim.ref });
  } else {
    steps.push({ text: `Span: ${ac ? '' : `${zeroCond}, read the output; then `}${a.text}; expect that ${deltaText}, and note the ratio of what you read to that as a correction (this design has no span trimmer). ${why}`, expect: ac ? delta : scale * x });
  }
  if (zeroTrim) {
    steps.push({ text: `Zero: remove the applied ${m === 'A' ? 'current' : m}; ${zeroCond}, turn ${zeroTrim.ref} (${ROLE_NAMES['zero-trim']}) until the output reads ${f(zero, 'V')} within ±${f(zeroWithin, 'V')}.`, expect: zero, within: zeroWithin, trimmer: zeroTrim.ref });
    // In a non-inverting stage the zero divider's Thevenin resistance sits in the ground leg, so turning it nudges the gain.
    if (gainTrim && stage.network.topology === 'non-inverting' && stage.network.reference.kind === 'divider') {
      steps.push({ text: `The zero divider is part of this stage's gain path: repeat the span difference once; it should still be within ±${f(spanWithin, 'V')}.`, trimmer: gainTrim.ref });
    }
  } else {
    steps.push({ text: `Zero: ${zeroCond}, read the output (expected ${f(zero, 'V')}) and note the difference as a correction; this design has no zero trimmer.`, expect: zero });
  }
  if (!ac && r.clip) {
    const what = m === 'A' ? (d.sensor.type === 'hall-gap-core' || d.sensor.type === 'closed-loop-hall' ? 'the conductor through the core (or the bench supply leads)' : 'the bench supply leads') : `the ${m}`;
    if (-x >= r.clip.measurandLow && -x <= r.clip.measurandHigh) {
      steps.push({ text: `Reverse ${what} and check the other polarity: the output should read ${f(zero - scale * x, 'V')}.`, expect: zero - scale * x });
    } else {
      steps.push({ text: `This design reads only one polarity on its supply: reversing ${what} drives the output to its limit (linear only from ${f(r.clip.measurandLow, m)}), so there is no reverse check.` });
    }
  }
  // The instrument advice (offset to null, polarity, probe ratio) is the one the findings give.
  const probe = r.warnings.find((w) => w.code === 'probe-ratio');
  if (probe) steps.push({ text: sayFinding(probe) });
  rangeSteps(r, steps);
  steps.push({ text: 'Seal the trimmers (a dab of varnish) and write the date, the scale and the zero on the probe.' });
  return steps;
}

/**
 * Issue 19: a range switch is calibrated range by range. The steps above are the first range's (switch at
 * position 1); each further range repeats its own span (and, with two poles, its own zero) at its position.
 * With one pole the zero trimmer is shared and stays where the first range set it: the zero of a further
 * range is read, not turned.
 */
function rangeSteps(r: Report, steps: CalibrationStep[]): void {
  const rs = r.ranges?.ok ? r.ranges.value : null;
  if (!rs) return;
  const m = r.design.sensor.measurand;
  const name = (i: number, scale: number) => `Range ${i + 1} (${formatEng(scale, `V/${m}`, 3)})`;
  const at = steps.findIndex((x) => x.trimmer !== undefined || x.expect !== undefined);
  steps.splice(at < 0 ? steps.length : at, 0, { text: `${name(0, r.design.target.scale)}: set ${rs.switchRef} to position 1 and calibrate this range first.` });
  const shared = rs.wiring === 'single-pole' ? r.stage?.parts.find((p) => p.role === 'zero-trim')?.ref : undefined;
  for (const pos of rs.positions.slice(1)) {
    if (!pos.report?.dc) continue;
    const n = name(pos.index, pos.scale);
    const zero = pos.report.dc.out[0];
    steps.push({ text: `${n}: set ${rs.switchRef} to position ${pos.index + 1}.${shared ? ` Leave ${shared} (${ROLE_NAMES['zero-trim']}) where range 1 set it: with nothing applied this range reads ${formatEng(zero, 'V', 4)}; note it, or null it on the instrument.` : ''}` });
    for (const x of calibrationSteps(pos.report)) {
      const own = x.text.startsWith('Before power') || x.trimmer !== undefined || x.expect !== undefined;
      if (!own || (shared && x.trimmer === shared) || x.text.startsWith('Range ')) continue;
      steps.push({ ...x, text: `${n}: ${x.text}` });
    }
  }
}
