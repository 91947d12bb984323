/**
 * The same design across op-amps: each candidate is put in the design's `opamp` and analysed by the one
 * report (`analyse`), and its row is read off that report. Nothing here computes a figure of its own, so a row
 * always says what the full report of that design with that op-amp says. Units: measurand units, Hz, A, hours.
 */
import type { Design, OpAmpSpec } from '../model/design.js';
import { OPAMP_ARCHETYPES } from '../model/opamps.js';
import { analyse, type Report } from './report.js';
import { peakRange } from '../physics/topology.js';
import { endOfLifeVoltage, type ClipCause } from './analysis.js';

/** One op-amp to try: where it comes from, and its figures. */
export interface OpAmpCandidate {
  /** `archetype` (built in), `own` (the person's list) or `design` (the design's op-amp as it stands). */
  source: 'archetype' | 'own' | 'design';
  /** Archetype id, the index in the person's list, or `design`. */
  id: string;
  opamp: OpAmpSpec;
}

/** Why a stage does not fit: which limit cuts the range, on which side, on which rail voltage. */
export interface Misfit {
  /** `supply`: on the design's rails (a fresh battery); `end-of-life`: on the battery's end-of-life voltage. */
  at: 'supply' | 'end-of-life';
  side: 'low' | 'high';
  /** The limit reached first on that side (null: no stage at all). */
  cause: ClipCause | null;
}

/** The figures of one report that a row of a comparison shows (op-amps here, supplies in supply-options.ts). */
export interface RowFigures {
  /** The stage covers the range (op-amp input range, output swing and every other limit) on these rails and, with a battery, at its end of life. */
  fits: boolean;
  misfits: Misfit[];
  /** Linear range on the design's rails, measurand units (null: no stage). */
  measurandLow: number | null;
  measurandHigh: number | null;
  /** Linear range at the battery's end-of-life voltage (null without a battery). */
  endOfLifeLow: number | null;
  endOfLifeHigh: number | null;
  /** Small-signal and full-power bandwidth, Hz. */
  bandwidth: number | null;
  fullPower: number | null;
  /** Noise referred to the measurand, measurand units rms. */
  noiseReferred: number | null;
  /** Worst-case DC error left after calibration, measurand units. */
  errorAfterTrim: number | null;
  /** Total supply current, A; battery life to end of life, hours (null without a battery). */
  supplyCurrent: number | null;
  batteryLife: number | null;
  /** Hours until the output first clips inside the range as the battery sags (null: never, or no battery). */
  hoursToClip: number | null;
  /** The worst line of the report's verdict (judged by the caller: the verdict's thresholds are the presentation's). */
  verdict: VerdictLevel;
  /** Codes of the report's fail and caution findings, in its order. */
  findings: string[];
}

export interface ComparisonRow extends RowFigures {
  source: OpAmpCandidate['source'];
  id: string;
  name: string;
  opamp: OpAmpSpec;
  /** Whether this op-amp is the design's own (the same figures). */
  current: boolean;
}

export type VerdictLevel = 'pass' | 'caution' | 'fail';
/**
 * How a report is judged: its worst verdict level. The verdict lines and their thresholds live in the
 * presentation layer (src/present/verdicts.ts), which passes this in (`comparisonRows`, `supplyChoices`).
 */
export type Judge = (r: Report) => VerdictLevel;

/** What the comparison runs the report with: the row needs no Monte Carlo and no waveform. */
export const COMPARE_OPTIONS = { spreadTrials: 0 } as const;

/** The design with another op-amp in it (nothing else changes). */
export function withOpAmp(design: Design, opamp: OpAmpSpec): Design {
  return { ...design, opamp: { ...opamp } };
}

const sameFigures = (a: OpAmpSpec, b: OpAmpSpec) => JSON.stringify(a) === JSON.stringify(b);

/**
 * The candidates for a design: the built-in archetypes, then the person's own op-amps, and the design's
 * own op-amp first when its figures match none of them (an edited archetype is a candidate of its own).
 */
export function candidates(design: Design, own: readonly OpAmpSpec[] = []): OpAmpCandidate[] {
  const list: OpAmpCandidate[] = [
    ...OPAMP_ARCHETYPES.map((a) => ({ source: 'archetype' as const, id: a.id, opamp: a.spec })),
    ...own.map((o, i) => ({ source: 'own' as const, id: String(i), opamp: o })),
  ];
  return list.some((c) => sameFigures(c.opamp, design.opamp)) ? list : [{ source: 'design', id: 'design', opamp: design.opamp }, ...list];
}

/** Reads a row's figures off a full report. */
export function figuresOf(r: Report, judge: Judge): RowFigures {
  const d = r.design;
  const [a, b] = peakRange(d);
  const misfits: Misfit[] = [];
  const c = r.clip;
  if (!c || !r.stage) misfits.push({ at: 'supply', side: 'low', cause: null }, { at: 'supply', side: 'high', cause: null });
  else {
    if (!c.linear || c.measurandLow > a) misfits.push({ at: 'supply', side: 'low', cause: c.firstLow });
    if (!c.linear || c.measurandHigh < b) misfits.push({ at: 'supply', side: 'high', cause: c.firstHigh });
  }
  // The battery sweep runs from fresh to end of life: its last step is the end-of-life voltage (to rounding).
  const bat = d.supply.battery;
  const last = r.battery[r.battery.length - 1];
  const end = bat && c && last && Math.abs(last.voltage - endOfLifeVoltage(d)) <= 1e-9 * endOfLifeVoltage(d) ? last : null;
  if (bat && c) {
    if (!end) misfits.push({ at: 'end-of-life', side: 'low', cause: null }, { at: 'end-of-life', side: 'high', cause: null });
    else {
      if (end.measurandLow > a) misfits.push({ at: 'end-of-life', side: 'low', cause: end.first });
      if (end.measurandHigh < b) misfits.push({ at: 'end-of-life', side: 'high', cause: end.first });
    }
  }
  return {
    fits: misfits.length === 0, misfits,
    measurandLow: c && r.stage ? c.measurandLow : null, measurandHigh: c && r.stage ? c.measurandHigh : null,
    endOfLifeLow: end ? end.measurandLow : null, endOfLifeHigh: end ? end.measurandHigh : null,
    bandwidth: r.speed?.smallSignal ?? null, fullPower: r.speed?.fullPower ?? null,
    noiseReferred: r.noise?.referredRms ?? null,
    errorAfterTrim: r.errors?.afterTrim ?? null,
    supplyCurrent: r.supply?.current ?? null, batteryLife: r.supply?.batteryLife ?? null,
    hoursToClip: r.batteryClip?.hoursToClip ?? null,
    verdict: judge(r),
    findings: r.warnings.filter((w) => w.level === 'fail' || w.level === 'caution').map((w) => w.code),
  };
}

/** Reads one row off the full report of the design with the candidate's op-amp. */
export function rowOf(candidate: OpAmpCandidate, r: Report, current: boolean, judge: Judge): ComparisonRow {
  return { source: candidate.source, id: candidate.id, name: candidate.opamp.name, opamp: candidate.opamp, current, ...figuresOf(r, judge) };
}

const RANK = { pass: 0, caution: 1, fail: 2 } as const;

/**
 * Passing rows first: by verdict (pass, caution, fail), then the ones that fit before the ones that do not,
 * then in the order given (a stable sort).
 */
export function sortRows<T extends RowFigures>(rows: T[]): T[] {
  return rows.map((r, i) => [r, i] as const)
    .sort(([x, i], [y, j]) => RANK[x.verdict] - RANK[y.verdict] || Number(y.fits) - Number(x.fits) || i - j)
    .map(([r]) => r);
}

/**
 * Compares op-amps on one design: one full analysis per candidate (the design's own op-amp, every archetype,
 * the person's own), one row each, passing first. `report` may pass the design's report already computed
 * (the app has it), so the design's own op-amp is not analysed twice.
 */
export function compareOpAmps(design: Design, judge: Judge, own: readonly OpAmpSpec[] = [], report?: Report): ComparisonRow[] {
  const rows = candidates(design, own).map((cand) => {
    const current = sameFigures(cand.opamp, design.opamp);
    const r = current && report ? report : analyse(withOpAmp(design, cand.opamp), COMPARE_OPTIONS);
    return rowOf(cand, r, current, judge);
  });
  return sortRows(rows);
}
