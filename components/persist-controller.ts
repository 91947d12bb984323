import type { ReactiveController, ReactiveControllerHost } from 'lit';
import {
  AUTOSAVE_KEY, DAMAGED_KEY, HISTORY_KEY, autosaveEntry, historyText, problemWords, readHistory, restoreAutosave, withHistory,
  type Design, type HistoryEntry, type RestoreResult,
} from '../src/index.js';

/** Whether the browser keeps what is saved: `full` (quota exceeded) and `off` (storage refused) lose edits on reload. */
export type StorageState = 'ok' | 'full' | 'off';

/** A damaged autosave entry, kept until the person dismisses it. */
export interface Damaged {
  text: string;
  reason: string;
}

/** What the controller tells its host; the host owns the design and decides what to do. */
export interface PersistHost extends ReactiveControllerHost {
  /** The design in force, to tell another tab's save from this tab's own. */
  readonly currentDesign: Design;
}

/**
 * Keeps the design in the browser for `<gw-app>` (which stays the one owner of the design): the autosave,
 * a short history of designs that were replaced (so every replacement can be undone), a damaged autosave
 * kept apart until dismissed, the state of storage (full or turned off: the host says so at once), and a
 * save by another tab (the `storage` event), which is kept in the history instead of being lost.
 *
 * Reading and writing are synchronous: an edit is in storage before the next one is typed, so a reload never
 * loses one. The controller starts no timers; the `storage` listener is removed on disconnect.
 */
export class PersistController implements ReactiveController {
  /** Whether the last write reached storage. */
  storage: StorageState = 'ok';
  /** A damaged autosave's text, kept (in storage under its own key) until dismissed. */
  damaged: Damaged | null = null;
  /** A different design another tab saved since this tab last wrote. */
  otherTab: Design | null = null;
  /** Designs put aside, newest first. */
  history: HistoryEntry[] = [];

  private readonly host: PersistHost;
  /** What this tab last wrote, to tell its own writes from another tab's. */
  private lastWritten: string | null = null;

  constructor(host: PersistHost) {
    this.host = host;
    host.addController(this);
  }

  hostConnected(): void {
    window.addEventListener('storage', this.onStorage);
  }

  hostDisconnected(): void {
    window.removeEventListener('storage', this.onStorage);
  }

  /**
   * Reads what the browser kept: the history, a damaged entry kept from before, and the autosave. A damaged
   * autosave is copied to its own key at once, so that the first edit's save cannot overwrite it.
   */
  restore(): RestoreResult {
    this.history = readHistory(this.read(HISTORY_KEY));
    const kept = this.read(DAMAGED_KEY);
    if (kept) {
      try {
        const d = JSON.parse(kept) as Damaged;
        if (typeof d.text === 'string' && typeof d.reason === 'string') this.damaged = d;
      } catch { /* a damaged copy of a damaged entry: nothing left to offer */ }
    }
    const saved = restoreAutosave(this.read(AUTOSAVE_KEY));
    // The reason in a person's words (fields by label), never as field paths.
    if (saved.kind === 'damaged') this.keepDamaged(saved.text, saved.problems ? `the saved design has problems: ${saved.problems.slice(0, 3).map((p) => problemWords(p)).join('; ')}` : saved.reason);
    return saved;
  }

  /** Keeps a text that could not be used (a damaged entry, a design that failed) until dismissed. */
  keepDamaged(text: string, reason: string): void {
    this.damaged = { text, reason };
    this.write(DAMAGED_KEY, JSON.stringify(this.damaged));
    this.host.requestUpdate();
  }

  /** The person has the damaged text (or does not want it): forget it. */
  dismissDamaged(): void {
    this.damaged = null;
    try { localStorage.removeItem(DAMAGED_KEY); } catch { /* storage off: nothing was kept */ }
    this.host.requestUpdate();
  }

  /** Saves the design in force; `unsaved` marks edits not yet saved to a file. */
  save(design: Design, unsaved: boolean): void {
    const entry = autosaveEntry(design, unsaved);
    if (this.write(AUTOSAVE_KEY, entry)) this.lastWritten = entry;
  }

  /** Puts a design aside in the history before it is replaced, with why. */
  remember(design: Design, why: string): void {
    this.history = withHistory(this.history, design, why);
    this.write(HISTORY_KEY, historyText(this.history));
    this.host.requestUpdate();
  }

  /** The other tab's design has been dealt with (taken or left in the history). */
  clearOtherTab(): void {
    this.otherTab = null;
    this.host.requestUpdate();
  }

  private read(key: string): string | null {
    try { return localStorage.getItem(key); } catch { this.setStorage('off'); return null; }
  }

  /** Writes one key; false (and the state said) when the browser refuses. */
  private write(key: string, value: string): boolean {
    try {
      localStorage.setItem(key, value);
      this.setStorage('ok');
      return true;
    } catch (e) {
      // QuotaExceededError (code 22) is a full store; anything else is storage turned off or blocked.
      const full = e instanceof DOMException && (e.name === 'QuotaExceededError' || e.code === 22);
      this.setStorage(full ? 'full' : 'off');
      return false;
    }
  }

  private setStorage(s: StorageState): void {
    if (this.storage === s) return;
    this.storage = s;
    this.host.requestUpdate();
  }

  /** Another tab wrote the autosave: keep its design in the history and tell the host, never overwrite ours. */
  private onStorage = (e: StorageEvent): void => {
    if (e.storageArea !== localStorage) return;
    if (e.key === HISTORY_KEY) { this.history = readHistory(e.newValue); this.host.requestUpdate(); return; }
    if (e.key !== AUTOSAVE_KEY || e.newValue === null || e.newValue === this.lastWritten) return;
    const theirs = restoreAutosave(e.newValue);
    if (theirs.kind !== 'ok' || JSON.stringify(theirs.design) === JSON.stringify(this.host.currentDesign)) return;
    this.otherTab = theirs.design;
    this.history = withHistory(this.history, theirs.design, 'saved by another tab');
    this.host.requestUpdate();
  };
}
