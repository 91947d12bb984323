/** The report as plain text for a terminal: verdicts first, then parts, figures, calibration, cautions. */
import { armJoint, partCode, partRole, partValue } from './parts.js';
import type { Report } from '../analysis/report.js';
import { calibrationSteps } from './calibration.js';
import { cautionsFor } from './cautions.js';
import { sayFinding, topologyWhy } from './finding-words.js';
import { verdictsOf } from './verdicts.js';
import { formatEng } from '../model/units.js';
import { terminalLine } from './inert.js';
import { waveformFigures } from './figures.js';
import { closedLoopLines } from './closed-loop.js';
import { noiseLabel } from './charts.js';
import { tradeLines } from './trade.js';
import { rangeLines } from './ranges.js';

const f = (x: number | null | undefined, u = '', d = 3) => (x === null || x === undefined ? '—' : formatEng(x, u, d));
const MARK = { pass: 'PASS', caution: 'CAUTION', fail: 'FAIL' } as const;

/** The whole report as plain text for a terminal: verdict, stage, parts, figures, findings, calibration, safety. Every line is inert. */
export function textReport(r: Report): string {
  const d = r.design;
  const m = d.sensor.measurand;
  const out: string[] = [];
  const h = (s: string) => out.push('', s, '-'.repeat(s.length));
  out.push(d.title, '='.repeat(Math.min(terminalLine(d.title).length, 80)));
  h('Verdict');
  for (const v of verdictsOf(r)) out.push(`  [${MARK[v.level]}] ${v.title}: ${v.detail}`);
  const s = r.stage;
  h('Stage');
  out.push(`  ${topologyWhy(r.choice)}`);
  if (s && r.dc) {
    out.push(`  Gain ${s.gain.toFixed(5)} (noise gain ${s.noiseGain.toFixed(5)}), reference ${f(s.reference, 'V', 5)}`);
    out.push(`  Scale ${f(r.dc.out[1], `V/${m}`, 5)} (target ${f(d.target.scale, `V/${m}`, 5)}, ${(s.scaleError * 100).toFixed(4)} % before trim), zero ${f(r.dc.out[0], 'V', 5)} (target ${f(d.target.zero, 'V', 5)})`);
    h('Parts');
    for (const p of s.parts) {
      out.push(`  ${p.ref.padEnd(5)} ${(partValue(p) + (p.arrangement === 'single' ? '' : ` (${p.arrangement})`)).padEnd(24)} ${partCode(p).padEnd(6)} ${p.series === 'trimmer' || p.series === 'capacitor' ? '' : `${p.series} ±${(p.tolerance * 100).toFixed(1)} %`.padEnd(13)} ${partRole(p)}${p.setting !== undefined ? ` (set to ${(p.setting * 100).toFixed(0)} %)` : ''}`);
    }
    if (s.alternatives.length > 1) {
      out.push('  Alternatives for the gain network (feedback / leg, error):');
      s.alternatives.slice(0, 5).forEach((a, i) => out.push(`   ${i === s.chosen ? '*' : ' '}${i}: ${a.a.parts.map((p) => formatEng(p, 'Ω')).join(armJoint(a.a.arrangement))} / ${a.b.parts.map((p) => formatEng(p, 'Ω')).join(armJoint(a.b.arrangement))}, ${(a.error * 100).toFixed(4)} %`));
    }
  }
  if (r.front.figures.length) {
    h('Sensor');
    for (const fig of r.front.figures) out.push(`  ${fig.label}: ${fig.unit === '' ? `${(fig.value * 100).toFixed(2)} %` : f(fig.value, fig.unit)}`);
    // --- closed-loop Hall sensor (issue #20) ---
    out.push(...closedLoopLines(r));
  }
  if (r.clip) {
    const c = r.clip;
    h('Range and clipping');
    out.push(`  Range ${f(c.rangePeak[0], m)} … ${f(c.rangePeak[1], m)}${d.target.signal === 'ac-rms' ? ' (sine peaks of the rms range)' : ''} → output ${f(c.rangeOutput[0], 'V')} … ${f(c.rangeOutput[1], 'V')}`);
    out.push(`  Linear from ${f(c.measurandLow, m)} (${c.firstLow}) to ${f(c.measurandHigh, m)} (${c.firstHigh}); output clips at ${f(c.outputLow, 'V')} / ${f(c.outputHigh, 'V')}`);
    out.push(`  Headroom ${f(c.headroom.low, 'V')} (${c.headroom.lowPercent.toFixed(1)} % of span) low, ${f(c.headroom.high, 'V')} (${c.headroom.highPercent.toFixed(1)} %) high; first to saturate: ${c.first}`);
  }
  if (r.speed) {
    h('Bandwidth');
    out.push(`  Small-signal bandwidth ${f(r.speed.smallSignal, 'Hz')}${r.speed.lowCorner ? `, low corner ${f(r.speed.lowCorner, 'Hz')}` : ''}, phase at the corner ${r.speed.phaseAtCorner.toFixed(1)}°`);
    out.push(`  Rise time ${f(r.speed.riseTime, 's')}; full-power bandwidth ${f(r.speed.fullPower, 'Hz')} at ${f(r.speed.peakSwing, 'V')} peak`);
  }
  if (r.noise) {
    h('Noise');
    out.push(`  ${f(r.noise.densityAt1kHz, 'V/√Hz')} at 1 kHz (${f(r.noise.referredDensityAt1kHz, `${m}/√Hz`)}); ${f(r.noise.rms, 'V')} rms over ${f(r.noise.band[0], 'Hz')}…${f(r.noise.band[1], 'Hz')} = ${f(r.noise.referredRms, m)} rms, about ${f(r.noise.peakToPeak, 'V')} p-p`);
    const lf = r.noise.lowFrequency;
    out.push(`  ${f(lf.band[0], 'Hz')}…${f(lf.band[1], 'Hz')} (how far a slow reading wanders): ${f(lf.rms, 'V')} rms, about ${f(lf.peakToPeak, 'V')} p-p = ${f(lf.referredPeakToPeak, m)} p-p`);
    out.push(`  Largest contributors: ${r.noise.shares.slice(0, 4).map((x) => `${noiseLabel(x)} ${(x.fraction * 100).toFixed(1)} %`).join(', ')}`);
  }
  if (r.errors) {
    const [lo, hi] = r.clip?.rangePeak ?? r.design.target.range;
    h(`DC error budget at ${f(lo, m)} / ${f(hi, m)}`);
    for (const t of r.errors.terms) out.push(`  ${t.name.padEnd(44)} ±${f(t.low, m)} / ±${f(t.high, m)}  ${t.calibration ? '(from the calibration)' : t.removedBy === 'none' ? '(remains after trim)' : `(trimmed: ${t.removedBy})`}`);
    out.push(`  At ${f(r.errors.at, m)}: worst case ±${f(r.errors.worstCase, m)}, RSS ±${f(r.errors.rss, m)}; after calibration ±${f(r.errors.afterTrim, m)} (RSS ±${f(r.errors.afterTrimRss, m)}); after calibration at the other end ±${f(r.errors.at === lo ? r.errors.afterTrimHigh : r.errors.afterTrimLow, m)}`);
  }
  if (r.supply) {
    h('Supply');
    for (const p of r.supply.parts) out.push(`  ${p.name}: ${f(p.current, 'A')}`);
    out.push(`  Total ${f(r.supply.current, 'A')}${r.supply.batteryLife !== null ? `; battery life about ${r.supply.batteryLife.toFixed(1)} h` : ''}`);
  }
  if (r.battery.length) {
    out.push('  Battery sweep (V: linear range, headroom low/high, zero shift, scale):');
    for (const b of r.battery) out.push(`   ${b.voltage.toFixed(2)} V: ${f(b.measurandLow, m)} … ${f(b.measurandHigh, m)}, ${f(b.headroomLow, 'V')} / ${f(b.headroomHigh, 'V')}, ${f(b.zeroShift, 'V')}, ${f(b.scale, `V/${m}`, 4)}${b.regulated ? '' : ' (regulator out of regulation)'}`);
    const bc = r.batteryClip;
    if (bc && bc.voltage !== null) out.push(`  Clips inside the range from ${f(bc.voltage, 'V', 4)}${bc.hoursToClip !== null ? `, after about ${bc.hoursToClip.toFixed(1)} h of ${bc.hoursToEnd!.toFixed(1)} h to end of life (voltage taken as linear in the charge drawn)` : ''}`);
  }
  if (r.spread) {
    h(`Tolerance spread (${r.spread.trials} seeded trials)`);
    out.push(`  Scale ${f(r.spread.scaleMean, `V/${m}`, 4)} ± ${f(r.spread.scaleStd, `V/${m}`)} (1σ); zero ${f(r.spread.zeroMean, 'V', 4)} ± ${f(r.spread.zeroStd, 'V')}; ${(r.spread.yield * 100).toFixed(1)} % within ±${(d.analysis.scaleLimit * 100).toFixed(1)} % and ±${f(d.analysis.zeroLimit, 'V')} before trim`);
  }
  if (r.drive) {
    h('Driving the instrument');
    out.push(`  Scale at a 1 MΩ input ${f(r.drive.scaleAt1M, `V/${m}`, 4)}, at 50 Ω ${f(r.drive.scaleAt50, `V/${m}`, 4)}${r.drive.drives50 ? '' : ' (the op-amp cannot drive 50 Ω over the range)'}`);
    const probe = r.warnings.find((w) => w.code === 'probe-ratio');
    if (probe) out.push(`  ${sayFinding(probe)}`);
  }
  const wave = waveformFigures(r);
  if (wave.length) {
    h('Waveform at the instrument');
    for (const row of wave) out.push(`  ${row.label}: ${row.value}${row.note ? ` (${row.note})` : ''}`);
  }
  // Issue 19: the turns / gap (or turns / burden) trade, when the report ran it.
  out.push(...tradeLines(r.trade, m));
  out.push(...rangeLines(r)); // issue 19
  if (r.warnings.length) {
    h('Findings');
    for (const w of r.warnings) out.push(`  [${w.level}] ${sayFinding(w)}`);
  }
  const calibration = calibrationSteps(r);
  if (calibration.length) {
    h('Calibration');
    calibration.forEach((c, i) => out.push(`  ${i + 1}. ${c.text}`));
  }
  h('Safety');
  for (const c of cautionsFor(d.sensor.type, r.front.cautions)) out.push(`  ! ${c}`);
  // Each entry is one line: whatever a design's text holds is shown, never acted on by the terminal.
  return out.map(terminalLine).join('\n') + '\n';
}
