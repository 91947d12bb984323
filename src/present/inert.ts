/**
 * Text from a design made inert for each output it reaches: a terminal line, a SPICE comment line and a
 * spreadsheet cell. A design's title, notes, names and measurand are a person's text, and may hold anything
 * a JSON string can: line breaks, terminal escape sequences, bidirectional overrides, formula starters.
 */

/**
 * Characters that act instead of printing: C0 and C1 controls (ESC, CR, LF, NUL, BEL …), DEL, the Unicode
 * line and paragraph separators and the bidirectional embeddings, overrides and isolates.
 */
const ACTIVE = /[\u0000-\u001f\u007f-\u009f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g;

/**
 * One terminal line: every active character written as a visible `\u001b`-style escape, as JSON writes it,
 * so an escape sequence in a title shows as text instead of clearing the screen.
 * `terminalLine('a\u001b[2Jb')` → `a\u001b[2Jb` written out with a backslash.
 */
export function terminalLine(text: string): string {
  return text.replace(ACTIVE, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`);
}

/**
 * JSON text for a terminal or a file: `JSON.stringify` escapes C0 controls but leaves C1 controls, DEL, the line
 * separators and the bidirectional overrides raw, which a terminal can act on. They are written as `\uXXXX`
 * escapes, which every JSON reader decodes back to the same string: the data is unchanged, the text is inert.
 * `jsonText({ t: 'a\u009b2J' })` → `{"t":"a\u009b2J"}` with a backslash written out.
 */
export function jsonText(value: unknown, indent?: number): string {
  // C0 controls are already escaped inside strings; outside them the only ones are the layout's line breaks.
  return JSON.stringify(value, null, indent).replace(/[\u007f-\u009f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g, (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`);
}

/** Page text: bidirectional overrides and isolates dropped (they would reorder what follows), line separators as spaces. */
export function pageText(text: string): string {
  return text.replace(/[\u202a-\u202e\u2066-\u2069]/g, '').replace(/[\u2028\u2029]/g, ' ');
}

/**
 * Text for the inside of one SPICE comment line (`* …`): active characters become spaces, runs of blanks one
 * space, at most `max` characters. A line break is the only way out of a SPICE comment; with none left, a
 * `.include` or `shell` in the text is just words in the comment.
 */
export function spiceCommentText(text: string, max = 120): string {
  return [...text.replace(ACTIVE, ' ').replace(/\s+/g, ' ').trim()].slice(0, max).join('');
}

/** Characters a spreadsheet reads as the start of a formula, in ASCII and in their fullwidth forms. */
const FORMULA_START = /^[=+\-@\uff1d\uff0b\uff0d\uff20]/;
/** What a spreadsheet skips before it looks for a formula: blanks of every kind and quote marks. */
const LEADING = /^[\s\u00a0\u3000"'\u2018\u2019\u201c\u201d\uff02\uff07]*/;

/**
 * One CSV cell (RFC 4180: always quoted, quotes doubled). A cell whose first character after blanks and quote
 * marks starts a formula (= + - @, or fullwidth ＝ ＋ － ＠) gets a leading apostrophe, which spreadsheets read
 * as "this is text" (the OWASP advice on CSV injection); active characters become spaces so a cell stays on
 * its line for importers.
 */
export function csvCell(value: string | number | null): string {
  const t = value === null ? '' : typeof value === 'number' ? String(value) : value.replace(ACTIVE, ' ');
  const safe = typeof value === 'string' && FORMULA_START.test(t.replace(LEADING, '')) ? `'${t}` : t;
  return `"${safe.replace(/"/g, '""')}"`;
}
