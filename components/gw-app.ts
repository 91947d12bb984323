import { LitElement, html, css, nothing } from 'lit';
import { customElement, state, query } from 'lit/decorators.js';
import { validateDesign, parseDesignText, MAX_DESIGN_BYTES, tooLargeMessage, type Design, type Problem } from '../src/index.js';
import { analyse, completeReport, reportWords, SAFETY_CAUTIONS, type Report, type ReportWords } from '../src/index.js';
import { DEMOS, demoDesign } from '../src/index.js';
import { FIELDS, GROUP_DEFAULTS, groupDefault, groupOff, readField, setPath } from '../src/index.js';
import { archetype } from '../src/index.js';
import { allCharts, waveformChart, type ChartData } from '../src/index.js';
import { schematic, type Schematic } from '../src/index.js';
import { bomRows, type BomRow } from '../src/index.js';
import { closedLoopTradeRows, keyFigures, waveformFigures, waveformLine, type FigureRow } from '../src/index.js';
import { decodeDesignBytes, designFromFragment, fileName, problemWords, serialiseDesign, shareFragment } from '../src/index.js';
import { sensorTemplate } from '../src/index.js';
import { formatEng } from '../src/index.js';
import { base } from './styles.js';
import { PersistController } from './persist-controller.js';
import type { ToolbarActionDetail } from './gw-toolbar.js';
import './gw-editor.js';
import './gw-verdicts.js';
import './gw-chart.js';
import './gw-schematic.js';
import './gw-parts.js';
import './gw-figures.js';
import './gw-toolbar.js';
import { tradeSweep, type TradeResult } from '../src/index.js'; // issue 19
// Op-amps side by side and supply choices (issue 18).
import { ComparisonController } from './comparison-controller.js';
// Issue 23: the panels around the verdict (comparisons, supplies, kit, range switch, trade, bench readings,
// printed sheet) and the exporters load on demand, each its own chunk.
import { PANELS_AFTER_FIRST_RENDER, loadPanel, onDemandCore } from './on-demand.js';
import { loadChartJs } from './chart-controller.js';

/** The unit engine (mathjs units) loads after the first render so that it does not delay it. */
let unitsLoading: Promise<unknown> | null = null;
const loadUnits = () => (unitsLoading ??= import('../src/model/units-mathjs.js'));


/** A line above the work area; `undo` offers to undo the replacement it reports, `undoChoice` the supply row adopted. */
interface Notice { text: string; bad: boolean; undo?: boolean; undoChoice?: boolean }

interface Derived {
  report: Report;
  /** The report's words: verdicts, findings, calibration steps, cautions. */
  words: ReportWords;
  charts: ChartData[];
  drawing: Schematic | null;
  rows: BomRow[];
  figures: FigureRow[];
  /** The scope view and its figures. */
  wave: ChartData | null;
  waveRows: FigureRow[];
  /** A closed-loop Hall sensor's turns trade (issue #20; empty for another sensor). */
  trade: FigureRow[];
  /**
   * Issue 23: the Monte Carlo spread and the starting waveform are still being worked out; meanwhile the spread
   * plot and the scope view of the design before are shown, marked busy.
   */
  pending: boolean;
}

/**
 * The first step (issue 23): everything the verdict, the findings and the transfer plot need, from the report
 * without the spread and the default waveform (throws only on a fault of ours). The other plots and the scope
 * view of `before` are kept until the second step replaces them, so their elements are not rebuilt, and not
 * redrawn before the verdict paints, on every edit.
 */
function deriveQuick(design: Design, before: Derived | null): Derived {
  performance.mark('gw-analyse-start');
  const report = analyse(design, { spreadTrials: 0 });
  // The transfer plot follows the edit at once; the other plots of the design before stay for the moment until
  // the second step redraws them, so that an edit draws one plot before the verdict paints, not five.
  const fresh = allCharts(report);
  const transfer = fresh.filter((c) => c.id === 'transfer');
  const charts = before ? [...transfer, ...before.charts.filter((c) => c.id !== 'transfer')] : fresh;
  const own = !!report.waveform;
  const derived: Derived = {
    report, words: reportWords(report), charts, drawing: schematic(report), rows: bomRows(report), figures: keyFigures(report),
    wave: own ? waveformChart(report) : before?.wave ?? null, waveRows: own ? waveformFigures(report) : before?.waveRows ?? [],
    trade: closedLoopTradeRows(report), pending: true,
  };
  performance.mark('gw-analyse-end');
  performance.measure('gw-analyse', 'gw-analyse-start', 'gw-analyse-end');
  return derived;
}

/** The second step (issue 23): the report completed with the spread and the starting waveform, and what shows them. */
function deriveFull(design: Design, quick: Derived): Derived {
  performance.mark('gw-complete-start');
  const report = completeReport(design, quick.report);
  const derived: Derived = { ...quick, report, charts: allCharts(report), figures: keyFigures(report), wave: waveformChart(report), waveRows: waveformFigures(report), pending: false };
  performance.mark('gw-complete-end');
  performance.measure('gw-complete', 'gw-complete-start', 'gw-complete-end');
  return derived;
}

/**
 * Runs `job` once the frame in progress has painted (a frame, then a task); a hidden page paints no frames, so
 * a timer runs it in any case. Returns a function that cancels it.
 */
function afterPaint(job: () => void): () => void {
  let done = false;
  const go = () => { if (!done) { done = true; job(); } };
  const frame = requestAnimationFrame(() => setTimeout(go, 0));
  const timer = setTimeout(go, 250);
  return () => { done = true; cancelAnimationFrame(frame); clearTimeout(timer); };
}

/** Runs `job` once Chart.js is loaded (or could not be) and the frame after has painted; returns a canceller. */
function afterChartJs(job: () => void): () => void {
  let cancel: (() => void) | null = null;
  let off = false;
  loadChartJs().catch(() => undefined).then(() => { if (!off) cancel = afterPaint(job); });
  return () => { off = true; cancel?.(); };
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
    header gw-toolbar { flex: 1 1 auto; min-width: 0; }
    @media (min-width: 1000px) { header gw-toolbar { flex: 1 0 auto; } }
    header select { max-width: 10rem; background: #2f4155; color: #fff; border: 1px solid #8fa3b8; border-radius: 4px; padding: 0.3rem 0.4rem; }
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
    .scope { display: grid; grid-template-columns: minmax(0, 3fr) minmax(0, 2fr); gap: 0.8rem; align-items: start; }
    @media (max-width: 1100px) { .scope { grid-template-columns: minmax(0, 1fr); } }
    .charts { display: grid; grid-template-columns: repeat(auto-fit, minmax(min(320px, 100%), 1fr)); gap: 0.8rem; }
    .scroll { overflow-x: auto; }
    summary h2.inline { display: inline; }
    main > section { min-width: 0; }
    .share { width: 100%; font-size: 0.8rem; }
    ol.cal li { margin-bottom: 0.3rem; }
    .sheet { display: none; }
    .safety li { margin-bottom: 0.2rem; }
    @media print {
      header, main, .notice, .no-print, .skip { display: none !important; }
      :host { background: #fff; min-height: 0; }
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
  @query('#verdict') private _verdictPanel!: HTMLElement | null;

  @state() private _design: Design = demoDesign();
  @state() private _derived: Derived | null = null;
  /** Refusals in a person's words, by the field path they are shown at. */
  @state() private _messages: Record<string, string> = {};
  @state() private _notice: Notice | null = null;
  @state() private _notes: Record<string, string> = {};
  @state() private _shareUrl = '';
  /** Edits not yet saved to a file (a replacement asks first). */
  @state() private _unsaved = false;
  /** The design the last replacement put aside: Undo brings it back. */
  @state() private _undo: { design: Design; title: string } | null = null;
  /** Issue 18: the design before a supply row was adopted, offered back while the design is still the one it made. */
  @state() private _choiceUndo: { before: Design; after: Design } | null = null;
  /** A replacement waiting for the person's yes, because the design in force has unsaved edits. */
  @state() private _confirm: { design: Design; what: string; done: string } | null = null;

  // --- issue 19: the turns trade, worked out only while its panel is open (a stage solve per point).
  @state() private _trade: TradeResult | null = null;
  @state() private _tradeFor: Design | null = null;
  @state() private _tradeOpen = false;
  private _tradeTimer = 0;

  /** A range switch position's own netlist, downloaded (issue 19). */
  private _onRangeSpice = async (e: HTMLElementEventMap['gw-range-spice']): Promise<void> => {
    const r = this._derived?.report;
    let positionNetlist: Awaited<ReturnType<typeof onDemandCore>>['positionNetlist'];
    try { ({ positionNetlist } = await onDemandCore()); } catch (err) { this._loadFault(err); return; }
    const net = r ? positionNetlist(r, e.detail.position) : null;
    if (net) this._download(net, fileName(this._design, 'cir').replace(/\.cir$/, `-range-${e.detail.position}.cir`), 'text/plain');
    else this._notice = { text: `No SPICE netlist for range ${e.detail.position}: that position has no working stage.`, bad: true };
  };
  // --- end issue 19

  private readonly _persist = new PersistController(this);
  /** The op-amp comparison and supply choices (and the person's own op-amps): rows computed by the core. */
  private readonly _compare = new ComparisonController(this);
  /** Edits run one after another, in the order they were made, even while the unit engine is loading. */
  private _queue: Promise<void> = Promise.resolve();
  /** Issue 23: cancels the second step (spread and starting waveform) waiting for the paint of the first. */
  private _cancelComplete: (() => void) | null = null;
  /** Issue 23: the last completed derivation, which the printed sheet shows (it is not on screen). */
  @state() private _complete: Derived | null = null;
  /** Issue 23: the results (schematic, plots, parts, findings…) join the page once the verdict has painted. */
  @state() private _resultsShown = false;

  /** The design in force (read by the persistence controller). */
  get currentDesign(): Design { return this._design; }
  /** The report of the design in force (read by the comparison controller). */
  get currentReport(): Report | null { return this._derived?.report ?? null; }

  override connectedCallback(): void {
    super.connectedCallback();
    this._restore();
    window.addEventListener('hashchange', this._onHash);
    window.addEventListener('beforeprint', this._onBeforePrint);
    this.updateComplete.then(() => {
      performance.mark('gw-first-render');
      // Once the verdict has painted: the results; once Chart.js is there too (the plots draw first), the unit
      // engine and the panels every page shows (issue 23).
      afterPaint(() => {
        this._resultsShown = true;
        afterChartJs(() => {
          void loadUnits();
          for (const tag of PANELS_AFTER_FIRST_RENDER) loadPanel(tag).catch((e: unknown) => this._loadFault(e));
        });
      });
    });
  }

  override disconnectedCallback(): void {
    window.removeEventListener('hashchange', this._onHash);
    window.removeEventListener('beforeprint', this._onBeforePrint);
    this._cancelComplete?.();
    clearTimeout(this._tradeTimer);
    super.disconnectedCallback();
  }

  // --- issue 23: loading on demand, and the report's second step
  /** The range switch's panel loads when a design has one. */
  protected override willUpdate(): void {
    if (this._derived?.report.ranges?.ok) loadPanel('gw-ranges').catch((e: unknown) => this._loadFault(e));
  }

  /** A part of the app that could not be fetched (the server gone): said, and the design stays as it is. */
  private _loadFault(e: unknown): void {
    const why = String(e instanceof Error ? e.message : e).replace(/\s+/g, ' ').slice(0, 160);
    this._notice = { text: `A part of Gainwright could not be loaded (${why}); the design in force is kept. Reload the page to try again.`, bad: true };
  }

  /** The second step for the design in force, at once (before printing: the sheet must be complete). */
  private _completeNow(): void {
    const d = this._derived;
    if (!d?.pending) return;
    this._cancelComplete?.();
    this._cancelComplete = null;
    try {
      const full = deriveFull(this._design, d);
      this._derived = full;
      this._complete = full;
    } catch (e) { this._fault(e); }
    // An edit's whole cost, every plot redrawn included (read by `npm run bench` beside `gw-edit`).
    const start = this._editStart;
    this._editStart = null;
    if (start !== null) void this.updateComplete.then(() => performance.measure('gw-edit-all', { start, end: performance.now() }));
  }

  /** When the edit whose second step is awaited began (performance.now()). */
  private _editStart: number | null = null;

  private _onBeforePrint = (): void => this._completeNow();
  // --- end issue 23

  private _clearFragment(): void {
    if (location.hash.startsWith('#d=')) history.replaceState(null, '', location.pathname + location.search);
  }

  private _onHash = (): void => {
    const fromLink = designFromFragment(location.hash);
    if (!fromLink) return;
    this._clearFragment();
    if (fromLink.ok) this._requestReplace(fromLink.design, 'replaced by a shared link', 'Opened the design from the link.');
    else this._notice = { text: `The link does not carry a usable design, so the current one stays: ${this._problemList(fromLink.problems)}`, bad: true };
  };

  /** Start-up order: a share link, then the autosave, then the first demo. */
  private _restore(): void {
    const saved = this._persist.restore();
    const fromLink = designFromFragment(location.hash);
    // The fragment goes at once: a reload must not repeat a link (good or bad) over later edits.
    this._clearFragment();
    if (fromLink?.ok) {
      if (saved.kind === 'ok') this._persist.remember(saved.design, 'replaced by a shared link');
      if (this._setDesign(fromLink.design)) {
        this._unsaved = true;
        this._persist.save(this._design, true);
        if (saved.kind === 'ok') this._undo = { design: saved.design, title: saved.design.title };
        this._notice = { text: 'Opened the design from the link.', bad: false, undo: saved.kind === 'ok' };
        return;
      }
    }
    if (saved.kind === 'ok') {
      if (this._setDesign(saved.design)) this._unsaved = saved.unsaved;
      else {
        this._persist.keepDamaged(JSON.stringify(saved.design, null, 2), 'the saved design could not be analysed');
        this._setDesign(demoDesign());
      }
    } else this._setDesign(demoDesign());
    if (fromLink && !fromLink.ok) this._notice = { text: `The link does not carry a usable design: ${this._problemList(fromLink.problems)}`, bad: true };
  }

  /**
   * Makes `design` the one in force, if it can be analysed: the last line of defence. A fault of ours while
   * analysing keeps the design in force as it was and says so, instead of leaving an empty page.
   */
  private _setDesign(design: Design): boolean {
    let derived: Derived;
    try {
      derived = deriveQuick(design, this._derived);
    } catch (e) {
      this._fault(e);
      return false;
    }
    this._design = design;
    this._derived = derived;
    // Issue 23: the Monte Carlo spread and the starting waveform once the verdict has painted (the design's own
    // trial count, analysis.spreadTrials); a newer design cancels the older one's.
    this._cancelComplete?.();
    const run = () => {
      this._cancelComplete = null;
      if (this._derived === derived) this._completeNow();
    };
    // At start-up, after the first plots too: they draw from the first step's data, and the second step adds to them.
    this._cancelComplete = this._resultsShown ? afterPaint(run) : afterChartJs(run);
    this._scheduleTrade();
    return true;
  }

  // --- issue 19: the trade follows the design a moment after each change, while its panel is open.
  private _scheduleTrade(): void {
    clearTimeout(this._tradeTimer);
    if (!this._tradeOpen || this._tradeFor === this._design) return;
    this._tradeTimer = window.setTimeout(() => {
      const design = this._design;
      try { this._trade = tradeSweep(design); this._tradeFor = design; } catch (e) { this._fault(e); }
    }, 60);
  }

  private _onTradeToggle(e: Event): void {
    this._tradeOpen = (e.target as HTMLDetailsElement).open;
    if (this._tradeOpen) loadPanel('gw-trade').catch((err: unknown) => this._loadFault(err)); // issue 23
    this._scheduleTrade();
  }

  /** Adopts a point of the trade: its fields applied together, as one edit. */
  private _onTradeAdopt = (e: HTMLElementEventMap['gw-trade-adopt']): void => {
    const { set, point } = e.detail;
    this._enqueue(() => {
      const before = this._design;
      let next: unknown = before;
      for (const s of set) next = setPath(next as Design, s.path, s.value);
      this._apply(next, null);
      if (this._design !== before) {
        const what = 'gap' in point ? `${point.turns} turn${point.turns === 1 ? '' : 's'} and a ${formatEng(point.gap, 'm')} gap` : `${point.turns} secondary turns and a ${formatEng(point.burden, 'Ω')} burden`;
        this._notice = { text: `Now built with ${what}.`, bad: false };
      }
    });
  };
  // --- end issue 19

  private _fault(e: unknown): void {
    const why = String(e instanceof Error ? e.message : e).replace(/\s+/g, ' ').slice(0, 160);
    this._notice = { text: `Gainwright could not analyse that design (a fault of its own: ${why}), so the design in force stays as it was. Save it and report the fault.`, bad: true };
  }

  /** Problems as one line in a person's words (at most six). */
  private _problemList(problems: Problem[]): string {
    return problems.slice(0, 6).map((p) => problemWords(p, this._design)).join('; ');
  }

  /**
   * Replaces the whole design (a demo, a file, a link, a recent design). The design in force goes to the
   * recent designs first and Undo brings it back; unsaved edits are asked about before anything happens.
   */
  private _requestReplace(design: Design, why: string, done: string): void {
    if (this._unsaved) this._confirm = { design, what: why, done };
    else this._replace(design, why, done);
  }

  private _replace(design: Design, why: string, done: string): void {
    const old = this._design;
    this._confirm = null;
    if (!this._setDesign(design)) return;
    this._persist.remember(old, why);
    this._messages = {};
    this._shareUrl = '';
    this._unsaved = false;
    this._persist.save(this._design, false);
    this._undo = { design: old, title: old.title };
    this._notice = { text: done, bad: false, undo: true };
  }

  private _undoReplace(): void {
    const u = this._undo;
    if (!u) return;
    this._replace(u.design, 'replaced by Undo', `Brought back "${u.title}".`);
  }

  /** Applies a change; a change that leaves the design invalid is refused, in the words of the field edited. */
  private _apply(next: unknown, fieldPath: string | null): void {
    const v = validateDesign(next);
    if (!v.ok) {
      this._reject(v.problems, fieldPath);
      return;
    }
    performance.mark('gw-edit-start');
    const start = performance.now();
    if (!this._setDesign(v.design)) return;
    this._editStart = start;
    const messages = { ...this._messages };
    if (fieldPath) delete messages[fieldPath];
    for (const k of Object.keys(messages)) if (!k.startsWith('(')) delete messages[k];
    this._messages = messages;
    if (this._notice?.bad) this._notice = null;
    this._unsaved = true;
    // The design no longer matches a share link in the address bar.
    this._clearFragment();
    this._shareUrl = '';
    this._persist.save(this._design, true);
    this.updateComplete.then(() => {
      performance.mark('gw-edit-end');
      performance.measure('gw-edit', 'gw-edit-start', 'gw-edit-end');
    });
  }

  /**
   * A refused edit: a typed field keeps what was typed, marked invalid, with the reason at it; a switch or a
   * choice goes back to the value in force and the reason is said above. Either way every field involved is
   * named by its label, with the fix.
   */
  private _reject(problems: Problem[], fieldPath: string | null): void {
    const words = `${problems.slice(0, 4).map((p) => problemWords(p, this._design)).join('; ')}. The value in force stays.`;
    const def = fieldPath ? FIELDS.find((f) => f.path === fieldPath) : undefined;
    const typed = !!def && (def.kind === 'number' || def.kind === 'text');
    // A fresh messages object either way: the editor renders again, and a switch or choice goes back to the
    // value in force (its binding compares with what the control shows now).
    this._messages = typed ? { ...this._messages, [fieldPath!]: words } : { ...this._messages };
    this._notice = typed && fieldPath !== 'title' ? null : { text: `Not applied: ${words}`, bad: true };
    this.requestUpdate();
  }

  /** Runs edits strictly in order; a fault in one is said and never stops the ones after it. */
  private _enqueue(job: () => void | Promise<void>): void {
    this._queue = this._queue.then(job).catch((e: unknown) => this._fault(e));
  }

  private _onFieldInput = (e: HTMLElementEventMap['gw-field-input']): void => {
    const { path, text } = e.detail;
    this._enqueue(async () => {
      const def = FIELDS.find((f) => f.path === path);
      if (!def) return;
      if (def.kind === 'text') return this._apply(setPath(this._design, path, text), path);
      if (text.trim() === '' && def.clearable) return this._apply(setPath(this._design, path, undefined), path);
      let read = readField(def, text, this._design);
      if (!read.ok && read.pending) {
        await loadUnits();
        read = readField(def, text, this._design);
      }
      if (!read.ok) {
        this._messages = { ...this._messages, [path]: `${def.label}: ${read.message}; the value in force stays` };
        return;
      }
      // How the value was read, when it was not typed in the unit the field shows.
      const notes = { ...this._notes };
      delete notes[path];
      if (read.readAs) notes[path] = read.readAs;
      this._notes = notes;
      this._apply(setPath(this._design, read.path, read.value), path);
    });
  };

  private _onSet = (e: HTMLElementEventMap['gw-set']): void => {
    const { path, value } = e.detail;
    this._enqueue(() => {
      if (path in GROUP_DEFAULTS) this._apply(setPath(this._design, path, value ? groupDefault(path, this._design) : groupOff(path)), path);
      else this._apply(setPath(this._design, path, value), path);
    });
  };

  private _onSensorType = (e: HTMLElementEventMap['gw-sensor-type']): void => {
    const type = e.detail.type;
    this._enqueue(() => this._apply(sensorTemplate(this._design, type), 'sensor.type'));
  };

  private _onArchetype = (e: HTMLElementEventMap['gw-opamp-archetype']): void => {
    const a = archetype(e.detail.id);
    if (a) this._enqueue(() => this._apply({ ...this._design, opamp: { ...a.spec } }, null));
  };

  // Picking a row of a comparison makes it the design's: an edit like any other, undone by editing back.
  private _onAdoptOpAmp = (e: HTMLElementEventMap['gw-adopt-opamp']): void => {
    const opamp = e.detail.opamp;
    this._enqueue(() => this._apply({ ...this._design, opamp: { ...opamp } }, null));
  };

  // --- issue 18, part 3: a supply row (its supply, zero and op-amp) is one edit, and Undo takes it back.
  private _onAdoptSupply = (e: HTMLElementEventMap['gw-adopt-supply']): void => {
    const { kind } = e.detail;
    this._enqueue(async () => {
      // Issue 23: the supply choices' core loads on demand (it is loaded already when a row can be picked).
      const { SUPPLY_WORDS, optionDesign } = await onDemandCore();
      const before = this._design;
      this._apply(optionDesign(before, e.detail), null);
      if (this._design === before) return;
      this._choiceUndo = { before, after: this._design };
      this._notice = { text: `Now: ${SUPPLY_WORDS[kind].toLowerCase()}${kind === 'zero' ? ` (${formatEng(this._design.target.zero, 'V', 3)})` : ''}.`, bad: false, undoChoice: true };
    });
  };

  private _undoChoice(): void {
    const u = this._choiceUndo;
    if (!u || this._design !== u.after) return;
    this._enqueue(() => {
      this._apply(u.before, null);
      this._choiceUndo = null;
      this._notice = { text: 'Back to the design before that choice.', bad: false };
    });
  }
  // --- end issue 18, part 3

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
    this._unsaved = false;
    this._persist.save(this._design, false);
  }

  private async _open(e: Event): Promise<void> {
    const input = e.target as HTMLInputElement;
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    const name = file.name.replace(/[\u0000-\u001f\u007f-\u009f]/g, ' ').slice(0, 80);
    if (file.size > MAX_DESIGN_BYTES) {
      this._notice = { text: `${name} ${tooLargeMessage(MAX_DESIGN_BYTES)}. The current design stays.`, bad: true };
      return;
    }
    // Decoded as the CLI decodes it: UTF-8 with or without a byte-order mark, or UTF-16.
    const text = decodeDesignBytes(new Uint8Array(await file.arrayBuffer()));
    const v = text.ok ? parseDesignText(text.text) : text;
    if (!v.ok) {
      this._notice = { text: `${name} cannot be opened, so the current design stays: ${this._problemList(v.problems)}`, bad: true };
      return;
    }
    this._requestReplace(v.design, `replaced by the file ${name}`, `Opened ${name}.`);
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

  private _onDemo = (e: HTMLElementEventMap['gw-demo']): void => {
    const id = e.detail.id;
    const demo = DEMOS.find((d) => d.id === id);
    if (demo) this._requestReplace(demoDesign(id), `replaced by the demo "${demo.label}"`, `Loaded the demo "${demo.label}" (a scenario of our own invention).`);
  };

  private _loadRecent(e: Event): void {
    const select = e.target as HTMLSelectElement;
    const entry = this._persist.history[Number(select.value)];
    select.value = '';
    if (entry) this._requestReplace(entry.design, 'replaced by a recent design', `Opened "${entry.design.title}" from Recent designs.`);
  }

  private _takeOtherTab(): void {
    const theirs = this._persist.otherTab;
    this._persist.clearOtherTab();
    if (theirs) this._requestReplace(theirs, 'replaced by the design of another tab', `Opened the design "${theirs.title}" saved by another tab.`);
  }

  /** The notices above the work area, each with what can be done about it. */
  private _notices() {
    const p = this._persist;
    const dismiss = (f: () => void) => html`<button aria-label="Dismiss" @click=${f}>×</button>`;
    return html`
      ${p.storage !== 'ok' ? html`<div class="notice bad" role="alert" data-notice="storage">This browser is not keeping your design (its storage is ${p.storage === 'full' ? 'full' : 'turned off'}): your edits will be lost when this page closes. Save it to a file. <button @click=${this._save}>Save</button></div>` : nothing}
      ${p.damaged ? html`<div class="notice bad" role="alert" data-notice="damaged">The design saved in this browser could not be read (${p.damaged.reason}). Gainwright started from the demo; the damaged text is kept until you dismiss this.
        <button @click=${() => this._download(p.damaged!.text, 'damaged-autosave.txt', 'text/plain')}>Download the damaged text</button> ${dismiss(() => p.dismissDamaged())}</div>` : nothing}
      ${p.otherTab ? html`<div class="notice" role="status" data-notice="other-tab">Another tab saved a different design ("${p.otherTab.title}"). This tab keeps its own; the other one is kept in Recent designs.
        <button @click=${this._takeOtherTab}>Open the other tab's design here</button> ${dismiss(() => p.clearOtherTab())}</div>` : nothing}
      ${this._confirm ? html`<div class="notice" role="alertdialog" aria-label="Replace the design?" data-notice="confirm">"${this._design.title}" has edits not saved to a file. Replace it (${this._confirm.what.replace(/^replaced by /, 'with ')})? It stays in Recent designs either way.
        <button @click=${() => this._replace(this._confirm!.design, this._confirm!.what, this._confirm!.done)}>Replace</button>
        <button @click=${() => { this._confirm = null; }}>Keep mine</button></div>` : nothing}
      ${this._notice ? html`<div class="notice ${this._notice.bad ? 'bad' : ''}" role="status" data-notice="message">${this._notice.text}
        ${this._undo && this._notice.undo ? html` <button @click=${this._undoReplace}>Undo</button>` : nothing}
        ${this._notice.undoChoice && this._choiceUndo?.after === this._design ? html` <button @click=${this._undoChoice}>Undo</button>` : nothing}
        ${dismiss(() => this._dismiss())}</div>` : nothing}
    `;
  }

  private _onToolbar = (e: CustomEvent<ToolbarActionDetail>): void => {
    const r = this._derived?.report;
    switch (e.detail.action) {
      case 'open': this._file.click(); break;
      case 'save': this._save(); break;
      case 'share': this._share(); break;
      case 'parts-csv': {
        // Issue 23: the CSV writer loads on demand.
        const design = this._design;
        if (r) onDemandCore().then(({ bomCsv }) => this._download(bomCsv(r), fileName(design, 'csv'), 'text/csv'), (err: unknown) => this._loadFault(err));
        break;
      }
      case 'spice': {
        // Issue 23: the netlist writer loads on demand.
        const design = this._design;
        onDemandCore().then(({ spiceNetlist }) => {
          const net = r ? spiceNetlist(r) : null;
          if (net) this._download(net, fileName(design, 'cir'), 'text/plain');
          else this._notice = { text: 'No SPICE netlist: the design has no working stage to simulate.', bad: true };
        }, (err: unknown) => this._loadFault(err));
        break;
      }
      case 'print': void this._print(); break;
    }
  };

  /** Issue 23: the printed sheet loads on demand and shows the completed report. */
  private async _print(): Promise<void> {
    try { await loadPanel('gw-build-sheet'); } catch (e) { this._loadFault(e); return; }
    this._completeNow();
    await this.updateComplete;
    window.print();
  }

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
    const verdicts = this._derived?.words.verdicts ?? [];
    const count = (l: string) => verdicts.filter((v) => v.level === l).length;
    const worst = verdicts[0];
    return `Verdict: ${count('fail')} fail, ${count('caution')} caution, ${count('pass')} pass${worst && worst.level !== 'pass' ? `; first: ${worst.title}` : ''}.`;
  }

  private _cautions(): string[] {
    return this._derived?.words.cautions ?? [...SAFETY_CAUTIONS];
  }

  /**
   * The printed sheet (issue 23): it shows the last completed derivation, so that an edit does not wait for a
   * view nobody sees on screen; printing completes the design in force first.
   */
  private _sheet() {
    const c = this._complete;
    const r = c?.report;
    return html`<gw-build-sheet class="sheet" aria-hidden="true" .report=${r ?? null} .drawing=${c?.drawing ?? null} .rows=${c?.rows ?? []} .figures=${c?.figures ?? []} .words=${c?.words ?? null} .trade=${this._tradeFor === this._design ? this._trade : null}>
        ${r ? html`<section><h2>What the scope shows</h2><div class="scope-print"><gw-trace .data=${c?.wave ?? null}></gw-trace><small>${waveformLine(r)}</small></div></section>
        <section><h2>Readings of the built probe</h2><gw-bench mode="sheet" .report=${r}></gw-bench></section>` : nothing}
      </gw-build-sheet>`;
  }

  override render() {
    const d = this._derived;
    const r = d?.report;
    return html`
      <a class="skip" href="#verdict" @click=${this._skip}>Skip to the verdict</a>
      <header>
        <h1>Gain<span>wright</span></h1>
        <gw-toolbar .demos=${DEMOS.map((x) => [x.id, x.label] as [string, string])} @gw-toolbar-action=${this._onToolbar} @gw-demo=${this._onDemo}></gw-toolbar>
        <select aria-label="Recent designs" @change=${this._loadRecent} ?disabled=${!this._persist.history.length}>
          <option value="">Recent designs…</option>
          ${this._persist.history.map((h, i) => html`<option value=${i}>${h.design.title} (${h.why}${h.savedAt ? `, ${h.savedAt.slice(0, 16).replace('T', ' ')}` : ''})</option>`)}
        </select>
        <input id="open-file" type="file" accept=".json,application/json" hidden @change=${this._open} />
      </header>
      <div class="safety-banner" role="note"><strong>Safety:</strong> ${this._cautions().join(' ')}</div>
      ${this._notices()}
      <div class="sr-only" role="status" aria-live="polite" id="verdict-live">${this._verdictLine(r)}</div>
      ${this._shareUrl ? html`<div class="notice no-print"><label>Share link <input class="share" readonly .value=${this._shareUrl} @focus=${(e: Event) => (e.target as HTMLInputElement).select()} /></label></div>` : nothing}
      <main>
        <section class="area-verdict" aria-label="Verdict">
          <div class="panel" id="verdict" tabindex="-1"><h2>Verdict</h2><gw-verdicts .verdicts=${d?.words.verdicts ?? []}></gw-verdicts></div>
        </section>
        <section class="area-editor" aria-label="Design">
          <gw-editor .design=${this._design} .messages=${this._messages} .notes=${this._notes}
            @gw-field-input=${this._onFieldInput} @gw-set=${this._onSet}
            @gw-sensor-type=${this._onSensorType} @gw-opamp-archetype=${this._onArchetype}></gw-editor>
          <div class="panel" id="kit"><h2>Resistor kit</h2><gw-kit-editor .kit=${this._design.target.kit ?? null} @gw-set=${this._onSet}></gw-kit-editor></div>
        </section>
        <section class="area-results" aria-label="Results" aria-busy=${this._resultsShown ? 'false' : 'true'}>${this._resultsShown ? this._results() : nothing}</section>
      </main>
      ${this._sheet()}
    `;
  }

  /** The results beside the verdict: comparisons, schematic, scope, plots, range switch, trade, parts, figures, findings, calibration, bench readings. */
  private _results() {
    const d = this._derived;
    const r = d?.report;
    return html`
          <div class="panel" id="compare-opamps"><gw-opamp-compare .rows=${this._compare.rows} .own=${this._compare.own} .message=${this._compare.message}
            .measurand=${this._design.sensor.measurand} ?battery=${!!this._design.supply.battery} ?open=${this._compare.open.opamps}
            @gw-panel-toggle=${(e: HTMLElementEventMap['gw-panel-toggle']) => this._compare.setOpen(e.detail.panel, e.detail.open)}
            @gw-own-opamps=${(e: HTMLElementEventMap['gw-own-opamps']) => this._compare.edit(e.detail)} @gw-adopt-opamp=${this._onAdoptOpAmp}></gw-opamp-compare></div>
          <div class="panel" id="compare-supplies"><gw-supply-options .options=${this._compare.supplies} .measurand=${this._design.sensor.measurand} ?open=${this._compare.open.supplies}
            @gw-panel-toggle=${(e: HTMLElementEventMap['gw-panel-toggle']) => this._compare.setOpen(e.detail.panel, e.detail.open)} @gw-adopt-supply=${this._onAdoptSupply}></gw-supply-options></div>
          <div class="panel"><h2>Schematic</h2><gw-schematic .drawing=${d?.drawing ?? null}></gw-schematic></div>
          <div class="panel scroll" id="scope" aria-busy=${d?.pending ? 'true' : 'false'}><h2>What the scope shows</h2><div class="scope">
            ${d?.wave ? html`<gw-chart data-chart="waveform" .data=${d.wave}></gw-chart>` : nothing}
            <gw-figures caption="Waveform figures" .rows=${d?.waveRows ?? []}></gw-figures></div></div>
          <div class="panel" id="plots" aria-busy=${d?.pending ? 'true' : 'false'}><h2>Plots</h2><div class="charts">${(d?.charts ?? []).map((c) => html`<gw-chart data-chart=${c.id} .data=${c}></gw-chart>`)}</div></div>
          ${r?.ranges?.ok ? html`<div class="panel scroll" id="ranges"><h2>Range switch</h2><gw-ranges .report=${r} @gw-range-spice=${this._onRangeSpice}></gw-ranges></div>` : nothing}
          <details class="panel" id="trade" @toggle=${this._onTradeToggle}><summary><h2 class="inline">Turns and gap: what each one buys</h2></summary>
            <gw-trade .trade=${this._trade} .measurand=${this._design.sensor.measurand} ?pending=${this._tradeFor !== this._design} @gw-trade-adopt=${this._onTradeAdopt}></gw-trade></details>
          <div class="panel scroll"><h2>Parts list</h2><gw-parts .rows=${d?.rows ?? []} .alternatives=${r?.stage?.alternatives ?? []} .chosen=${r?.stage?.chosen ?? 0} @gw-set=${this._onSet}></gw-parts></div>
          <div class="panel scroll"><h2>Figures</h2><gw-figures caption="Figures" .rows=${d?.figures ?? []}></gw-figures></div>
          ${d?.trade.length ? html`<div class="panel scroll" id="turns-trade"><h2>Winding turns: the trade</h2><gw-figures caption="Winding turns trade" .rows=${d.trade}></gw-figures></div>` : nothing}
          <div class="panel"><h2>Findings</h2><ul>${(d?.words.findings ?? []).map((w) => html`<li data-code=${w.code}><strong>${w.level}</strong>: ${w.message}</li>`)}</ul></div>
          <div class="panel"><h2>Calibration</h2><ol class="cal">${(d?.words.calibration ?? []).map((c) => html`<li>${c.text}</li>`)}</ol></div>
          <div class="panel" id="probe-readings"><h2>Measured on the built probe</h2><gw-bench mode="probe" .report=${r ?? null} @gw-set=${this._onSet}></gw-bench></div>
          <div class="panel" id="sensor-readings"><h2>Sensor from bench readings</h2><gw-bench mode="sensor" .report=${r ?? null} @gw-set=${this._onSet}></gw-bench></div>`;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-app': GwApp; }
}
