import { LitElement, html, css, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import { SUPPLY_WORDS, formatEng, hoursText, misfitWords, railsText, rangeText, sayFinding, type OpAmpSpec, type Supply, type SupplyKind, type SupplyOption } from '../src/index.js';
import { base, choiceTable } from './styles.js';

/**
 * `gw-adopt-supply`: make this the design's supply and the zero it was designed for, and with `opamp` (the
 * rail-to-rail row) that op-amp, as one edit; `kind` says which row.
 */
export interface AdoptSupplyDetail { supply: Supply; zero: number; opamp: OpAmpSpec | null; kind: SupplyKind }

const VERDICT = { pass: 'Pass', caution: 'Caution', fail: 'Fail' } as const;

/**
 * The supply choices for a design on a battery, one row each: the rails, the zero, whether the stage fits
 * fresh and at end of life, the linear range at end of life, the battery life and the hours to the first
 * clip, and the verdict; the rows that buy back range lost at end of life (a zero for it, a rail-to-rail
 * output op-amp) are marked, and each row's notes say what it changes. The rows come from the core; the
 * element only shows them.
 * @fires gw-panel-toggle - `{ panel: 'supplies', open }` when the person opens or closes the panel.
 * @fires gw-adopt-supply - `{ supply, zero, opamp, kind }` when the person picks a row to use.
 */
@customElement('gw-supply-options')
export class GwSupplyOptions extends LitElement {
  static override styles = [base, choiceTable, css`
    tr.gains th::after, .legend::before { content: '▲ '; color: var(--gw-pass, #1a7f37); }
    tr.gains th::after { content: ' ▲'; }
    .notes { margin: 0.5em 0 0; padding-left: 1.2em; max-width: 60em; }
    .notes li { margin: 0.25em 0; }
    .legend { margin: 0.5em 0 0; }
    th[scope='row'] { min-width: 11em; }
    td.fits { min-width: 13em; }
  `];

  /** Choices from the core (`supplyOptions`); null while being worked out; empty without a battery. */
  @property({ attribute: false }) options: SupplyOption[] | null = null;
  /** The design's measurand unit symbol. */
  @property() measurand = '';
  /** Whether the panel is open. */
  @property({ type: Boolean }) open = false;

  private _toggle(e: Event): void {
    const open = (e.target as HTMLDetailsElement).open;
    if (open !== this.open) this.dispatchEvent(new CustomEvent('gw-panel-toggle', { detail: { panel: 'supplies', open }, bubbles: true, composed: true }));
  }

  private _adopt(o: SupplyOption): void {
    this.dispatchEvent(new CustomEvent('gw-adopt-supply', { detail: { supply: o.supply, zero: o.zero, opamp: o.opamp, kind: o.kind }, bubbles: true, composed: true }));
  }

  private _row(o: SupplyOption) {
    const m = this.measurand;
    return html`<tr class=${o.current ? 'current' : o.gainsAtEndOfLife ? 'gains' : ''} data-kind=${o.kind} data-fits=${o.fits ? 'yes' : 'no'} data-verdict=${o.verdict}>
      <th scope="row">${SUPPLY_WORDS[o.kind]}${o.current ? html`<br /><small>used now</small>` : nothing}${o.regulatorDropped ? html`<br /><small>no regulator: it does not fit under the positive rail</small>` : nothing}${o.opamp ? html`<br /><small>${o.opamp.name}</small>` : nothing}</th>
      <td class="num">${railsText(o.supply)}</td><td class="num">${formatEng(o.zero, 'V', 3)}</td>
      <td class="fits">${o.fits ? 'Yes' : html`<span class="no">No</span><br /><small>${o.misfits.map(misfitWords).join('; ')}</small>`}</td>
      <td class="num">${rangeText(o.endOfLifeLow, o.endOfLifeHigh, m)}</td>
      <td class="num">${hoursText(o.batteryLife)}</td><td class="num">${o.hoursToClip === null ? 'never' : hoursText(o.hoursToClip)}</td>
      <td class=${o.verdict}><span class="tag">${VERDICT[o.verdict]}</span></td>
      <td>${o.current ? nothing : html`<button @click=${() => this._adopt(o)} aria-label=${`Use: ${SUPPLY_WORDS[o.kind]}`}>Use</button>`}</td>
    </tr>`;
  }

  /** What the rows that change more than the supply do, one sentence each from the core's notes. */
  private _notes(options: SupplyOption[]) {
    const notes = options.flatMap((o) => o.notes.map((n) => ({ o, n })));
    return notes.length ? html`<ul class="notes" aria-label="About these choices">${notes.map(({ o, n }) => html`<li data-note=${n.code} data-kind=${o.kind}><strong>${SUPPLY_WORDS[o.kind]}:</strong> ${sayFinding(n)}</li>`)}</ul>` : nothing;
  }

  override render() {
    return html`<details ?open=${this.open} @toggle=${this._toggle}>
      <summary>Supply choices for this battery</summary>
      ${!this.open ? nothing : this.options === null ? html`<p role="status">Working out each supply…</p>`
        : !this.options.length ? html`<p>The design runs from a bench supply: switch on Battery (Supply) to compare the ways a battery can feed it.</p>`
        : html`<div class="scroll"><table aria-label="Supply choices">
          <thead><tr><th>Supply</th><th class="num">Rails</th><th class="num">Zero</th><th>Fits</th><th class="num">Linear at end of life</th><th class="num">Battery life</th><th class="num">Clips after</th><th>Verdict</th><th></th></tr></thead>
          <tbody>${this.options.map((o) => this._row(o))}</tbody>
        </table></div>
        ${this.options.some((o) => o.gainsAtEndOfLife) ? html`<p class="legend"><small>More of the range stays linear at end of battery life than with the design as it is.</small></p>` : nothing}
        ${this._notes(this.options)}`}
    </details>`;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-supply-options': GwSupplyOptions; }
  interface HTMLElementEventMap { 'gw-adopt-supply': CustomEvent<AdoptSupplyDetail>; }
}
