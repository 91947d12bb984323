import { LitElement, html, css } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import { base } from './styles.js';

/** What a toolbar button asks the app to do. */
export type ToolbarAction = 'open' | 'save' | 'share' | 'parts-csv' | 'spice' | 'print';

export interface ToolbarActionDetail { action: ToolbarAction }
export interface DemoDetail { id: string }

/**
 * The header's commands: load a demo, open, save, share, export the parts list and the SPICE netlist, print
 * the build sheet. It holds no state; the app does the work.
 *
 * @fires gw-toolbar-action - a button was pressed, `{ action }`.
 * @fires gw-demo - a demo was picked, `{ id }`.
 */
@customElement('gw-toolbar')
export class GwToolbar extends LitElement {
  static override styles = [base, css`
    :host { display: flex; flex-wrap: wrap; gap: 0.45rem; align-items: center; }
    button, select { background: #2f4155; color: #fff; border: 1px solid #8fa3b8; border-radius: 4px; padding: 0.3rem 0.6rem; white-space: nowrap; }
    button:hover { background: #3d5570; }
    select { max-width: 100%; }
  `];

  /** The demos to offer, `[id, label]`. */
  @property({ attribute: false }) demos: Array<[string, string]> = [];

  private _act(action: ToolbarAction): void {
    this.dispatchEvent(new CustomEvent<ToolbarActionDetail>('gw-toolbar-action', { detail: { action }, bubbles: true, composed: true }));
  }

  private _demo(e: Event): void {
    const select = e.target as HTMLSelectElement;
    const id = select.value;
    select.value = '';
    if (id) this.dispatchEvent(new CustomEvent<DemoDetail>('gw-demo', { detail: { id }, bubbles: true, composed: true }));
  }

  override render() {
    return html`
      <select aria-label="Load a demo" @change=${this._demo}>
        <option value="">Load a demo…</option>
        ${this.demos.map(([id, label]) => html`<option value=${id}>${label}</option>`)}
      </select>
      <button @click=${() => this._act('open')}>Open…</button>
      <button @click=${() => this._act('save')}>Save</button>
      <button @click=${() => this._act('share')}>Share link</button>
      <button @click=${() => this._act('parts-csv')}>Parts CSV</button>
      <button @click=${() => this._act('spice')}>SPICE netlist</button>
      <button @click=${() => this._act('print')}>Print build sheet</button>
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-toolbar': GwToolbar; }
  interface HTMLElementEventMap {
    'gw-toolbar-action': CustomEvent<ToolbarActionDetail>;
    'gw-demo': CustomEvent<DemoDetail>;
  }
}
