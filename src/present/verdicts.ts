/**
 * The verdict lines: the short pass / caution / fail list a person reads first, worded from the report's
 * figures and findings. Our own thresholds are stated where they are applied.
 */
import type { Report } from '../analysis/report.js';
import { DEFAULT_BAND_SHARE } from '../analysis/analysis.js';
import { formatEng } from '../model/units.js';
import { LIMIT_NAMES, findingTitle, limitWhy, sayFinding } from './finding-words.js';

export interface Verdict {
  level: 'pass' | 'caution' | 'fail';
  title: string;
  detail: string;
}

const f3 = (x: number, unit = '') => formatEng(x, unit, 3);

/** The short pass / caution / fail list a person reads first. */
export function verdictsOf(r: Report): Verdict[] {
  const v: Verdict[] = [];
  const d = r.design;
  const m = d.sensor.measurand;
  if (!r.clip || !r.stage || !r.dc) {
    v.push({ level: 'fail', title: 'No design', detail: r.warnings.filter((w) => w.level === 'fail').map(sayFinding).join(' ') || (r.absent.all ?? r.absent.clip ?? 'not computed') });
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
  v.push({ level: inputOk ? 'pass' : 'fail', title: inputOk ? 'Op-amp inputs stay in their range' : 'Op-amp input range is violated', detail: limitWhy(inputLimit.data) + (inputOk ? '.' : `: leaves it at ${f3(Math.max(inputLimit.low, a), m)} / ${f3(Math.min(inputLimit.high, b), m)}.`) });
  const se = r.stage.scaleError;
  v.push({ level: Math.abs(se) < d.target.tolerance ? 'pass' : 'caution', title: `Scale ${f3(r.dc!.out[1], `V/${m}`)} before trim`, detail: `${((Math.abs(se) < 5e-6 ? 0 : se) * 100).toFixed(3)} % from the target with the trimmers at mid; zero ${f3(r.dc!.out[0], 'V')}.` });
  if (r.speed) {
    const bwOk = !(d.target.bandwidth > 0) || r.speed.smallSignal >= d.target.bandwidth;
    const short = r.warnings.find((w) => w.code === 'bandwidth-short');
    const bwShort = bwOk || !short ? '' : `${sayFinding(short)} `;
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
  for (const w of r.warnings.filter((x) => (x.level === 'fail' || x.level === 'caution') && !x.code.startsWith('clips-in-range') && x.code !== 'bandwidth-short')) {
    v.push({ level: w.level === 'fail' ? 'fail' : 'caution', title: findingTitle(w.code), detail: sayFinding(w) });
  }
  // --- issue 19: with a range switch every range's own lines (range, inputs, scale, bandwidth, noise, error)
  // name their range; the lines that belong to the whole probe (supply, sensor findings) are said once.
  if (r.ranges?.ok) {
    const own = /^(Covers the range|Clips inside the range|Op-amp input|Scale |Bandwidth|Noise |Error ±)/;
    const name = (i: number, scale: number) => `Range ${i + 1} (${f3(scale, `V/${m}`)}): `;
    for (const line of v) if (own.test(line.title)) line.title = name(0, d.target.scale) + line.title;
    for (const p of r.ranges.value.positions.slice(1)) {
      if (!p.report) continue;
      for (const line of verdictsOf(p.report)) if (own.test(line.title)) v.push({ ...line, title: name(p.index, p.scale) + line.title });
    }
  }
  // --- end issue 19
  // Worst first.
  const rank = { fail: 0, caution: 1, pass: 2 } as const;
  v.sort((a, b) => rank[a.level] - rank[b.level]);
  return v;
}
