/**
 * Bench readings: pairs (measurand, output volts) a person measured, typed into the app's table, pasted
 * from a spreadsheet or read from a CSV file. This module reads such text into numbers; the fit lives in
 * src/analysis/fit.ts.
 *
 * The text: one reading a line, the measurand first and the output (volts) second; further columns are
 * ignored. A header row (names) and a unit row (e.g. `A,V` or `mA;mV`) are allowed before the numbers.
 * Columns are separated by a comma, a semicolon or a tab (the first of tab, semicolon, comma found in the
 * text wins); when the separator is not a comma, a decimal comma (`2,5`) is read as a decimal point.
 * Blank lines and lines starting with `#` are skipped.
 */
import type { Problem } from './validate.js';

/** One reading: [measurand, output volts]. */
export type Reading = [number, number];

/** Most readings one table or file may hold (a bench session is a few dozen). */
export const MAX_READINGS = 500;
/** Largest readings text accepted, characters. */
export const MAX_READINGS_TEXT = 200_000;

export type Separator = ',' | ';' | '\t';

export interface ParsedReadings {
  points: Reading[];
  /** 1-based line of the text each point came from. */
  lines: number[];
  /** Header names and units, when the text carried them ("" when absent). */
  names: [string, string];
  units: [string, string];
  separator: Separator;
  /** Lines that could not be read, each with its line number as the path (`line 4`). */
  problems: Problem[];
}

/** SI prefixes a unit row may carry in front of the measurand's or the output's unit. */
const PREFIX: Record<string, number> = { p: 1e-12, n: 1e-9, u: 1e-6, 'µ': 1e-6, 'μ': 1e-6, m: 1e-3, k: 1e3, M: 1e6 };

/**
 * The factor that turns a number in unit `given` into unit `wanted`, when they differ only by an SI
 * prefix: unitFactor('mA', 'A') = 1e-3, unitFactor('mV', 'V') = 1e-3, unitFactor('A', 'mA') = 1000;
 * null when they are not the same unit. An empty `given` is taken as `wanted`.
 */
export function unitFactor(given: string, wanted: string): number | null {
  const g = given.trim(), w = wanted.trim();
  if (g === '' || g === w) return 1;
  const split = (u: string): [number, string][] => {
    const out: [number, string][] = [[1, u]];
    const p = PREFIX[u[0] ?? ''];
    if (p !== undefined && u.length > 1) out.push([p, u.slice(1)]);
    return out;
  };
  for (const [pg, bg] of split(g)) for (const [pw, bw] of split(w)) if (bg === bw) return pg / pw;
  return null;
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function readNumber(field: string, separator: Separator): number | null {
  let s = field.trim().replace(/^"(.*)"$/, '$1').trim();
  if (separator !== ',') s = s.replace(',', '.');
  if (!NUMBER.test(s)) return null;
  const x = Number(s);
  return Number.isFinite(x) ? x : null;
}

/** Picks the separator: tab, else semicolon, else comma. */
function detectSeparator(text: string): Separator {
  if (text.includes('\t')) return '\t';
  if (text.includes(';')) return ';';
  return ',';
}

/**
 * Reads readings text. Never throws: what cannot be read is a problem naming its line. The output column
 * is converted to volts when the unit row gives it with a prefix (`mV`); the measurand stays in the unit
 * the text gives (see `unitFactor` to bring it to a design's measurand).
 * Example: parseReadings('I;V\nA;mV\n0;2500\n1;2531,5').points → [[0, 2.5], [1, 2.5315]].
 */
export function parseReadings(text: string): ParsedReadings {
  const out: ParsedReadings = { points: [], lines: [], names: ['', ''], units: ['', ''], separator: ',', problems: [] };
  if (typeof text !== 'string') {
    out.problems.push({ path: '(readings)', message: 'must be text' });
    return out;
  }
  if (text.length > MAX_READINGS_TEXT) {
    out.problems.push({ path: '(readings)', message: `is longer than ${MAX_READINGS_TEXT / 1000} k characters; a bench session is a few dozen lines` });
    return out;
  }
  const sep = detectSeparator(text);
  out.separator = sep;
  const rows = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
  // Text rows before the first number: names and units (at most two).
  const heads: Array<{ cells: string[]; at: string }> = [];
  let outFactor = 1;
  for (let i = 0; i < rows.length; i++) {
    const line = rows[i]!;
    const at = `line ${i + 1}`;
    if (line.trim() === '' || line.trim().startsWith('#')) continue;
    const fields = line.split(sep);
    const x = readNumber(fields[0] ?? '', sep);
    const y = readNumber(fields[1] ?? '', sep);
    if (x !== null && y !== null) {
      if (out.points.length === 0 && heads.length) outFactor = header(heads, out);
      if (out.points.length >= MAX_READINGS) {
        out.problems.push({ path: at, message: `is beyond the ${MAX_READINGS} readings one set may hold; the rest is ignored` });
        break;
      }
      out.points.push([x, y * outFactor]);
      out.lines.push(i + 1);
      continue;
    }
    if (out.points.length === 0 && heads.length < 2 && x === null && fields.length >= 2) {
      heads.push({ cells: fields.map((f) => f.trim().replace(/^"(.*)"$/, '$1').trim().slice(0, 24)), at });
      continue;
    }
    const bad = x === null ? fields[0] ?? '' : fields[1] ?? '';
    out.problems.push({
      path: at,
      message: fields.length < 2
        ? `has one value; a reading is two (measurand${sep === '\t' ? ', tab,' : ` ${sep}`} output volts)`
        : `"${bad.trim().slice(0, 24)}" is not a number`,
    });
  }
  if (out.points.length === 0 && heads.length) header(heads, out);
  return out;
}

/** Reads the names and units rows; returns the factor that brings the output column to volts. */
function header(heads: Array<{ cells: string[]; at: string }>, out: ParsedReadings): number {
  const cell = (h: { cells: string[] }, k: number) => h.cells[k] ?? '';
  let unitRow: { cells: string[]; at: string } | null = null;
  if (heads.length === 2) {
    out.names = [cell(heads[0]!, 0), cell(heads[0]!, 1)];
    unitRow = heads[1]!;
  } else if (isUnitLike(cell(heads[0]!, 0)) && unitFactor(cell(heads[0]!, 1), 'V') !== null) {
    unitRow = heads[0]!;
  } else {
    out.names = [cell(heads[0]!, 0), cell(heads[0]!, 1)];
  }
  if (!unitRow) return 1;
  out.units = [cell(unitRow, 0), cell(unitRow, 1)];
  const f = unitFactor(out.units[1], 'V');
  if (f === null) {
    out.problems.push({ path: unitRow.at, message: `gives the output in "${out.units[1]}"; the output is read in volts (V, mV or µV)` });
    return 1;
  }
  return f;
}

/** A short unit symbol (letters, an optional prefix, `/`, `·`), not a column name like "current". */
function isUnitLike(s: string): boolean {
  return /^[A-Za-zµμΩ°/·.^0-9]{1,6}$/.test(s) && s.length <= 4;
}

/** Writes readings as CSV text with a header and a unit row (the inverse of `parseReadings`). */
export function readingsCsv(points: readonly Reading[], measurand: string): string {
  const safe = measurand.replace(/[^A-Za-z0-9µμΩ°/]/g, '');
  return `measurand,output\n${safe},V\n${points.map(([x, y]) => `${x},${y}`).join('\n')}\n`;
}
