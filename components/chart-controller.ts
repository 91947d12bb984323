import type { ReactiveController, ReactiveControllerHost } from 'lit';
import type { Chart, ChartConfiguration } from 'chart.js';
import type { ChartData, Series } from '../src/index.js';

// --- issue 23: Chart.js is a chunk of its own (about a third of the app's JavaScript). Its fetch starts when
// this module is evaluated, beside the first analysis; it is evaluated after the first render, so the verdict
// never waits for it, and each chart draws once it is there.
let chartClass: typeof Chart | null = null;
let chartLoading: Promise<typeof Chart> | null = null;

/** Loads Chart.js once, registered with only what the plots use (the rest of it is left out of the bundle). */
export function loadChartJs(): Promise<typeof Chart> {
  return (chartLoading ??= import('chart.js').then((m) => {
    m.Chart.register(m.LineController, m.LineElement, m.PointElement, m.BarController, m.BarElement, m.LinearScale, m.LogarithmicScale, m.Legend, m.Title, m.Tooltip);
    chartClass = m.Chart;
    return m.Chart;
  }, (e: unknown) => { chartLoading = null; throw e; }));
}
loadChartJs().catch(() => { /* tried again by the first chart that draws */ });
// --- end issue 23

const SOURCE_COLOURS = ['#2f7d6d', '#b5651d', '#6a4c93', '#8c8c2a', '#c0392b', '#3d6fa8'];

function styleFor(s: Series, i: number) {
  switch (s.role) {
    case 'main': return { borderColor: '#1d4f91', backgroundColor: '#1d4f91', borderWidth: 2 };
    case 'clipped': return { borderColor: '#a11d1d', backgroundColor: '#a11d1d', borderWidth: 2, borderDash: [6, 4] };
    case 'limit': return { borderColor: '#7a828f', backgroundColor: '#7a828f', borderWidth: 1, borderDash: [2, 3] };
    case 'range': return { borderColor: '#a4520f', backgroundColor: '#a4520f', borderWidth: 1.5, borderDash: [8, 3] };
    case 'secondary': return { borderColor: '#6a4c93', backgroundColor: '#6a4c93', borderWidth: 1.5, borderDash: [4, 2] };
    default: return { borderColor: SOURCE_COLOURS[i % SOURCE_COLOURS.length], backgroundColor: SOURCE_COLOURS[i % SOURCE_COLOURS.length], borderWidth: 1.2 };
  }
}

/** Turns our plain chart data into a Chart.js configuration. */
export function chartConfig(d: ChartData): ChartConfiguration {
  const datasets = d.series.map((s, i) => ({
    label: s.label, data: s.points, parsing: false as const, pointRadius: 0, tension: 0, spanGaps: false,
    yAxisID: s.axis === 'y2' ? 'y2' : 'y', ...styleFor(s, i),
    // Readings are points, not a curve.
    ...(d.dots ? { showLine: false, pointRadius: 3 } : {}),
    // Each point a choice (the trade sweep): a marker on the line, larger under the pointer.
    ...(d.markers ? { pointRadius: 3.5, pointHoverRadius: 6 } : {}),
  }));
  const scales: Record<string, unknown> = {
    x: { type: d.x.log ? 'logarithmic' : 'linear', title: { display: true, text: d.x.label }, ...(d.bars ? { offset: true } : {}) },
    y: { type: d.y.log ? 'logarithmic' : 'linear', title: { display: true, text: d.y.label } },
  };
  if (d.y2) scales.y2 = { type: 'linear', position: 'right', title: { display: true, text: d.y2.label }, grid: { drawOnChartArea: false } };
  return {
    type: d.bars ? 'bar' : 'line',
    data: { datasets: datasets as never },
    options: {
      animation: false, responsive: true, maintainAspectRatio: false, normalized: true,
      plugins: { title: { display: true, text: d.title }, legend: { labels: { boxWidth: 14 } } },
      scales: scales as never,
    },
  } as ChartConfiguration;
}

/** Everything of a chart's data that its Chart.js options are built from (chartConfig): titles, axes, kind (issue 23). */
const optionsKey = (d: ChartData): string => JSON.stringify([d.title, d.x, d.y, d.y2, d.bars, d.dots, d.markers, d.pickable]);

/** A point of the data picked by a click: its series and index, and its values. */
export interface PickedPoint { series: string; index: number; x: number; y: number }

/** Owns one Chart.js instance on a canvas of its host; updates it when the data change. */
export class ChartController implements ReactiveController {
  private chart: Chart | null = null;
  constructor(private host: ReactiveControllerHost & { canvas: HTMLCanvasElement | null; data: ChartData | null; picked?(p: PickedPoint): void }) {
    host.addController(this);
  }
  private pending = false;
  /** What the options of the chart drawn were built from (issue 23). */
  private drawnKey = '';
  hostUpdated(): void {
    // The first drawing waits for the next frame and for Chart.js, so the verdict paints before the charts are
    // built; later updates redraw at once.
    if (!this.chart) {
      if (!this.pending) {
        this.pending = true;
        Promise.all([loadChartJs(), new Promise((r) => requestAnimationFrame(r))]).then(
          () => { this.pending = false; this.draw(); },
          // Chart.js could not be fetched: the chart's text alternative stays; the next update tries again.
          () => { this.pending = false; },
        );
      }
      return;
    }
    this.draw();
  }
  private draw(): void {
    const { canvas, data } = this.host;
    const Chart = chartClass;
    if (!canvas || !data || !Chart) return;
    const cfg = chartConfig(data);
    // A pickable chart reports the point nearest the click along x (a point is small to hit exactly).
    if (data.pickable && this.host.picked) {
      (cfg.options as Record<string, unknown>).onClick = (e: unknown) => {
        const hit = this.chart?.getElementsAtEventForMode(e as Event, 'nearest', { intersect: false, axis: 'xy' }, true)[0];
        const d = this.host.data;
        const s = hit && d?.series[hit.datasetIndex];
        const p = s?.points[hit!.index];
        if (s && p) this.host.picked!({ series: s.label, index: hit!.index, x: p.x, y: p.y });
      };
    }
    if (!this.chart || this.chart.canvas !== canvas || (this.chart.config as { type?: string }).type !== cfg.type) {
      this.chart?.destroy();
      this.chart = new Chart(canvas, cfg);
      // Issue 23: when the transfer plot is first on the page (read by `npm run bench`).
      if (data.id === 'transfer' && !performance.getEntriesByName('gw-first-plot').length) performance.mark('gw-first-plot');
    } else {
      this.chart.data = cfg.data;
      // Issue 23: new options make Chart.js resolve every scale and plugin again; they change only with the
      // titles, axes and kind of plot, so the points alone are replaced when those stay.
      if (optionsKey(data) !== this.drawnKey) this.chart.options = cfg.options ?? {};
      this.chart.update('none');
    }
    this.drawnKey = optionsKey(data);
  }
  /** Where a point is drawn on the canvas, in CSS pixels from its top left (null before the first drawing). */
  pixelOf(series: number, index: number): { x: number; y: number } | null {
    const el = this.chart?.getDatasetMeta(series)?.data[index];
    return el ? { x: el.x, y: el.y } : null;
  }
  hostDisconnected(): void {
    this.chart?.destroy();
    this.chart = null;
  }
}
