/**
 * A range switch (issue 19) in words, tables and JSON: the per-position figures the report carries, the
 * wiring said with its reason, the calibration range by range. The numbers come from src/analysis/ranges.ts.
 */
import { positionFigures, type RangeSwitchResult } from '../analysis/ranges.js';
import type { Report } from '../analysis/report.js';
import { formatEng } from '../model/units.js';
import { LIMIT_NAMES } from './finding-words.js';
import { spiceNetlist, type SpiceOptions } from './spice.js';
import { spiceCommentText } from './inert.js';

/** The range switch as the report JSON's `ranges` list and `rangeSwitch` object (non-finite numbers become null). */
export function rangesJson(rs: RangeSwitchResult | null): { ranges: Array<Record<string, unknown>>; rangeSwitch: Record<string, unknown> | null } {
  if (!rs) return { ranges: [], rangeSwitch: null };
  if (!rs.ok) return { ranges: [], rangeSwitch: { ok: false, code: rs.code, topology: rs.topology, buffer: rs.buffer } };
  const v = rs.value;
  const fin = (x: number) => (Number.isFinite(x) ? x : null);
  return {
    ranges: v.positions.map((p) => {
      const f = positionFigures(p);
      const clip = f.clip ? { measurandLow: fin(f.clip.measurandLow), measurandHigh: fin(f.clip.measurandHigh), first: f.clip.first } : null;
      return {
        position: p.index + 1, scale: f.scale, zero: f.zero, range: f.range, clip, bandwidth: { smallSignal: f.bandwidth }, noise: { referredRms: f.noiseReferred }, errors: { afterTrim: f.afterTrim },
        zeroShift: f.zeroShift, zeroShiftClosedForm: f.zeroShiftClosedForm, sharedTrimResidual: f.sharedTrimResidual, parts: p.parts.map((q) => q.ref), unbuilt: f.unbuilt,
      };
    }),
    rangeSwitch: {
      ok: true, ref: v.switchRef, wiring: v.wiring, decidedBy: v.decidedBy, poles: v.poles, throws: v.throws, singlePoleShift: fin(v.singlePoleShift), shiftLimit: v.shiftLimit, idleCurrent: v.idleCurrent,
      parts: v.parts.map((q) => ({ ref: q.ref, role: q.role, ohms: q.ohms, series: q.series, arrangement: q.arrangement, ...(q.setting !== undefined ? { setting: q.setting } : {}) })),
    },
  };
}

/** The ranges as a table for the app and the printed sheet: one row per position, in words. */
export interface RangeTable {
  caption: string;
  head: string[];
  rows: Array<{ position: number; cells: string[] }>;
}

const fe = (x: number | null, unit: string) => (x === null ? '—' : formatEng(x, unit, 3));

export function rangeTable(r: Report): RangeTable | null {
  const rs = r.ranges?.ok ? r.ranges.value : null;
  if (!rs) return null;
  const m = r.design.sensor.measurand;
  const first = (c: string | null) => (c ? LIMIT_NAMES[c as keyof typeof LIMIT_NAMES] ?? c : '—');
  return {
    caption: `Ranges: ${rs.switchRef}, ${rs.poles === 1 ? 'one pole (the feedback arm; the zero moves)' : 'two poles (the feedback arm and the reference; the zero holds)'}, ${rs.throws} positions`,
    head: ['Position', 'Scale', 'Range', 'Zero', 'Linear from … to (first limit)', 'Bandwidth', 'Noise (referred, rms)', 'Error after calibration', 'Parts switched in'],
    rows: rs.positions.map((p) => {
      const f = positionFigures(p);
      const own = p.parts.filter((q) => !rs.positions.every((o) => o.parts.some((x) => x.ref === q.ref))).map((q) => q.ref);
      return {
        position: p.index + 1,
        cells: [
          String(p.index + 1), fe(f.scale ?? p.scale, `V/${m}`), `${fe(p.range[0], m)} … ${fe(p.range[1], m)}`,
          f.zero === null ? '—' : `${formatEng(f.zero, 'V', 4)}${rs.wiring === 'single-pole' && p.index > 0 ? ` (${f.zeroShift !== null && f.zeroShift >= 0 ? '+' : ''}${fe(f.zeroShift, 'V')})` : ''}`,
          f.clip ? `${fe(f.clip.measurandLow, m)} … ${fe(f.clip.measurandHigh, m)} (${first(f.clip.first)})` : p.unbuilt ? 'cannot be built' : '—',
          fe(f.bandwidth, 'Hz'), fe(f.noiseReferred, m), f.afterTrim === null ? '—' : `±${fe(f.afterTrim, m)}${rs.wiring === 'single-pole' && p.index > 0 ? ' (zero trimmer shared)' : ''}`,
          own.join(', ') || '—',
        ],
      };
    }),
  };
}

/** The ranges as terminal lines for the text report. */
export function rangeLines(r: Report): string[] {
  const t = rangeTable(r);
  if (!t) return [];
  const rows = t.rows.map((x) => x.cells);
  const width = t.head.map((h, i) => Math.max(h.length, ...rows.map((c) => c[i]!.length)));
  const line = (c: string[]) => `  ${c.map((x, i) => x.padEnd(width[i]!)).join('  ')}`.trimEnd();
  return ['', t.caption, '-'.repeat(t.caption.length), line(t.head), ...rows.map(line)];
}

/** The report of one range switch position (1-based: 1 is the design's own range), or null when there is none. */
export function positionReport(r: Report, position: number): Report | null {
  const rs = r.ranges?.ok ? r.ranges.value : null;
  return rs?.positions[position - 1]?.report ?? null;
}

/** The words that say which position a printed report or netlist is of: "Range switch SW1 (two poles) at position 2 of 3: …". */
export function positionLine(r: Report, position: number): string | null {
  const rs = r.ranges?.ok ? r.ranges.value : null;
  const p = rs?.positions[position - 1];
  if (!rs || !p) return null;
  const m = spiceCommentText(r.design.sensor.measurand, 16);
  return `Range switch ${rs.switchRef} (${rs.poles === 1 ? 'one pole' : 'two poles'}) at position ${position} of ${rs.throws}: ${formatEng(p.scale, `V/${m}`, 4)} over ${formatEng(p.range[0], m, 4)} to ${formatEng(p.range[1], m, 4)}; only this position's parts (the other throws are open).`;
}

/**
 * One switch position as its own SPICE netlist: the position's circuit (the parts the switch puts in; the
 * other throws are open and left out), with a header line that says which position it is. Null when the
 * design has no switch, the position does not exist or could not be built.
 */
export function positionNetlist(r: Report, position: number, opts: SpiceOptions = {}): string | null {
  const rs = r.ranges?.ok ? r.ranges.value : null;
  const p = rs?.positions[position - 1];
  if (!rs || !p?.report) return null;
  const net = spiceNetlist(p.report, opts);
  if (!net) return null;
  const lines = net.split('\n');
  lines.splice(1, 0, `* ${positionLine(r, position)!}`);
  return lines.join('\n');
}
