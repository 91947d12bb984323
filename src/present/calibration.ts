/**
 * The bench calibration procedure for a solved design: which trimmer sets the zero and which the span, in
 * which order, what to apply and what to expect, and how close each step should land.
 */
import type { Report } from '../analysis/report.js';
import { formatEng } from '../model/units.js';
import { peakRange } from '../physics/topology.js';

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

export function calibrationSteps(r: Report): CalibrationStep[] {
  const steps: CalibrationStep[] = [];
  const d = r.design;
  const stage = r.stage;
  const dc = r.dc;
  if (!stage || !dc) return steps;
  const m = d.sensor.measurand;
  const isCurrent = m === 'A';
  const scale = dc.out[1], zero = dc.out[0];
  const span = Math.abs(scale * (d.target.range[1] - d.target.range[0]));
  const zeroTrim = stage.parts.find((p) => p.role === 'zero-trim');
  const gainTrim = stage.parts.find((p) => p.role === 'gain-trim');
  const zeroWithin = Math.max(stage.network.reference.trim?.step ?? 0, span * 1e-3);
  const f = (x: number, u: string) => formatEng(x, u, 4);
  steps.push({ text: 'Safety first: de-energise the circuit under test; fit the probe only to an insulated conductor; connect the output to the instrument (1 MΩ input, DC coupling).' });
  steps.push({ text: 'Power the probe and let it settle for a minute (the op-amp and sensor warm up).' });
  const zeroCond = d.sensor.type === 'hall-gap-core'
    ? 'with no current in the conductor, the core closed, in the place and orientation where it will be used (the Earth\'s field and nearby steel shift the zero)'
    : `with zero ${m} applied`;
  if (zeroTrim) {
    steps.push({ text: `Zero: ${zeroCond}, turn ${zeroTrim.ref} (zero trim) until the output reads ${f(zero, 'V')} within ±${f(zeroWithin, 'V')}.`, expect: zero, within: zeroWithin, trimmer: zeroTrim.ref });
  } else {
    steps.push({ text: `Zero: ${zeroCond}, read the output (expected ${f(zero, 'V')}) and note the difference as a correction; this design has no zero trimmer.`, expect: zero });
  }
  const [, hi] = peakRange(d);
  const acNote = d.target.signal === 'ac-rms' ? ' (AC: use an rms-reading meter on the bench current and on the output, and read the output\'s AC rms)' : '';
  let applied: string;
  let x: number;
  if (isCurrent) {
    const [n, i] = calibrationCurrent(hi / (d.target.signal === 'ac-rms' ? Math.SQRT2 : 1));
    x = n * i;
    applied = `${n === 1 ? 'pass the conductor once through the probe' : `wind ${n} turns of insulated wire through the probe`} and drive ${f(i, 'A')} through it from a current-limited bench supply, checked with a meter (${n} × ${f(i, 'A')} = ${f(x, 'A')}${n > 1 ? '; the turns multiply a small bench current' : ''})`;
  } else {
    x = Number((hi * 0.5).toPrecision(2));
    applied = `apply a known ${f(x, m)}`;
  }
  const expectSpan = d.target.signal === 'ac-rms' ? Math.abs(scale) * x : zero + scale * x;
  const spanWithin = Math.max((stage.network.gainTrim?.step ?? 0) * Math.abs(scale * x), Math.abs(scale * x) * 1e-3);
  if (gainTrim) {
    steps.push({ text: `Span: ${applied}${acNote}; turn ${gainTrim.ref} (gain trim) until the output reads ${f(expectSpan, d.target.signal === 'ac-rms' ? 'V rms' : 'V')} within ±${f(spanWithin, 'V')}${d.target.signal === 'ac-rms' ? '' : `: judge it by the difference from the zero reading you just took (${f(scale * x, 'V')}), so that a zero error stays out of the span`}.`, expect: expectSpan, within: spanWithin, trimmer: gainTrim.ref });
  } else {
    steps.push({ text: `Span: ${applied}${acNote}; the output should read ${f(expectSpan, 'V')}; note the ratio as a correction (this design has no gain trimmer).`, expect: expectSpan });
  }
  if (zeroTrim && gainTrim) steps.push({ text: `Remove the current and re-check the zero: the span trim moves it slightly in this topology. Repeat zero then span until both land within their tolerances.`, trimmer: zeroTrim.ref });
  if (d.target.signal !== 'ac-rms') steps.push({ text: `Reverse the ${isCurrent ? 'conductor (or the bench supply leads)' : 'measurand'} and check the other polarity: the output should read ${f(zero - scale * x, 'V')}.`, expect: zero - scale * x });
  const probe = r.warnings.find((w) => w.code === 'probe-ratio');
  if (probe) steps.push({ text: probe.message });
  steps.push({ text: 'Seal the trimmers (a dab of varnish) and write the date, the scale and the zero on the probe.' });
  return steps;
}
