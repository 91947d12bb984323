/**
 * Chart datasets built from a report as plain data (no Chart.js import), so that they are tested without a
 * DOM. The app's chart element hands them to Chart.js as they are.
 */
import type { Report } from '../analysis/report.js';
import type { ElementRole } from '../circuit/mna.js';

export interface Series {
  label: string;
  points: Array<{ x: number; y: number }>;
  /** Semantic role the chart element maps to a colour and line style. */
  role: 'main' | 'clipped' | 'limit' | 'range' | 'secondary' | 'source';
  axis?: 'y' | 'y2';
}

export interface ChartData {
  id: 'transfer' | 'response' | 'noise' | 'battery' | 'spread' | 'residuals' | 'waveform' | 'trade-turns' | 'trade-gap' | 'trade-burden';
  title: string;
  x: { label: string; log?: boolean };
  y: { label: string; log?: boolean };
  y2?: { label: string };
  series: Series[];
  /** Bar chart (histogram) instead of lines. */
  bars?: boolean;
  /** Points without joining lines (readings, residuals). */
  dots?: boolean;
  /** Issue 19: lines with a marker at each point (each point is a choice, as in the trade sweep). */
  markers?: boolean;
  /** Issue 19: a click on a point is reported by the chart element (`gw-chart-pick`). */
  pickable?: boolean;
}

const pts = (x: ArrayLike<number>, y: ArrayLike<number>) => Array.from({ length: x.length }, (_, i) => ({ x: x[i]!, y: y[i]! })).filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y));

/** The DC transfer: output V against the measurand over the range and beyond, with the clip points marked. */
export function transferChart(r: Report): ChartData | null {
  if (!r.transfer || !r.clip) return null;
  const m = r.design.sensor.measurand;
  const t = r.transfer;
  const lin: Array<{ x: number; y: number }> = [], clip: Array<{ x: number; y: number }> = [];
  for (let i = 0; i < t.x.length; i++) (t.clipped[i] ? clip : lin).push({ x: t.x[i]!, y: t.y[i]! });
  const x0 = t.x[0]!, x1 = t.x[t.x.length - 1]!;
  const { positive, negative } = r.design.supply;
  const [a, b] = r.clip.rangePeak;
  const yLo = Math.min(negative, ...t.y), yHi = Math.max(positive, ...t.y);
  return {
    id: 'transfer', title: 'Transfer: output against measurand',
    x: { label: `Measurand (${m})` }, y: { label: 'Output (V)' },
    series: [
      { label: 'Output (linear)', role: 'main', points: lin },
      { label: 'Output (saturated)', role: 'clipped', points: clip },
      { label: 'Positive rail', role: 'limit', points: [{ x: x0, y: positive }, { x: x1, y: positive }] },
      { label: 'Negative rail', role: 'limit', points: [{ x: x0, y: negative }, { x: x1, y: negative }] },
      { label: 'Wanted range', role: 'range', points: [{ x: a, y: yLo }, { x: a, y: yHi }, { x: NaN, y: NaN }, { x: b, y: yHi }, { x: b, y: yLo }].filter((p) => Number.isFinite(p.x)) },
    ],
  };
}

function responseChart(r: Report): ChartData | null {
  if (!r.response) return null;
  const { freqs, magnitude, phase } = r.response;
  const ref = r.speed?.passband || magnitude[0]!;
  const db = Array.from(magnitude, (v) => 20 * Math.log10(v / ref));
  return {
    id: 'response', title: 'Frequency response (relative to the passband scale)',
    x: { label: 'Frequency (Hz)', log: true }, y: { label: 'Magnitude (dB)' }, y2: { label: 'Phase (°)' },
    series: [
      { label: 'Magnitude', role: 'main', points: pts(freqs, db) },
      { label: 'Phase', role: 'secondary', points: pts(freqs, phase), axis: 'y2' },
    ],
  };
}

/** Output noise density against frequency, total and the `sources` largest contributors, V/√Hz. */
export function noiseChart(r: Report, sources = 5): ChartData | null {
  if (!r.noise) return null;
  const s = r.noise.spectrum;
  const scale = 1e9;
  const top = r.noise.shares.slice(0, sources).map((x) => x.name);
  return {
    id: 'noise', title: 'Output noise density by source',
    x: { label: 'Frequency (Hz)', log: true }, y: { label: 'Noise density (nV/√Hz)', log: true },
    series: [
      { label: 'Total', role: 'main', points: pts(s.freqs, Array.from(s.total, (v) => v * scale)).filter((p) => p.y > 0) },
      ...s.sources.filter((x) => top.includes(x.name)).map((x) => ({ label: noiseLabel(x), role: 'source' as const, points: pts(s.freqs, Array.from(x.density, (v) => v * scale)).filter((p) => p.y > 0) })),
    ],
  };
}

/** What a noise source stands for, in words, by its role in the circuit (the op-amp's sources, the sensor's). */
const NOISE_ROLE_WORDS: Partial<Record<ElementRole, string>> = {
  'opamp-offset': 'op-amp voltage noise',
  'opamp-bias-positive': 'op-amp current noise (+ input)',
  'opamp-bias-negative': 'op-amp current noise (− input)',
  signal: 'sensor',
  'sensor-source': 'sensor output resistance',
  burden: 'burden',
  shunt: 'shunt',
  load: 'instrument input',
};

/**
 * Plain words for a noise source, from what it stands for: its role, else the part it belongs to (a resistor
 * or trimmer of the parts list: "R3 thermal"), else the element of the sensor's own model it is.
 */
export function noiseLabel(source: { name: string; role?: ElementRole; part?: string } | undefined): string {
  if (!source) return '—';
  const byRole = source.role ? NOISE_ROLE_WORDS[source.role] : undefined;
  return byRole ?? `${source.part ?? source.name} thermal`;
}

function batteryChart(r: Report): ChartData | null {
  if (!r.battery.length) return null;
  const b = r.battery;
  return {
    id: 'battery', title: 'Battery sweep: headroom and zero shift',
    x: { label: 'Battery voltage (V)' }, y: { label: 'Headroom (V)' }, y2: { label: 'Zero shift (mV)' },
    series: [
      { label: 'Headroom, low side', role: 'main', points: b.map((s) => ({ x: s.voltage, y: s.headroomLow })) },
      { label: 'Headroom, high side', role: 'source', points: b.map((s) => ({ x: s.voltage, y: s.headroomHigh })) },
      { label: 'Zero shift', role: 'secondary', axis: 'y2', points: b.map((s) => ({ x: s.voltage, y: s.zeroShift * 1e3 })) },
    ].map((s) => ({ ...s, points: s.points.filter((p) => Number.isFinite(p.y)) })) as Series[],
  };
}

function spreadChart(r: Report): ChartData | null {
  if (!r.spread) return null;
  const { edges, counts } = r.spread.histogram;
  return {
    id: 'spread', title: `Scale spread over ${r.spread.trials} builds (before trim)`, bars: true,
    x: { label: 'Scale error (%)' }, y: { label: 'Builds (count)' },
    series: [{ label: 'Builds', role: 'main', points: Array.from(counts, (c, i) => ({ x: ((edges[i]! + edges[i + 1]!) / 2) * 100, y: c })) }],
  };
}

/** SI prefix for a time span so that the axis reads in 1…1000: [factor, unit]. */
export function timeUnit(span: number): [number, string] {
  const units: Array<[number, string]> = [[1, 's'], [1e3, 'ms'], [1e6, 'µs'], [1e9, 'ns']];
  for (const [k, u] of units) if (span * k >= 1) return [k, u];
  return units[units.length - 1]!;
}

/**
 * The scope view: output and ideal (the DC transfer without delay or limits) against time, with the
 * levels where the output clips. Time in a prefixed unit chosen from the window.
 */
export function waveformChart(r: Report): ChartData | null {
  const w = r.waveform;
  if (!w || w.t.length < 2) return null;
  const [k, unit] = timeUnit(w.t[w.t.length - 1]! - w.t[0]!);
  const ts = Array.from(w.t, (t) => t * k);
  const x0 = ts[0]!, x1 = ts[ts.length - 1]!;
  const series: Series[] = [
    { label: 'Output at the instrument', role: 'main', points: pts(ts, w.output) },
    { label: 'Ideal (DC transfer, no delay or limits)', role: 'secondary', points: pts(ts, w.ideal) },
  ];
  if (r.clip) {
    series.push({ label: 'Output clips (high)', role: 'limit', points: [{ x: x0, y: r.clip.outputHigh }, { x: x1, y: r.clip.outputHigh }].filter((p) => Number.isFinite(p.y)) });
    series.push({ label: 'Output clips (low)', role: 'limit', points: [{ x: x0, y: r.clip.outputLow }, { x: x1, y: r.clip.outputLow }].filter((p) => Number.isFinite(p.y)) });
  }
  return { id: 'waveform', title: 'What the scope shows', x: { label: `Time (${unit})` }, y: { label: 'Output (V)' }, series };
}

/** Every chart the app shows for a report, in display order (the ones that cannot be drawn are left out). */
export function allCharts(r: Report): ChartData[] {
  return [transferChart(r), responseChart(r), noiseChart(r), batteryChart(r), spreadChart(r)].filter((c): c is ChartData => c !== null);
}

/** A chart as SVG polylines in a w × h box (for the printed sheet, where a canvas does not print well). */
export interface TraceDrawing {
  lines: Array<{ role: Series['role']; label: string; points: string }>;
  x: [number, number];
  y: [number, number];
}

/** Scales every series of a (linear) chart into a w × h box, y upwards; null when there is nothing to draw. */
export function traceDrawing(d: ChartData, w: number, h: number): TraceDrawing | null {
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
  for (const s of d.series) for (const p of s.points) { x0 = Math.min(x0, p.x); x1 = Math.max(x1, p.x); y0 = Math.min(y0, p.y); y1 = Math.max(y1, p.y); }
  if (!(x1 > x0) || !Number.isFinite(y0) || !Number.isFinite(y1)) return null;
  if (!(y1 > y0)) { y0 -= 0.5; y1 += 0.5; }
  const pad = (y1 - y0) * 0.05;
  y0 -= pad; y1 += pad;
  const sx = (x: number) => (((x - x0) / (x1 - x0)) * w).toFixed(1);
  const sy = (y: number) => (h - ((y - y0) / (y1 - y0)) * h).toFixed(1);
  return {
    lines: d.series.filter((s) => s.points.length > 1).map((s) => ({ role: s.role, label: s.label, points: s.points.map((p) => `${sx(p.x)},${sy(p.y)}`).join(' ') })),
    x: [x0, x1], y: [y0, y1],
  };
}

/** A chart's text alternative: one summary sentence per series and its data as table rows. */
export interface ChartText {
  summary: string;
  head: [string, string, string];
  rows: Array<[string, string, string]>;
}

/** Most rows a series gives the table: enough to read the curve, few enough to read at all. */
const TABLE_ROWS_PER_SERIES = 25;
const num = (x: number) => (Number.isFinite(x) ? String(Number(x.toPrecision(4))) : '—');

/**
 * The text alternative of a chart (WCAG 2.2, 1.1.1 non-text content): a summary of each series' extent and
 * its points as a table, thinned evenly to at most TABLE_ROWS_PER_SERIES per series (first and last kept).
 */
export function chartText(c: ChartData): ChartText {
  const parts = c.series.filter((s) => s.points.length > 0).map((s) => {
    const xs = s.points.map((p) => p.x), ys = s.points.map((p) => p.y);
    const xLo = Math.min(...xs), xHi = Math.max(...xs), yLo = Math.min(...ys), yHi = Math.max(...ys);
    const ax = s.axis === 'y2' && c.y2 ? c.y2.label : c.y.label;
    return `${s.label}: ${c.x.label} ${num(xLo)} to ${num(xHi)}, ${ax} ${num(yLo)} to ${num(yHi)}`;
  });
  const rows: Array<[string, string, string]> = [];
  for (const s of c.series) {
    const n = s.points.length;
    const step = Math.max(1, Math.ceil(n / TABLE_ROWS_PER_SERIES));
    for (let i = 0; i < n; i += step) rows.push([s.label, num(s.points[i]!.x), num(s.points[i]!.y)]);
    if (n > 1 && (n - 1) % step !== 0) rows.push([s.label, num(s.points[n - 1]!.x), num(s.points[n - 1]!.y)]);
  }
  return {
    summary: parts.length ? `${c.title}. ${parts.join('; ')}.` : `${c.title}: no data.`,
    head: ['Series', c.x.label, c.y2 ? `${c.y.label} (or ${c.y2.label})` : c.y.label],
    rows,
  };
}
