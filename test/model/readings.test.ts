import { describe, expect, it } from 'vitest';
import { parseReadings, readingsCsv, unitFactor, MAX_READINGS } from '../../src/model/readings.js';

describe('parseReadings', () => {
  it('reads comma-separated pairs without a header', () => {
    const r = parseReadings('0,2.5\n1,2.525\n2,2.55\n');
    expect(r.points).toEqual([[0, 2.5], [1, 2.525], [2, 2.55]]);
    expect(r.problems).toEqual([]);
    expect(r.separator).toBe(',');
  });
  it('reads a header row and a unit row, and brings millivolts to volts', () => {
    const r = parseReadings('current,output\nA,mV\n0,2500\n10,2750\n');
    expect(r.names).toEqual(['current', 'output']);
    expect(r.units).toEqual(['A', 'mV']);
    expect(r.points[1]![1]).toBeCloseTo(2.75, 12);
  });
  it('reads semicolons with a decimal comma', () => {
    const r = parseReadings('I;U\nA;V\n0;2,5\n-1,5;2,4625\r\n');
    expect(r.separator).toBe(';');
    expect(r.points).toEqual([[0, 2.5], [-1.5, 2.4625]]);
  });
  it('reads tabs as pasted from a spreadsheet, with a decimal comma', () => {
    const r = parseReadings('A\tV\n0\t2,5\n5\t2,625\n');
    expect(r.separator).toBe('\t');
    expect(r.units).toEqual(['A', 'V']);
    expect(r.points).toEqual([[0, 2.5], [5, 2.625]]);
  });
  it('a comma-separated file does not take the comma as a decimal mark', () => {
    const r = parseReadings('0,2,5\n');
    expect(r.points).toEqual([[0, 2]]);
  });
  it('names the line of every value it cannot read and keeps the rest', () => {
    const r = parseReadings('0,2.5\n1,abc\n2\n3,2.575\n');
    expect(r.points).toEqual([[0, 2.5], [3, 2.575]]);
    expect(r.problems.map((p) => p.path)).toEqual(['line 2', 'line 3']);
    expect(r.problems[0]!.message).toMatch(/"abc" is not a number/);
  });
  it('refuses Infinity, NaN and hex as numbers', () => {
    const r = parseReadings('0,Infinity\n1,NaN\n2,0x10\n');
    expect(r.points).toEqual([]);
    expect(r.problems).toHaveLength(3);
  });
  it('an output unit that is not volts is a problem on the unit row', () => {
    const r = parseReadings('x,y\nA,T\n0,1\n');
    expect(r.problems[0]!.path).toBe('line 2');
  });
  it('stops at MAX_READINGS readings with a problem', () => {
    const text = Array.from({ length: MAX_READINGS + 5 }, (_, i) => `${i},${i}`).join('\n');
    const r = parseReadings(text);
    expect(r.points).toHaveLength(MAX_READINGS);
    expect(r.problems).toHaveLength(1);
  });
  it('empty text gives no points and no crash; comments and blank lines are skipped', () => {
    expect(parseReadings('').points).toEqual([]);
    expect(parseReadings('# bench, 2 Dec\n\n0,1\n').points).toEqual([[0, 1]]);
  });
  it('readingsCsv writes text that parseReadings reads back', () => {
    const pts: Array<[number, number]> = [[0, 2.5], [1.5, 2.5375]];
    const back = parseReadings(readingsCsv(pts, 'A'));
    expect(back.points).toEqual(pts);
    expect(back.units).toEqual(['A', 'V']);
  });
});

describe('unitFactor', () => {
  // SI prefixes (SI Brochure, 9th ed., 2019, Table 7): m = 1e-3, k = 1e3, µ = 1e-6.
  it.each([['mA', 'A', 1e-3], ['A', 'mA', 1e3], ['mV', 'V', 1e-3], ['µV', 'V', 1e-6], ['kA', 'A', 1e3], ['mT', 'mT', 1], ['', 'A', 1]])(
    'unitFactor(%s, %s) = %d', (g, w, f) => {
      expect(unitFactor(g as string, w as string)).toBeCloseTo(f as number, 15);
    });
  it('unitFactor of unrelated units is null', () => {
    expect(unitFactor('T', 'A')).toBeNull();
    expect(unitFactor('mT', 'A')).toBeNull();
  });
});
