/**
 * The op-amp comparison in words and as JSON: the table the terminal prints, the line each row becomes with
 * `--json`, and the short words the app's table uses. The rows themselves come from src/analysis/compare.ts.
 */
import type { ClipCause } from '../analysis/analysis.js';
import { compareOpAmps, type ComparisonRow, type Misfit, type VerdictLevel } from '../analysis/compare.js';
import { supplyOptions, type SupplyKind, type SupplyOption } from '../analysis/supply-options.js';
import type { Report } from '../analysis/report.js';
import type { Design, OpAmpSpec, Supply } from '../model/design.js';
import { verdictsOf } from './verdicts.js';
import { formatEng } from '../model/units.js';
import { terminalLine } from './inert.js';
import { sayFinding } from './finding-words.js';

/** A report's worst verdict level: the first of its verdict lines (worst first), `fail` when there are none. */
export function worstVerdict(r: Report): VerdictLevel {
  return verdictsOf(r)[0]?.level ?? 'fail';
}

/** The op-amp comparison judged by the verdict lines (`compareOpAmps` with `worstVerdict`). */
export function comparisonRows(design: Design, own: readonly OpAmpSpec[] = [], report?: Report): ComparisonRow[] {
  return compareOpAmps(design, worstVerdict, own, report);
}

/**
 * The supply choices judged by the verdict lines (`supplyOptions` with `worstVerdict`); `rows` the op-amp
 * comparison of the same design when it is at hand (its best rail-to-rail row is taken, not recomputed).
 */
export function supplyChoices(design: Design, report?: Report, rows?: readonly ComparisonRow[]): SupplyOption[] {
  return supplyOptions(design, worstVerdict, report, rows);
}

const f = (x: number | null, unit = '', d = 3) => (x === null ? '—' : formatEng(x, unit, d));

/** What cuts the range, in a few words. */
export const LIMIT_WORDS: Record<ClipCause, string> = {
  'opamp-output': 'output swing',
  'opamp-current': 'output current',
  'opamp-input': 'input range',
  sensor: 'sensor limit',
  core: 'core saturation',
  burden: 'burden power',
  driver: 'compensation driver',
};

/** Where a row's stage does not fit, as one phrase: "high end: output swing at end of battery life". */
export function misfitWords(m: Misfit): string {
  return `${m.side} end: ${m.cause ? LIMIT_WORDS[m.cause] : 'no stage'}${m.at === 'end-of-life' ? ' at end of battery life' : ''}`;
}

/** Where each row comes from, for a person. */
export const SOURCE_WORDS: Record<ComparisonRow['source'], string> = { archetype: 'built-in', own: 'yours', design: 'in the design' };

/** The linear range as "-44.5 A … 30.0 A", each end with its own prefix (a dash for none). */
export const rangeText = (low: number | null, high: number | null, m: string) => (low === null || high === null ? '—' : `${f(low, m, 3)} … ${f(high, m, 3)}`);

/** Hours as "86 h" (one decimal below ten). */
export const hoursText = (h: number | null) => (h === null ? '—' : `${h < 10 ? h.toFixed(1) : h.toFixed(0)} h`);

/**
 * One JSON object per row (`gainwright compare --json`): name, fits, measurandLow, measurandHigh, bandwidth,
 * noiseReferred, errorAfterTrim, batteryLife, verdict, and the rest of the row's figures beside them.
 */
export function comparisonJson(row: ComparisonRow): Record<string, unknown> {
  return {
    name: row.name, source: row.source, id: row.id, current: row.current,
    fits: row.fits, misfits: row.misfits,
    measurandLow: row.measurandLow, measurandHigh: row.measurandHigh, endOfLifeLow: row.endOfLifeLow, endOfLifeHigh: row.endOfLifeHigh,
    bandwidth: row.bandwidth, fullPower: row.fullPower, noiseReferred: row.noiseReferred, errorAfterTrim: row.errorAfterTrim,
    supplyCurrent: row.supplyCurrent, batteryLife: row.batteryLife, hoursToClip: row.hoursToClip, verdict: row.verdict, findings: row.findings,
  };
}

const MARK = { pass: 'PASS', caution: 'CAUTION', fail: 'FAIL' } as const;

/**
 * The comparison as terminal lines: one block per op-amp, passing first, every name made inert (a name is a
 * person's text). `measurand` is the design's unit symbol (already restricted by the file format).
 */
export function comparisonLines(rows: readonly ComparisonRow[], measurand: string, battery: boolean): string[] {
  const out: string[] = [];
  rows.forEach((r, i) => {
    out.push(`${i + 1}. [${MARK[r.verdict]}] ${terminalLine(r.name)} (${SOURCE_WORDS[r.source]}${r.current ? ', the design\'s op-amp now' : ''})`);
    out.push(`   fits: ${r.fits ? 'yes' : `no (${r.misfits.map(misfitWords).join('; ')})`}`);
    out.push(`   linear ${rangeText(r.measurandLow, r.measurandHigh, measurand)}${battery ? `; at end of battery life ${rangeText(r.endOfLifeLow, r.endOfLifeHigh, measurand)}` : ''}`);
    out.push(`   bandwidth ${f(r.bandwidth, 'Hz')}, full power ${f(r.fullPower, 'Hz')}; noise ${f(r.noiseReferred, `${measurand} rms`)}; error after calibration ±${f(r.errorAfterTrim, measurand)}`);
    out.push(`   supply ${f(r.supplyCurrent, 'A')}${battery ? `, battery life ${hoursText(r.batteryLife)}` : ''}`);
  });
  return out;
}

/** Each supply choice as a person names it. */
export const SUPPLY_WORDS: Record<SupplyKind, string> = {
  'as-is': 'The battery as it is',
  zero: 'The battery as it is, zero for the end of its life',
  'rail-to-rail': 'The battery as it is, a rail-to-rail output op-amp',
  regulator: 'Sensor and reference on a regulator',
  'front-end-regulated': 'The whole front end on a regulator',
  split: 'Split rails from a rail splitter',
  pair: 'A second battery for the negative rail',
};

/** The rails of a supply as "0 … 9 V" or "±4.5 V", with a regulator's output after it. */
export function railsText(s: Supply): string {
  const rails = s.negative === -s.positive ? `±${formatEng(s.positive, 'V')}` : `${formatEng(s.negative, 'V')} … ${formatEng(s.positive, 'V')}`;
  if (s.battery?.rails === 'regulated') return `${rails}, all from the regulator`;
  return s.regulated ? `${rails}, regulator ${formatEng(s.regulated.voltage, 'V')}` : rails;
}

// --- issue 18: the supply choices for the terminal and as JSON lines (`gainwright compare --supplies`).

/**
 * One JSON object per supply choice (`gainwright compare --supplies --json`): kind, name, current, the rails
 * (positive, negative, regulated: the regulator's output or null, batteryRails), zero, opamp (the op-amp's
 * name when the row changes it, else null), fits, misfits, measurandLow/High, endOfLifeLow/High,
 * supplyCurrent, batteryLife, hoursToClip, verdict, findings, and notes (each `{ code, data, text }`).
 */
export function supplyJson(o: SupplyOption): Record<string, unknown> {
  return {
    kind: o.kind, name: SUPPLY_WORDS[o.kind], current: o.current,
    positive: o.supply.positive, negative: o.supply.negative, regulated: o.supply.regulated?.voltage ?? null, batteryRails: o.supply.battery?.rails ?? 'positive',
    zero: o.zero, opamp: o.opamp?.name ?? null, regulatorDropped: o.regulatorDropped,
    fits: o.fits, misfits: o.misfits,
    measurandLow: o.measurandLow, measurandHigh: o.measurandHigh, endOfLifeLow: o.endOfLifeLow, endOfLifeHigh: o.endOfLifeHigh,
    supplyCurrent: o.supplyCurrent, batteryLife: o.batteryLife, hoursToClip: o.hoursToClip, verdict: o.verdict, findings: o.findings,
    notes: o.notes.map((n) => ({ code: n.code, data: n.data, text: sayFinding(n) })),
  };
}

/** The supply choices as terminal lines, one block each in the panel's order; text from the design made inert. */
export function supplyLines(options: readonly SupplyOption[], measurand: string): string[] {
  const out: string[] = [];
  options.forEach((o, i) => {
    out.push(`${i + 1}. [${MARK[o.verdict]}] ${SUPPLY_WORDS[o.kind]}${o.current ? ' (the design now)' : ''}`);
    out.push(`   rails ${railsText(o.supply)}; zero ${formatEng(o.zero, 'V', 3)}${o.opamp ? `; op-amp ${terminalLine(o.opamp.name)}` : ''}`);
    out.push(`   fits: ${o.fits ? 'yes' : `no (${o.misfits.map(misfitWords).join('; ')})`}`);
    out.push(`   linear ${rangeText(o.measurandLow, o.measurandHigh, measurand)}; at end of battery life ${rangeText(o.endOfLifeLow, o.endOfLifeHigh, measurand)}`);
    out.push(`   supply ${f(o.supplyCurrent, 'A')}, battery life ${hoursText(o.batteryLife)}, clips after ${o.hoursToClip === null ? 'never' : hoursText(o.hoursToClip)}`);
    for (const n of o.notes) out.push(`   ${terminalLine(sayFinding(n))}`);
  });
  return out;
}
// --- end issue 18
