import { LitElement, html, css } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { FigureRow } from '../src/index.js';
import { base } from './styles.js';

/** A table of labelled figures, already written as text by the app from the report. */
@customElement('gw-figures')
export class GwFigures extends LitElement {
  static override styles = [base, css`td.v { white-space: nowrap; font-variant-numeric: tabular-nums; } td.n { color: var(--gw-muted); font-size: 0.9em; }`];

  /** Rows to show. */
  @property({ attribute: false }) rows: FigureRow[] = [];
  /** Accessible name of the table. */
  @property() caption = 'Figures';

  override render() {
    return html`<table aria-label=${this.caption}><tbody>${this.rows.map((r) => html`<tr><td>${r.label}</td><td class="v">${r.value}</td><td class="n">${r.note ?? ''}</td></tr>`)}</tbody></table>`;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-figures': GwFigures; }
}
