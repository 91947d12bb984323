/**
 * Reading what a person types and writing values the way the trade writes them.
 *
 * All values inside Gainwright are SI: V, A, Ω, Hz, s, T, m, K, F, C (charge, for battery capacity).
 * The common forms (plain numbers, `4.7k`, the IEC 60062 code `4k7`, `12.5 mV/A` in the field's own unit) are
 * read here directly; anything else goes to the unit engine, mathjs units (src/model/units-mathjs.ts), which the
 * CLI loads at once and the app loads right after its first render so that it does not delay it.
 */

/**
 * Evaluates a normalised expression (arithmetic allowed) and gives its value in the given SI unit, with
 * `bare: true` when the result carries no unit at all (a plain number), or null when it cannot be read.
 */
export type UnitEngine = (expr: string, target: string) => { value: number; bare: boolean } | null;
let engine: UnitEngine | null = null;

/** Installs the unit engine (mathjs units). */
export function setUnitEngine(e: UnitEngine): void {
  engine = e;
}

/** Whether the unit engine is installed. */
export function unitEngineReady(): boolean {
  return engine !== null;
}

/** A physical kind of quantity a field holds, as a mathjs unit expression of its SI unit. */
export type Dimension =
  | 'ohm' | 'V' | 'A' | 'Hz' | 's' | 'm' | 'T' | 'K' | 'F' | 'C' | 'W' | 'H'
  | 'V/A' | 'V/T' | 'V/s' | 'V/Hz^0.5' | 'A/Hz^0.5' | 'V/K' | '1/K' | '1';

export type ParseResult = { ok: true; value: number } | { ok: false; message: string; pending?: boolean };

/** Human names for each dimension, used in messages. */
export const DIMENSION_NAMES: Record<Dimension, string> = {
  ohm: 'a resistance (e.g. 4k7, 47 kΩ)',
  V: 'a voltage (e.g. 2.5 V, 350 mV)',
  A: 'a current (e.g. 20 A, 5 mA)',
  Hz: 'a frequency (e.g. 100 kHz)',
  s: 'a time (e.g. 10 µs)',
  m: 'a length (e.g. 1.5 mm)',
  T: 'a flux density (e.g. 300 mT, 100 G)',
  K: 'a temperature (e.g. 25 °C, 300 K)',
  F: 'a capacitance (e.g. 100 nF)',
  C: 'a charge (e.g. 565 mAh)',
  W: 'a power (e.g. 0.25 W)',
  H: 'an inductance factor in henries per turn² (e.g. 3 µH)',
  'V/A': 'a sensitivity in volts per ampere (e.g. 12.5 mV/A)',
  'V/T': 'a sensitivity in volts per tesla (e.g. 25 mV/mT, 2.5 mV/G)',
  'V/s': 'a slew rate (e.g. 0.5 V/µs)',
  'V/Hz^0.5': 'a voltage noise density (e.g. 35 nV/√Hz)',
  'A/Hz^0.5': 'a current noise density (e.g. 0.1 pA/√Hz)',
  'V/K': 'a voltage drift (e.g. 5 µV/K)',
  '1/K': 'a temperature coefficient (e.g. 100 ppm/K)',
  '1': 'a plain number (e.g. 0.01, 1 %)',
};

const SI_PREFIX: Record<string, number> = {
  f: 1e-15, p: 1e-12, n: 1e-9, u: 1e-6, m: 1e-3, '': 1, k: 1e3, K: 1e3, M: 1e6, G: 1e9, T: 1e12,
};

/** Round away binary noise from prefix arithmetic (0.1 * 1e-4 and friends) to 12 significant digits. */
export function clean(x: number): number {
  if (!Number.isFinite(x) || x === 0) return x;
  return Number(x.toPrecision(12));
}

/**
 * Reads the IEC 60062 letter-and-digit code: the letter stands for the decimal point and the multiplier.
 * `rkm('4K7')` → 4700, `rkm('R47')` → 0.47, `rkm('1M0')` → 1e6, `rkm('2L2')` → 0.0022 (IEC 60062:2016, §4).
 * Returns NaN for anything else.
 */
export function parseRkm(text: string): number {
  const m = /^(\d*)([RLKMGT])(\d*)$/i.exec(text.trim());
  if (!m) return NaN;
  const [, whole, letter, frac] = m;
  if (whole === '' && frac === '') return NaN;
  const mult: Record<string, number> = { L: 1e-3, R: 1, K: 1e3, M: 1e6, G: 1e9, T: 1e12 };
  const value = Number(`${whole || '0'}.${frac || '0'}`) * mult[letter!.toUpperCase()]!;
  return clean(value);
}

function normalise(text: string): string {
  return text
    .trim()
    .replace(/\u2212/g, '-') // typographic minus
    .replace(/[×·]/g, '*')
    .replace(/[Ωω\u2126]/g, 'ohm')
    .replace(/[µμ]/g, 'u')
    .replace(/°\s*C/gi, 'degC')
    .replace(/°\s*F/gi, 'degF')
    .replace(/√\s*Hz|sqrt\(\s*Hz\s*\)|rt\s*Hz/gi, 'Hz^0.5')
    .replace(/ppm/gi, 'ppm')
    .replace(/(\d)\s*(m?)ah\b/gi, (_, d: string, m: string) => `${d} ${m ? 'm' : ''}A h`)
    .replace(/\s+/g, ' ');
}

/** The unit symbols read in fields, as the unit engine writes them (SI Brochure, 9th ed., tables 4 and 8). */
const UNIT_SYMBOLS = ['V', 'A', 'Hz', 'ohm', 's', 'm', 'T', 'gauss', 'K', 'degC', 'degF', 'F', 'C', 'W', 'H', 'h', 'ppm'];
/**
 * Unit names read without regard to case: every symbol above that no other differs from only by case (so
 * not H and h, henry and hour), and the spelled-out names.
 */
const CASE_FREE = new Map<string, string>([
  ...UNIT_SYMBOLS.filter((u) => UNIT_SYMBOLS.filter((v) => v.toLowerCase() === u.toLowerCase()).length === 1).map((u) => [u.toLowerCase(), u] as [string, string]),
  ...Object.entries({
    volt: 'V', volts: 'V', amp: 'A', amps: 'A', ampere: 'A', amperes: 'A', ohms: 'ohm', hertz: 'Hz', tesla: 'T', gauss: 'gauss',
    metre: 'm', metres: 'm', meter: 'm', meters: 'm', sec: 's', second: 's', seconds: 's', farad: 'F', farads: 'F', watt: 'W', watts: 'W',
  }),
]);
/** SI prefixes, read by their case (m milli, M mega); K is also taken as kilo, as it is often written. */
const PREFIX_LETTERS: Record<string, string> = { f: 'f', p: 'p', n: 'n', u: 'u', m: 'm', k: 'k', K: 'k', M: 'M', G: 'G', T: 'T' };
/** Words the arithmetic understands besides units. */
const FUNCTION_WORDS = new Set(['pi', 'sqrt']);

/** The unit symbols a field's own dimension is written with, for single letters that could be a prefix too. */
function ownSymbols(dimension: Dimension): string[] {
  const own = dimension.split(/[/^*.\d]+/).filter(Boolean);
  if (dimension === 'T' || dimension === 'V/T') own.push('G');
  if (dimension === 'C') own.push('C');
  return own;
}

/** A single letter after a number: the field's own unit (0.06 m of length, 300 K), else a prefix (4.7k, 2.2M), else a unit by any case (9 v). */
function loneLetter(letter: string, dimension: Dimension): { unit: string } | { exponent: number } | null {
  if (ownSymbols(dimension).includes(letter)) return { unit: letter === 'G' ? 'gauss' : letter };
  const p = PREFIX_LETTERS[letter];
  if (p) return { exponent: SI_EXPONENT[p]! };
  const own = ownSymbols(dimension).find((x) => x.toLowerCase() === letter.toLowerCase());
  if (own) return { unit: own === 'G' ? 'gauss' : own };
  const u = CASE_FREE.get(letter.toLowerCase());
  return u ? { unit: u } : null;
}
const SI_EXPONENT: Record<string, number> = { f: -15, p: -12, n: -9, u: -6, m: -3, '': 0, k: 3, M: 6, G: 9, T: 12 };

/** One word of a unit expression in the unit engine's spelling: 'khz' → kHz, 'mv' → mV, 'MHZ' → MHz, 'Ohms' → ohm. */
function unitWord(word: string, dimension: Dimension): string {
  if (FUNCTION_WORDS.has(word)) return word;
  if (dimension === 'K' && /^c$/i.test(word)) return 'degC';
  if (/^g$/i.test(word) && ownSymbols(dimension).includes('G')) return 'gauss';
  if (UNIT_SYMBOLS.includes(word)) return word;
  const p = PREFIX_LETTERS[word[0]!];
  const rest = word.slice(1);
  if (p && rest) {
    if (rest === 'G' && ownSymbols(dimension).includes('G')) return `${p}gauss`;
    if (UNIT_SYMBOLS.includes(rest)) return p + rest;
  }
  const whole = CASE_FREE.get(word.toLowerCase());
  if (whole) return whole;
  if (p && rest) {
    const u = CASE_FREE.get(rest.toLowerCase());
    if (u) return p + u;
  }
  return word;
}

const NUM = '(?:\\d+\\.?\\d*|\\.\\d+)(?:[eE][-+]?\\d+)?';

/**
 * Rewrites what a person typed into the unit engine's spelling: IEC 60062 codes (4k7, 4n7, 2R2) become
 * numbers, a letter after a number becomes the field's unit or a power of ten, and unit words get their
 * proper case where that is unambiguous. Prefixes keep their case (m is milli, M is mega).
 */
export function canonicalExpression(text: string, dimension: Dimension): string {
  let e = normalise(text);
  // IEC 60062:2016 §4: the letter is the decimal point and the multiplier (R and L only for resistances).
  const rkmLetters = dimension === 'ohm' ? 'pnumkKMGRrL' : 'pnumkKMG';
  e = e.replace(new RegExp(`(^|[^\\w.])(\\d+)([${rkmLetters}])(\\d+)(?![\\w.])`, 'g'), (_, pre: string, w: string, l: string, f: string) => {
    const mult = /[RrL]/.test(l) ? (l === 'L' ? 'e-3' : '') : `${l}`;
    return `${pre}${w}.${f}${mult}`;
  });
  // A single letter after a number, not part of a unit expression (not followed by / or ^).
  e = e.replace(new RegExp(`(${NUM})\\s*([A-Za-z])(?=$|\\s*[-+*)]|\\s+[-+*(])`, 'g'), (all, n: string, l: string) => {
    const r = loneLetter(l, dimension);
    if (!r) return all;
    return 'unit' in r ? `${n} ${r.unit}` : String(clean(Number(n) * 10 ** r.exponent));
  });
  e = e.replace(/[A-Za-z_]+(?:\^0\.5)?/g, (w) => {
    const root = w.endsWith('^0.5') ? '^0.5' : '';
    return unitWord(root ? w.slice(0, -4) : w, dimension) + root;
  });
  return e;
}

/**
 * Parses a typed value into SI units of the wanted dimension.
 *
 * Accepts numbers with an SI prefix letter and no unit (`4.7k`), the IEC 60062 code (`4k7`, `470R`, `4n7`),
 * percentages and ppm for plain numbers, any unit expression of the right dimension (`47 kΩ`, `35 nV/√Hz`,
 * `12.5 mV/A`, `25 mV/mT`, `10 G`) with unit names in any case where that is unambiguous (`9 v`, `20 khz`)
 * and prefixes by their case (m milli, M mega), and arithmetic (`2*4k7`, `1/(2*pi*10k*10n)`, `9 V - 0.7 V`).
 * A plain number, or arithmetic on plain numbers, is in the field's own unit: `bare` turns it into SI
 * (default: it is SI already).
 *
 * @example parseQuantity('4k7', 'ohm') // { ok: true, value: 4700 }
 * @example parseQuantity('1.5', 'm', (mm) => mm / 1000) // { ok: true, value: 0.0015 }
 */
export function parseQuantity(text: string, dimension: Dimension, bare: (x: number) => number = (x) => x): ParseResult {
  if (typeof text !== 'string' || text.trim() === '') {
    return { ok: false, message: `expected ${DIMENSION_NAMES[dimension]}, got nothing` };
  }
  const raw = text.trim();
  const fail = (): ParseResult => ({ ok: false, message: `cannot read "${raw}" as ${DIMENSION_NAMES[dimension]}` });
  if (raw.length > 64) return fail();

  // A bare number is in the field's own unit.
  if (new RegExp(`^[-+]?${NUM}$`).test(raw)) return finite(clean(bare(Number(raw))), fail);

  if (dimension === 'ohm') {
    const r = parseRkm(raw);
    if (Number.isFinite(r)) return { ok: true, value: r };
  }
  if (dimension === '1' || dimension === '1/K') {
    const pc = new RegExp(`^([-+]?${NUM})\\s*(%|ppm)(?:\\s*/\\s*(?:K|degC|°C))?$`, 'i').exec(raw);
    if (pc) return finite(clean(Number(pc[1]) * (pc[2] === '%' ? 1e-2 : 1e-6)), fail);
  }

  const expr = canonicalExpression(raw, dimension);
  // A number and a power of ten only (4.7e3 from 4.7k): SI, as a prefix on the field's SI unit.
  if (new RegExp(`^[-+]?${NUM}$`).test(expr)) return finite(clean(Number(expr)), fail);
  // The field's own unit with an SI prefix on its first symbol: 12.5 mV/A, 47 kohm, 35 nV/Hz^0.5.
  const own = dimension === 'C' ? null : new RegExp(`^([-+]?${NUM})\\s*([fpnumkMGT]?)${dimension.replace(/[\^./]/g, (c) => `\\${c}`)}$`).exec(expr);
  if (own) return finite(clean(Number(own[1]) * SI_PREFIX[own[2]!]!), fail);
  if (!engine) return { ok: false, message: `reading "${raw}" needs the unit tables, which are still loading`, pending: true };
  const v = engine(expr, dimension === 'C' ? 'A s' : dimension);
  if (v === null) return fail();
  return finite(clean(v.bare ? bare(v.value) : v.value), fail);
}

function finite(v: number, fail: () => ParseResult): ParseResult {
  return Number.isFinite(v) ? { ok: true, value: v } : fail();
}

const ENG_PREFIXES: Array<[number, string]> = [
  [1e12, 'T'], [1e9, 'G'], [1e6, 'M'], [1e3, 'k'], [1, ''], [1e-3, 'm'], [1e-6, 'µ'], [1e-9, 'n'],
  [1e-12, 'p'], [1e-15, 'f'],
];

/**
 * Engineering notation with an SI prefix: `formatEng(4700, 'Ω')` → "4.70 kΩ", `formatEng(3.5e-8, 'V/√Hz')`
 * → "35.0 nV/√Hz". Non-finite input gives "—" so that no NaN or Infinity ever reaches a person.
 */
export function formatEng(value: number, unit = '', digits = 3): string {
  if (!Number.isFinite(value)) return '—';
  if (value === 0) return `0 ${unit}`.trim();
  const abs = Math.abs(value);
  let [scale, prefix] = ENG_PREFIXES[ENG_PREFIXES.length - 1]!;
  for (const [s, p] of ENG_PREFIXES) {
    if (abs >= s * 0.9995) { scale = s; prefix = p; break; }
  }
  let mant = value / scale;
  let text = mant.toPrecision(digits);
  if (Math.abs(Number(text)) >= 1000 && scale < 1e12) {
    const idx = ENG_PREFIXES.findIndex(([s]) => s === scale);
    const [s2, p2] = ENG_PREFIXES[idx - 1]!;
    mant = value / s2; prefix = p2; text = mant.toPrecision(digits);
  }
  if (text.includes('e')) text = String(Number(text));
  return `${text} ${prefix}${unit}`.trim();
}

/**
 * IEC 60062 letter-and-digit code for a resistance with `sig` significant figures (2 for E3–E24, 3 for
 * E48–E192): 4700 → "4K7", 2.2 → "2R2", 1e6 → "1M0", 100 → "100R", 0.47 → "R47", 47300 → "47K3".
 */
export function rkmCode(ohms: number, sig = 2): string {
  if (!Number.isFinite(ohms) || ohms <= 0) return '—';
  const letters: Array<[number, string]> = [[1e9, 'G'], [1e6, 'M'], [1e3, 'K'], [1, 'R'], [1e-3, 'L']];
  let [mult, letter] = letters[letters.length - 1]!;
  for (const [m, l] of letters) {
    // R serves down to 0.1 Ω (R47); L (milliohms) only below that.
    if (ohms >= m * 0.99999 || (l === 'R' && ohms >= 0.09999)) { mult = m; letter = l; break; }
  }
  let v = Number((ohms / mult).toPrecision(sig));
  if (v >= 1000 && letter !== 'G') {
    const i = letters.findIndex(([m]) => m === mult);
    [mult, letter] = letters[i - 1]!;
    v = Number((ohms / mult).toPrecision(sig));
  }
  const intDigits = v >= 1 ? Math.floor(Math.log10(v) + 1e-9) + 1 : 0;
  const decimals = Math.max(0, sig - intDigits);
  const [whole, frac = ''] = v.toFixed(decimals).split('.');
  const w = whole === '0' ? '' : whole;
  return `${w}${letter}${frac}`;
}

/** IEC 60062 tolerance letters. F ±1 % and K ±10 % are published examples; the others are from memory. */
export const TOLERANCE_LETTERS: Array<[number, string]> = [
  [0.0005, 'A'], [0.001, 'B'], [0.0025, 'C'], [0.005, 'D'], [0.01, 'F'], [0.02, 'G'], [0.05, 'J'], // F, K published; the rest from memory
  [0.1, 'K'], [0.2, 'M'],
];

/** Tolerance letter for a fractional tolerance, or '' when it has none: 0.01 → "F". */
export function toleranceLetter(tolerance: number): string {
  const hit = TOLERANCE_LETTERS.find(([t]) => Math.abs(t - tolerance) < 1e-9);
  return hit ? hit[1] : '';
}

const COLOURS = ['black', 'brown', 'red', 'orange', 'yellow', 'green', 'blue', 'violet', 'grey', 'white'];
const TOL_COLOURS: Array<[number, string]> = [
  [0.01, 'brown'], [0.02, 'red'], [0.005, 'green'], [0.0025, 'blue'], [0.001, 'violet'], [0.0005, 'grey'],
  [0.05, 'gold'], [0.1, 'silver'],
];

/**
 * IEC 60062 colour bands: 4 bands (2 digits) for E3–E24, 5 bands (3 digits) otherwise.
 * `colourBands(1000, 0.05)` → brown-black-red-gold; `colourBands(2260, 0.01)` → red-red-blue-brown-brown.
 */
export function colourBands(ohms: number, tolerance: number, digits = tolerance >= 0.05 ? 2 : 3): string[] {
  if (!Number.isFinite(ohms) || ohms <= 0) return [];
  const exp = Math.floor(Math.log10(ohms) + 1e-9) - (digits - 1);
  const mant = Math.round(ohms / 10 ** exp);
  const fixedMant = mant >= 10 ** digits ? mant / 10 : mant;
  const e = mant >= 10 ** digits ? exp + 1 : exp;
  const ds = String(fixedMant).padStart(digits, '0').split('').map((d) => COLOURS[Number(d)]!);
  const multColour = e >= 0 ? COLOURS[e] : e === -1 ? 'gold' : e === -2 ? 'silver' : undefined;
  const tol = TOL_COLOURS.find(([t]) => Math.abs(t - tolerance) < 1e-9)?.[1];
  return [...ds, multColour ?? '?', ...(tol ? [tol] : [])];
}
