/**
 * Resistor kits: the values a person holds, for the solver to pick from instead of a whole E-series
 * (`target.kit` in the design, docs/design-format.md). Values in ohms; a count of Infinity means as many as
 * needed.
 */
import type { ResistorKit } from './design.js';
import type { ParseResult } from './units.js';
import { SERIES_NAMES, valuesInRange, type SeriesName } from './eseries.js';

/** One value of a kit and how many of it there are (Infinity: as many as needed). */
export interface KitValue { ohms: number; count: number }

/** Two values within this relative distance are the same value (a list typed as 4700 and 4.7e3). */
const SAME = 1e-9;

/**
 * The kit's values within [min, max] (the design's resistance window), ascending, each once, with the counts
 * of the series and of the listed parts added together.
 * `kitValues({ series: 'E3', min: 10, max: 100, count: 2, parts: [{ ohms: 47, count: 1 }] }, 1, 1e9)`
 * → 10 ×2, 22 ×2, 47 ×3, 100 ×2.
 */
export function kitValues(kit: ResistorKit, min: number, max: number): KitValue[] {
  const all: KitValue[] = [];
  const seriesCount = kit.count ?? Infinity;
  if (kit.series) for (const v of valuesInRange(kit.series, kit.min, kit.max)) all.push({ ohms: v, count: seriesCount });
  for (const p of kit.parts) all.push({ ohms: p.ohms, count: p.count ?? Infinity });
  all.sort((a, b) => a.ohms - b.ohms);
  const out: KitValue[] = [];
  for (const v of all) {
    if (v.ohms < min * (1 - SAME) || v.ohms > max * (1 + SAME)) continue;
    const last = out[out.length - 1];
    if (last && Math.abs(v.ohms - last.ohms) <= last.ohms * SAME) last.count += v.count;
    else out.push({ ...v });
  }
  return out;
}

/**
 * The series to buy from when the kit falls short: the next finer series after the kit's (E12 → E24); for a
 * kit that is only a list, E24 (the usual next step for a maker's drawer; common practice). Null after E192.
 */
export function seriesToBuyFrom(kit: ResistorKit): SeriesName | null {
  if (!kit.series) return 'E24';
  const i = SERIES_NAMES.indexOf(kit.series);
  return SERIES_NAMES[i + 1] ?? null;
}

/** Common kit shapes a person can start from (the assortments sold to makers; common practice). */
export const KIT_SHAPES: ReadonlyArray<{ id: string; label: string; kit: ResistorKit }> = [
  { id: 'e12-10-1m', label: 'E12, 10 Ω to 1 MΩ (the usual assortment)', kit: { series: 'E12', min: 10, max: 1e6, parts: [] } },
  { id: 'e24-1-1m', label: 'E24, 1 Ω to 1 MΩ', kit: { series: 'E24', min: 1, max: 1e6, parts: [] } },
  { id: 'e6-100-1m', label: 'E6, 100 Ω to 1 MΩ (a small starter kit)', kit: { series: 'E6', min: 100, max: 1e6, parts: [] } },
  { id: 'e96-10-1m', label: 'E96, 10 Ω to 1 MΩ (a 1 % book)', kit: { series: 'E96', min: 10, max: 1e6, parts: [] } },
];

/** A list of kit parts read from text, with a message for each piece that could not be read. */
export interface ParsedKitList {
  parts: Array<{ ohms: number; count?: number }>;
  problems: string[];
}

/**
 * Reads a pasted list of values: pieces separated by commas, semicolons or new lines, each a resistance as
 * a field takes it (`4k7`, `4.7k`, `47 kΩ`, IEC 60062 codes) with an optional count after `x` or `×`
 * (`10k x2`, `4K7 ×3`). A piece that cannot be read is named and left out; at most 500 parts.
 * `parseKitList('10k x2, 4k7; 470R')` → 10 kΩ ×2, 4.7 kΩ, 470 Ω.
 */
export function parseKitList(text: string, read: (piece: string) => ParseResult): ParsedKitList {
  const parts: ParsedKitList['parts'] = [];
  const problems: string[] = [];
  for (const raw of text.split(/[,;\n\r]+/)) {
    const piece = raw.trim();
    if (!piece) continue;
    if (parts.length >= 500) { problems.push('more than 500 values: the rest are left out'); break; }
    const m = /^(.*?)\s*[x×]\s*(\d+)$/i.exec(piece);
    const value = read(m ? m[1]! : piece);
    const count = m ? Number(m[2]) : undefined;
    const shown = [...piece].slice(0, 30).join('').replace(/[\u0000-\u001f\u007f-\u009f]/g, ' ');
    if (!value.ok || !(value.value >= 0.01 && value.value <= 1e10)) problems.push(`"${shown}" is not a resistance`);
    else if (count !== undefined && !(count >= 1 && count <= 1e6)) problems.push(`"${shown}" has a count that is not a whole number from 1`);
    else parts.push(count === undefined ? { ohms: value.value } : { ohms: value.value, count });
  }
  return { parts, problems };
}

/** A kit's listed parts as text that parseKitList reads back: `4.7 kΩ ×2, 150 kΩ`. */
export function kitListText(parts: ResistorKit['parts'], format: (ohms: number) => string): string {
  return parts.map((p) => `${format(p.ohms)}${p.count ? ` ×${p.count}` : ''}`).join(', ');
}
