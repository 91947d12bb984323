import { LitElement, html, css, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { BomRow, FigureRow, Report, ReportWords, Schematic, TradeResult } from '../src/index.js';
import { errorBudgetRows, pageText, sheetStatus, trimmerStarts, tradeNotes, tradeSweeps, tradeTable } from '../src/index.js';
import { base } from './styles.js';
import './gw-schematic.js';
import './gw-parts.js';
import './gw-figures.js';
import './gw-ranges.js';

const WORD = { pass: 'Pass', caution: 'Caution', fail: 'Fail', info: 'Note' } as const;

/**
 * The printed build sheet: verdict and findings first, then schematic, parts, trimmer start positions,
 * calibration, the error budget by term, key figures and the cautions. The status line sits in the head of
 * a table that wraps the sheet, so that print repeats it on every page: a failed design says so on each.
 * Shown only in print (the app hides it on screen).
 */
@customElement('gw-build-sheet')
export class GwBuildSheet extends LitElement {
  static override styles = [base, css`
    :host { display: block; --gw-font-size: 8pt; --gw-cell-pad: 0 0.2rem; font-size: 8pt; line-height: 1.3; color: #000; background: #fff; }
    table.page { width: 100%; border-collapse: collapse; }
    table.page > thead { display: table-header-group; }
    table.page > thead th, table.page > tbody > tr > td { border: 0; padding: 0; font-size: inherit; color: inherit; font-weight: normal; }
    .status { border: 1.5pt solid #000; padding: 0.1rem 0.4rem; margin-bottom: 0.25rem; font-weight: 700; text-align: left; }
    .status.failed { border-width: 3pt; font-size: 10pt; }
    h1 { font-size: 13pt; margin: 0 0 0.2rem; }
    h2 { font-size: 10pt; margin: 0.4rem 0 0.15rem; }
    p, ul, ol { margin: 0.1rem 0; }
    ul.verdicts { list-style: none; padding: 0; }
    ul.verdicts li, ul.findings li { margin: 0.05rem 0; }
    .lvl { display: inline-block; min-width: 3.2rem; font-weight: 700; }
    .grid { display: grid; grid-template-columns: 1fr 1fr; gap: 0 0.6cm; }
    section { break-inside: avoid; }
    gw-schematic { display: block; width: 100%; --gw-schematic-max-height: 7cm; }
    ol { padding-left: 1.2rem; }
    .safety { border: 1px solid #000; padding: 0.1rem 0.3rem 0.1rem 1.2rem; }
    table.budget td:nth-child(2) { white-space: nowrap; font-variant-numeric: tabular-nums; }
    h3 { font-size: 9pt; margin: 0.3rem 0 0.1rem; }
    section.trade td, section.trade th { font-variant-numeric: tabular-nums; white-space: nowrap; }
  `];

  /** The report to print. */
  @property({ attribute: false }) report: Report | null = null;
  /** Its schematic, parts rows and key figures, as the app already derived them. */
  @property({ attribute: false }) drawing: Schematic | null = null;
  @property({ attribute: false }) rows: BomRow[] = [];
  @property({ attribute: false }) figures: FigureRow[] = [];
  /** The report's words (verdicts, findings, calibration steps, cautions), as the app already derived them. */
  @property({ attribute: false }) words: ReportWords | null = null;
  /** The turns trade, when the app has worked it out (its panel was opened): printed after the figures. */
  @property({ attribute: false }) trade: TradeResult | null = null;

  override render() {
    const r = this.report;
    const w = this.words;
    if (!r || !w) return nothing;
    const status = sheetStatus(r);
    const budget = errorBudgetRows(r);
    const trims = trimmerStarts(r);
    const half = Math.ceil(this.figures.length / 2);
    return html`<table class="page" data-failed=${status.failed ? 'true' : 'false'}>
      <thead><tr><th><div class="status ${status.failed ? 'failed' : ''}">${pageText(r.design.title)}: ${status.line}</div></th></tr></thead>
      <tbody><tr><td>
        <h1>${pageText(r.design.title)}</h1>
        ${r.design.notes ? html`<p>${pageText(r.design.notes)}</p>` : nothing}
        <div class="grid">
          <section><h2>Verdict</h2><ul class="verdicts">${w.verdicts.map((v) => html`<li><span class="lvl">${WORD[v.level]}</span> ${v.title}</li>`)}</ul></section>
          <section><h2>Findings</h2>${w.findings.length ? html`<ul class="findings">${w.findings.map((f) => html`<li><span class="lvl">${WORD[f.level]}</span> ${f.message}</li>`)}</ul>` : html`<p>None.</p>`}</section>
        </div>
        <section><h2>Schematic</h2><gw-schematic .drawing=${this.drawing}></gw-schematic></section>
        ${r.ranges?.ok ? html`<section><h2>Ranges</h2><gw-ranges compact .report=${r}></gw-ranges></section>` : nothing}
        <section><h2>Safety</h2><ul class="safety">${w.cautions.map((c) => html`<li>${c}</li>`)}</ul></section>
        <section><h2>Parts list</h2><gw-parts compact .rows=${this.rows}></gw-parts></section>
        ${w.calibration.length ? html`<section><h2>Calibration</h2><ol>${w.calibration.map((c) => html`<li>${c.text}</li>`)}</ol></section>` : nothing}
        <div class="grid">
          ${budget.length ? html`<section><h2>Error budget at the range end</h2><table class="budget" aria-label="Error budget"><tbody>${budget.map((b) => html`<tr><td>${b.term}</td><td>${b.value}</td><td>${b.after}</td></tr>`)}</tbody></table></section>` : nothing}
          ${trims.length ? html`<section><h2>Trimmer start positions</h2><table aria-label="Trimmer start positions"><tbody>${trims.map((t) => html`<tr><td>${t.ref}</td><td>${t.value}</td><td>${t.role}</td><td>${t.setting}</td></tr>`)}</tbody></table></section>` : nothing}
        </div>
        <!-- What the app adds beside the design's own figures: the scope trace, the blank readings table. -->
        <slot></slot>
        <div class="grid">
          <section><h2>Key figures</h2><gw-figures caption="Key figures" .rows=${this.figures.slice(0, half)}></gw-figures></section>
          <section><h2>&nbsp;</h2><gw-figures caption="Key figures, continued" .rows=${this.figures.slice(half)}></gw-figures></section>
        </div>
        ${this.renderTrade(r)}
        <p><small>Made with Gainwright from the design's own figures; check them against your parts before building.</small></p>
      </td></tr></tbody>
    </table>`;
  }

  /** The trade as a table per sweep (the design's own rows marked), with what the table leaves out. */
  private renderTrade(r: Report) {
    const t = this.trade;
    const table = tradeTable(t, r.design.sensor.measurand);
    if (!t || !table) return nothing;
    return html`<section class="trade"><h2>What the winding buys</h2>
      ${tradeSweeps(t).map((s) => html`<h3>${s.title}</h3>
        <table aria-label=${s.title}><thead><tr><th></th>${table.head.map((h) => html`<th>${h}</th>`)}<th></th></tr></thead>
        <tbody>${table.rows.filter((row) => row.sweep === s.sweep).map((row) => html`<tr><td>${row.current ? '*' : ''}</td>${row.cells.map((c) => html`<td>${c}</td>`)}<td>${row.why ?? ''}</td></tr>`)}</tbody></table>`)}
      <p><small>* the design as it is. ${tradeNotes(t).join(' ')}</small></p>
    </section>`;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-build-sheet': GwBuildSheet; }
}
