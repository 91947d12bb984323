import { LitElement, html, css, nothing } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import { base } from './styles.js';

export interface FieldInputDetail {
  path: string;
  text: string;
}

/**
 * One labelled design field. Shows the value as text and reports what the person typed; the app parses it
 * and sends back a message when it cannot be used.
 *
 * @fires gw-field-input - on change (Enter or leaving the field), with `{ path, text }`.
 */
@customElement('gw-field')
export class GwField extends LitElement {
  static override styles = [base, css`
    :host { display: block; }
    label { display: grid; grid-template-columns: minmax(7rem, 1fr) minmax(6rem, 9rem); gap: 0.4rem; align-items: center; }
    .name { font-size: 0.9rem; }
    input[type='text'] { width: 100%; box-sizing: border-box; padding: 0.2rem 0.35rem; border: 1px solid var(--gw-line); border-radius: 3px; }
    input[aria-invalid='true'] { border-color: var(--gw-fail); background: #fff3f3; }
    .msg { color: var(--gw-fail); font-size: 0.8rem; margin: 0.1rem 0 0.3rem; }
    .hint { color: var(--gw-muted); font-size: 0.75rem; }
    .read-as { color: var(--gw-accent); font-size: 0.78rem; }
  `];

  @state() private _draft: string | null = null;

  /** Dotted design path this field edits. */
  @property() path = '';
  /** Label in the trade's words. */
  @property() label = '';
  /** The current value, written for a person. */
  @property() value = '';
  /** A message to show at the field (the value could not be used). */
  @property() message = '';
  /** Short help under the field. */
  @property() hint = '';
  /** How the last value typed was read, when it was typed otherwise than the field shows it ("read as 1.5 mm"). */
  @property() note = '';
  /** A number field: offers the decimal keypad on touch screens (text fields such as the title do not). */
  @property({ type: Boolean }) numeric = false;

  override willUpdate(changed: Map<string, unknown>): void {
    // A message keeps what was typed on screen, marked invalid; once there is no message, the field shows
    // the value in force again (a new good value, or the refusal withdrawn), never a typed text not in force.
    if ((changed.has('value') || changed.has('message') || changed.has('note')) && !this.message) this._draft = null;
  }

  private _commit(e: Event): void {
    const text = (e.target as HTMLInputElement).value;
    this._draft = text;
    this.dispatchEvent(new CustomEvent<FieldInputDetail>('gw-field-input', { detail: { path: this.path, text }, bubbles: true, composed: true }));
  }

  override render() {
    const id = `f-${this.path.replace(/\./g, '-')}`;
    return html`
      <label for=${id}>
        <span class="name">${this.label}</span>
        <input id=${id} type="text" inputmode=${this.numeric ? 'decimal' : 'text'} spellcheck="false" autocomplete="off"
          data-path=${this.path}
          .value=${this._draft ?? this.value}
          aria-invalid=${this.message ? 'true' : 'false'}
          aria-describedby=${`${id}-msg`}
          @change=${this._commit} />
      </label>
      <div id=${`${id}-msg`} class=${this.message ? 'msg' : 'hint'} role=${this.message ? 'alert' : 'note'}>${this.message || this.hint}</div>
      ${this.note && !this.message ? html`<div class="read-as" role="status">read as ${this.note}</div>` : nothing}
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-field': GwField; }
  interface HTMLElementEventMap { 'gw-field-input': CustomEvent<FieldInputDetail>; }
}
