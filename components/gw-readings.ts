import { LitElement, html, css, nothing } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import { parseReadings, unitFactor, type Reading } from '../src/index.js';
import { base } from './styles.js';

export interface ReadingsDetail { points: Reading[] }

/**
 * A table of bench readings (measurand, output volts): rows can be added one at a time, pasted from a
 * spreadsheet (tab, semicolon or comma separated, with a header and a unit row if wanted), removed or
 * cleared. It owns no design: every change goes up as the whole new list.
 *
 * @fires gw-readings - the new list of readings, `{ points }`.
 */
@customElement('gw-readings')
export class GwReadings extends LitElement {
  static override styles = [base, css`
    :host { display: block; }
    table { max-width: 28rem; }
    td input { width: 100%; max-width: 7rem; min-width: 2.5rem; box-sizing: border-box; }
    .marked td { color: var(--gw-muted); }
    .mark { font-size: 0.8rem; color: var(--gw-caution); }
    textarea { width: 100%; max-width: 28rem; min-height: 4.5rem; font: inherit; font-size: 0.85rem; }
    .bar { display: flex; flex-wrap: wrap; gap: 0.4rem; margin: 0.4rem 0; align-items: center; }
    [role='alert'] { color: var(--gw-fail); font-size: 0.85rem; }
  `];

  @state() private _problems: string[] = [];
  @state() private _x = '';
  @state() private _y = '';

  /** The readings shown. */
  @property({ attribute: false }) points: Reading[] = [];
  /** Unit of the measurand column (the design's measurand). */
  @property() measurand = 'A';
  /** Accessible name of the table. */
  @property() caption = 'Readings';
  /** Notes by row index (e.g. "outlier", "beyond the linear region"). */
  @property({ attribute: false }) marks: Record<number, string> = {};

  private _send(points: Reading[]): void {
    this.dispatchEvent(new CustomEvent<ReadingsDetail>('gw-readings', { detail: { points }, bubbles: true, composed: true }));
  }

  /** Reads text in the readings format; a unit row in a prefixed unit (mA for A) is converted. */
  private _read(text: string): Reading[] {
    const parsed = parseReadings(text);
    const k = unitFactor(parsed.units[0], this.measurand);
    const problems = parsed.problems.map((p) => `${p.path}: ${p.message}`);
    if (k === null) {
      problems.push(`the measurand column is in "${parsed.units[0]}", not ${this.measurand}`);
      this._problems = problems;
      return [];
    }
    this._problems = problems;
    return parsed.points.map(([x, y]) => [x * k, y]);
  }

  private _addRow(): void {
    const pts = this._read(`${this._x.trim()};${this._y.trim()}`);
    if (!pts.length) {
      this._problems = [`type two numbers: the ${this.measurand} value and the output in volts`];
      return;
    }
    this._x = ''; this._y = '';
    this._send([...this.points, ...pts]);
  }

  private _paste(): void {
    const area = this.renderRoot.querySelector('textarea')!;
    const pts = this._read(area.value);
    if (!pts.length) {
      if (!this._problems.length) this._problems = ['nothing to read: paste two columns, the measurand and the output in volts'];
      return;
    }
    area.value = '';
    this._send([...this.points, ...pts]);
  }

  override render() {
    const m = this.measurand;
    return html`
      <table aria-label=${this.caption}>
        <thead><tr><th>#</th><th>${m}</th><th>Output (V)</th><th></th></tr></thead>
        <tbody>
          ${this.points.map(([x, y], i) => html`<tr class=${this.marks[i] ? 'marked' : ''}>
            <td class="num">${i + 1}</td><td class="num">${x}</td><td class="num">${y}${this.marks[i] ? html` <span class="mark">${this.marks[i]}</span>` : nothing}</td>
            <td><button aria-label="Remove reading ${i + 1}" @click=${() => this._send(this.points.filter((_, j) => j !== i))}>×</button></td></tr>`)}
          <tr>
            <td></td>
            <td><input aria-label="New reading: ${m}" data-new="x" .value=${this._x} @input=${(e: Event) => { this._x = (e.target as HTMLInputElement).value; }}
              @keydown=${(e: KeyboardEvent) => { if (e.key === 'Enter') this._addRow(); }} /></td>
            <td><input aria-label="New reading: output in volts" data-new="y" .value=${this._y} @input=${(e: Event) => { this._y = (e.target as HTMLInputElement).value; }}
              @keydown=${(e: KeyboardEvent) => { if (e.key === 'Enter') this._addRow(); }} /></td>
            <td><button @click=${this._addRow}>Add</button></td>
          </tr>
        </tbody>
      </table>
      <details>
        <summary>Paste from a spreadsheet or CSV</summary>
        <textarea aria-label="Readings to paste" placeholder=${`${m};V\n0;2,50\n10;2,73`}></textarea>
        <div class="bar"><button data-action="paste" @click=${this._paste}>Add pasted readings</button>
          ${this.points.length ? html`<button data-action="clear" @click=${() => this._send([])}>Clear all</button>` : nothing}</div>
      </details>
      ${this._problems.length ? html`<div role="alert">${this._problems.slice(0, 5).map((p) => html`<div>${p}</div>`)}</div>` : nothing}
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-readings': GwReadings; }
  interface HTMLElementEventMap { 'gw-readings': CustomEvent<ReadingsDetail>; }
}
