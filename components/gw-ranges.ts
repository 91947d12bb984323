import { LitElement, html, css, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { Report } from '../src/index.js';
import { rangeTable } from '../src/index.js';
import { base } from './styles.js';

/** Which switch position's netlist is asked for (1 = the first range). */
export interface RangeSpiceDetail { position: number }

/**
 * The range switch at a glance: one row per position with its scale, zero, linear span and first limit,
 * bandwidth, noise and error after calibration, and the parts it switches in. On screen each row offers the
 * position's own SPICE netlist.
 * @fires gw-range-spice - the netlist of one position is asked for (`detail.position`, from 1).
 */
@customElement('gw-ranges')
export class GwRanges extends LitElement {
  static override styles = [base, css`
    :host { display: block; }
    caption { text-align: left; font-weight: 600; padding-bottom: 0.2rem; }
    td button { padding: 0.1rem 0.5rem; font-size: 0.82rem; }
  `];

  /** The report whose switch to show (nothing without one). */
  @property({ attribute: false }) report: Report | null = null;
  /** The printed sheet's form: no buttons. */
  @property({ type: Boolean }) compact = false;

  private _spice(position: number): void {
    this.dispatchEvent(new CustomEvent<RangeSpiceDetail>('gw-range-spice', { detail: { position }, bubbles: true, composed: true }));
  }

  override render() {
    const t = this.report ? rangeTable(this.report) : null;
    if (!t) return nothing;
    return html`<table aria-label="Ranges">
      <caption>${t.caption}</caption>
      <thead><tr>${t.head.map((h) => html`<th scope="col">${h}</th>`)}${this.compact ? nothing : html`<th scope="col" aria-label="Netlist"></th>`}</tr></thead>
      <tbody>${t.rows.map((r) => html`<tr data-position=${r.position}>${r.cells.map((c) => html`<td class="num">${c}</td>`)}
        ${this.compact ? nothing : html`<td><button @click=${() => this._spice(r.position)}>SPICE netlist</button></td>`}</tr>`)}</tbody>
    </table>`;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-ranges': GwRanges; }
  interface HTMLElementEventMap { 'gw-range-spice': CustomEvent<RangeSpiceDetail>; }
}
