import { LitElement, html, css, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { TradeResult, TradePoint } from '../src/index.js';
import { adoptTradePoint, sweepPoints, tradeCharts, tradeNotes, tradeSweeps, tradeTable } from '../src/index.js';
import { base } from './styles.js';
import './gw-chart.js';

/** The design edits that adopt one point of the trade, applied together by the design's owner. */
export interface TradeAdoptDetail {
  set: Array<{ path: string; value: number }>;
  /** The point adopted, for the notice that says what changed. */
  point: TradePoint;
}

/**
 * The turns trade: what each turn, millimetre of gap or ohm of burden buys, as two plots and a table. A
 * click on a plotted point, or a row's button, asks for that build.
 * @fires gw-trade-adopt - a point was chosen (`detail.set`: the field paths and values to apply together).
 */
@customElement('gw-trade')
export class GwTrade extends LitElement {
  static override styles = [base, css`
    :host { display: block; }
    .plots { display: grid; grid-template-columns: repeat(auto-fit, minmax(min(320px, 100%), 1fr)); gap: 0.8rem; }
    .builds { overflow-x: auto; margin-top: 0.6rem; }
    tr.own { background: #fdf3e7; }
    td button { padding: 0.1rem 0.5rem; font-size: 0.82rem; }
    .stale { opacity: 0.55; }
    .notes { color: var(--gw-muted); font-size: 0.82rem; }
    .why { color: var(--gw-muted); font-size: 0.78rem; }
  `];

  /** The sweep to show (null: the sensor has no turns to trade, or it has not been worked out yet). */
  @property({ attribute: false }) trade: TradeResult | null = null;
  /** The measurand's unit symbol. */
  @property() measurand = 'A';
  /** The sweep shown belongs to an earlier design and a fresh one is being worked out. */
  @property({ type: Boolean }) pending = false;

  private _adopt(p: TradePoint): void {
    this.dispatchEvent(new CustomEvent<TradeAdoptDetail>('gw-trade-adopt', { detail: { set: adoptTradePoint(p), point: p }, bubbles: true, composed: true }));
  }

  private _onPick = (e: HTMLElementEventMap['gw-chart-pick']): void => {
    e.stopPropagation();
    const t = this.trade;
    if (!t) return;
    const sweep = tradeSweeps(t).find((s) => `trade-${s.sweep}` === e.detail.chart);
    if (!sweep) return;
    // The point of that sweep nearest the clicked x (every series of a chart shares its x values).
    const pts = sweepPoints(t, sweep.sweep);
    const best = pts.reduce((a, b) => (Math.abs(sweep.x(b) - e.detail.x) < Math.abs(sweep.x(a) - e.detail.x) ? b : a), pts[0]!);
    if (best) this._adopt(best);
  };

  override render() {
    const t = this.trade;
    if (!t) return html`<p class="notes">${this.pending ? 'Working out the trade…' : 'Only a Hall sensor in a gapped core or a current transformer has turns to trade.'}</p>`;
    const table = tradeTable(t, this.measurand)!;
    return html`<div class=${this.pending ? 'stale' : ''} aria-busy=${this.pending ? 'true' : 'false'}>
      <div class="plots" @gw-chart-pick=${this._onPick}>${tradeCharts(t, this.measurand).map((c) => html`<gw-chart data-chart=${c.id} .data=${c}></gw-chart>`)}</div>
      <p class="notes">Click a point on a plot, or a row's button below, to build with it.</p>
      <div class="builds"><table aria-label="Trade: each build's figures">
        <thead><tr>${table.head.map((h) => html`<th scope="col">${h}</th>`)}<th scope="col" aria-label="Build"></th></tr></thead>
        <tbody>${table.rows.map((r) => html`<tr class=${r.current ? 'own' : ''} data-sweep=${r.sweep} data-turns=${r.point.turns}>
          ${r.cells.map((c) => html`<td class="num">${c}</td>`)}
          <td>${r.current ? html`<small>in use</small>` : html`<button @click=${() => this._adopt(r.point)}>Use this</button>`}${r.why ? html`<div class="why">${r.why}</div>` : nothing}</td>
        </tr>`)}</tbody>
      </table></div>
      ${tradeNotes(t).map((n) => html`<p class="notes">${n}</p>`)}
    </div>`;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-trade': GwTrade; }
  interface HTMLElementEventMap { 'gw-trade-adopt': CustomEvent<TradeAdoptDetail>; }
}
