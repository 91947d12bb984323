import { LitElement, html, css, nothing } from 'lit';
import { customElement, property, query, state } from 'lit/decorators.js';
import { KIT_SHAPES, formatEng, kitListText, parseKitList, parseQuantity, type ResistorKit } from '../src/index.js';
import { base } from './styles.js';
import type { SetDetail } from './gw-editor.js';
import { KitShelfController } from './kit-shelf-controller.js';

/**
 * The resistors at hand (`target.kit`): a common kit shape (a series between two limits), how many of each,
 * and further values pasted as a list (`10k x2, 4k7, 470R`). The element reads what was typed and sends the
 * whole kit up; the owner of the design checks and applies it. The person's kits are kept by name in the
 * browser and saved and opened as kit files (`KitShelfController`); one taken from there is sent up the same way.
 * @fires gw-set - `{ path: 'target.kit', value }` with the new kit, or null to design from the whole series again.
 */
@customElement('gw-kit-editor')
export class GwKitEditor extends LitElement {
  static override styles = [base, css`
    label { display: block; margin: 0.3rem 0; font-size: 0.9rem; }
    textarea { width: 100%; min-height: 3.5rem; font: inherit; box-sizing: border-box; }
    select, input[type=number] { margin-left: 0.3rem; }
    .problems { color: var(--gw-fail); font-size: 0.85rem; margin: 0.2rem 0; }
    .hint { color: var(--gw-muted); font-size: 0.82rem; }
    fieldset { border: 1px solid var(--gw-line, #ccc); margin: 0.6rem 0 0; padding: 0.3rem 0.6rem; }
    legend { font-size: 0.9rem; }
    .row { display: flex; flex-wrap: wrap; gap: 0.4rem; align-items: center; margin: 0.3rem 0; }
    .said { font-size: 0.85rem; margin: 0.2rem 0; }
    .said.bad { color: var(--gw-fail); }
  `];

  @query('textarea') private _list!: HTMLTextAreaElement;

  /** Pieces of the pasted list that could not be read. */
  @state() private _problems: string[] = [];
  /** "Only the values listed" chosen while the list is still empty: the series stays until a list is applied. */
  @state() private _listOnly = false;

  /** The name the kit is kept and saved by. */
  @state() private _name = 'my kit';

  private readonly _shelf = new KitShelfController(this, (kit) => this._send(kit));

  /** The design's kit (null: the solver uses the whole series). */
  @property({ attribute: false }) kit: ResistorKit | null = null;

  private _send(value: ResistorKit | null): void {
    this.dispatchEvent(new CustomEvent<SetDetail>('gw-set', { detail: { path: 'target.kit', value }, bubbles: true, composed: true }));
  }

  private _toggle(e: Event): void {
    this._problems = [];
    this._listOnly = false;
    this._send((e.target as HTMLInputElement).checked ? { ...KIT_SHAPES[0]!.kit, parts: [] } : null);
  }

  private _shape(e: Event): void {
    const id = (e.target as HTMLSelectElement).value;
    const shape = KIT_SHAPES.find((k) => k.id === id);
    const kit = this.kit!;
    this._listOnly = id === 'list';
    if (id === 'list') { if (kit.parts.length) this._send({ min: kit.min, max: kit.max, parts: kit.parts }); }
    else if (shape) this._send({ ...shape.kit, ...(kit.count ? { count: kit.count } : {}), parts: kit.parts });
  }

  private _count(e: Event): void {
    const text = (e.target as HTMLInputElement).value.trim();
    const n = Number(text);
    // Empty: as many as needed. A count that is not a whole number from 1 goes up as typed and is refused there.
    const { count: _old, ...rest } = this.kit!;
    this._send(text === '' ? rest : { ...rest, count: n });
  }

  private _applyList(): void {
    const read = parseKitList(this._list.value, (piece) => parseQuantity(piece, 'ohm'));
    this._problems = read.problems;
    const kit = this.kit!;
    this._send(this._listOnly ? { min: kit.min, max: kit.max, parts: read.parts } : { ...kit, parts: read.parts });
  }

  private async _openFile(e: Event): Promise<void> {
    const input = e.target as HTMLInputElement;
    const file = input.files?.[0];
    if (!file) return;
    const name = await this._shelf.open(file);
    if (name) this._name = name;
    // The same file may be opened again after an edit.
    input.value = '';
  }

  private _renderShelf() {
    const kit = this.kit;
    const shelf = this._shelf;
    const said = shelf.message;
    return html`<fieldset><legend>Your kits</legend>
      ${kit ? html`<div class="row"><label>Name <input type="text" aria-label="Kit name" maxlength="80" .value=${this._name}
          @change=${(e: Event) => { this._name = (e.target as HTMLInputElement).value; }} /></label>
        <button @click=${() => shelf.keep(this._name, kit)}>Keep in this browser</button>
        <button @click=${() => shelf.download(this._name, kit)}>Save as a file</button></div>` : nothing}
      ${shelf.kits.length ? html`<div class="row"><label>Kept in this browser <select aria-label="Kept kits">
          ${shelf.kits.map((k, i) => html`<option value=${i}>${k.name}</option>`)}</select></label>
        <button @click=${() => { this._name = shelf.load(this._keptIndex()) ?? this._name; }}>Use</button>
        <button @click=${() => shelf.remove(this._keptIndex())}>Remove</button></div>` : nothing}
      <div class="row"><label>Open a kit file <input type="file" accept=".json,application/json" aria-label="Open a kit file" @change=${this._openFile} /></label></div>
      ${said ? html`<p class="said ${said.bad ? 'bad' : ''}" role=${said.bad ? 'alert' : 'status'}>${said.text}</p>` : nothing}
    </fieldset>`;
  }

  private _keptIndex(): number {
    return Number((this.renderRoot.querySelector('select[aria-label="Kept kits"]') as HTMLSelectElement | null)?.value ?? 0);
  }

  override render() {
    const kit = this.kit;
    const shape = this._listOnly ? 'list' : kit?.series ? KIT_SHAPES.find((k) => k.kit.series === kit.series && k.kit.min === kit.min && k.kit.max === kit.max)?.id ?? 'custom' : 'list';
    return html`
      <label><input type="checkbox" .checked=${!!kit} @change=${this._toggle} /> Design from the resistors I have</label>
      ${!kit ? html`<p class="hint">Off: the solver picks from the whole series in the resistance window.</p>` : html`
        <label>Kit <select aria-label="Kit shape" @change=${this._shape}>
          ${KIT_SHAPES.map((k) => html`<option value=${k.id} ?selected=${shape === k.id}>${k.label}</option>`)}
          ${shape === 'custom' ? html`<option value="custom" selected>${kit.series}, ${formatEng(kit.min, 'Ω')} to ${formatEng(kit.max, 'Ω')}</option>` : nothing}
          <option value="list" ?selected=${shape === 'list'}>Only the values listed below</option>
        </select></label>
        ${kit.series ? html`<label>How many of each ${kit.series} value
          <input type="number" min="1" step="1" placeholder="plenty" aria-label="How many of each series value" .value=${kit.count ? String(kit.count) : ''} @change=${this._count} /></label>` : nothing}
        <label>Further values (or the whole kit), with counts: <span class="hint">10k x2, 4k7, 470R</span>
          <textarea aria-label="Listed values" .value=${kitListText(kit.parts, (x) => formatEng(x, 'Ω', 4))}></textarea></label>
        <button @click=${this._applyList}>Use these values</button>
        ${this._problems.length ? html`<p class="problems" role="alert">Left out: ${this._problems.join('; ')}.</p>` : nothing}`}
      ${this._renderShelf()}
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-kit-editor': GwKitEditor; }
}
