/**
 * Words and plots for bench readings: the sensor fit (src/analysis/fit.ts), the sensor "from readings"
 * (src/analysis/sensor-readings.ts) and the trim of a built probe (src/analysis/trim.ts). The CLI prints
 * these lines, the app shows them beside its readings tables.
 */
import type { FitProblem, ReadingsFit } from '../analysis/fit.js';
import type { Report } from '../analysis/report.js';
import type { SensorFromReadings } from '../analysis/sensor-readings.js';
import type { Deviation, TrimProblem, TrimResult } from '../analysis/trim.js';
import type { Part } from '../circuit/network.js';
import type { Reading } from '../model/readings.js';
import { formatEng } from '../model/units.js';
import type { ChartData } from './charts.js';
import { partRole, partValue } from './parts.js';

const f = (x: number, unit = '', digits = 4) => formatEng(x, unit, digits);

/** What a fit problem means, and what is missing. */
function fitProblemText(p: FitProblem, measurand: string): string {
  if (p.code === 'no-spread') return `All usable readings are at one ${measurand} value: a line needs readings at two or more values, and standard errors need three or more.`;
  const more = p.need - p.have;
  return `${p.have} usable reading${p.have === 1 ? '' : 's'}: a fit with standard errors needs at least ${p.need}; take ${more} more at different ${measurand} values (zero and the range ends are good choices).`;
}

/** The fit in lines of text: line, uncertainties, linear region, outliers. Indices are shown counting from 1. */
export function fitLines(fit: ReadingsFit, readings: readonly Reading[], measurand: string): string[] {
  const lines: string[] = [];
  if (fit.unusable.length) lines.push(`Readings ${fit.unusable.map((i) => i + 1).join(', ')} are not two numbers and are left out.`);
  if (!fit.line || fit.problem) {
    lines.push(fit.problem ? fitProblemText(fit.problem, measurand) : 'No line could be fitted.');
    return lines;
  }
  const l = fit.line;
  lines.push(`Sensitivity ${f(l.slope, `V/${measurand}`)} ± ${f(l.slopeStdError, `V/${measurand}`, 2)} (one standard error), zero ${f(l.intercept, 'V')} ± ${f(l.interceptStdError, 'V', 2)}.`);
  lines.push(`Residual standard deviation ${f(l.residualStd, 'V', 3)} from ${fit.used} of ${fit.points} readings (${l.dof} degrees of freedom).`);
  lines.push(`Linear from ${f(fit.linear![0], measurand)} to ${f(fit.linear![1], measurand)}.`);
  const beyond = (idx: number[], side: string) => idx.length
    ? `${idx.length} reading${idx.length === 1 ? '' : 's'} ${side} (${idx.map((i) => f(readings[i]![0], measurand, 3)).join(', ')}) leave${idx.length === 1 ? 's' : ''} the straight line: left out of the fit.`
    : '';
  const lo = beyond(fit.beyondLow, 'below'), hi = beyond(fit.beyondHigh, 'above');
  if (lo) lines.push(lo);
  if (hi) lines.push(hi);
  if (fit.outliers.length) lines.push(`Reading${fit.outliers.length === 1 ? '' : 's'} ${fit.outliers.map((i) => `${i + 1} (${f(readings[i]![0], measurand, 3)})`).join(', ')} lie${fit.outliers.length === 1 ? 's' : ''} off the line beyond the noise (an outlier): left out; measure again.`);
  return lines;
}

/** What the design took from its sensor readings, in lines. */
export function sensorReadingsLines(sr: SensorFromReadings, readings: readonly Reading[], measurand: string): string[] {
  const lines = fitLines(sr.fit, readings, measurand);
  if (!sr.fit.line) return lines;
  if (sr.fringing !== null) lines.push(`For this core the measured sensitivity implies a fringing factor of ${sr.fringing.toFixed(3)}${sr.effectiveGap !== null ? `, or an effective gap of ${f(sr.effectiveGap, 'm', 3)} with no fringing` : ''}.`);
  if (sr.applied) {
    lines.push(`In use: sensitivity and zero from the readings, tolerances ±${(sr.sensitivityTolerance * 100).toFixed(2)} % and ±${f(sr.quiescentTolerance, 'V', 2)} (standard errors × ${sr.coverage.toFixed(2)}, Student's t for about 95 %).`);
  }
  return lines;
}

const causeName = (d: Deviation, parts: readonly Part[]): string => {
  switch (d.kind) {
    case 'resistor': {
      const p = parts.find((x) => x.ref === d.ref);
      return p ? `${p.ref} (${partRole(p)}, ${partValue(p)})` : d.ref ?? '?';
    }
    case 'sensor-sensitivity': return "the sensor's sensitivity";
    case 'sensor-zero': return "the sensor's zero";
    case 'opamp-offset': return "the op-amp's offset";
  }
};

const deviationText = (d: Deviation, parts: readonly Part[]) => {
  const amount = d.kind === 'sensor-zero' || d.kind === 'opamp-offset' ? `${d.value >= 0 ? '+' : ''}${f(d.value, 'V', 2)}` : `${d.value >= 0 ? '+' : ''}${(d.value * 100).toFixed(2)} %`;
  return `${causeName(d, parts)} ${amount} (${Math.abs(d.tolerances).toFixed(1)} × its tolerance)`;
};

/** What a trim problem means. */
export function trimProblemText(p: TrimProblem, measurand: string): string {
  switch (p.code) {
    case 'no-stage': return 'The design has no solved stage to trim: fix the design first.';
    case 'ac-design': return 'This design reads AC (rms): trimming from readings needs DC readings of a DC design; follow the calibration steps instead.';
    case 'too-few-readings': return `Readings at ${p.have} ${measurand} value${p.have === 1 ? '' : 's'}: the trim needs at least ${p.need} different values (zero and one near the top of the range).`;
    case 'no-trimmers': return 'This design has no trimmers: use the measured scale and zero as corrections at the instrument.';
    case 'unexplained': return 'The readings cannot be explained by the parts of this design: check the wiring and that the readings belong to this probe.';
    case 'no-solution': return 'No trimmer settings reach the target from these readings: check the wiring and the readings.';
    case 'out-of-reach': return `Even with the resistors below changed, ${p.trimmers.join(' and ')} would have to turn past ${p.trimmers.length === 1 ? 'its' : 'their'} travel: check the build and the readings before turning; the settings below only show the direction.`;
  }
}

/** The trim in lines of text: what was measured, what differs, what to change, what to turn in which order. */
export function trimLines(t: TrimResult, parts: readonly Part[], measurand: string): string[] {
  const lines: string[] = [];
  if (t.problem && t.problem.code !== 'out-of-reach') {
    if (Number.isFinite(t.scale)) lines.push(`Measured: scale ${f(t.scale, `V/${measurand}`)}, zero ${f(t.zero, 'V')}.`);
    lines.push(trimProblemText(t.problem, measurand));
    return lines;
  }
  lines.push(`Measured: scale ${f(t.scale, `V/${measurand}`)} (${((t.scale / t.target.scale - 1) * 100).toFixed(2)} % from the target ${f(t.target.scale, `V/${measurand}`)}), zero ${f(t.zero, 'V')} (${f(t.zero - t.target.zero, 'V', 3)} from ${f(t.target.zero, 'V')}).`);
  const best = t.explanations[0];
  if (best) {
    lines.push(`Most likely: ${best.deviations.map((d) => deviationText(d, parts)).join(' and ')}.`);
    const next = t.explanations.slice(1, 3);
    if (next.length) lines.push(`Also possible: ${next.map((e) => e.deviations.map((d) => deviationText(d, parts)).join(' with ')).join('; ')}. Readings alone cannot tell these apart; measure a suspect part out of circuit if it matters.`);
  }
  if (t.problem) lines.push(trimProblemText(t.problem, measurand));
  for (const r of t.replace) {
    const p = parts.find((x) => x.ref === r.ref);
    lines.push(`Change ${r.ref}${p ? ` (${partRole(p)})` : ''} from ${f(r.from, 'Ω', 3)} to ${f(r.ohms, 'Ω', 3)}: its trimmer cannot reach otherwise.`);
  }
  t.settings.forEach((s, i) => {
    const step = t.steps[i]!;
    const where = step.measurand === 0 ? `with 0 ${measurand} applied` : `with ${f(step.measurand, measurand)} applied`;
    lines.push(`${i + 1}. Turn ${s.ref} (${s.role === 'gain-trim' ? 'gain' : 'zero'} trim) from ${(s.from * 100).toFixed(1)} % to ${(s.setting * 100).toFixed(1)} % of its travel; ${where} the output should then read ${f(step.output, 'V')}.`);
  });
  if (t.checks.length) lines.push(`Then check: ${t.checks.map((c) => `${f(c.measurand, measurand, 3)} → ${f(c.output, 'V')}`).join(', ')}.`);
  if (Number.isFinite(t.step.scale) || Number.isFinite(t.step.zero)) {
    lines.push(`One settable step of the trimmers moves the scale by about ${f(t.step.scale, `V/${measurand}`, 2)} and the zero by about ${f(t.step.zero, 'V', 2)}; a large correction is best made in rounds: turn, read again, give where the trimmers now sit, trim again (the trimmers' own ±20 % and which part is off are not known from one set of readings).`);
  }
  return lines;
}

/** The readings against the fitted line, and the residuals, as plot data (residuals in mV). */
export function residualChart(fit: ReadingsFit, readings: readonly Reading[], measurand: string): ChartData | null {
  if (!fit.line) return null;
  const used = new Set(fit.usedIndices);
  const pick = (keep: (i: number) => boolean) => readings.map((r, i) => ({ r, i })).filter(({ r, i }) => keep(i) && Number.isFinite(fit.residuals[i]!) && Number.isFinite(r[0]))
    .map(({ r, i }) => ({ x: r[0], y: fit.residuals[i]! * 1e3 }));
  return {
    id: 'residuals', title: 'Residuals of the readings from the fitted line', dots: true,
    x: { label: `Measurand (${measurand})` }, y: { label: 'Residual (mV)' },
    series: [
      { label: 'Used in the fit', role: 'main', points: pick((i) => used.has(i)) },
      { label: 'Left out (beyond the linear region or outlier)', role: 'clipped', points: pick((i) => !used.has(i)) },
    ],
  };
}

/**
 * Rows of the blank readings table on the printed sheet: the measurand values to apply and the output the
 * target gives there (zero, half the range end and the range end, and minus half for a range below zero).
 */
export function probeSheetRows(r: Report): Array<{ measurand: number; expected: number; unit: string }> {
  const d = r.design;
  const { scale, zero, range, signal } = d.target;
  const top = Math.max(Math.abs(range[0]), Math.abs(range[1]));
  const round = (x: number) => Number(x.toPrecision(2));
  if (signal === 'ac-rms') return [0.5, 1].map((k) => ({ measurand: round(k * top), expected: Math.abs(scale) * round(k * top), unit: 'V rms' }));
  const xs = [0, round(range[1] / 2), range[1]];
  if (range[0] < 0) xs.push(round(range[0] / 2));
  return xs.map((x) => ({ measurand: x, expected: zero + scale * x, unit: 'V' }));
}
