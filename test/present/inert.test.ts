/** Text from a design is inert in every output (issue 14): terminal, SPICE comment, CSV cell. */
import { describe, expect, it } from 'vitest';
import { csvCell, jsonText, spiceCommentText, terminalLine } from '../../src/present/inert.js';
import { cautionsFor } from '../../src/present/cautions.js';

describe('terminalLine', () => {
  it('writes ESC, NUL, CR, BEL, C1 controls and bidirectional overrides as visible escapes', () => {
    const t = terminalLine('a\u001b[2J\u001b]0;owned\u0007b\u0000c\rd\u009be\u202ef');
    expect(t).not.toMatch(/[\u0000-\u001f\u007f-\u009f\u202e]/);
    expect(t).toBe('a\\u001b[2J\\u001b]0;owned\\u0007b\\u0000c\\u000dd\\u009be\\u202ef');
  });
  it('leaves ordinary text, Unicode included, as it is', () => {
    expect(terminalLine('Zange – 100 mV/A µ Ω')).toBe('Zange – 100 mV/A µ Ω');
  });
});

describe('spiceCommentText', () => {
  it('keeps a line break, CR, form feed or Unicode line separator from starting a new netlist line', () => {
    for (const s of ['x\n.inc other.cir', 'x\r.control\rshell rm -rf x', 'x\f.end', 'x\u2028.inc y', 'x\u0085.inc y', 'x\v.inc y']) {
      const c = spiceCommentText(s);
      expect(c).not.toMatch(/[\n\r\f\v\u2028\u0085]/);
      expect(c.startsWith('x ')).toBe(true);
    }
  });
  it('is at most the given length', () => {
    expect([...spiceCommentText('é'.repeat(500), 120)]).toHaveLength(120);
  });
});

describe('csvCell', () => {
  // OWASP "CSV Injection": a cell a spreadsheet would run as a formula starts with = + - @ (also tab or CR).
  it.each([
    ['=1+1'], ['+1'], ['-1+1'], ['@SUM(A1)'], ['\t=1+1'], ['\r=1+1'], ['\n=1+1'], [' =1+1'], ['\u3000=1+1'], ['\uff1d1+1'],
    ['"=1+1'], ["'=1+1"], ['\u00a0+cmd'], ['\uff20x'],
  ])('a cell whose first non-blank character starts a formula is text: %j', (s) => {
    const cell = csvCell(s);
    // The cell, unquoted: it starts with the apostrophe that marks it as text.
    const inner = cell.slice(1, -1).replace(/""/g, '"');
    expect(inner.startsWith("'")).toBe(true);
    expect(inner).not.toMatch(/[\r\n\t]/);
  });
  it('leaves ordinary text and numbers alone, and quotes with doubled quotes (RFC 4180)', () => {
    expect(csvCell('10 kΩ')).toBe('"10 kΩ"');
    expect(csvCell('say "hi"')).toBe('"say ""hi"""');
    expect(csvCell(-0.5)).toBe('"-0.5"');
    expect(csvCell(null)).toBe('""');
  });
});

describe('jsonText and the cautions by sensor', () => {
  it('jsonText writes C1 controls and direction overrides as \\u escapes and parses back to the same string (RFC 8259 §7)', () => {
    const title = 'a\u009b2J\u202eb\u2028c';
    const text = jsonText({ title }, 2);
    expect(text).not.toMatch(/[\u0080-\u009f\u202a-\u202e\u2028]/);
    expect(text).toContain('\\u009b');
    expect(JSON.parse(text)).toEqual({ title });
  });
  it('cautionsFor words the list for the sensor: a shunt never on mains, a CT never open, a module within its isolation (common practice)', () => {
    expect(cautionsFor('shunt', []).join(' ')).toMatch(/never on mains/);
    expect(cautionsFor('current-transformer', ['ct-open-secondary']).join(' ')).toMatch(/secondary open/);
    expect(cautionsFor('voltage-output', []).join(' ')).toMatch(/isolation voltage/);
    expect(cautionsFor('hall-gap-core', []).join(' ')).toMatch(/Clamp only onto insulated conductors/);
    for (const t of ['shunt', 'current-transformer', 'voltage-output', 'hall-gap-core', 'closed-loop-hall'] as const) {
      expect(cautionsFor(t, []).join(' '), t).toMatch(/measurement-category/);
    }
  });
});
