import { LitElement, html, css, nothing } from 'lit';
import { customElement, property, query } from 'lit/decorators.js';
import type { ChartData } from '../src/index.js';
import { chartText, sameChart } from '../src/index.js';
import { base } from './styles.js';
import { ChartController, type PickedPoint } from './chart-controller.js';

/**
 * One plot. The data come ready-made from the core (src/present/charts.ts); this element only draws them,
 * with a text alternative: a short summary under the plot and the data as a table on request.
 * @fires gw-chart-pick - a point of a pickable chart was clicked (`detail`: its series, index and values).
 * @cssproperty --gw-chart-height - plot height (default 260px).
 */
@customElement('gw-chart')
export class GwChart extends LitElement {
  static override styles = [base, css`
    :host { display: block; }
    .plot { position: relative; height: var(--gw-chart-height, 260px); }
    canvas { width: 100%; height: 100%; }
    .summary { color: var(--gw-muted); font-size: 0.8rem; margin: 0.2rem 0; }
    details { font-size: 0.8rem; }
    details table { font-size: 0.78rem; }
    .rows { max-height: 16rem; overflow: auto; }
  `];

  @query('canvas') canvas!: HTMLCanvasElement | null;

  /** What to plot. Data equal to what is drawn (a report recomputed without a change to this plot) draw nothing (issue 23). */
  @property({ attribute: false, hasChanged: (now: ChartData | null, before: ChartData | null) => !sameChart(now, before) }) data: ChartData | null = null;

  private readonly _chart = new ChartController(this);

  /** Called by the controller when a point of a pickable chart is clicked. */
  picked(p: PickedPoint): void {
    this.dispatchEvent(new CustomEvent<ChartPickDetail>('gw-chart-pick', { detail: { chart: this.data?.id ?? '', ...p }, bubbles: true, composed: true }));
  }

  /** Where a point is drawn, in CSS pixels from the canvas's top left (null before the first drawing). */
  pointPosition(series: number, index: number): { x: number; y: number } | null {
    return this._chart.pixelOf(series, index);
  }

  override render() {
    const d = this.data;
    const text = d ? chartText(d) : null;
    return html`<div class="plot"><canvas role="img" aria-label=${d?.title ?? 'chart'} aria-describedby="summary"></canvas></div>
      ${text ? html`<p class="summary" id="summary">${text.summary}</p>
      <details><summary>${d!.title}: the data as a table</summary>
        <div class="rows"><table aria-label=${`${d!.title}: data`}><thead><tr>${text.head.map((h) => html`<th scope="col">${h}</th>`)}</tr></thead>
        <tbody>${text.rows.map((row) => html`<tr>${row.map((c) => html`<td>${c}</td>`)}</tr>`)}</tbody></table></div>
      </details>` : nothing}`;
  }
}

/** A clicked point of a pickable chart: which chart, which series and point, and its values. */
export interface ChartPickDetail extends PickedPoint { chart: string }

declare global {
  interface HTMLElementTagNameMap { 'gw-chart': GwChart; }
  interface HTMLElementEventMap { 'gw-chart-pick': CustomEvent<ChartPickDetail>; }
}
