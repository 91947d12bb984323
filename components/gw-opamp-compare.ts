import { LitElement, html, css, nothing } from 'lit';
import { customElement, property, query } from 'lit/decorators.js';
import { SOURCE_WORDS, formatEng, hoursText, misfitWords, rangeText, type ComparisonRow, type OpAmpSpec } from '../src/index.js';
import { base, choiceTable } from './styles.js';
import type { ComparisonPanel, OwnOpAmpsAction } from './comparison-controller.js';

/** `gw-panel-toggle`: the person opened or closed a comparison panel. */
export interface PanelToggleDetail { panel: ComparisonPanel; open: boolean }
/** `gw-adopt-opamp`: make this op-amp the design's. */
export interface AdoptOpAmpDetail { opamp: OpAmpSpec }

const VERDICT = { pass: 'Pass', caution: 'Caution', fail: 'Fail' } as const;
const f = (x: number | null, unit: string) => (x === null ? '—' : formatEng(x, unit, 3));

/**
 * The design's op-amp against the others at hand, one row each, passing first: whether the stage fits on
 * these rails (and at end of battery life), its linear range, speed, noise, error after calibration, supply
 * current, battery life and verdict. The rows come from the core; the element only shows them.
 * @fires gw-panel-toggle - `{ panel: 'opamps', open }` when the person opens or closes the panel.
 * @fires gw-adopt-opamp - `{ opamp }` when the person picks a row to use.
 * @fires gw-own-opamps - an edit of the person's own list (`keep` the design's op-amp, `remove`, `open` a file, `save`).
 */
@customElement('gw-opamp-compare')
export class GwOpAmpCompare extends LitElement {
  static override styles = [base, choiceTable, css`
    tbody th { min-width: 10rem; }
    td.num small { white-space: nowrap; }
    td.fits { min-width: 8rem; }
    td button { margin-left: 0.3rem; padding: 0.1rem 0.5rem; }
    .source { color: var(--gw-muted); font-size: 0.8rem; }
    .own { display: flex; flex-wrap: wrap; gap: 0.4rem; align-items: center; margin-top: 0.6rem; }
    .own ul { list-style: none; padding: 0; margin: 0.3rem 0 0; width: 100%; }
    .own li { padding: 0.1rem 0; }
    .message { margin: 0.4rem 0 0; font-size: 0.88rem; }
    .message.bad { color: var(--gw-fail); }
  `];

  @query('input[type=file]') private _file!: HTMLInputElement;

  /** Rows from the core (`compareOpAmps`), passing first; null while being worked out. */
  @property({ attribute: false }) rows: ComparisonRow[] | null = null;
  /** The person's own op-amps, for the list under the table. */
  @property({ attribute: false }) own: OpAmpSpec[] = [];
  /** The design's measurand unit symbol. */
  @property() measurand = '';
  /** Whether the design runs from a battery (shows the end-of-life and battery-life columns). */
  @property({ type: Boolean }) battery = false;
  /** Whether the panel is open. */
  @property({ type: Boolean }) open = false;
  /** A line about the own list. */
  @property({ attribute: false }) message: { text: string; bad: boolean } | null = null;

  private _toggle(e: Event): void {
    const open = (e.target as HTMLDetailsElement).open;
    // The toggle event also follows a change of the property: only a person's click is sent up.
    if (open !== this.open) this.dispatchEvent(new CustomEvent('gw-panel-toggle', { detail: { panel: 'opamps', open }, bubbles: true, composed: true }));
  }

  private _adopt(row: ComparisonRow): void {
    this.dispatchEvent(new CustomEvent('gw-adopt-opamp', { detail: { opamp: row.opamp }, bubbles: true, composed: true }));
  }

  private _own(detail: OwnOpAmpsAction): void {
    this.dispatchEvent(new CustomEvent('gw-own-opamps', { detail, bubbles: true, composed: true }));
  }

  private _picked(): void {
    const file = this._file.files?.[0];
    this._file.value = '';
    if (file) this._own({ action: 'open', file });
  }

  private _row(r: ComparisonRow) {
    const m = this.measurand;
    return html`<tr class=${r.current ? 'current' : ''} data-id=${`${r.source}:${r.id}`} data-fits=${r.fits ? 'yes' : 'no'} data-verdict=${r.verdict}>
      <th scope="row">${r.name}<br /><span class="source">${SOURCE_WORDS[r.source]}${r.current ? ', used now' : ''}</span></th>
      <td class="fits">${r.fits ? 'Yes' : html`<span class="no">No</span><br /><small>${r.misfits.map(misfitWords).join('; ')}</small>`}</td>
      <td class="num">${rangeText(r.measurandLow, r.measurandHigh, m)}${this.battery ? html`<br /><small>at end of life ${rangeText(r.endOfLifeLow, r.endOfLifeHigh, m)}</small>` : nothing}</td>
      <td class="num">${f(r.bandwidth, 'Hz')}<br /><small>full power ${f(r.fullPower, 'Hz')}</small></td>
      <td class="num">${f(r.noiseReferred, `${m} rms`)}</td><td class="num">${r.errorAfterTrim === null ? '—' : `±${f(r.errorAfterTrim, m)}`}</td>
      <td class="num">${f(r.supplyCurrent, 'A')}${this.battery ? html`<br /><small>${hoursText(r.batteryLife)} on the battery</small>` : nothing}</td>
      <td class=${r.verdict}><span class="tag">${VERDICT[r.verdict]}</span>
        ${r.current ? nothing : html`<button @click=${() => this._adopt(r)} aria-label=${`Use ${r.name}`}>Use</button>`}</td>
    </tr>`;
  }

  override render() {
    return html`<details ?open=${this.open} @toggle=${this._toggle}>
      <summary>Compare the op-amps at hand on this design</summary>
      ${!this.open ? nothing : this.rows === null ? html`<p role="status">Working out each op-amp…</p>` : html`
        <div class="scroll"><table aria-label="Op-amps side by side">
          <thead><tr><th>Op-amp</th><th>Fits</th><th class="num">Linear range</th><th class="num">Bandwidth</th><th class="num">Noise</th>
            <th class="num">Error after calibration</th><th class="num">Supply current</th><th>Verdict</th></tr></thead>
          <tbody>${this.rows.map((r) => this._row(r))}</tbody>
        </table></div>`}
      <div class="own">
        <button @click=${() => this._own({ action: 'keep' })}>Keep the design's op-amp in my list</button>
        <button @click=${() => this._file.click()}>Open op-amps file…</button>
        <button ?disabled=${!this.own.length} @click=${() => this._own({ action: 'save' })}>Save my op-amps</button>
        <input type="file" accept=".json,application/json" hidden @change=${this._picked} />
        ${this.own.length ? html`<ul aria-label="My op-amps">${this.own.map((o, i) => html`<li>${o.name} <button aria-label=${`Remove ${o.name}`} @click=${() => this._own({ action: 'remove', index: i })}>Remove</button></li>`)}</ul>` : nothing}
      </div>
      ${this.message ? html`<p class="message ${this.message.bad ? 'bad' : ''}" role="status">${this.message.text}</p>` : nothing}
    </details>`;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-opamp-compare': GwOpAmpCompare; }
  interface HTMLElementEventMap {
    'gw-panel-toggle': CustomEvent<PanelToggleDetail>;
    'gw-adopt-opamp': CustomEvent<AdoptOpAmpDetail>;
    'gw-own-opamps': CustomEvent<OwnOpAmpsAction>;
  }
}
