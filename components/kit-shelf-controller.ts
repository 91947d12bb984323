import type { ReactiveController, ReactiveControllerHost } from 'lit';
import {
  KIT_SHELF_KEY, MAX_KIT_FILE_BYTES, MAX_SHELF_KITS, parseKitFileText, parseKitShelf, serialiseKitFile, serialiseKitShelf, shelveKit,
  type NamedKit, type ResistorKit,
} from '../src/index.js';

/** A name or file name as it is shown: control characters out, at most 80 characters (it is then bound as text). */
const shown = (s: string) => [...s.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g, ' ')].slice(0, 80).join('');

/**
 * The person's kits for `<gw-kit-editor>`: a shelf of named kits kept in the browser (KIT_SHELF_KEY), and
 * kit files ("gainwright-kit") saved and opened. It holds kits only; the design's kit is the app's, and a
 * kit opened or taken from the shelf goes up to it through the host's `use` callback.
 */
export class KitShelfController implements ReactiveController {
  /** The kits kept in this browser, in the order kept. */
  kits: NamedKit[] = [];
  /** A line about the last action (kept, opened, refused). */
  message: { text: string; bad: boolean } | null = null;

  private readonly host: ReactiveControllerHost;
  private readonly use: (kit: ResistorKit) => void;

  constructor(host: ReactiveControllerHost, use: (kit: ResistorKit) => void) {
    this.host = host;
    this.use = use;
    host.addController(this);
  }

  hostConnected(): void {
    let stored: string | null = null;
    try { stored = localStorage.getItem(KIT_SHELF_KEY); } catch { /* storage off: the shelf starts empty */ }
    if (!stored) return;
    const read = parseKitShelf(stored);
    this.kits = read.kits;
    if (read.dropped) this.message = { text: `${read.dropped} kit${read.dropped === 1 ? '' : 's'} kept in this browser could not be read and ${read.dropped === 1 ? 'is' : 'are'} left out.`, bad: true };
  }

  /** Keeps `kit` on the shelf under `name` (a kit of that name is replaced). */
  keep(name: string, kit: ResistorKit): void {
    const clean = shown(name).trim();
    if (!clean) { this.say('Give the kit a name to keep it by.', true); return; }
    const next = shelveKit(this.kits, { name: clean, kit });
    if (!next) { this.say(`This browser keeps at most ${MAX_SHELF_KITS} kits: remove one first.`, true); return; }
    try {
      localStorage.setItem(KIT_SHELF_KEY, serialiseKitShelf(next));
    } catch {
      this.say('This browser is not keeping kits (its storage is full or turned off): save the kit as a file instead.', true);
      return;
    }
    this.kits = next;
    this.say(`Kept "${clean}" in this browser.`, false);
  }

  /** Sends the shelf's kit at `index` up to the design; its name, or null when there is none. */
  load(index: number): string | null {
    const k = this.kits[index];
    if (!k) return null;
    this.use(k.kit);
    this.say(`Took "${k.name}" from this browser.`, false);
    return k.name;
  }

  remove(index: number): void {
    const k = this.kits[index];
    if (!k) return;
    const next = this.kits.filter((_, i) => i !== index);
    try { localStorage.setItem(KIT_SHELF_KEY, serialiseKitShelf(next)); } catch { /* the shelf in this page still loses it */ }
    this.kits = next;
    this.say(`Removed "${k.name}" from this browser.`, false);
  }

  /** Saves `kit` as a kit file named after `name`. */
  download(name: string, kit: ResistorKit): void {
    const clean = shown(name).trim() || 'my kit';
    const url = URL.createObjectURL(new Blob([serialiseKitFile({ name: clean, kit })], { type: 'application/json' }));
    const a = document.createElement('a');
    a.href = url;
    a.download = `kit-${clean.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'mine'}.json`;
    a.click();
    setTimeout(() => URL.revokeObjectURL(url), 1000);
  }

  /** Opens a kit file: a good one goes up to the design (and its name is offered for keeping); a bad one is said, nothing changes. */
  async open(file: File): Promise<string | null> {
    const name = shown(file.name);
    if (file.size > MAX_KIT_FILE_BYTES) { this.say(`${name} is larger than ${MAX_KIT_FILE_BYTES / 1000} kB; a kit file is a few kB. The kit stays as it was.`, true); return null; }
    let text: string;
    try { text = await file.text(); } catch { this.say(`${name} could not be read. The kit stays as it was.`, true); return null; }
    const v = parseKitFileText(text);
    if (!v.ok) {
      this.say(`${name} is not a kit file, so the kit stays as it was: ${v.problems.slice(0, 3).map((p) => `${shown(p.path)} ${shown(p.message)}`).join('; ')}.`, true);
      return null;
    }
    this.use(v.named.kit);
    this.say(`Read "${shown(v.named.name)}" from ${name}.`, false);
    return shown(v.named.name);
  }

  private say(text: string, bad: boolean): void {
    this.message = { text, bad };
    this.host.requestUpdate();
  }
}
