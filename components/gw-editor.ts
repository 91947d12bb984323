import { LitElement, html, css, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import { live } from 'lit/directives/live.js';
import type { Design, SensorType } from '../src/index.js';
import { displayValue, fieldHint, fieldsFor, getPath, SENSOR_TYPES, type FieldDef, type Section } from '../src/index.js';
import { OPAMP_ARCHETYPES } from '../src/index.js';
import { base } from './styles.js';
import './gw-field.js';

export interface SetDetail { path: string; value: unknown }
export interface SensorTypeDetail { type: SensorType }
export interface ArchetypeDetail { id: string }

const SECTIONS: Array<[Section, string]> = [
  ['sensor', '1 · Sensor'],
  ['target', '2 · Amplifier: target scale'],
  ['amplifier', '3 · Amplifier: op-amp figures'],
  ['output', '4 · Output and instrument'],
  ['supply', '5 · Supply'],
  ['environment', '6 · Temperature and analysis'],
];

/**
 * The design editor, in sections that follow the signal from the sensor to the instrument and the supply.
 *
 * @fires gw-field-input - a typed value, `{ path, text }` (from its fields).
 * @fires gw-set - a chosen value (select or switch), `{ path, value }`.
 * @fires gw-sensor-type - the sensor model, `{ type }`.
 * @fires gw-opamp-archetype - an op-amp archetype to start from, `{ id }`.
 */
@customElement('gw-editor')
export class GwEditor extends LitElement {
  static override styles = [base, css`
    :host { display: block; }
    fieldset { border: 1px solid var(--gw-line); border-radius: 6px; margin: 0 0 0.8rem; padding: 0.5rem 0.7rem 0.7rem; background: var(--gw-paper); }
    legend { font-weight: 700; padding: 0 0.3rem; }
    .row { display: grid; grid-template-columns: minmax(7rem, 1fr) minmax(6rem, 9rem); gap: 0.4rem; align-items: center; margin: 0.15rem 0 0.35rem; font-size: 0.9rem; }
    /* A select takes the width its longest choice needs and wraps under its label when the row is narrow. */
    .row.choice { display: flex; flex-wrap: wrap; justify-content: space-between; column-gap: 0.4rem; row-gap: 0.15rem; }
    .row.choice > span { flex: 1 1 7rem; }
    select { flex: 0 1 auto; max-width: 100%; }
    fieldset { min-width: 0; }
    .note { color: var(--gw-muted); font-size: 0.8rem; margin: 0.2rem 0 0.4rem; }
  `];

  /** The design in force (the last good one). */
  @property({ attribute: false }) design!: Design;
  /** Messages by field path for values that could not be used. */
  @property({ attribute: false }) messages: Record<string, string> = {};
  /** How the last value typed into a field was read, by field path, when it was typed in another unit. */
  @property({ attribute: false }) notes: Record<string, string> = {};

  private _set(path: string, value: unknown): void {
    this.dispatchEvent(new CustomEvent<SetDetail>('gw-set', { detail: { path, value }, bubbles: true, composed: true }));
  }

  private _field(f: FieldDef) {
    const path = f.path;
    const value = getPath(this.design, path);
    if (f.kind === 'select') {
      return html`<label class="row choice"><span>${f.label}</span>
        <select data-path=${path} .value=${live(String(Math.max(0, f.options!.findIndex(([v]) => JSON.stringify(v) === JSON.stringify(value)))))} @change=${(e: Event) => this._set(path, f.options![Number((e.target as HTMLSelectElement).value)]![0])}>
          ${f.options!.map(([v, l], i) => html`<option value=${i} ?selected=${JSON.stringify(value) === JSON.stringify(v)}>${l}</option>`)}
        </select></label>`;
    }
    if (f.kind === 'bool') {
      const on = f.group ? value !== null && value !== undefined : value === true;
      return html`<label class="row"><span>${f.label}</span>
        <input type="checkbox" data-path=${path} .checked=${live(on)} @change=${(e: Event) => this._set(path, (e.target as HTMLInputElement).checked)} /></label>`;
    }
    if (f.kind === 'text') {
      return html`<gw-field path=${path} label=${f.label} .value=${String(value ?? '')} .message=${this.messages[path] ?? ''}></gw-field>`;
    }
    const label = path.startsWith('target.range') ? `${f.label} (${this.design.sensor.measurand}${this.design.target.signal === 'ac-rms' ? ' rms' : ''})` : f.label;
    return html`<gw-field numeric path=${path} label=${label} .value=${displayValue(f, value, this.design)} .message=${this.messages[path] ?? ''} .hint=${fieldHint(f, this.design)} .note=${this.notes[path] ?? ''}></gw-field>`;
  }

  override render() {
    if (!this.design) return nothing;
    const fields = fieldsFor(this.design);
    const archetype = OPAMP_ARCHETYPES.find((a) => a.spec.name === this.design.opamp.name);
    return SECTIONS.map(([section, title]) => html`
      <fieldset>
        <legend>${title}</legend>
        ${section === 'sensor' ? html`<label class="row choice"><span>Sensor model</span>
          <select data-path="sensor.type" .value=${live(this.design.sensor.type)} @change=${(e: Event) => this.dispatchEvent(new CustomEvent<SensorTypeDetail>('gw-sensor-type', { detail: { type: (e.target as HTMLSelectElement).value as SensorType }, bubbles: true, composed: true }))}>
            ${SENSOR_TYPES.map(([t, l]) => html`<option value=${t} ?selected=${this.design.sensor.type === t}>${l}</option>`)}
          </select></label>` : nothing}
        ${section === 'amplifier' ? html`<label class="row choice"><span>Start from an archetype</span>
          <select data-path="opamp.archetype" .value=${live(archetype?.id ?? '')} @change=${(e: Event) => this.dispatchEvent(new CustomEvent<ArchetypeDetail>('gw-opamp-archetype', { detail: { id: (e.target as HTMLSelectElement).value }, bubbles: true, composed: true }))}>
            <option value="" ?selected=${!archetype}>— figures as entered —</option>
            ${OPAMP_ARCHETYPES.map((a) => html`<option value=${a.id} ?selected=${archetype?.id === a.id}>${a.label}</option>`)}
          </select></label>
          <p class="note">Archetype figures are typical, from memory, for a kind of part, not any product. Replace them with your datasheet's.</p>` : nothing}
        ${fields.filter((f) => f.section === section).map((f) => this._field(f))}
      </fieldset>`);
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-editor': GwEditor; }
  interface HTMLElementEventMap {
    'gw-set': CustomEvent<SetDetail>;
    'gw-sensor-type': CustomEvent<SensorTypeDetail>;
    'gw-opamp-archetype': CustomEvent<ArchetypeDetail>;
  }
}
