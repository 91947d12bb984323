import { LitElement, html, css, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { BomRow } from '../src/index.js';
import type { PairCandidate } from '../src/index.js';
import { formatEng } from '../src/index.js';
import { base } from './styles.js';

/**
 * The parts list and the solver's ranked alternatives for the gain network.
 * @fires gw-set - `{ path: 'target.alternative', value }` when an alternative is chosen.
 */
@customElement('gw-parts')
export class GwParts extends LitElement {
  static override styles = [base, css`
    .alts { margin-top: 0.6rem; }
    .alts label { display: block; padding: 0.15rem 0; font-size: 0.88rem; }
  `];

  /** Parts list rows (from src/present/bom.ts). */
  @property({ attribute: false }) rows: BomRow[] = [];
  /** Ranked gain-network alternatives. */
  @property({ attribute: false }) alternatives: PairCandidate[] = [];
  /** Index of the alternative built. */
  @property({ type: Number }) chosen = 0;
  /** Hide the alternatives (the printed sheet). */
  @property({ type: Boolean }) compact = false;

  private _pick(i: number): void {
    this.dispatchEvent(new CustomEvent('gw-set', { detail: { path: 'target.alternative', value: i }, bubbles: true, composed: true }));
  }

  override render() {
    const arm = (a: PairCandidate['a']) => a.parts.map((p) => formatEng(p, 'Ω')).join(a.arrangement === 'parallel' ? ' ∥ ' : ' + ');
    return html`
      <table aria-label="Parts list">
        <thead><tr><th>Ref</th><th>Value</th><th>Code</th><th>Series / kind</th><th>Rating</th><th>Qty</th><th>Role</th></tr></thead>
        <tbody>${this.rows.map((r) => html`<tr data-ref=${r.ref}>
          <td>${r.ref}</td><td class="num">${r.value}</td><td>${r.code}</td><td>${r.spec}</td>
          <td class="num">${r.rating === null ? '' : `${r.rating} W`}${r.dissipation ? html`<br /><small>${formatEng(r.dissipation, 'W')} used</small>` : nothing}</td>
          <td>${r.quantity}</td><td>${r.role}</td></tr>`)}</tbody>
      </table>
      ${this.compact || this.alternatives.length < 2 ? nothing : html`<fieldset class="alts"><legend>Gain network alternatives (feedback / ${'leg or input'}, error before trim)</legend>
        ${this.alternatives.map((a, i) => html`<label><input type="radio" name="alt" .checked=${i === this.chosen} @change=${() => this._pick(i)} />
          ${arm(a.a)} / ${arm(a.b)} — ${(a.error * 100).toFixed(4)} %, ${a.parts} parts</label>`)}
      </fieldset>`}
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-parts': GwParts; }
}
