/**
 * A report in two steps, for the app (issue 23): `analyse(design, { spreadTrials: 0 })` gives everything the
 * verdict, the findings and the plots of the transfer, response, noise and battery need; `completeReport` then
 * adds the two figures nothing else depends on, the Monte Carlo spread and the step over the range that the
 * scope view starts from, so the verdict is shown before they are worked out.
 *
 * The result equals `analyse(design, { defaultWaveform: true, spreadTrials })` (a test checks it field by field on
 * every demo). Only the plain case is composed here: where either figure would come out missing or not finite,
 * the full `analyse()` runs instead, so the reasons written into `absent` keep their one source (report.ts).
 */
import type { Design } from '../model/design.js';
import { analyse, firstNonFinite, type Report } from './report.js';
import { spread } from './analysis.js';
import { stepOverRange, waveform } from './waveform.js';

/** Samples of the waveform `analyse()` solves by default. */
const WAVEFORM_SAMPLES = 2000;

/**
 * `quick` (the report of `design` with `spreadTrials: 0`) completed with the tolerance spread (`spreadTrials`
 * trials, the design's own count by default) and, when the design names no waveform, a step over the range.
 * `quick` itself is left as it was.
 */
export function completeReport(design: Design, quick: Report, spreadTrials = design.analysis.spreadTrials): Report {
  const full = (): Report => analyse(design, { spreadTrials, defaultWaveform: true });
  const { circuit, dc, clip, speed } = quick;
  // A report that stopped early (no stage, no circuit, no operating point) has neither figure either way.
  if (!circuit || !dc) return quick;
  const absent = { ...quick.absent };
  let spr = quick.spread;
  if (spreadTrials > 0 && !spr) {
    spr = spread(quick.design, quick.front, circuit, dc, spreadTrials);
    if (firstNonFinite(spr) !== null) return full();
    delete absent.spread;
  }
  let wave = quick.waveform, spec = quick.waveformSpec;
  if (!spec && !quick.absent.waveform) {
    if (!clip || !speed) return full();
    spec = stepOverRange(quick.design);
    wave = waveform(quick.design, spec, circuit, quick.front, dc, clip, speed, WAVEFORM_SAMPLES);
    if (!wave) return full();
  }
  const out: Report = { ...quick, spread: spr, waveform: wave, waveformSpec: spec, absent };
  // A range switch's first position is the report itself: it points at the completed one.
  const rs = quick.ranges;
  if (rs?.ok) out.ranges = { ...rs, value: { ...rs.value, positions: rs.value.positions.map((p) => (p.report === quick ? { ...p, report: out } : p)) } };
  return out;
}
