import { LitElement, html, css, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import { formatEng, probeSheetRows, residualChart, sensorReadingsLines, trimLines, type Report } from '../src/index.js';
import { base } from './styles.js';
import type { ReadingsDetail } from './gw-readings.js';
import type { SetDetail } from './gw-editor.js';
import './gw-readings.js';
import './gw-chart.js';

/**
 * The bench loop: readings taken on the bench, and what the design makes of them. Three modes:
 * `sensor` (readings of the sensor alone; their fit can set its sensitivity and zero), `probe` (readings of
 * the built probe; the trim from them) and `sheet` (the blank readings table for the printed sheet).
 *
 * @fires gw-set - a design change, `{ path, value }` (`sensor.readings`, `sensor.readings.use`, `probeReadings`).
 */
@customElement('gw-bench')
export class GwBench extends LitElement {
  static override styles = [base, css`
    :host { display: block; }
    ul { margin: 0.4rem 0; padding-left: 1.2rem; }
    li { margin-bottom: 0.25rem; }
    .note { color: var(--gw-muted); font-size: 0.85rem; }
    gw-chart { --gw-chart-height: 200px; max-width: 34rem; }
    .blank td { height: 1.3em; }
  `];

  /** What to show: sensor readings, built-probe readings, or the printed blank table. */
  @property() mode: 'sensor' | 'probe' | 'sheet' = 'probe';
  /** The report of the design in force. */
  @property({ attribute: false }) report: Report | null = null;

  private _set(path: string, value: unknown): void {
    this.dispatchEvent(new CustomEvent<SetDetail>('gw-set', { detail: { path, value }, bubbles: true, composed: true }));
  }

  private _sensor(r: Report) {
    const s = r.design.sensor;
    const m = s.measurand;
    if (s.type !== 'voltage-output' && s.type !== 'hall-gap-core') {
      return html`<p class="note">Bench readings can set the sensitivity and zero of a voltage-output sensor or a Hall sensor in a gapped core; a current transformer or a shunt is set by its parts.</p>`;
    }
    const readings = s.readings ?? null;
    const points = readings?.points ?? [];
    const sr = r.readings;
    const marks: Record<number, string> = {};
    if (sr) {
      for (const i of sr.fit.outliers) marks[i] = 'outlier';
      for (const i of [...sr.fit.beyondLow, ...sr.fit.beyondHigh]) marks[i] = 'beyond the linear region';
    }
    const chart = sr ? residualChart(sr.fit, points, m) : null;
    return html`
      <p class="note">Pass known ${m === 'A' ? 'currents' : `values of ${m}`} through the sensor and note its output; the fit gives the sensitivity and zero with their uncertainty, and where the sensor stops being linear.</p>
      <gw-readings caption="Sensor readings" .measurand=${m} .points=${points} .marks=${marks}
        @gw-readings=${(e: CustomEvent<ReadingsDetail>) => { e.stopPropagation(); this._set('sensor.readings', e.detail.points.length ? { use: readings?.use ?? false, points: e.detail.points } : null); }}></gw-readings>
      ${readings ? html`<label><input type="checkbox" data-path="sensor.readings.use" .checked=${readings.use}
        @change=${(e: Event) => this._set('sensor.readings.use', (e.target as HTMLInputElement).checked)} />
        Take the sensor's sensitivity and zero (and their tolerances) from these readings</label>` : nothing}
      ${sr ? html`<ul class="fit">${sensorReadingsLines(sr, points, m).map((l) => html`<li>${l}</li>`)}</ul>` : nothing}
      ${chart ? html`<gw-chart data-chart="residuals" .data=${chart}></gw-chart>` : nothing}`;
  }

  /** Where a trimmer sat while the probe readings were taken: as given, else its parts-list setting. */
  private _settingOf(r: Report, ref: string, fallback: number): number {
    return r.design.probeSettings?.find(([x]) => x === ref)?.[1] ?? fallback;
  }

  private _setSetting(r: Report, ref: string, text: string): void {
    const v = Number(text.replace(',', '.').replace('%', '').trim()) / 100;
    if (!(v >= 0 && v <= 1)) return;
    const rest = (r.design.probeSettings ?? []).filter(([x]) => x !== ref);
    this._set('probeSettings', [...rest, [ref, v]]);
  }

  private _probe(r: Report) {
    const m = r.design.sensor.measurand;
    const points = r.design.probeReadings ?? [];
    const trimmers = (r.stage?.parts ?? []).filter((p) => p.kind === 'trimmer');
    return html`
      <p class="note">After building, with the trimmers where the parts list puts them, read the output at zero and at one or two known ${m === 'A' ? 'currents' : `values of ${m}`}: the trim below says which trimmer to turn, how far, in which order, and what to read after each turn.</p>
      <gw-readings caption="Readings of the built probe" .measurand=${m} .points=${points}
        @gw-readings=${(e: CustomEvent<ReadingsDetail>) => { e.stopPropagation(); this._set('probeReadings', e.detail.points); }}></gw-readings>
      ${trimmers.length ? html`<p class="settings">Where the trimmers sat while reading (change after turning, for the next round):
        ${trimmers.map((p) => html`<label>${p.ref} <input size="5" data-setting=${p.ref} .value=${(this._settingOf(r, p.ref, p.setting ?? 0.5) * 100).toFixed(1)}
          @change=${(e: Event) => this._setSetting(r, p.ref, (e.target as HTMLInputElement).value)} /> %</label> `)}</p>` : nothing}
      ${r.trim ? html`<ul class="trim">${trimLines(r.trim, r.stage?.parts ?? [], m).map((l) => html`<li>${l}</li>`)}</ul>` : nothing}`;
  }

  private _sheet(r: Report) {
    const m = r.design.sensor.measurand;
    return html`<table class="blank" aria-label="Readings of the built probe (to fill in)">
      <thead><tr><th>${m} applied</th><th>Expected</th><th>Read, as built</th><th>Read, trimmed</th></tr></thead>
      <tbody>${probeSheetRows(r).map((row) => html`<tr><td class="num">${formatEng(row.measurand, m, 3)}</td><td class="num">${formatEng(row.expected, row.unit, 4)}</td><td></td><td></td></tr>`)}</tbody></table>`;
  }

  override render() {
    const r = this.report;
    if (!r) return nothing;
    return this.mode === 'sensor' ? this._sensor(r) : this.mode === 'sheet' ? this._sheet(r) : this._probe(r);
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-bench': GwBench; }
}
