/**
 * A small declarative checker for JSON documents: every problem is reported with the path of its field,
 * and the checked value comes back with defaults filled in. Used by the design file module.
 */

export interface Problem {
  /** Dotted path of the field, e.g. `opamp.gbw` or `target.range[1]`. */
  path: string;
  message: string;
  /**
   * For a number outside its bounds: the bound it broke, in SI, so that a screen can write it in the
   * field's own unit. `other` lists further fields a cross-field rule involves.
   */
  limit?: { kind: 'min' | 'max' | 'maxAbs' | 'minAbs' | 'whole' | 'positive' | 'nonneg' | 'fraction'; value: number };
  other?: string[];
}

export type NumCheck = 'positive' | 'nonneg' | 'any' | 'fraction';

export type Spec =
  | {
    t: 'num'; what: string; check?: NumCheck; optional?: boolean; def?: number; min?: number; max?: number; maxAbs?: number;
    /** Smallest magnitude other than zero that means something physically (a tinier value is refused). */
    minAbs?: number;
    /** A count or an index: whole numbers only. */
    whole?: boolean;
  }
  | { t: 'str'; optional?: boolean; def?: string; oneOf?: readonly string[]; maxLength?: number; pattern?: RegExp; patternHint?: string }
  | { t: 'bool'; optional?: boolean; def?: boolean }
  | { t: 'obj'; fields: Record<string, Spec>; optional?: boolean; nullable?: boolean; def?: unknown }
  | { t: 'tuple'; items: Spec[]; optional?: boolean; nullable?: boolean; def?: unknown[] | null }
  | { t: 'list'; item: Spec; optional?: boolean; def?: unknown[]; nonEmpty?: boolean; maxItems?: number }
  | { t: 'variant'; tag: string; variants: Record<string, Record<string, Spec>>; optional?: boolean };

/**
 * A piece of a person's text inside a message: at most `max` characters, with control and line-break
 * characters written as escapes, so that a message always stays one inert line.
 */
export function quoteText(text: string, max = 40): string {
  const cut = [...text].slice(0, max).join('');
  return `"${cut.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029\u202a-\u202e\u2066-\u2069"\\]/g, (c) => (c === '"' ? '\\"' : c === '\\' ? '\\\\' : `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`))}${cut.length < text.length ? '…' : ''}"`;
}

const article = (w: string) => (/^[aeiou]/i.test(w) ? 'an' : 'a');

function describe(spec: Spec & { t: 'num' }): string {
  switch (spec.check ?? 'any') {
    case 'positive': return `must be a positive number of ${spec.what}`;
    case 'nonneg': return `must be zero or a positive number of ${spec.what}`;
    case 'fraction': return `must be a number of ${spec.what} from 0 to 1`;
    default: return `must be ${article(spec.what)} number of ${spec.what}`.replace('a number of a ', 'a ');
  }
}

const join = (path: string, key: string | number) =>
  typeof key === 'number' ? `${path}[${key}]` : path ? `${path}.${key}` : key;

/** Checks `value` against `spec`; pushes problems; returns the value with defaults applied. */
export function check(value: unknown, spec: Spec, path: string, problems: Problem[]): unknown {
  const label = path || '(document)';
  if (value === undefined) {
    // An object's default is checked too, so that its own fields' defaults fill in.
    if ('def' in spec && spec.def !== undefined && spec.def !== null && spec.t === 'obj') return check(structuredClone(spec.def), spec, path, problems);
    if ('def' in spec && spec.def !== undefined) return structuredClone(spec.def);
    if (spec.optional) return undefined;
    problems.push({ path: label, message: 'is missing' });
    return undefined;
  }
  switch (spec.t) {
    case 'num': {
      if (typeof value !== 'number' || !Number.isFinite(value)) {
        problems.push({ path: label, message: describe(spec) + (typeof value === 'string' ? ` (got the text ${quoteText(value)})` : '') });
        return undefined;
      }
      const c = spec.check ?? 'any';
      if ((c === 'positive' && !(value > 0)) || (c === 'nonneg' && value < 0) || (c === 'fraction' && (value < 0 || value > 1))) {
        // With a lower bound the bound says more than the sign ("at least 0.36 coulombs", not "positive").
        const limit = spec.min !== undefined && c !== 'fraction' ? { kind: 'min' as const, value: spec.min } : { kind: c, value: c === 'fraction' ? 1 : 0 };
        problems.push({ path: label, message: describe(spec), limit });
        return undefined;
      }
      if (spec.whole && !Number.isInteger(value)) {
        problems.push({ path: label, message: `must be a whole number of ${spec.what}`, limit: { kind: 'whole', value: Math.round(value) } });
        return undefined;
      }
      if (spec.min !== undefined && value < spec.min) {
        problems.push({ path: label, message: `must be at least ${spec.min} ${spec.what}`, limit: { kind: 'min', value: spec.min } });
        return undefined;
      }
      if (spec.max !== undefined && value > spec.max) {
        problems.push({ path: label, message: `must be at most ${spec.max} ${spec.what}`, limit: { kind: 'max', value: spec.max } });
        return undefined;
      }
      if (spec.maxAbs !== undefined && Math.abs(value) > spec.maxAbs) {
        problems.push({ path: label, message: `is out of bounds: keep it within ±${spec.maxAbs} ${spec.what}`, limit: { kind: 'maxAbs', value: spec.maxAbs } });
        return undefined;
      }
      if (spec.minAbs !== undefined && value !== 0 && Math.abs(value) < spec.minAbs) {
        const zeroOk = c !== 'positive' && (spec.min === undefined || spec.min <= 0) && (spec.max === undefined || spec.max >= 0);
        problems.push({ path: label, message: `is too small to mean anything: ${zeroOk ? 'use 0 or ' : 'use '}at least ${spec.minAbs} ${spec.what}${c === 'any' ? ' in size' : ''}`, limit: { kind: 'minAbs', value: spec.minAbs } });
        return undefined;
      }
      return value;
    }
    case 'str': {
      if (typeof value !== 'string') {
        problems.push({ path: label, message: spec.oneOf ? `must be one of ${spec.oneOf.map((s) => `"${s}"`).join(', ')}` : 'must be text' });
        return undefined;
      }
      if (spec.oneOf && !spec.oneOf.includes(value)) {
        problems.push({ path: label, message: `must be one of ${spec.oneOf.map((s) => `"${s}"`).join(', ')} (got ${quoteText(value)})` });
        return undefined;
      }
      if (spec.maxLength !== undefined && value.length > spec.maxLength) {
        problems.push({ path: label, message: `is too long (at most ${spec.maxLength} characters)` });
        return undefined;
      }
      if (spec.pattern && !spec.pattern.test(value)) {
        problems.push({ path: label, message: `${spec.patternHint ?? 'has characters this field does not take'} (got ${quoteText(value, 20)})` });
        return undefined;
      }
      return value;
    }
    case 'bool':
      if (typeof value !== 'boolean') {
        problems.push({ path: label, message: 'must be true or false' });
        return undefined;
      }
      return value;
    case 'obj': {
      if (value === null && spec.nullable) return null;
      if (typeof value !== 'object' || value === null || Array.isArray(value)) {
        problems.push({ path: label, message: spec.nullable ? 'must be an object or null' : 'must be an object' });
        return undefined;
      }
      return checkFields(value as Record<string, unknown>, spec.fields, path, problems);
    }
    case 'tuple': {
      if (value === null && spec.nullable) return null;
      if (!Array.isArray(value) || value.length !== spec.items.length) {
        problems.push({ path: label, message: `must be a list of ${spec.items.length} values` });
        return undefined;
      }
      return spec.items.map((s, i) => check(value[i], s, join(path, i), problems));
    }
    case 'list': {
      if (!Array.isArray(value)) {
        problems.push({ path: label, message: 'must be a list' });
        return undefined;
      }
      if (spec.nonEmpty && value.length === 0) {
        problems.push({ path: label, message: 'must not be empty' });
        return undefined;
      }
      if (spec.maxItems !== undefined && value.length > spec.maxItems) {
        problems.push({ path: label, message: `has too many entries (at most ${spec.maxItems})` });
        return undefined;
      }
      return value.map((v, i) => check(v, spec.item, join(path, i), problems));
    }
    case 'variant': {
      if (typeof value !== 'object' || value === null || Array.isArray(value)) {
        problems.push({ path: label, message: 'must be an object' });
        return undefined;
      }
      const tag = ownValue(value as Record<string, unknown>, spec.tag);
      const names = Object.keys(spec.variants);
      if (typeof tag !== 'string' || !names.includes(tag)) {
        problems.push({ path: join(path, spec.tag), message: `must be one of ${names.map((s) => `"${s}"`).join(', ')}` });
        return undefined;
      }
      return checkFields(value as Record<string, unknown>, { [spec.tag]: { t: 'str' }, ...spec.variants[tag]! }, path, problems);
    }
  }
}

/** A key's value only when the object holds it itself (never `constructor` or `toString` from its prototype). */
const ownValue = (obj: Record<string, unknown>, key: string): unknown => (Object.hasOwn(obj, key) ? obj[key] : undefined);

function checkFields(obj: Record<string, unknown>, fields: Record<string, Spec>, path: string, problems: Problem[]): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const key of Object.keys(obj)) {
    if (!Object.hasOwn(fields, key)) problems.push({ path: join(path, quoteKey(key)), message: 'is not a field this format knows' });
  }
  for (const [key, s] of Object.entries(fields)) {
    const v = check(ownValue(obj, key), s, join(path, key), problems);
    if (v !== undefined) out[key] = v;
  }
  return out;
}

/** A key as it may appear in a path: plain when it is a simple name, quoted (and escaped) otherwise. */
function quoteKey(key: string): string {
  return /^[A-Za-z_$][\w$]{0,39}$/.test(key) ? key : quoteText(key);
}
