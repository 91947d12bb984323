/**
 * IEC 60063:2015 preferred number series for resistors (E3 … E192).
 *
 * The tables are the standard's, not the rounded formula 10^(i/n): E3–E24 depart from the formula at
 * several places (2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2 in E24) and E192 at one (9.20, where the formula
 * gives 9.19). Values are stored as mantissas in one decade, scaled to 100 … 999.
 */

export type SeriesName = 'E3' | 'E6' | 'E12' | 'E24' | 'E48' | 'E96' | 'E192';
export const SERIES_NAMES: readonly SeriesName[] = ['E3', 'E6', 'E12', 'E24', 'E48', 'E96', 'E192'];

// IEC 60063:2015, table 1 (E24); E12, E6 and E3 are every other value of the next finer series.
const E24 = [100, 110, 120, 130, 150, 160, 180, 200, 220, 240, 270, 300, 330, 360, 390, 430, 470, 510, 560, 620, 680, 750, 820, 910];
// IEC 60063:2015, table 2 (E96); E48 is every other value.
const E96 = [
  100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130, 133, 137, 140, 143, 147, 150, 154, 158, 162, 165, 169, 174,
  178, 182, 187, 191, 196, 200, 205, 210, 215, 221, 226, 232, 237, 243, 249, 255, 261, 267, 274, 280, 287, 294, 301, 309,
  316, 324, 332, 340, 348, 357, 365, 374, 383, 392, 402, 412, 422, 432, 442, 453, 464, 475, 487, 499, 511, 523, 536, 549,
  562, 576, 590, 604, 619, 634, 649, 665, 681, 698, 715, 732, 750, 768, 787, 806, 825, 845, 866, 887, 909, 931, 953, 976,
];
// E192 follows round(10^(i/192)·100) except 920 (IEC 60063:2015, table 2, note on 9.20).
const E192 = Array.from({ length: 192 }, (_, i) => {
  const v = Math.round(100 * 10 ** (i / 192));
  return v === 919 ? 920 : v;
});

const everyOther = (a: number[]): number[] => a.filter((_, i) => i % 2 === 0);

const MANTISSAS: Record<SeriesName, readonly number[]> = {
  E3: everyOther(everyOther(everyOther(E24))),
  E6: everyOther(everyOther(E24)),
  E12: everyOther(E24),
  E24,
  E48: everyOther(E96),
  E96,
  E192,
};

/** Usual tolerance of each series (IEC 60063:2015, clause 4): E6 20 %, … E96 1 %, E192 0.5 %. */
const USUAL_TOLERANCE: Record<SeriesName, number> = {
  E3: 0.4, E6: 0.2, E12: 0.1, E24: 0.05, E48: 0.02, E96: 0.01, E192: 0.005,
};

/** Significant figures each series is written with: two for E3–E24, three for E48–E192. */
export function significantFigures(series: SeriesName): number {
  return series === 'E48' || series === 'E96' || series === 'E192' ? 3 : 2;
}

/** The mantissas of one decade, 100 … 976 for E96, as written in the standard (×100). */
export function mantissas(series: SeriesName): readonly number[] {
  return MANTISSAS[series];
}

/** The usual tolerance of a series as a fraction: `usualTolerance('E96')` → 0.01. */
export function usualTolerance(series: SeriesName): number {
  return USUAL_TOLERANCE[series];
}

const rangeCache = new Map<string, Float64Array>();

/**
 * Every value of a series between `min` and `max` inclusive, ascending, as a typed array.
 * `valuesInRange('E12', 1000, 10000)` → 1000, 1200, 1500, … 8200, 10000.
 */
export function valuesInRange(series: SeriesName, min: number, max: number): Float64Array {
  const key = `${series}:${min}:${max}`;
  const hit = rangeCache.get(key);
  if (hit) return hit;
  const out: number[] = [];
  if (Number.isFinite(min) && Number.isFinite(max) && min > 0 && max >= min) {
    const m = MANTISSAS[series];
    for (let dec = Math.floor(Math.log10(min)) - 2; dec <= Math.ceil(Math.log10(max)); dec++) {
      for (const v of m) {
        const x = Number((v * 10 ** dec).toPrecision(6));
        if (x >= min * (1 - 1e-12) && x <= max * (1 + 1e-12)) out.push(x);
      }
    }
  }
  const arr = Float64Array.from(out.sort((a, b) => a - b));
  rangeCache.set(key, arr);
  return arr;
}

/** The series values just at or below and just at or above `x`: `neighbours(4750, 'E24')` → [4700, 5100]. */
export function neighbours(x: number, series: SeriesName): [number, number] {
  if (!Number.isFinite(x) || x <= 0) return [NaN, NaN];
  const dec = Math.floor(Math.log10(x)) - 2;
  const m = MANTISSAS[series];
  const scaled = (v: number, d: number) => Number((v * 10 ** d).toPrecision(6));
  let below = scaled(m[m.length - 1]!, dec - 1);
  let above = scaled(m[0]!, dec + 1);
  for (const v of m) {
    const val = scaled(v, dec);
    if (val <= x * (1 + 1e-12)) below = val;
    if (val >= x * (1 - 1e-12)) { above = val; break; }
  }
  return [below, above];
}

/**
 * The nearest series value to `x`, nearest on a logarithmic scale (the series are geometric):
 * `nearest(4.75, 'E24')` → 4.7.
 */
export function nearest(x: number, series: SeriesName): number {
  const [lo, hi] = neighbours(x, series);
  if (!Number.isFinite(lo)) return NaN;
  return Math.log(x / lo) <= Math.log(hi / x) ? lo : hi;
}

/** Whether `x` is a member of the series (any decade), to a relative 1e-6. */
export function isMember(x: number, series: SeriesName): boolean {
  if (!Number.isFinite(x) || x <= 0) return false;
  const n = nearest(x, series);
  return Math.abs(n / x - 1) < 1e-6;
}

/** Standard trimmer values, 100 Ω … 1 MΩ in a 1-2-5 sequence (common practice). */
export const TRIMMER_VALUES: readonly number[] = [
  100, 200, 500, 1e3, 2e3, 5e3, 10e3, 20e3, 50e3, 100e3, 200e3, 500e3, 1e6,
];
