/**
 * What the printed build sheet adds to the app's own panels: whether the design failed, the error budget by
 * term and the trimmers' start positions, as rows of text from the report.
 */
import type { Report } from '../analysis/report.js';
import { formatEng } from '../model/units.js';
import { ROLE_NAMES } from './parts.js';
import { verdictsOf } from './verdicts.js';

/** The sheet's status line: a failed design is marked as such on every page. */
export function sheetStatus(r: Report): { failed: boolean; line: string } {
  const verdicts = verdictsOf(r);
  const fails = verdicts.filter((v) => v.level === 'fail');
  if (fails.length) return { failed: true, line: `FAILED DESIGN: do not build. ${fails.map((v) => v.title).join('; ')}.` };
  const cautions = verdicts.filter((v) => v.level === 'caution').length;
  return { failed: false, line: cautions ? `Builds, with ${cautions} caution${cautions > 1 ? 's' : ''} below.` : 'Passes every check.' };
}

export interface BudgetRow { term: string; value: string; after: string }

/** The DC error budget at the range end, by term, with what calibration does to each. */
export function errorBudgetRows(r: Report): BudgetRow[] {
  const e = r.errors;
  if (!e) return [];
  const m = r.design.sensor.measurand;
  const by = { zero: 'trimmed out by the zero', scale: 'trimmed out by the span', both: 'trimmed out', none: 'remains' } as const;
  const rows: BudgetRow[] = e.terms.map((t) => ({ term: t.name, value: `±${formatEng(Math.abs(t.value), m)}`, after: by[t.removedBy] }));
  rows.push({ term: 'worst case / RSS, before calibration', value: `±${formatEng(e.worstCase, m)} / ±${formatEng(e.rss, m)}`, after: '' });
  rows.push({ term: 'after calibration, worst case / RSS', value: `±${formatEng(e.afterTrim, m)} / ±${formatEng(e.afterTrimRss, m)}`, after: '' });
  return rows;
}

/** Each trimmer's start position (the solver's setting), to set with an ohmmeter before power. */
export function trimmerStarts(r: Report): Array<{ ref: string; role: string; value: string; setting: string }> {
  return (r.stage?.parts ?? []).filter((p) => p.kind === 'trimmer' && p.setting !== undefined).map((p) => ({
    ref: p.ref, role: ROLE_NAMES[p.role], value: formatEng(p.ohms, 'Ω', 2),
    setting: `${(p.setting! * 100).toFixed(0)} % (${formatEng(p.ohms * p.setting!, 'Ω', 3)} from one end)`,
  }));
}
