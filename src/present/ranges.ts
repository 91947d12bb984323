/**
 * A range switch (issue 19) in words, tables and JSON: the per-position figures the report carries, the
 * wiring said with its reason, the calibration range by range. The numbers come from src/analysis/ranges.ts.
 */
import { positionFigures, type RangeSwitchResult } from '../analysis/ranges.js';

/** The range switch as the report JSON's `ranges` list and `rangeSwitch` object (non-finite numbers become null). */
export function rangesJson(rs: RangeSwitchResult | null): { ranges: Array<Record<string, unknown>>; rangeSwitch: Record<string, unknown> | null } {
  if (!rs) return { ranges: [], rangeSwitch: null };
  if (!rs.ok) return { ranges: [], rangeSwitch: { ok: false, code: rs.code, topology: rs.topology } };
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
