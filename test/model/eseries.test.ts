import { describe, expect, it } from 'vitest';
import { isMember, mantissas, nearest, neighbours, significantFigures, usualTolerance, valuesInRange, SERIES_NAMES } from '../../src/model/eseries.js';

// IEC 60063:2015 table values as published (mirrored by Wikipedia "E series of preferred numbers").
const E24_PUBLISHED = [10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30, 33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91];
const E96_PUBLISHED = [100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130, 133, 137, 140, 143, 147, 150, 154, 158, 162, 165, 169, 174, 178, 182, 187, 191, 196, 200, 205, 210, 215, 221, 226, 232, 237, 243, 249, 255, 261, 267, 274, 280, 287, 294, 301, 309, 316, 324, 332, 340, 348, 357, 365, 374, 383, 392, 402, 412, 422, 432, 442, 453, 464, 475, 487, 499, 511, 523, 536, 549, 562, 576, 590, 604, 619, 634, 649, 665, 681, 698, 715, 732, 750, 768, 787, 806, 825, 845, 866, 887, 909, 931, 953, 976];

describe('IEC 60063 series tables', () => {
  it('E24 equals the published table', () => {
    expect(mantissas('E24').map((v) => v / 10)).toEqual(E24_PUBLISHED);
  });
  it('E96 equals the published table', () => {
    expect([...mantissas('E96')]).toEqual(E96_PUBLISHED);
  });
  it('E12, E6 and E3 are every other value of the next finer series (IEC 60063)', () => {
    expect(mantissas('E12').map((v) => v / 10)).toEqual([10, 12, 15, 18, 22, 27, 33, 39, 47, 56, 68, 82]);
    expect(mantissas('E6').map((v) => v / 10)).toEqual([10, 15, 22, 33, 47, 68]);
    expect(mantissas('E3').map((v) => v / 10)).toEqual([10, 22, 47]);
    expect([...mantissas('E48')]).toEqual(E96_PUBLISHED.filter((_, i) => i % 2 === 0));
    expect(mantissas('E192').filter((_, i) => i % 2 === 0)).toEqual(E96_PUBLISHED);
  });
  it('E24 departs from round(10^(i/24)) exactly at 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2 (IEC 60063)', () => {
    const differ = mantissas('E24').filter((v, i) => Math.round(10 * 10 ** (i / 24)) !== v / 10).map((v) => v / 100);
    expect(differ).toEqual([2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2]);
  });
  it('E96 follows round(10^(i/96)) everywhere; E192 departs only at 9.20 (IEC 60063)', () => {
    expect(mantissas('E96').every((v, i) => Math.round(100 * 10 ** (i / 96)) === v)).toBe(true);
    const differ = mantissas('E192').filter((v, i) => Math.round(100 * 10 ** (i / 192)) !== v);
    expect(differ).toEqual([920]);
  });
  it('each series has n values per decade', () => {
    for (const s of SERIES_NAMES) expect(mantissas(s).length).toBe(Number(s.slice(1)));
  });
  it('usual tolerances: E6 20 %, E12 10 %, E24 5 %, E48 2 %, E96 1 %, E192 0.5 % (IEC 60063)', () => {
    expect([usualTolerance('E6'), usualTolerance('E12'), usualTolerance('E24'), usualTolerance('E48'), usualTolerance('E96'), usualTolerance('E192')]).toEqual([0.2, 0.1, 0.05, 0.02, 0.01, 0.005]);
  });
  it('E3–E24 have two significant figures, E48–E192 three (IEC 60063)', () => {
    expect(significantFigures('E24')).toBe(2);
    expect(significantFigures('E48')).toBe(3);
  });
});

describe('lookups', () => {
  it("nearest(4.75, 'E24') returns 4.7", () => expect(nearest(4.75, 'E24')).toBe(4.7));
  it("nearest(4.95, 'E24') returns 5.1 (log-nearest)", () => expect(nearest(4.95, 'E24')).toBe(5.1));
  it("neighbours(4750, 'E24') returns [4700, 5100]", () => expect(neighbours(4750, 'E24')).toEqual([4700, 5100]));
  it('neighbours of a member are itself both sides', () => expect(neighbours(2260, 'E96')).toEqual([2260, 2260]));
  it('neighbours across a decade: 9.9 k in E12 → [8.2 k, 10 k]', () => expect(neighbours(9900, 'E12')).toEqual([8200, 10000]));
  it('isMember knows 2.26 kΩ is E96 but not E24', () => {
    expect(isMember(2260, 'E96')).toBe(true);
    expect(isMember(2260, 'E24')).toBe(false);
    expect(isMember(0, 'E24')).toBe(false);
    expect(isMember(NaN, 'E24')).toBe(false);
  });
  it('valuesInRange(E12, 1 k, 10 k) lists one decade inclusive', () => {
    expect([...valuesInRange('E12', 1000, 10000)]).toEqual([1000, 1200, 1500, 1800, 2200, 2700, 3300, 3900, 4700, 5600, 6800, 8200, 10000]);
  });
  it('valuesInRange of an empty or reversed window is empty', () => {
    expect(valuesInRange('E12', 10, 1).length).toBe(0);
    expect(valuesInRange('E12', -1, 10).length).toBe(0);
  });
  it('nearest of zero, negative or NaN is NaN', () => {
    expect(nearest(0, 'E12')).toBeNaN();
    expect(nearest(-3, 'E12')).toBeNaN();
    expect(nearest(NaN, 'E12')).toBeNaN();
  });
});
