import { LitElement, html, css, nothing } from 'lit';
import { customElement, state, query } from 'lit/decorators.js';
import { validateDesign, parseDesignText, formatProblems, MAX_DESIGN_BYTES, type Design, type Problem } from '../src/index.js';
import { analyse, SAFETY_CAUTIONS, type Report } from '../src/index.js';
import { DEMOS, demoDesign } from '../src/index.js';
import { FIELDS, GROUP_DEFAULTS, readField, setPath } from '../src/index.js';
import { spiceNetlist } from '../src/index.js';
import { archetype } from '../src/index.js';
import { allCharts, type ChartData } from '../src/index.js';
import { schematic, type Schematic } from '../src/index.js';
import { bomCsv, bomRows, type BomRow } from '../src/index.js';
import { keyFigures, type FigureRow } from '../src/index.js';
import { AUTOSAVE_KEY, autosaveEntry, designFromFragment, fileName, restoreAutosave, serialiseDesign, shareFragment } from '../src/index.js';
import { sensorTemplate } from '../src/index.js';
import { base } from './styles.js';
import type { FieldInputDetail } from './gw-field.js';
import type { ArchetypeDetail, SensorTypeDetail, SetDetail } from './gw-editor.js';
import type { DemoDetail, ToolbarActionDetail } from './gw-toolbar.js';
import './gw-editor.js';
import './gw-verdicts.js';
import './gw-chart.js';
import './gw-schematic.js';
import './gw-parts.js';
import './gw-figures.js';
import './gw-toolbar.js';
import './gw-build-sheet.js';

/** The unit engine (mathjs units) loads after the first render so that it does not delay it. */
let unitsLoading: Promise<unknown> | null = null;
const loadUnits = () => (unitsLoading ??= import('../src/model/units-mathjs.js'));


interface Derived {
  report: Report;
  charts: ChartData[];
  drawing: Schematic | null;
  rows: BomRow[];
  figures: FigureRow[];
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
    header gw-toolbar { flex: 1 1 20rem; min-width: 0; }
    .skip { position: absolute; left: 0.5rem; top: -3rem; background: #fff; color: var(--gw-ink); padding: 0.3rem 0.6rem; border-radius: 4px; z-index: 2; }
    .skip:focus { top: 0.5rem; }
    .sr-only { position: absolute; width: 1px; height: 1px; overflow: hidden; clip: rect(0 0 0 0); white-space: nowrap; }
    .panel:focus { outline: none; }
    .panel:focus-visible { outline: 3px solid var(--gw-focus); }
    .safety-banner { background: #fff4e0; border-bottom: 2px solid var(--gw-caution); padding: 0.45rem 1rem; font-size: 0.88rem; }
    .notice { background: #e8f0fb; border-bottom: 1px solid #9db4d6; padding: 0.45rem 1rem; font-size: 0.9rem; }
    .notice.bad { background: #fdeaea; border-color: #d9a0a0; }
    main { display: grid; grid-template-columns: minmax(300px, 470px) 1fr; grid-template-areas: 'editor verdict' 'editor results'; align-items: start; gap: 0 1rem; padding: 1rem; }
    .area-editor { grid-area: editor; }
    .area-verdict { grid-area: verdict; }
    .area-results { grid-area: results; }
    /* On a narrow screen the verdict comes first, then the editor, then the rest. */
    @media (max-width: 860px) { main { grid-template-columns: minmax(0, 1fr); grid-template-areas: 'verdict' 'editor' 'results'; padding: 0.5rem; } }
    .panel { background: var(--gw-paper); border: 1px solid var(--gw-line); border-radius: 6px; padding: 0.7rem 0.9rem; margin-bottom: 1rem; }
    .charts { display: grid; grid-template-columns: repeat(auto-fit, minmax(min(320px, 100%), 1fr)); gap: 0.8rem; }
    .scroll { overflow-x: auto; }
    main > section { min-width: 0; }
    .share { width: 100%; font-size: 0.8rem; }
    ol.cal li { margin-bottom: 0.3rem; }
    .sheet { display: none; }
    .safety li { margin-bottom: 0.2rem; }
    @media print {
      header, main, .notice, .no-print, .skip { display: none !important; }
      :host { background: #fff; min-height: 0; }
      .safety-banner { display: none; }
      .sheet { display: block; }
    }
  `];

  @query('#open-file') private _file!: HTMLInputElement;
  @query('#verdict') private _verdictPanel!: HTMLElement | null;

  @state() private _design: Design = demoDesign();
  @state() private _derived: Derived | null = null;
  @state() private _messages: Record<string, string> = {};
  @state() private _notes: Record<string, string> = {};
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
    this._notes = {};
    this._recompute(0);
    this._scheduleSpread();
    if (notice) this._notice = { text: notice, bad: false };
    if (save) this._autosave();
  }

  private _spreadTimer = 0;

  /** Runs the Monte Carlo spread with the design's own trial count a moment after the quick report. */
  private _scheduleSpread(): void {
    clearTimeout(this._spreadTimer);
    this._spreadTimer = window.setTimeout(() => this._recompute(), 50);
  }

  /**
   * Recomputes the report. The Monte Carlo spread is left to a moment later, so the verdict of the first
   * render (and of a freshly opened design) does not wait for it.
   */
  private _recompute(trials = this._design.analysis.spreadTrials): void {
    performance.mark('gw-analyse-start');
    const report = analyse(this._design, { spreadTrials: trials });
    this._derived = { report, charts: allCharts(report), drawing: schematic(report), rows: bomRows(report), figures: keyFigures(report) };
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
    this._recompute(0);
    this._scheduleSpread();
    this._autosave();
    this.updateComplete.then(() => {
      performance.mark('gw-edit-end');
      performance.measure('gw-edit', 'gw-edit-start', 'gw-edit-end');
    });
  }

  private _reject(problems: Problem[], fieldPath: string | null): void {
    const messages: Record<string, string> = { ...this._messages };
    for (const p of problems) {
      // The field itself first, else the field holding it (a group switch only when nothing closer matches).
      const known = FIELDS.find((f) => f.path === p.path) ?? FIELDS.find((f) => p.path.startsWith(`${f.path}.`) || f.path.replace(/\.(\d)$/, '[$1]') === p.path);
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
    let read = readField(def, text, this._design);
    if (!read.ok && read.pending) {
      await loadUnits();
      read = readField(def, text, this._design);
    }
    if (!read.ok) {
      this._messages = { ...this._messages, [path]: `${read.message}; the last good value stays in force` };
      return;
    }
    const notes = { ...this._notes };
    delete notes[path];
    if (read.readAs) notes[path] = read.readAs;
    this._notes = notes;
    this._apply(setPath(this._design, read.path, read.value), path);
  };

  private _onSet = (e: CustomEvent<SetDetail>): void => {
    const { path, value } = e.detail;
    if (path in GROUP_DEFAULTS) {
      this._apply(setPath(this._design, path, value ? GROUP_DEFAULTS[path] : null), path);
      return;
    }
    this._apply(setPath(this._design, path, value), path);
  };

  private _onSensorType = (e: CustomEvent<SensorTypeDetail>): void => {
    this._apply(sensorTemplate(this._design, e.detail.type), 'sensor.type');
  };

  private _onArchetype = (e: CustomEvent<ArchetypeDetail>): void => {
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

  private _onDemo = (e: CustomEvent<DemoDetail>): void => {
    const id = e.detail.id;
    this._adopt(demoDesign(id), `Loaded the demo "${DEMOS.find((d) => d.id === id)?.label}" (a scenario of our own invention).`);
  };

  private _onToolbar = (e: CustomEvent<ToolbarActionDetail>): void => {
    const r = this._derived?.report;
    switch (e.detail.action) {
      case 'open': this._file.click(); break;
      case 'save': this._save(); break;
      case 'share': this._share(); break;
      case 'parts-csv': if (r) this._download(bomCsv(r), fileName(this._design, 'csv'), 'text/csv'); break;
      case 'spice': {
        const net = r ? spiceNetlist(r) : null;
        if (net) this._download(net, fileName(this._design, 'cir'), 'text/plain');
        else this._notice = { text: 'No SPICE netlist: the design has no working stage to simulate.', bad: true };
        break;
      }
      case 'print': window.print(); break;
    }
  };

  /** Dismissing a notice puts focus on the verdict, not on the page body. */
  private _dismiss(): void {
    this._notice = null;
    void this.updateComplete.then(() => this._verdictPanel?.focus());
  }

  private _skip(e: Event): void {
    e.preventDefault();
    this._verdictPanel?.focus();
  }

  /** One line for the live region: what the verdict now says, announced when it changes. */
  private _verdictLine(r: Report | undefined): string {
    if (!r) return '';
    const count = (l: string) => r.verdicts.filter((v) => v.level === l).length;
    const worst = r.verdicts[0];
    return `Verdict: ${count('fail')} fail, ${count('caution')} caution, ${count('pass')} pass${worst && worst.level !== 'pass' ? `; first: ${worst.title}` : ''}.`;
  }

  private _cautions(): string[] {
    return [...SAFETY_CAUTIONS, ...(this._derived?.report.front.cautions ?? [])];
  }

  override render() {
    const d = this._derived;
    const r = d?.report;
    return html`
      <a class="skip" href="#verdict" @click=${this._skip}>Skip to the verdict</a>
      <header>
        <h1>Gain<span>wright</span></h1>
        <gw-toolbar .demos=${DEMOS.map((x) => [x.id, x.label] as [string, string])} @gw-toolbar-action=${this._onToolbar} @gw-demo=${this._onDemo}></gw-toolbar>
        <input id="open-file" type="file" accept=".json,application/json" hidden @change=${this._open} />
      </header>
      <div class="safety-banner" role="note"><strong>Safety:</strong> ${this._cautions().join(' ')}</div>
      ${this._notice ? html`<div class="notice ${this._notice.bad ? 'bad' : ''}" role="status">${this._notice.text}
        ${this._damaged ? html` <button @click=${() => this._download(this._damaged!, 'damaged-autosave.txt', 'text/plain')}>Download the damaged text</button>` : nothing}
        <button aria-label="Dismiss" @click=${this._dismiss}>×</button></div>` : nothing}
      <div class="sr-only" role="status" aria-live="polite" id="verdict-live">${this._verdictLine(r)}</div>
      ${this._shareUrl ? html`<div class="notice no-print"><label>Share link <input class="share" readonly .value=${this._shareUrl} @focus=${(e: Event) => (e.target as HTMLInputElement).select()} /></label></div>` : nothing}
      <main>
        <section class="area-verdict" aria-label="Verdict">
          <div class="panel" id="verdict" tabindex="-1"><h2>Verdict</h2><gw-verdicts .verdicts=${r?.verdicts ?? []}></gw-verdicts></div>
        </section>
        <section class="area-editor" aria-label="Design">
          <gw-editor .design=${this._design} .messages=${this._messages} .notes=${this._notes}
            @gw-field-input=${this._onFieldInput} @gw-set=${this._onSet}
            @gw-sensor-type=${this._onSensorType} @gw-opamp-archetype=${this._onArchetype}></gw-editor>
        </section>
        <section class="area-results" aria-label="Results">
          <div class="panel"><h2>Schematic</h2><gw-schematic .drawing=${d?.drawing ?? null}></gw-schematic></div>
          <div class="panel"><h2>Plots</h2><div class="charts">${(d?.charts ?? []).map((c) => html`<gw-chart data-chart=${c.id} .data=${c}></gw-chart>`)}</div></div>
          <div class="panel scroll"><h2>Parts list</h2><gw-parts .rows=${d?.rows ?? []} .alternatives=${r?.stage?.alternatives ?? []} .chosen=${r?.stage?.chosen ?? 0} @gw-set=${this._onSet}></gw-parts></div>
          <div class="panel scroll"><h2>Figures</h2><gw-figures caption="Figures" .rows=${d?.figures ?? []}></gw-figures></div>
          <div class="panel"><h2>Findings</h2><ul>${(r?.warnings ?? []).map((w) => html`<li data-code=${w.code}><strong>${w.level}</strong>: ${w.message}</li>`)}</ul></div>
          <div class="panel"><h2>Calibration</h2><ol class="cal">${(r?.calibration ?? []).map((c) => html`<li>${c.text}</li>`)}</ol></div>
        </section>
      </main>
      <gw-build-sheet class="sheet" aria-hidden="true" .report=${r ?? null} .drawing=${d?.drawing ?? null} .rows=${d?.rows ?? []} .figures=${d?.figures ?? []} .cautions=${this._cautions()}></gw-build-sheet>
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-app': GwApp; }
}
