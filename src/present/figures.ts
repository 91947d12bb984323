/** The report's key figures as labelled text rows, for the app and the printed build sheet. */
import type { Report } from '../analysis/report.js';
import { noiseLabel } from './charts.js';
import { formatEng } from '../model/units.js';
import { STAGE_NAMES } from './words.js';
import { stageReasonWords } from './finding-words.js';
import { closedLoopFigureRows } from './closed-loop.js';

export interface FigureRow { label: string; value: string; note?: string }

const f = (x: number | null | undefined, u = '', d = 3) => (x === null || x === undefined ? '—' : formatEng(x, u, d));

/** The key figures as labelled text rows (stage, gain, scale, zero, range, bandwidth, noise, errors, supply, sensor). */
export function keyFigures(r: Report): FigureRow[] {
  const m = r.design.sensor.measurand;
  const rows: FigureRow[] = [];
  const s = r.stage;
  if (!s || !r.dc) return [{ label: 'Design', value: 'not solved', note: r.absent.all ?? '' }];
  rows.push({ label: 'Stage', value: STAGE_NAMES[s.ideal.topology], note: (r.choice.chosen?.reasons ?? []).map(stageReasonWords).join('; ') });
  rows.push({ label: 'Gain / noise gain', value: `${s.gain.toFixed(4)} / ${s.noiseGain.toFixed(4)}` });
  rows.push({ label: 'Scale at the instrument', value: f(r.dc.out[1], `V/${m}`, 5), note: `${(s.scaleError * 100).toFixed(4)} % before trim` });
  rows.push({ label: 'Zero', value: f(r.dc.out[0], 'V', 5) });
  if (Number.isFinite(s.reference)) rows.push({ label: 'Reference', value: f(s.reference, 'V', 4) });
  for (const fig of r.front.figures) rows.push({ label: fig.label, value: fig.unit === '' ? `${(fig.value * 100).toFixed(2)} %` : f(fig.value, fig.unit) });
  rows.push(...closedLoopFigureRows(r)); // closed-loop Hall sensor (issue #20)
  if (r.clip) {
    rows.push({ label: 'Linear range', value: `${f(r.clip.measurandLow, m)} … ${f(r.clip.measurandHigh, m)}`, note: `first to saturate: ${r.clip.firstLow ?? '—'} / ${r.clip.firstHigh ?? '—'}` });
    rows.push({ label: 'Output clips at', value: `${f(r.clip.outputLow, 'V')} / ${f(r.clip.outputHigh, 'V')}` });
    rows.push({ label: 'Headroom low / high', value: `${f(r.clip.headroom.low, 'V')} / ${f(r.clip.headroom.high, 'V')}`, note: `${r.clip.headroom.lowPercent.toFixed(1)} % / ${r.clip.headroom.highPercent.toFixed(1)} % of the span${r.design.target.signal === 'ac-rms' ? ', at the sine peak' : ''}` });
  }
  if (r.speed) {
    rows.push({ label: 'Bandwidth (−3 dB)', value: f(r.speed.smallSignal, 'Hz'), note: `${r.speed.lowCorner ? `low corner ${f(r.speed.lowCorner, 'Hz')}; ` : ''}phase ${r.speed.phaseAtCorner.toFixed(1)}° at the corner` });
    rows.push({ label: 'Rise time', value: f(r.speed.riseTime, 's') });
    rows.push({ label: 'Full-power bandwidth', value: f(r.speed.fullPower, 'Hz'), note: `at ${f(r.speed.peakSwing, 'V')} peak` });
  }
  if (r.noise) {
    rows.push({ label: 'Noise at 1 kHz', value: f(r.noise.densityAt1kHz, 'V/√Hz'), note: `${f(r.noise.referredDensityAt1kHz, `${m}/√Hz`)} referred` });
    rows.push({ label: 'Noise rms', value: f(r.noise.rms, 'V'), note: `${f(r.noise.referredRms, m)} rms over ${f(r.noise.band[0], 'Hz')}…${f(r.noise.band[1], 'Hz')}; ${f(r.noise.peakToPeak, 'V')} p-p` });
    rows.push({ label: 'Largest noise source', value: noiseLabel(r.noise.shares[0]), note: `${((r.noise.shares[0]?.fraction ?? 0) * 100).toFixed(0)} % of the power` });
  }
  if (r.errors) {
    rows.push({ label: 'DC error, worst case', value: `±${f(r.errors.worstCase, m)}`, note: `RSS ±${f(r.errors.rss, m)} at ${f(r.errors.at, m)}` });
    rows.push({ label: 'DC error after calibration', value: `±${f(r.errors.afterTrim, m)}`, note: 'drift, trim resolution and the calibration meter remain' });
  }
  if (r.supply) {
    rows.push({ label: 'Supply current', value: f(r.supply.current, 'A') });
    if (r.supply.batteryLife !== null) {
      const bc = r.batteryClip;
      rows.push({ label: 'Battery life', value: `${r.supply.batteryLife.toFixed(1)} h`, note: bc && bc.voltage !== null && bc.hoursToClip !== null ? `clips inside the range after about ${bc.hoursToClip.toFixed(1)} h (${f(bc.voltage, 'V')})` : 'to end of life' });
    }
  }
  if (r.spread) rows.push({ label: 'Spread (1σ, before trim)', value: `${f(r.spread.scaleStd, `V/${m}`)} / ${f(r.spread.zeroStd, 'V')}`, note: `${(r.spread.yield * 100).toFixed(1)} % of builds within limits untrimmed` });
  if (r.drive) {
    rows.push({ label: 'Scale at 1 MΩ / 50 Ω', value: `${f(r.drive.scaleAt1M, `V/${m}`, 4)} / ${f(r.drive.scaleAt50, `V/${m}`, 4)}`, note: r.drive.drives50 ? '' : 'cannot drive 50 Ω over the range' });
    if (r.drive.probeRatio) rows.push({ label: 'Instrument probe ratio', value: `${r.drive.probeRatio}×`, note: Math.abs(r.drive.probeOffsetShown) < 1e-3 ? `reads ${m} directly${r.drive.probeInvert ? ' (inverted)' : ''}` : `null the ${f(r.drive.probeOffsetShown, m)} zero offset on the instrument${r.drive.probeInvert ? '; invert the channel' : ''}` });
  }
  return rows;
}

const SHAPES = { step: 'step', sine: 'sine', square: 'square wave', triangle: 'triangle' } as const;

/** What the measurand waveform is, in words: "step from −20 A to 20 A", "square wave −5 A … 5 A at 200 Hz, 50 % duty". */
function waveformTitle(r: Report): string {
  const w = r.waveformSpec;
  if (!w) return 'no waveform';
  const m = r.design.sensor.measurand;
  if (w.shape === 'step') return `step ${f(w.low, m)} → ${f(w.high, m)}${r.design.analysis.waveform ? '' : ', the range (a start: name your own)'}`;
  return `${SHAPES[w.shape]} ${f(w.low, m)} … ${f(w.high, m)} at ${f(w.frequency, 'Hz')}${w.shape === 'sine' ? '' : `, ${(w.duty * 100).toFixed(0)} % ${w.shape === 'triangle' ? 'rising' : 'duty'}`}`;
}

/** The waveform's figures as rows, for the app (beside the plot), the printed sheet and the text report. */
export function waveformFigures(r: Report): FigureRow[] {
  const w = r.waveform;
  if (!w) return r.waveformSpec || r.absent.waveform ? [{ label: 'Waveform', value: 'not solved', note: r.absent.waveform ?? '' }] : [];
  const pct = (x: number | null) => (x === null ? '—' : `${(x * 100).toFixed(1)} %`);
  const spec = r.waveformSpec!;
  const rows: FigureRow[] = [{ label: 'Measurand', value: SHAPES[spec.shape], note: waveformTitle(r) }];
  const edge = w.riseTime !== null || w.overshoot !== null;
  if (edge) {
    rows.push({ label: 'Rise time (10–90 %)', value: f(w.riseTime, 's'), note: w.slewLimited ? 'slew-limited' : `small-signal ${f(r.speed?.riseTime, 's')}` });
    rows.push({ label: 'Overshoot', value: pct(w.overshoot) });
    rows.push({ label: 'Settling to 1 %', value: w.settlingTime === null ? 'not within the view' : f(w.settlingTime, 's') });
  }
  if (w.droop !== null) rows.push({ label: 'Droop over a half-period', value: pct(w.droop), note: r.front.passesDc ? 'DC-coupled: none' : 'the sensor passes no DC' });
  let lo = Infinity, hi = -Infinity;
  for (const v of w.output) { lo = Math.min(lo, v); hi = Math.max(hi, v); }
  rows.push({ label: 'Output swings', value: `${f(lo, 'V')} … ${f(hi, 'V')}` });
  rows.push({ label: 'Slew-limited', value: w.slewLimited ? 'yes' : 'no', note: w.slewLimited ? `at ${f(r.design.opamp.slewRate, 'V/s')}` : '' });
  rows.push({ label: 'Clipped', value: w.clipped ? 'yes' : 'no', note: w.clipped ? 'output or sensor at a limit' : '' });
  return rows;
}

/** The waveform's figures in one line, for the printed sheet: "Measurand: step …; Rise time (10–90 %): 6.40 µs (slew-limited); …". */
export function waveformLine(r: Report): string {
  return waveformFigures(r).filter((row) => row.label !== 'Output swings').map((row) => row.label === 'Measurand' ? row.note ?? row.value : `${row.label}: ${row.value}${row.note ? ` (${row.note})` : ''}`).join('; ');
}
