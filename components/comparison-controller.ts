import type { ReactiveController, ReactiveControllerHost } from 'lit';
import {
  MAX_OPAMP_LIST_BYTES, MAX_OPAMPS, OPAMP_LIST_KEY, problemWords,
  type ComparisonRow, type Design, type OpAmpSpec, type Problem, type Report, type SupplyOption,
} from '../src/index.js';
// Issue 23: the comparisons, supply choices and the op-amp list file load on demand.
import { onDemandCore, type OnDemandCore } from './on-demand.js';

/** What the controller reads from its host, which stays the one owner of the design. */
export interface ComparisonHost extends ReactiveControllerHost {
  readonly currentDesign: Design;
  readonly currentReport: Report | null;
}

/** A problem of an op-amp list in a person's words: an entry's field by the editor's label (`op-amp 2: GBW …`). */
function listProblemWords(p: Problem): string {
  const m = /^opamps\[(\d+)\]\.(.+)$/.exec(p.path);
  return m ? `op-amp ${Number(m[1]) + 1}: ${problemWords({ ...p, path: `opamp.${m[2]}` })}` : problemWords(p);
}

/** Which panel: the op-amps side by side, or the supply choices. */
export type ComparisonPanel = 'opamps' | 'supplies';

/** An edit of the person's own op-amps, sent up by `<gw-opamp-compare>`. */
export type OwnOpAmpsAction = { action: 'keep' } | { action: 'remove'; index: number } | { action: 'open'; file: File } | { action: 'save' };

/**
 * The comparisons for `<gw-app>`: the person's own op-amps (kept in the browser under OPAMP_LIST_KEY, saved
 * and opened as a `gainwright-opamps` file), and the rows of each open panel, recomputed a moment after the
 * design changes (each row is a full report, so nothing is computed while a panel is closed). The host
 * renders the rows; the core computes them.
 */
export class ComparisonController implements ReactiveController {
  /** The person's own op-amps. */
  own: OpAmpSpec[] = [];
  /** Rows of the op-amp comparison, or null until computed for the design in force. */
  rows: ComparisonRow[] | null = null;
  /** The supply choices, or null until computed. */
  supplies: SupplyOption[] | null = null;
  /** Panels the person has opened. */
  readonly open: Record<ComparisonPanel, boolean> = { opamps: false, supplies: false };
  /** A line about the own list (opened, refused, not kept). */
  message: { text: string; bad: boolean } | null = null;

  private readonly host: ComparisonHost;
  private computed: Record<ComparisonPanel, Design | null> = { opamps: null, supplies: null };
  private ownVersion = 0;
  private rowsOwnVersion = -1;
  private timer = 0;
  // --- issue 23: the on-demand core, and the stored list read once it is there.
  private core: OnDemandCore | null = null;
  private stored: string | null = null;

  /** The on-demand core; the first time, the op-amps kept in the browser are read with it. */
  private async ready(): Promise<OnDemandCore> {
    const core = await onDemandCore();
    if (!this.core) {
      this.core = core;
      if (this.stored) {
        const v = core.parseOpAmpListText(this.stored);
        if (v.ok) { this.own = v.opamps; this.ownVersion++; }
        else this.message = { text: 'The op-amps kept in this browser could not be read, so the list starts empty.', bad: true };
        this.stored = null;
      }
    }
    return core;
  }

  private loadFault(e: unknown): void {
    this.message = { text: `The comparisons could not be loaded (${String(e instanceof Error ? e.message : e).slice(0, 120)}). Reload the page to try again.`, bad: true };
    this.host.requestUpdate();
  }
  // --- end issue 23

  constructor(host: ComparisonHost) {
    this.host = host;
    host.addController(this);
  }

  hostConnected(): void {
    // Read now, parsed when a panel first needs it (issue 23).
    try { this.stored = localStorage.getItem(OPAMP_LIST_KEY); } catch { /* storage off: the list starts empty */ }
  }

  hostDisconnected(): void {
    clearTimeout(this.timer);
  }

  /** After each render: an open panel whose rows belong to another design is recomputed a moment later. */
  hostUpdated(): void {
    if (this.stale('opamps') || this.stale('supplies')) {
      clearTimeout(this.timer);
      this.timer = window.setTimeout(() => { this.ready().then(() => this.compute(), (e: unknown) => this.loadFault(e)); }, 0);
    }
  }

  setOpen(panel: ComparisonPanel, open: boolean): void {
    if (this.open[panel] === open) return;
    this.open[panel] = open;
    this.host.requestUpdate();
  }

  edit(a: OwnOpAmpsAction): void {
    this.ready().then(() => this.editNow(a), (e: unknown) => this.loadFault(e));
  }

  private editNow(a: OwnOpAmpsAction): void {
    switch (a.action) {
      case 'keep': {
        if (this.own.length >= MAX_OPAMPS) { this.message = { text: `Your list holds at most ${MAX_OPAMPS} op-amps: remove one first.`, bad: true }; break; }
        const op = this.host.currentDesign.opamp;
        this.setOwn([...this.own, { ...op }]);
        this.message = { text: `Kept "${op.name}" in your op-amps.`, bad: false };
        break;
      }
      case 'remove':
        this.setOwn(this.own.filter((_, i) => i !== a.index));
        this.message = null;
        break;
      case 'save': this.download(); break;
      case 'open': void this.openFile(a.file); break;
    }
    this.host.requestUpdate();
  }

  private stale(panel: ComparisonPanel): boolean {
    if (!this.open[panel]) return false;
    return this.computed[panel] !== this.host.currentDesign || (panel === 'opamps' && this.rowsOwnVersion !== this.ownVersion);
  }

  private compute(): void {
    const design = this.host.currentDesign;
    const report = this.host.currentReport ?? undefined;
    const { comparisonRows, supplyChoices } = this.core!;
    if (this.stale('opamps')) {
      this.rows = comparisonRows(design, this.own, report);
      this.computed.opamps = design;
      this.rowsOwnVersion = this.ownVersion;
    }
    if (this.stale('supplies')) {
      // The op-amp comparison of this same design, when at hand, gives the rail-to-rail row (issue 18).
      this.supplies = supplyChoices(design, report, this.computed.opamps === design && this.rows ? this.rows : undefined);
      this.computed.supplies = design;
    }
    this.host.requestUpdate();
  }

  private setOwn(list: OpAmpSpec[]): void {
    this.own = list;
    this.ownVersion++;
    try {
      localStorage.setItem(OPAMP_LIST_KEY, this.core!.serialiseOpAmpList(list));
    } catch {
      this.message = { text: 'This browser is not keeping your op-amps (its storage is full or turned off): save them to a file.', bad: true };
    }
  }

  private async openFile(file: File): Promise<void> {
    const name = file.name.replace(/[\u0000-\u001f\u007f-\u009f]/g, ' ').slice(0, 80);
    if (file.size > MAX_OPAMP_LIST_BYTES) {
      this.message = { text: `${name} is larger than ${MAX_OPAMP_LIST_BYTES / 1000} kB; an op-amp list is a few kB. Your list stays as it was.`, bad: true };
    } else {
      const v = this.core!.parseOpAmpListText(await file.text());
      if (!v.ok) this.message = { text: `${name} is not an op-amp list, so your list stays as it was: ${v.problems.slice(0, 4).map(listProblemWords).join('; ')}`, bad: true };
      else {
        const added = v.opamps.slice(0, Math.max(MAX_OPAMPS - this.own.length, 0));
        this.message = null;
        this.setOwn([...this.own, ...added]);
        this.message ??= { text: `Added ${added.length} op-amp${added.length === 1 ? '' : 's'} from ${name}${added.length < v.opamps.length ? ` (your list is full at ${MAX_OPAMPS})` : ''}.`, bad: false };
      }
    }
    this.host.requestUpdate();
  }

  private download(): void {
    const url = URL.createObjectURL(new Blob([this.core!.serialiseOpAmpList(this.own)], { type: 'application/json' }));
    const a = document.createElement('a');
    a.href = url;
    a.download = 'my-opamps.json';
    a.click();
    setTimeout(() => URL.revokeObjectURL(url), 1000);
  }
}
