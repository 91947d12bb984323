/**
 * Keeping designs: the share link (the design in the URL fragment), the versioned autosave envelope and a
 * safe file name. Pure functions; the app does the storage and the download.
 */
import { parseDesignText, serialiseDesign, validateDesign, type Design, type Problem, type ValidationResult } from './design.js';

export const AUTOSAVE_KEY = 'gainwright.autosave';
const AUTOSAVE_VERSION = 1;
/** Recent designs kept in the browser (each replaced design, so that every replacement can be undone). */
export const HISTORY_KEY = 'gainwright.history';
/** A damaged autosave's text, kept apart until the person dismisses it, so a later save cannot overwrite it. */
export const DAMAGED_KEY = 'gainwright.damaged';
/** How many recent designs the browser keeps. */
export const HISTORY_SIZE = 8;

function toBase64Url(text: string): string {
  const bytes = new TextEncoder().encode(text);
  let bin = '';
  for (const b of bytes) bin += String.fromCharCode(b);
  return btoa(bin).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
}

function fromBase64Url(s: string): string | null {
  if (!/^[A-Za-z0-9_-]*$/.test(s)) return null;
  try {
    const bin = atob(s.replace(/-/g, '+').replace(/_/g, '/') + '==='.slice((s.length + 3) % 4));
    const bytes = Uint8Array.from(bin, (c) => c.charCodeAt(0));
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    return null;
  }
}

/** The fragment that carries a design: `#d=<base64url of the JSON>`. */
export function shareFragment(design: Design): string {
  return `#d=${toBase64Url(JSON.stringify(design))}`;
}

/** Reads a design from a URL fragment; `null` when the fragment carries none. */
export function designFromFragment(hash: string): ValidationResult | null {
  const m = /^#d=(.*)$/.exec(hash);
  if (!m) return null;
  if (m[1]!.length > 1_400_000) return { ok: false, problems: [{ path: '(link)', message: 'is too long to be a design' }] };
  const text = fromBase64Url(m[1]!);
  if (text === null) return { ok: false, problems: [{ path: '(link)', message: 'is damaged: it does not decode to text' }] };
  return parseDesignText(text);
}

/**
 * The autosave entry: versioned so that a future format can migrate it. `unsaved` says whether the design
 * holds edits not yet saved to a file (the app asks before replacing such a design).
 */
export function autosaveEntry(design: Design, unsaved = false): string {
  return JSON.stringify({ v: AUTOSAVE_VERSION, savedAt: new Date().toISOString(), design, ...(unsaved ? { unsaved } : {}) });
}

export type RestoreResult =
  | { kind: 'none' }
  | { kind: 'ok'; design: Design; unsaved: boolean }
  | { kind: 'damaged'; text: string; reason: string; problems?: Problem[] };

/** Reads the autosave entry; a damaged one is reported with its text so that nothing is lost. */
export function restoreAutosave(stored: string | null): RestoreResult {
  if (stored === null || stored === '') return { kind: 'none' };
  let doc: unknown;
  try {
    doc = JSON.parse(stored);
  } catch {
    return { kind: 'damaged', text: stored, reason: 'the saved entry is not valid JSON' };
  }
  const env = doc as { v?: unknown; design?: unknown; unsaved?: unknown };
  if (typeof env !== 'object' || env === null || env.v !== AUTOSAVE_VERSION) {
    return { kind: 'damaged', text: stored, reason: 'the saved entry has an unknown layout' };
  }
  const v = validateDesign(env.design);
  if (!v.ok) return { kind: 'damaged', text: stored, reason: `the saved design has problems: ${v.problems.slice(0, 3).map((p) => `${p.path}: ${p.message}`).join('; ')}`, problems: v.problems };
  return { kind: 'ok', design: v.design, unsaved: env.unsaved === true };
}

/** One design kept in the browser's short history: when, why it was put aside, and the design. */
export interface HistoryEntry {
  savedAt: string;
  /** Why it was kept: "replaced by the demo …", "saved by another tab" (the app's words). */
  why: string;
  design: Design;
}

/**
 * The history with `design` added first; an identical design already kept moves to the front instead of
 * being kept twice; at most HISTORY_SIZE entries.
 */
export function withHistory(list: readonly HistoryEntry[], design: Design, why: string, savedAt = new Date().toISOString()): HistoryEntry[] {
  const same = JSON.stringify(design);
  return [{ savedAt, why, design }, ...list.filter((e) => JSON.stringify(e.design) !== same)].slice(0, HISTORY_SIZE);
}

/** The stored history as text. */
export function historyText(list: readonly HistoryEntry[]): string {
  return JSON.stringify({ v: AUTOSAVE_VERSION, entries: list });
}

/** Reads the stored history; entries that no longer validate are left out, a damaged store reads as empty. */
export function readHistory(stored: string | null): HistoryEntry[] {
  if (!stored) return [];
  let doc: unknown;
  try { doc = JSON.parse(stored); } catch { return []; }
  const entries = (doc as { v?: unknown; entries?: unknown })?.entries;
  if ((doc as { v?: unknown })?.v !== AUTOSAVE_VERSION || !Array.isArray(entries)) return [];
  const out: HistoryEntry[] = [];
  for (const e of entries.slice(0, HISTORY_SIZE)) {
    const v = validateDesign((e as { design?: unknown })?.design);
    if (v.ok) out.push({ savedAt: String((e as { savedAt?: unknown }).savedAt ?? ''), why: String((e as { why?: unknown }).why ?? '').slice(0, 200), design: v.design });
  }
  return out;
}

/** A file name from the title: letters, digits and dashes only. */
export function fileName(design: Design, ext: string): string {
  const base = design.title.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60) || 'design';
  return `${base}.${ext}`;
}

export { serialiseDesign };
