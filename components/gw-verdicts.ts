import { LitElement, html, css } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { Verdict } from '../src/index.js';
import { base } from './styles.js';

const WORD = { pass: 'Pass', caution: 'Caution', fail: 'Fail' } as const;

/** The verdict list: pass / caution / fail lines in plain words, each with the figure behind it. */
@customElement('gw-verdicts')
export class GwVerdicts extends LitElement {
  static override styles = [base, css`
    ul { list-style: none; margin: 0; padding: 0; }
    li { display: grid; grid-template-columns: 5.2rem 1fr; gap: 0.5rem; padding: 0.35rem 0; border-bottom: 1px solid var(--gw-line); }
    .tag { font-weight: 700; font-size: 0.8rem; text-transform: uppercase; letter-spacing: 0.03em; border-radius: 3px; padding: 0.1rem 0.3rem; height: fit-content; text-align: center; color: #fff; }
    .pass .tag { background: var(--gw-pass); }
    .caution .tag { background: var(--gw-caution); }
    .fail .tag { background: var(--gw-fail); }
    .title { font-weight: 600; }
    .detail { color: var(--gw-muted); font-size: 0.88rem; }
  `];

  /** Verdict lines, worst first is up to the caller. */
  @property({ attribute: false }) verdicts: Verdict[] = [];

  override render() {
    return html`<ul aria-label="Verdict">
      ${this.verdicts.map((v) => html`<li class=${v.level} data-level=${v.level}>
        <span class="tag">${WORD[v.level]}</span>
        <span><span class="title">${v.title}</span><br /><span class="detail">${v.detail}</span></span>
      </li>`)}
    </ul>`;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-verdicts': GwVerdicts; }
}
