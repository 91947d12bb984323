import { describe, expect, it } from 'vitest';
import { colourBands, formatEng, parseQuantity, parseRkm, rkmCode, toleranceLetter } from '../../src/model/units.js';

const value = (text: string, dim: Parameters<typeof parseQuantity>[1]) => {
  const r = parseQuantity(text, dim);
  if (!r.ok) throw new Error(r.message);
  return r.value;
};

describe('parseRkm (IEC 60062 letter-and-digit code)', () => {
  // IEC 60062 examples (Wikipedia "RKM code"): R47 = 0.47 Ω, 4R7 = 4.7 Ω, 470R, 4K7, 47K, 47K3, 470K, 4M7.
  it.each([
    ['R47', 0.47], ['4R7', 4.7], ['470R', 470], ['4K7', 4700], ['47K', 47e3], ['47K3', 47.3e3], ['470K', 470e3], ['4M7', 4.7e6],
    ['4k7', 4700], ['1M0', 1e6], ['2L2', 0.0022],
  ])('parseRkm(%s) → %d Ω', (code, ohms) => {
    expect(parseRkm(code)).toBeCloseTo(ohms, 12);
  });
  it('rejects text that is not a code', () => {
    expect(parseRkm('K')).toBeNaN();
    expect(parseRkm('4X7')).toBeNaN();
    expect(parseRkm('')).toBeNaN();
  });
});

describe('rkmCode (IEC 60062)', () => {
  // Same published examples, written back.
  it.each([
    [0.47, 2, 'R47'], [4.7, 2, '4R7'], [470, 2, '470R'], [4700, 2, '4K7'], [47e3, 2, '47K'], [47.3e3, 3, '47K3'], [470e3, 2, '470K'],
    [4.7e6, 2, '4M7'], [1e6, 2, '1M0'], [2.2, 2, '2R2'], [100, 3, '100R'],
  ])('rkmCode(%d, %d) → %s', (ohms, sig, code) => {
    expect(rkmCode(ohms, sig)).toBe(code);
  });
  it('writes — for a value that is not a resistance', () => {
    expect(rkmCode(NaN)).toBe('—');
    expect(rkmCode(-5)).toBe('—');
  });
});

describe('parseQuantity', () => {
  it.each([
    ['4.7k', 'ohm', 4700], ['4k7', 'ohm', 4700], ['47 kΩ', 'ohm', 47e3], ['2.2 MΩ', 'ohm', 2.2e6], ['35 nV/√Hz', 'V/Hz^0.5', 35e-9],
    ['1.5 mm', 'm', 1.5e-3], ['12.5 mV/A', 'V/A', 12.5e-3], ['25 mV/mT', 'V/T', 25], ['100 kHz', 'Hz', 1e5], ['0.5 V/µs', 'V/s', 5e5],
    ['0.1 pA/√Hz', 'A/Hz^0.5', 1e-13], ['1 %', '1', 0.01], ['100 ppm/K', '1/K', 1e-4], ['350 mV', 'V', 0.35],
  ] as const)('parseQuantity(%s, %s) → %d', (text, dim, expected) => {
    expect(value(text, dim)).toBeCloseTo(expected, 15);
    expect(value(text, dim) / expected).toBeCloseTo(1, 10);
  });
  // 1 G = 1e-4 T (SI Brochure, 9th ed., table 10; "1 mT = 10 G").
  it('reads gauss: 10 G is 1 mT and 2.5 mV/G is 25 V/T', () => {
    expect(value('10 G', 'T')).toBeCloseTo(1e-3, 15);
    expect(value('2.5 mV/G', 'V/T')).toBeCloseTo(25, 10);
  });
  // 25 °C = 298.15 K (SI Brochure: T/K = t/°C + 273.15).
  it('reads a Celsius temperature as kelvins', () => {
    expect(value('25 °C', 'K')).toBeCloseTo(298.15, 9);
  });
  // 1 mAh = 3.6 C (1 A·h = 3600 C).
  it('reads a battery capacity in mAh as coulombs', () => {
    expect(value('565 mAh', 'C')).toBeCloseTo(2034, 9);
  });
  it.each([['', 'ohm'], ['abc', 'ohm'], ['5 V', 'ohm'], ['12 mV', 'V/A'], ['1e999', 'V'], ['NaN', 'V']] as const)('rejects %j as %s with a message', (text, dim) => {
    const r = parseQuantity(text, dim);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message.length).toBeGreaterThan(10);
  });
});

describe('formatEng', () => {
  it('writes engineering notation with SI prefixes', () => {
    expect(formatEng(4700, 'Ω')).toBe('4.70 kΩ');
    expect(formatEng(3.5e-8, 'V/√Hz')).toBe('35.0 nV/√Hz');
    expect(formatEng(0.1, 'V/A')).toBe('100 mV/A');
    expect(formatEng(999.96, 'Hz')).toBe('1.00 kHz');
    expect(formatEng(-0.002, 'V')).toBe('-2.00 mV');
  });
  it('never writes NaN or Infinity', () => {
    expect(formatEng(NaN, 'V')).toBe('—');
    expect(formatEng(Infinity, 'V')).toBe('—');
  });
});

describe('tolerance letters and colour bands (IEC 60062)', () => {
  it('F is ±1 % and K is ±10 % (published)', () => {
    expect(toleranceLetter(0.01)).toBe('F');
    expect(toleranceLetter(0.1)).toBe('K');
  });
  // Published examples: brown-black-red-gold = 1 kΩ ±5 %; red-red-blue-brown-brown = 2.26 kΩ ±1 %.
  it('colours 1 kΩ ±5 % and 2.26 kΩ ±1 %', () => {
    expect(colourBands(1000, 0.05)).toEqual(['brown', 'black', 'red', 'gold']);
    expect(colourBands(2260, 0.01)).toEqual(['red', 'red', 'blue', 'brown', 'brown']);
  });
});

// SI Brochure, 9th ed. (2019), table 7: m = 1e-3 (milli), M = 1e6 (mega), k = 1e3, n = 1e-9; prefix symbols
// are case-sensitive. Unit symbols: V, Hz, T, m (metre).
describe('parseQuantity reads what a person means', () => {
  it.each([
    ['0.06 m', 'm', 0.06], ['0.0015 m', 'm', 0.0015], ['1.5 mm', 'm', 1.5e-3], ['60 MM', 'm', 60e6],
    ['9 v', 'V', 9], ['20 khz', 'Hz', 20e3], ['20 KHz', 'Hz', 20e3], ['20 kHZ', 'Hz', 20e3], ['2 MHz', 'Hz', 2e6], ['2 mHz', 'Hz', 2e-3],
    ['300 K', 'K', 300], ['5 ma', 'A', 5e-3], ['5 MA', 'A', 5e6], ['47 KOhm', 'ohm', 47e3], ['47 ohms', 'ohm', 47], ['4.7 K', 'ohm', 4700],
    ['25 mv/mt', 'V/T', 25], ['0.5 v/us', 'V/s', 5e5], ['35 nv/√hz', 'V/Hz^0.5', 35e-9], ['100 nf', 'F', 100e-9], ['4n7', 'F', 4.7e-9],
    ['300 mt', 'T', 0.3], ['10 g', 'T', 1e-3], ['1 G', 'Hz', 1e9],
  ] as const)('parseQuantity(%j, %s) → %d', (text, dim, expected) => {
    expect(value(text, dim) / expected).toBeCloseTo(1, 10);
  });
  // Arithmetic: 2 × 4.7 kΩ = 9.4 kΩ; 1/(2π·10 kΩ·10 nF) = 1591.549 Hz (RC corner, any circuits textbook); 9 V − 0.7 V = 8.3 V.
  it.each([
    ['2*4k7', 'ohm', 9400], ['1/(2*pi*10k*10n)', 'Hz', 1 / (2 * Math.PI * 1e4 * 1e-8)], ['9 V - 0.7 V', 'V', 8.3], ['sqrt(2) * 3 A', 'A', 3 * Math.SQRT2],
    ['10 m - 2 m', 'm', 8], ['2 × 4.7k', 'ohm', 9400],
  ] as const)('arithmetic: parseQuantity(%j, %s) → %d', (text, dim, expected) => {
    expect(value(text, dim) / expected).toBeCloseTo(1, 10);
  });
  it('a bare number and bare arithmetic are in the unit given by the caller (millimetres here)', () => {
    const mm = (x: number) => x / 1000;
    expect(parseQuantity('1.5', 'm', mm)).toEqual({ ok: true, value: 0.0015 });
    expect(parseQuantity('2*0.75', 'm', mm)).toEqual({ ok: true, value: 0.0015 });
    expect(parseQuantity('1.5 m', 'm', mm)).toEqual({ ok: true, value: 1.5 });
  });
  it.each([['import("fs")', 'V'], ['cos(1) V', 'V'], ['x', 'V'], ['9 V - 0.7 A', 'V'], ['9^9^9^9', 'V'], ['2 kHz', 'V']] as const)('refuses %j as %s with a message naming what it wanted', (text, dim) => {
    const r = parseQuantity(text, dim);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/cannot read/);
  });
});
