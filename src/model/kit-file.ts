/**
 * A resistor kit as a file of its own (format "gainwright-kit"): the kit a person holds, named, to keep in
 * the browser, save, share, and give the CLI (`gainwright report DESIGN --kit FILE`). The `kit` inside has
 * exactly the shape of a design's `target.kit` and is checked by the same schema and rule (KIT_SCHEMA,
 * kitLimitProblem in ./design.ts). See docs/design-format.md.
 */
import { firstDuplicateKey, KIT_SCHEMA, kitLimitProblem, validateDesign, type Design, type ResistorKit, type ValidationResult } from './design.js';
import { check, type Problem } from './validate.js';

export const KIT_FILE_FORMAT = 'gainwright-kit';
export const KIT_FILE_VERSION = 1;
/** Largest kit file read, bytes (500 listed values take about 20 kB). */
export const MAX_KIT_FILE_BYTES = 100_000;
/** Longest kit name, characters. */
export const MAX_KIT_NAME = 80;
/** Where the app keeps the person's kits in the browser, and how many it keeps. */
export const KIT_SHELF_KEY = 'gainwright.kits';
export const MAX_SHELF_KITS = 20;

/** A kit with the name a person gave it. */
export interface NamedKit { name: string; kit: ResistorKit }

export type KitFileResult = { ok: true; named: NamedKit } | { ok: false; problems: Problem[] };

/**
 * Checks a parsed JSON value as a kit file: `{ format, version, name, kit }`, the kit through the design's
 * kit schema (defaults filled in) and its limit rule; problems by path (`kit.parts[3].ohms: …`).
 */
export function validateKitFile(doc: unknown): KitFileResult {
  const problems: Problem[] = [];
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc)) return { ok: false, problems: [{ path: '(document)', message: 'must be a JSON object' }] };
  const d = doc as Record<string, unknown>;
  if (d.format !== KIT_FILE_FORMAT) return { ok: false, problems: [{ path: 'format', message: `must be "${KIT_FILE_FORMAT}"` }] };
  for (const key of Object.keys(d)) if (!['format', 'version', 'name', 'kit'].includes(key)) problems.push({ path: /^[A-Za-z_$][\w$]{0,39}$/.test(key) ? key : '(a key)', message: 'is not a field this format knows' });
  if (d.version !== KIT_FILE_VERSION) problems.push({ path: 'version', message: `must be ${KIT_FILE_VERSION}` });
  const name = check(Object.hasOwn(d, 'name') ? d.name : undefined, { t: 'str', def: 'my kit', maxLength: MAX_KIT_NAME }, 'name', problems) as string;
  if (!Object.hasOwn(d, 'kit')) problems.push({ path: 'kit', message: 'is missing: the kit itself, shaped as a design\'s target.kit' });
  if (problems.length) return { ok: false, problems };
  const kit = check(d.kit, KIT_SCHEMA, 'kit', problems) as ResistorKit;
  if (problems.length) return { ok: false, problems };
  const limits = kitLimitProblem(kit, 'kit');
  if (limits) return { ok: false, problems: [limits] };
  if (!kit.series && !kit.parts.length) return { ok: false, problems: [{ path: 'kit.parts', message: 'is empty and the kit has no series: a kit holds at least one value' }] };
  return { ok: true, named: { name, kit } };
}

/** Parses kit file text (a byte-order mark skipped, a key twice refused, as for a design). */
export function parseKitFileText(text: string): KitFileResult {
  if (text.length > MAX_KIT_FILE_BYTES) return { ok: false, problems: [{ path: '(file)', message: `is larger than ${MAX_KIT_FILE_BYTES / 1000} kB; a kit file is a few kB` }] };
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  let doc: unknown;
  try { doc = JSON.parse(body); } catch { return { ok: false, problems: [{ path: '(file)', message: 'is not valid JSON' }] }; }
  const twice = firstDuplicateKey(body);
  if (twice) return { ok: false, problems: [{ path: twice, message: 'appears twice in the file: keep the one you mean and delete the other' }] };
  return validateKitFile(doc);
}

/** The kit as a file to save. */
export function serialiseKitFile(named: NamedKit): string {
  return JSON.stringify({ format: KIT_FILE_FORMAT, version: KIT_FILE_VERSION, name: named.name, kit: named.kit }, null, 2) + '\n';
}

/**
 * The kits kept in the browser: a JSON list of kit files, each read by `validateKitFile`. An entry that no
 * longer reads is left out and counted, never the whole shelf lost.
 */
export function parseKitShelf(text: string): { kits: NamedKit[]; dropped: number } {
  let doc: unknown;
  try { doc = JSON.parse(text); } catch { return { kits: [], dropped: 1 }; }
  if (!Array.isArray(doc)) return { kits: [], dropped: 1 };
  const kits: NamedKit[] = [];
  let dropped = 0;
  for (const entry of doc.slice(0, MAX_SHELF_KITS)) {
    const v = validateKitFile(entry);
    if (v.ok) kits.push(v.named); else dropped++;
  }
  return { kits, dropped: dropped + Math.max(doc.length - MAX_SHELF_KITS, 0) };
}

/** The shelf as the text kept in the browser. */
export function serialiseKitShelf(kits: readonly NamedKit[]): string {
  return JSON.stringify(kits.map((k) => ({ format: KIT_FILE_FORMAT, version: KIT_FILE_VERSION, name: k.name, kit: k.kit })));
}

/**
 * The shelf with `named` put on it: a kit of the same name is replaced in its place, a new one goes last;
 * null when the shelf is full (MAX_SHELF_KITS) and the name is new.
 */
export function shelveKit(kits: readonly NamedKit[], named: NamedKit): NamedKit[] | null {
  const at = kits.findIndex((k) => k.name === named.name);
  if (at >= 0) return kits.map((k, i) => (i === at ? named : k));
  return kits.length >= MAX_SHELF_KITS ? null : [...kits, named];
}

/**
 * A design with a kit file's kit in place of its own `target.kit`, checked again as a whole (the kit must
 * hold a value inside the design's resistance window); null leaves the design as it is.
 */
export function designWithKit(design: Design, kit: ResistorKit | null): ValidationResult {
  return kit ? validateDesign({ ...design, target: { ...design.target, kit } }) : { ok: true, design };
}
