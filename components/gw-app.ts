import { LitElement, html, css, nothing } from 'lit';
import { customElement, state, query } from 'lit/decorators.js';
import { validateDesign, parseDesignText, formatProblems, MAX_DESIGN_BYTES, type Design, type Problem } from '../src/index.js';
import { analyse, SAFETY_CAUTIONS, type Report } from '../src/index.js';
import { DEMOS, demoDesign } from '../src/index.js';
import { FIELDS, GROUP_DEFAULTS, groupDefault, parseField, setPath } from '../src/index.js';
import { archetype } from '../src/index.js';
import { allCharts, waveformChart, type ChartData } from '../src/index.js';
import { schematic, type Schematic } from '../src/index.js';
import { bomCsv, bomRows, type BomRow } from '../src/index.js';
import { keyFigures, waveformFigures, waveformLine, type FigureRow } from '../src/index.js';
import { AUTOSAVE_KEY, autosaveEntry, designFromFragment, fileName, restoreAutosave, serialiseDesign, shareFragment } from '../src/index.js';
import { sensorTemplate } from '../src/index.js';
import type { SensorType } from '../src/index.js';
import { base } from './styles.js';
import type { FieldInputDetail } from './gw-field.js';
import type { SetDetail } from './gw-editor.js';
import './gw-editor.js';
import './gw-verdicts.js';
import './gw-chart.js';
import './gw-schematic.js';
import './gw-parts.js';
import './gw-figures.js';
import './gw-trace.js';

/** The unit engine (mathjs units) loads after the first render so that it does not delay it. */
let unitsLoading: Promise<unknown> | null = null;
const loadUnits = () => (unitsLoading ??= import('../src/model/units-mathjs.js'));

/** Monte Carlo trials run on each edit: enough for a stable histogram, quick enough to keep typing smooth. */
const EDIT_TRIALS = 400;

interface Derived {
  report: Report;
  charts: ChartData[];
  drawing: Schematic | null;
  rows: BomRow[];
  figures: FigureRow[];
  /** The scope view and its figures. */
  wave: ChartData | null;
  waveRows: FigureRow[];
}

/**
 * The application and the one owner of the design. Children get the design and the derived report as
 * properties and send edits up as events; the report is recomputed from the design on each edit.
 */
@customElement('gw-app')
export class GwApp extends LitElement {
  static override styles = [base, css`
    :host { display: block; background: var(--gw-panel); min-height: 100vh; }
    header { background: #22303f; color: #fff; padding: 0.6rem 1rem; display: flex; flex-wrap: wrap; gap: 0.6rem; align-items: center; }
    header h1 { font-size: 1.15rem; margin: 0 1rem 0 0; letter-spacing: 0.02em; }
    header h1 span { color: #e9a268; }
    header button, header select { background: #2f4155; color: #fff; border-color: #8fa3b8; }
    header select { max-width: 100%; }
    header button:hover { background: #3d5570; }
    .safety-banner { background: #fff4e0; border-bottom: 2px solid var(--gw-caution); padding: 0.45rem 1rem; font-size: 0.88rem; }
    .notice { background: #e8f0fb; border-bottom: 1px solid #9db4d6; padding: 0.45rem 1rem; font-size: 0.9rem; }
    .notice.bad { background: #fdeaea; border-color: #d9a0a0; }
    main { display: grid; grid-template-columns: minmax(300px, 430px) 1fr; grid-template-areas: 'editor verdict' 'editor results'; align-items: start; gap: 0 1rem; padding: 1rem; }
    .area-editor { grid-area: editor; }
    .area-verdict { grid-area: verdict; }
    .area-results { grid-area: results; }
    /* On a narrow screen the verdict comes first, then the editor, then the rest. */
    @media (max-width: 860px) { main { grid-template-columns: minmax(0, 1fr); grid-template-areas: 'verdict' 'editor' 'results'; padding: 0.5rem; } .title-input { width: 100%; } }
    .panel { background: var(--gw-paper); border: 1px solid var(--gw-line); border-radius: 6px; padding: 0.7rem 0.9rem; margin-bottom: 1rem; }
    .scope { display: grid; grid-template-columns: minmax(0, 3fr) minmax(0, 2fr); gap: 0.8rem; align-items: start; }
    @media (max-width: 1100px) { .scope { grid-template-columns: minmax(0, 1fr); } }
    .charts { display: grid; grid-template-columns: repeat(auto-fit, minmax(min(320px, 100%), 1fr)); gap: 0.8rem; }
    .scroll { overflow-x: auto; }
    main > section { min-width: 0; }
    .title-input { font-size: 1rem; width: min(28rem, 100%); }
    .share { width: 100%; font-size: 0.8rem; }
    ol.cal li { margin-bottom: 0.3rem; }
    .sheet { display: none; }
    .safety li { margin-bottom: 0.2rem; }
    @media print {
      header, main, .notice, .no-print { display: none !important; }
      :host { background: #fff; }
      .safety-banner { display: none; }
      /* One or two A4 pages: small type, two columns where the content allows. */
      .sheet { display: block; padding: 0; --gw-font-size: 8.5pt; --gw-cell-pad: 0.05rem 0.25rem; font-size: 8.5pt; line-height: 1.3; }
      .sheet h1 { font-size: 13pt; margin: 0 0 0.2rem; }
      .sheet h2 { font-size: 10pt; margin: 0.4rem 0 0.2rem; }
      .sheet p, .sheet ul, .sheet ol { margin: 0.1rem 0; }
      .sheet .grid { display: grid; grid-template-columns: 1fr 1fr; gap: 0 0.6cm; }
      .sheet .wide { grid-column: 1 / -1; }
      .sheet gw-schematic { display: block; max-width: 9.5cm; }
      .sheet section { break-inside: avoid; }
      .sheet .scope-print { display: grid; grid-template-columns: 3fr 2fr; gap: 0 0.3cm; align-items: start; font-size: 7pt; line-height: 1.2; }
      .sheet .safety { border: 1px solid #000; padding: 0.1rem 0.3rem 0.1rem 1.2rem; }
    }
  `];

  @query('#open-file') private _file!: HTMLInputElement;

  @state() private _design: Design = demoDesign();
  @state() private _derived: Derived | null = null;
  @state() private _messages: Record<string, string> = {};
  @state() private _notice: { text: string; bad: boolean } | null = null;
  @state() private _damaged: string | null = null;
  @state() private _shareUrl = '';

  override connectedCallback(): void {
    super.connectedCallback();
    this._restore();
    window.addEventListener('hashchange', this._onHash);
    this.updateComplete.then(() => {
      performance.mark('gw-first-render');
      void loadUnits();
    });
  }

  override disconnectedCallback(): void {
    window.removeEventListener('hashchange', this._onHash);
    super.disconnectedCallback();
  }

  private _clearFragment(): void {
    if (location.hash.startsWith('#d=')) history.replaceState(null, '', location.pathname + location.search);
  }

  private _onHash = (): void => {
    const fromLink = designFromFragment(location.hash);
    if (!fromLink) return;
    if (fromLink.ok) { this._adopt(fromLink.design, 'Opened the design from the link.'); this._clearFragment(); }
    else this._notice = { text: `The link does not carry a usable design, so the current one stays: ${formatProblems(fromLink.problems)}`, bad: true };
  };

  /** Start-up order: a share link, then the autosave, then the first demo. */
  private _restore(): void {
    const fromLink = designFromFragment(location.hash);
    let stored: string | null = null;
    try { stored = localStorage.getItem(AUTOSAVE_KEY); } catch { stored = null; }
    const saved = restoreAutosave(stored);
    if (fromLink?.ok) {
      // Keep it in the browser and drop the fragment, so a reload after later edits keeps the edits.
      this._adopt(fromLink.design, 'Opened the design from the link.', true);
      this._clearFragment();
      return;
    }
    if (saved.kind === 'ok') this._adopt(saved.design, null, false);
    else {
      this._adopt(demoDesign(), null, false);
      if (saved.kind === 'damaged') {
        this._damaged = saved.text;
        this._notice = { text: `The design saved in this browser could not be read (${saved.reason}). Started from the demo; you can download the damaged text below.`, bad: true };
      }
    }
    if (fromLink && !fromLink.ok) this._notice = { text: `The link does not carry a usable design: ${formatProblems(fromLink.problems)}`, bad: true };
  }

  private _adopt(design: Design, notice: string | null, save = true): void {
    this._design = design;
    this._messages = {};
    this._recompute(0);
    clearTimeout(this._spreadTimer);
    this._spreadTimer = window.setTimeout(() => this._recompute(), 50);
    if (notice) this._notice = { text: notice, bad: false };
    if (save) this._autosave();
  }

  private _spreadTimer = 0;

  /**
   * Recomputes the report. The Monte Carlo spread is left to a moment later, so the verdict of the first
   * render (and of a freshly opened design) does not wait for it.
   */
  private _recompute(trials = EDIT_TRIALS): void {
    performance.mark('gw-analyse-start');
    const report = analyse(this._design, { spreadTrials: trials, defaultWaveform: true });
    this._derived = { report, charts: allCharts(report), drawing: schematic(report), rows: bomRows(report), figures: keyFigures(report), wave: waveformChart(report), waveRows: waveformFigures(report) };
    performance.mark('gw-analyse-end');
    performance.measure('gw-analyse', 'gw-analyse-start', 'gw-analyse-end');
  }

  private _autosave(): void {
    try { localStorage.setItem(AUTOSAVE_KEY, autosaveEntry(this._design)); } catch { /* storage full or off: nothing else to do */ }
  }

  /** Applies a change; a change that leaves the design invalid is refused with the problems at their fields. */
  private _apply(next: unknown, fieldPath: string | null): void {
    const v = validateDesign(next);
    if (!v.ok) {
      this._reject(v.problems, fieldPath);
      return;
    }
    const messages = { ...this._messages };
    if (fieldPath) delete messages[fieldPath];
    for (const k of Object.keys(messages)) if (!k.startsWith('(')) delete messages[k];
    this._messages = messages;
    this._design = v.design;
    // The design no longer matches a share link in the address bar.
    this._clearFragment();
    this._shareUrl = '';
    performance.mark('gw-edit-start');
    this._recompute();
    this._autosave();
    this.updateComplete.then(() => {
      performance.mark('gw-edit-end');
      performance.measure('gw-edit', 'gw-edit-start', 'gw-edit-end');
    });
  }

  private _reject(problems: Problem[], fieldPath: string | null): void {
    const messages: Record<string, string> = { ...this._messages };
    for (const p of problems) {
      const known = FIELDS.find((f) => f.path === p.path || p.path.startsWith(`${f.path}.`) || f.path.replace(/\.(\d)$/, '[$1]') === p.path);
      messages[known?.path ?? fieldPath ?? '(design)'] = `${p.message}; the last good design stays in force`;
    }
    this._messages = messages;
    this._notice = { text: `Not applied: ${formatProblems(problems).split('\n').slice(0, 3).join('; ')}`, bad: true };
  }

  private _onFieldInput = async (e: CustomEvent<FieldInputDetail>): Promise<void> => {
    const { path, text } = e.detail;
    const def = FIELDS.find((f) => f.path === path);
    if (!def) return;
    if (def.kind === 'text') {
      this._apply(setPath(this._design, path, text), path);
      return;
    }
    if (text.trim() === '' && def.clearable) {
      this._apply(setPath(this._design, path, undefined), path);
      return;
    }
    let parsed = parseField(def, text, this._design);
    if (!parsed.ok && parsed.pending) {
      await loadUnits();
      parsed = parseField(def, text, this._design);
    }
    if (!parsed.ok) {
      this._messages = { ...this._messages, [path]: `${parsed.message}; the last good value stays in force` };
      return;
    }
    this._apply(setPath(this._design, path, parsed.value), path);
  };

  private _onSet = (e: CustomEvent<SetDetail>): void => {
    const { path, value } = e.detail;
    if (path in GROUP_DEFAULTS) {
      this._apply(setPath(this._design, path, value ? groupDefault(path, this._design) : null), path);
      return;
    }
    this._apply(setPath(this._design, path, value), path);
  };

  private _onSensorType = (e: CustomEvent<{ type: SensorType }>): void => {
    this._apply(sensorTemplate(this._design, e.detail.type), 'sensor.type');
  };

  private _onArchetype = (e: CustomEvent<{ id: string }>): void => {
    const a = archetype(e.detail.id);
    if (a) this._apply({ ...this._design, opamp: { ...a.spec } }, null);
  };

  private _download(text: string, name: string, type: string): void {
    const url = URL.createObjectURL(new Blob([text], { type }));
    const a = document.createElement('a');
    a.href = url;
    a.download = name;
    a.click();
    setTimeout(() => URL.revokeObjectURL(url), 1000);
  }

  private _save(): void {
    this._download(serialiseDesign(this._design), fileName(this._design, 'json'), 'application/json');
  }

  private async _open(e: Event): Promise<void> {
    const input = e.target as HTMLInputElement;
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    if (file.size > MAX_DESIGN_BYTES) {
      this._notice = { text: `${file.name} is larger than 1 MB; a design file is a few kB. The current design stays.`, bad: true };
      return;
    }
    const v = parseDesignText(await file.text());
    if (!v.ok) {
      this._notice = { text: `${file.name} cannot be opened, so the current design stays: ${formatProblems(v.problems).split('\n').slice(0, 6).join('; ')}`, bad: true };
      return;
    }
    this._adopt(v.design, `Opened ${file.name}.`);
  }

  private _share(): void {
    const frag = shareFragment(this._design);
    history.replaceState(null, '', frag);
    this._shareUrl = location.href;
    navigator.clipboard?.writeText(this._shareUrl).then(
      () => { this._notice = { text: 'Share link copied to the clipboard.', bad: false }; },
      () => { this._notice = { text: 'Share link ready below: copy it from the box.', bad: false }; },
    );
  }

  private _loadDemo(e: Event): void {
    const id = (e.target as HTMLSelectElement).value;
    if (id) this._adopt(demoDesign(id), `Loaded the demo "${DEMOS.find((d) => d.id === id)?.label}" (a scenario of our own invention).`);
    (e.target as HTMLSelectElement).value = '';
  }

  private _cautions(): string[] {
    return [...SAFETY_CAUTIONS, ...(this._derived?.report.front.cautions ?? [])];
  }

  private _sheet() {
    const d = this._derived;
    if (!d) return nothing;
    const r = d.report;
    const half = Math.ceil(d.figures.length / 2);
    return html`<div class="sheet" aria-hidden="true">
      <h1>${this._design.title}</h1>
      <p>${this._design.notes}</p>
      <div class="grid">
        <section><h2>Schematic</h2><gw-schematic .drawing=${d.drawing}></gw-schematic></section>
        <section><h2>Safety</h2><ul class="safety">${this._cautions().map((c) => html`<li>${c}</li>`)}</ul>
          <h2>What the scope shows</h2><div class="scope-print"><gw-trace .data=${d.wave}></gw-trace><small>${waveformLine(r)}</small></div></section>
        <section class="wide"><h2>Parts list</h2><gw-parts compact .rows=${d.rows}></gw-parts></section>
        <section class="wide"><h2>Calibration</h2><ol class="cal">${r.calibration.map((c) => html`<li>${c.text}</li>`)}</ol></section>
        <section><h2>Key figures</h2><gw-figures caption="Key figures" .rows=${d.figures.slice(0, half)}></gw-figures></section>
        <section><h2>&nbsp;</h2><gw-figures caption="Key figures, continued" .rows=${d.figures.slice(half)}></gw-figures></section>
      </div>
      <p><small>Made with Gainwright from the design's own figures; check them against your parts before building.</small></p>
    </div>`;
  }

  override render() {
    const d = this._derived;
    const r = d?.report;
    return html`
      <header>
        <h1>Gain<span>wright</span></h1>
        <input class="title-input" aria-label="Design title" .value=${this._design.title}
          @change=${(e: Event) => this._apply(setPath(this._design, 'title', (e.target as HTMLInputElement).value), 'title')} />
        <select aria-label="Load a demo" @change=${this._loadDemo}>
          <option value="">Load a demo…</option>
          ${DEMOS.map((x) => html`<option value=${x.id}>${x.label}</option>`)}
        </select>
        <button @click=${() => this._file.click()}>Open…</button>
        <input id="open-file" type="file" accept=".json,application/json" hidden @change=${this._open} />
        <button @click=${this._save}>Save</button>
        <button @click=${this._share}>Share link</button>
        <button @click=${() => r && this._download(bomCsv(r), fileName(this._design, 'csv'), 'text/csv')}>Parts CSV</button>
        <button @click=${() => window.print()}>Print build sheet</button>
      </header>
      <div class="safety-banner" role="note"><strong>Safety:</strong> ${this._cautions().join(' ')}</div>
      ${this._notice ? html`<div class="notice ${this._notice.bad ? 'bad' : ''}" role="status">${this._notice.text}
        ${this._damaged ? html` <button @click=${() => this._download(this._damaged!, 'damaged-autosave.txt', 'text/plain')}>Download the damaged text</button>` : nothing}
        <button aria-label="Dismiss" @click=${() => { this._notice = null; }}>×</button></div>` : nothing}
      ${this._shareUrl ? html`<div class="notice no-print"><label>Share link <input class="share" readonly .value=${this._shareUrl} @focus=${(e: Event) => (e.target as HTMLInputElement).select()} /></label></div>` : nothing}
      <main>
        <section class="area-verdict" aria-label="Verdict">
          <div class="panel" id="verdict"><h2>Verdict</h2><gw-verdicts .verdicts=${r?.verdicts ?? []}></gw-verdicts></div>
        </section>
        <section class="area-editor" aria-label="Design">
          <gw-editor .design=${this._design} .messages=${this._messages}
            @gw-field-input=${this._onFieldInput} @gw-set=${this._onSet}
            @gw-sensor-type=${this._onSensorType} @gw-opamp-archetype=${this._onArchetype}></gw-editor>
        </section>
        <section class="area-results" aria-label="Results">
          <div class="panel"><h2>Schematic</h2><gw-schematic .drawing=${d?.drawing ?? null}></gw-schematic></div>
          <div class="panel scroll" id="scope"><h2>What the scope shows</h2><div class="scope">
            ${d?.wave ? html`<gw-chart data-chart="waveform" .data=${d.wave}></gw-chart>` : nothing}
            <gw-figures caption="Waveform figures" .rows=${d?.waveRows ?? []}></gw-figures></div></div>
          <div class="panel"><h2>Plots</h2><div class="charts">${(d?.charts ?? []).map((c) => html`<gw-chart data-chart=${c.id} .data=${c}></gw-chart>`)}</div></div>
          <div class="panel scroll"><h2>Parts list</h2><gw-parts .rows=${d?.rows ?? []} .alternatives=${r?.stage?.alternatives ?? []} .chosen=${r?.stage?.chosen ?? 0} @gw-set=${this._onSet}></gw-parts></div>
          <div class="panel scroll"><h2>Figures</h2><gw-figures caption="Figures" .rows=${d?.figures ?? []}></gw-figures></div>
          <div class="panel"><h2>Findings</h2><ul>${(r?.warnings ?? []).map((w) => html`<li data-code=${w.code}><strong>${w.level}</strong>: ${w.message}</li>`)}</ul></div>
          <div class="panel"><h2>Calibration</h2><ol class="cal">${(r?.calibration ?? []).map((c) => html`<li>${c.text}</li>`)}</ol></div>
        </section>
      </main>
      ${this._sheet()}
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-app': GwApp; }
}
