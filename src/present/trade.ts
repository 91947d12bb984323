/**
 * The trade sweep in words and pictures: chart data (plain data, drawn by the app's chart element), the table
 * the app and the printed sheet show, and the terminal table. The numbers come from src/analysis/trade.ts.
 */
import type { CtTradePoint, HallTradePoint, TradeResult } from '../analysis/trade.js';
import { formatEng } from '../model/units.js';
import type { ChartData, Series } from './charts.js';

type Point = HallTradePoint | CtTradePoint;

const f = (x: number | null, unit = '', d = 3) => (x === null ? '—' : formatEng(x, unit, d));
/** A gain as a plain number (no SI prefix: 0.974, not 974 m). */
const ratio = (g: number) => (Number.isFinite(g) ? String(Number(Math.abs(g).toPrecision(3))) : '—');

/** Why a point has no bandwidth or noise, in a person's words. */
export function unbuiltWords(code: string): string {
  switch (code) {
    case 'no-topology': return 'no single stage fits this gain on these rails';
    case 'gain-not-computable': return 'the gain cannot be computed';
    case 'singular': return 'the circuit has no unique solution';
    case 'speed': return 'the bandwidth cannot be computed';
    default: return `the resistor solver finds no parts for this gain (${code})`;
  }
}

/** Which sweeps a trade has, in order, with the x the chart plots and its axis. */
export function tradeSweeps(t: TradeResult): Array<{ sweep: Point['sweep']; title: string; x: (p: Point) => number; xLabel: string; log: boolean }> {
  if (t.kind === 'hall-gap-core') {
    return [
      { sweep: 'turns', title: 'What each turn buys (gap held)', x: (p) => p.turns, xLabel: 'Turns through the core', log: false },
      { sweep: 'gap', title: 'What each millimetre of gap buys (turns held)', x: (p) => (p as HallTradePoint).gap * 1e3, xLabel: 'Gap (mm)', log: false },
    ];
  }
  return [
    { sweep: 'turns', title: 'What each secondary turn buys (burden held)', x: (p) => p.turns, xLabel: 'Secondary turns', log: true },
    { sweep: 'burden', title: 'What the burden buys (turns held)', x: (p) => (p as CtTradePoint).burden, xLabel: 'Burden (Ω)', log: true },
  ];
}

/** The points of one sweep, in the order plotted. */
export function sweepPoints(t: TradeResult, sweep: Point['sweep']): Point[] {
  return (t.points as Point[]).filter((p) => p.sweep === sweep);
}

/**
 * One chart per sweep: the limits and the noise in measurand units (log scale) against the swept figure, the
 * range end as a line, and the gain needed (Hall) or the CT's own low corner on the right axis. Points are
 * drawn as markers: each is a build the person can adopt.
 */
export function tradeCharts(t: TradeResult | null, measurand: string): ChartData[] {
  if (!t) return [];
  const unit = t.kind === 'current-transformer' ? `${measurand} rms` : measurand;
  return tradeSweeps(t).map((s): ChartData => {
    const pts = sweepPoints(t, s.sweep);
    const line = (y: (p: Point) => number | null) => pts.map((p) => ({ x: s.x(p), y: y(p) })).filter((q): q is { x: number; y: number } => q.y !== null && Number.isFinite(q.y) && q.y > 0 && Number.isFinite(q.x));
    const x0 = Math.min(...pts.map(s.x)), x1 = Math.max(...pts.map(s.x));
    const series: Series[] = t.kind === 'hall-gap-core'
      ? [
        { label: 'Core saturates at', role: 'main', points: line((p) => (p as HallTradePoint).coreSaturation) },
        { label: 'Hall sensor linear to', role: 'source', points: line((p) => (p as HallTradePoint).sensorLinear) },
        { label: 'Noise referred to the input (rms)', role: 'source', points: line((p) => p.noiseReferred) },
        { label: 'Gain needed', role: 'secondary', axis: 'y2', points: pts.map((p) => ({ x: s.x(p), y: Math.abs(p.gain) })).filter((q) => Number.isFinite(q.y)) },
      ]
      : [
        { label: `Core saturates at ${formatEng(t.lowestFrequency, 'Hz')}`, role: 'main', points: line((p) => (p as CtTradePoint).coreSaturation) },
        { label: 'Burden reaches its rating', role: 'source', points: line((p) => (p as CtTradePoint).burdenLimit) },
        { label: 'Noise referred to the input (rms)', role: 'source', points: line((p) => p.noiseReferred) },
        { label: 'CT low-frequency corner (Hz)', role: 'secondary', axis: 'y2', points: line((p) => (p as CtTradePoint).lowCorner) },
      ];
    series.push({ label: 'Range end', role: 'range', points: [{ x: x0, y: t.rangeEnd }, { x: x1, y: t.rangeEnd }].filter((q) => q.y > 0) });
    return {
      id: s.sweep === 'turns' ? 'trade-turns' : s.sweep === 'gap' ? 'trade-gap' : 'trade-burden',
      title: s.title,
      x: { label: s.xLabel, log: s.log },
      y: { label: `Measurand (${unit})`, log: true },
      y2: { label: t.kind === 'hall-gap-core' ? 'Gain needed' : 'Low corner (Hz)' },
      series: series.filter((x) => x.points.length > 0),
      markers: true,
      pickable: true,
    };
  });
}

/** The table of a trade: its head and one row per point, in sweep order. */
export interface TradeTable {
  head: string[];
  rows: Array<{ sweep: Point['sweep']; cells: string[]; current: boolean; point: Point; why: string | null }>;
}

export function tradeTable(t: TradeResult | null, measurand: string): TradeTable | null {
  if (!t) return null;
  const m = measurand;
  const chain = (p: Point) => [p.bandwidth === null ? '—' : f(p.bandwidth, 'Hz'), p.noiseReferred === null ? '—' : f(p.noiseReferred, `${m} rms`)];
  if (t.kind === 'hall-gap-core') {
    return {
      head: ['Turns', 'Gap', 'Sensitivity', 'Core saturates at', 'Hall sensor linear to', 'Gain needed', 'Bandwidth', 'Noise (referred)', 'Inductance added'],
      rows: (t.points as HallTradePoint[]).map((p) => ({
        sweep: p.sweep, current: p.current, point: p, why: p.unbuilt === null ? null : unbuiltWords(p.unbuilt),
        cells: [String(p.turns), f(p.gap, 'm'), f(p.sensitivity, `V/${m}`), f(p.coreSaturation, m), f(p.sensorLinear, m), ratio(p.gain), ...chain(p), p.insertionInductance === null ? '—' : f(p.insertionInductance, 'H')],
      })),
    };
  }
  return {
    head: ['Secondary turns', 'Burden', 'Sensitivity', 'Low corner', 'Burden power', 'Burden rating reached at', `Core saturates at (${formatEng(t.lowestFrequency, 'Hz')})`, 'Gain needed', 'Bandwidth', 'Noise (referred)'],
    rows: (t.points as CtTradePoint[]).map((p) => ({
      sweep: p.sweep, current: p.current, point: p, why: p.unbuilt === null ? null : unbuiltWords(p.unbuilt),
      cells: [String(p.turns), f(p.burden, 'Ω'), f(p.sensitivity, `V/${m}`), f(p.lowCorner, 'Hz'), f(p.burdenPower, 'W'), f(p.burdenLimit, `${m} rms`), f(p.coreSaturation, `${m} rms`), ratio(p.gain), ...chain(p)],
    })),
  };
}

/** What the table leaves out, said once under it. */
export function tradeNotes(t: TradeResult | null): string[] {
  if (!t) return [];
  const notes: string[] = [];
  if (t.kind === 'hall-gap-core') {
    notes.push('Each row is the design rebuilt with those turns and that gap: the stage is solved again, so the gain, bandwidth and noise are what that build gives. Currents are peaks; the noise is over the report\'s band.');
    if (t.crossSection === null) notes.push('Inductance added: give the core\'s cross-section (width and depth at the gap) to see the inductance the turns put in series with the measured conductor.');
  } else {
    notes.push(`Each row is the design rebuilt with that winding and burden. Currents are rms; the core's saturation is at ${formatEng(t.lowestFrequency, 'Hz')}, the lowest frequency of interest (lower frequencies saturate sooner).`);
    if (!t.coreGiven) notes.push('Core saturation: give the core\'s cross-section and saturation flux density to see the primary current at which it saturates.');
  }
  return notes;
}

/** The trade as terminal lines: a heading, the table in aligned columns (the design's own rows marked *). */
export function tradeLines(t: TradeResult | null, measurand: string): string[] {
  const table = tradeTable(t, measurand);
  if (!t || !table) return [];
  const cols = [' ', ...table.head];
  const rows = table.rows.map((r) => [r.current ? '*' : ' ', ...r.cells]);
  const width = cols.map((c, i) => Math.max(c.length, ...rows.map((r) => r[i]!.length)));
  const line = (cells: string[]) => `  ${cells.map((c, i) => c.padEnd(width[i]!)).join('  ')}`.trimEnd();
  const out: string[] = [];
  for (const s of tradeSweeps(t)) {
    out.push('', s.title, '-'.repeat(s.title.length), line(cols));
    table.rows.forEach((r, i) => { if (r.sweep === s.sweep) out.push(line(rows[i]!) + (r.why ? `  (${r.why})` : '')); });
  }
  out.push(...tradeNotes(t).map((n) => `  ${n}`));
  return out;
}

/** The trade as the report JSON's `trade` list (non-finite numbers become null). */
export function tradeJson(t: TradeResult | null): Array<Record<string, unknown>> {
  if (!t) return [];
  const num = (x: number | null) => (x === null || !Number.isFinite(x) ? null : x);
  if (t.kind === 'hall-gap-core') {
    return t.points.map((p) => ({
      sweep: p.sweep, turns: p.turns, gap: p.gap, sensitivity: num(p.sensitivity), coreSaturation: num(p.coreSaturation), sensorLinear: num(p.sensorLinear),
      gain: num(p.gain), bandwidth: num(p.bandwidth), noiseReferred: num(p.noiseReferred), insertionInductance: num(p.insertionInductance), unbuilt: p.unbuilt, current: p.current,
    }));
  }
  return t.points.map((p) => ({
    sweep: p.sweep, turns: p.turns, burden: p.burden, sensitivity: num(p.sensitivity), lowCorner: num(p.lowCorner), burdenPower: num(p.burdenPower), burdenLimit: num(p.burdenLimit),
    coreSaturation: num(p.coreSaturation), lowestFrequency: t.lowestFrequency, gain: num(p.gain), bandwidth: num(p.bandwidth), noiseReferred: num(p.noiseReferred), unbuilt: p.unbuilt, current: p.current,
  }));
}
