/**
 * A person's own op-amps: a list file (format "gainwright-opamps") that the app keeps in the browser and
 * saves as a file, and the CLI reads with `gainwright compare DESIGN --opamps FILE`. Each entry has exactly the
 * fields of a design's `opamp` and is checked by the same schema (OPAMP_SCHEMA). See docs/design-format.md.
 */
import { firstDuplicateKey, OPAMP_SCHEMA, type OpAmpSpec } from './design.js';
import { check, type Problem } from './validate.js';

export const OPAMP_LIST_FORMAT = 'gainwright-opamps';
export const OPAMP_LIST_VERSION = 1;
/** How many op-amps one list holds. */
export const MAX_OPAMPS = 100;
/** Largest list file read, bytes (a hundred entries take about 60 kB). */
export const MAX_OPAMP_LIST_BYTES = 200_000;
/** Where the app keeps the list in the browser. */
export const OPAMP_LIST_KEY = 'gainwright.opamps';

export type OpAmpListResult = { ok: true; opamps: OpAmpSpec[] } | { ok: false; problems: Problem[] };

/**
 * Checks a parsed JSON value as an op-amp list: `{ format, version, opamps: [ {…}, … ] }`, every entry
 * through the design's op-amp schema (defaults filled in), problems by path (`opamps[2].gbw: …`).
 */
export function validateOpAmpList(doc: unknown): OpAmpListResult {
  const problems: Problem[] = [];
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc)) return { ok: false, problems: [{ path: '(document)', message: 'must be a JSON object' }] };
  const d = doc as Record<string, unknown>;
  if (d.format !== OPAMP_LIST_FORMAT) return { ok: false, problems: [{ path: 'format', message: `must be "${OPAMP_LIST_FORMAT}"` }] };
  for (const key of Object.keys(d)) if (!['format', 'version', 'opamps'].includes(key)) problems.push({ path: /^[A-Za-z_$][\w$]{0,39}$/.test(key) ? key : '(a key)', message: 'is not a field this format knows' });
  if (d.version !== OPAMP_LIST_VERSION) problems.push({ path: 'version', message: `must be ${OPAMP_LIST_VERSION}` });
  const list = Object.hasOwn(d, 'opamps') ? d.opamps : undefined;
  if (!Array.isArray(list)) problems.push({ path: 'opamps', message: 'must be a list' });
  else if (list.length > MAX_OPAMPS) problems.push({ path: 'opamps', message: `has too many entries (at most ${MAX_OPAMPS})` });
  if (problems.length) return { ok: false, problems };
  const out = (list as unknown[]).map((o, i) => check(o, OPAMP_SCHEMA, `opamps[${i}]`, problems) as OpAmpSpec);
  return problems.length ? { ok: false, problems } : { ok: true, opamps: out };
}

/** Parses list text (a byte-order mark skipped, a key twice refused, as for a design). */
export function parseOpAmpListText(text: string): OpAmpListResult {
  if (text.length > MAX_OPAMP_LIST_BYTES) return { ok: false, problems: [{ path: '(file)', message: `is larger than ${MAX_OPAMP_LIST_BYTES / 1000} kB; an op-amp list is a few kB` }] };
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  let doc: unknown;
  try { doc = JSON.parse(body); } catch { return { ok: false, problems: [{ path: '(file)', message: 'is not valid JSON' }] }; }
  const twice = firstDuplicateKey(body);
  if (twice) return { ok: false, problems: [{ path: twice, message: 'appears twice in the file: keep the one you mean and delete the other' }] };
  return validateOpAmpList(doc);
}

/** The list as a file to save (and the text kept in the browser). */
export function serialiseOpAmpList(opamps: readonly OpAmpSpec[]): string {
  return JSON.stringify({ format: OPAMP_LIST_FORMAT, version: OPAMP_LIST_VERSION, opamps }, null, 2) + '\n';
}
