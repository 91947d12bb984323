/**
 * Hostile and odd design files (issue 14): whole-number fields, keys named like built-in object properties,
 * duplicate keys, byte-order marks and UTF-16, control characters in messages, measurand symbols and the
 * smallest meaningful size of every number.
 */
import { describe, expect, it } from 'vitest';
import { decodeDesignBytes, firstDuplicateKey, parseDesignText, validateDesign } from '../../src/model/design.js';
import { DEMOS } from '../../src/model/demos.js';

const demo = (id = 'generic-sensor') => structuredClone(DEMOS.find((d) => d.id === id)!.document) as Record<string, any>;
const problemsOf = (doc: unknown) => { const v = validateDesign(doc); return v.ok ? [] : v.problems; };

describe('validateDesign: whole numbers', () => {
  it('refuses target.alternative 0.5 and 1e-9 as not a whole number, and accepts 2', () => {
    for (const bad of [0.5, 1e-9]) {
      const d = demo(); d.target.alternative = bad;
      expect(problemsOf(d)).toEqual([expect.objectContaining({ path: 'target.alternative', message: expect.stringMatching(/whole number/) })]);
    }
    const ok = demo(); ok.target.alternative = 2;
    expect(validateDesign(ok).ok).toBe(true);
  });
  it('refuses fractional turns, trials and seeds', () => {
    const h = demo('bench-clamp'); h.sensor.turns = 1.5;
    expect(problemsOf(h).map((p) => p.path)).toEqual(['sensor.turns']);
    const c = demo('appliance-ct'); c.sensor.secondaryTurns = 1999.5;
    expect(problemsOf(c).map((p) => p.path)).toEqual(['sensor.secondaryTurns']);
    const a = demo(); a.analysis = { spreadTrials: 100.5, spreadSeed: 0.1 };
    expect(problemsOf(a).map((p) => p.path).sort()).toEqual(['analysis.spreadSeed', 'analysis.spreadTrials']);
  });
});

describe('validateDesign: keys', () => {
  it('refuses keys named like built-in object properties, at any level, as unknown fields', () => {
    for (const key of ['__proto__', 'constructor', 'toString', 'hasOwnProperty', 'valueOf']) {
      const text = JSON.stringify(demo()).replace('"opamp":{', `"opamp":{"${key}":1,`).replace('{"format"', `{"${key}":{},"format"`);
      const v = parseDesignText(text);
      expect(v.ok, key).toBe(false);
      if (!v.ok) expect(v.problems.map((p) => p.path).sort()).toEqual([key, `opamp.${key}`].sort());
    }
  });
  it('never reads a field from the object prototype (a design without "name" gets the default, not a function)', () => {
    const d = demo();
    delete d.opamp.name;
    const v = validateDesign(d);
    expect(v.ok && v.design.opamp.name).toBe('custom');
  });
  it('refuses a key that appears twice in one object, naming it', () => {
    const text = JSON.stringify(demo()).replace('"gbw":1000000', '"gbw":1000000,"gbw":1');
    const v = parseDesignText(text);
    expect(v.ok).toBe(false);
    if (!v.ok) expect(v.problems).toEqual([{ path: 'opamp.gbw', message: expect.stringMatching(/appears twice/) }]);
  });
  it('firstDuplicateKey tells keys from values and sees through nesting and arrays', () => {
    expect(firstDuplicateKey('{"a":"x,\\"a\\":","b":[{"a":1},{"a":2}]}')).toBeNull();
    expect(firstDuplicateKey('{"a":1,"b":{"c":[1,{"d":2,"d":3}]}}')).toBe('b.c[1].d');
    expect(firstDuplicateKey('{"a":1,"b":{"a":2},"a":3}')).toBe('a');
    expect(firstDuplicateKey('[[[[[[[[[[{"x":1}]]]]]]]]]]')).toBeNull();
    expect(firstDuplicateKey('['.repeat(200000) + ']'.repeat(200000))).toBeNull();
  });
});

describe('decodeDesignBytes and parseDesignText: encodings and one-line messages', () => {
  const json = JSON.stringify(demo());
  const utf16 = (s: string, be: boolean, bom: boolean) => {
    const out: number[] = bom ? (be ? [0xfe, 0xff] : [0xff, 0xfe]) : [];
    for (let i = 0; i < s.length; i++) { const c = s.charCodeAt(i); out.push(...(be ? [c >> 8, c & 255] : [c & 255, c >> 8])); }
    return Uint8Array.from(out);
  };
  it('reads UTF-8 with and without a byte-order mark, and UTF-16 in both byte orders, to the same design', () => {
    const plain = new TextEncoder().encode(json);
    const inputs = [plain, Uint8Array.from([0xef, 0xbb, 0xbf, ...plain]), utf16(json, false, true), utf16(json, true, true), utf16(json, false, false)];
    for (const bytes of inputs) {
      const t = decodeDesignBytes(bytes);
      expect(t.ok).toBe(true);
      if (t.ok) expect(parseDesignText(t.text).ok).toBe(true);
    }
  });
  it('a byte-order mark left in the text is skipped', () => {
    expect(parseDesignText('\ufeff' + json).ok).toBe(true);
  });
  it('refuses bytes that are not text with one line', () => {
    const t = decodeDesignBytes(Uint8Array.from([0x7b, 0xff, 0xfe, 0xfd, 0x80]));
    expect(t.ok).toBe(false);
    if (!t.ok) expect(t.problems[0]!.message).not.toMatch(/[\n\r\u0000]/);
  });
  it('says where JSON breaks in one line without quoting control characters', () => {
    for (const text of ['{"a": \u0000\u0000\n\u001b[2J', '{"a": ', '{\n  "a": 1,\n  x\n}', '\u0000{\u0000"']) {
      const v = parseDesignText(text);
      expect(v.ok).toBe(false);
      if (!v.ok) {
        expect(v.problems).toHaveLength(1);
        expect(v.problems[0]!.message).toMatch(/^is not valid JSON/);
        expect(v.problems[0]!.message).not.toMatch(/[\u0000-\u001f]/);
      }
    }
    const v = parseDesignText('{\n  "a": 1,\n  x\n}');
    expect(!v.ok && v.problems[0]!.message).toBe('is not valid JSON (at line 3, column 3)');
  });
  it('a text value quoted back in a message has its control characters escaped', () => {
    const d = demo(); d.target.series = 'E96\n\u001b]0;owned\u0007';
    const p = problemsOf(d);
    expect(p[0]!.path).toBe('target.series');
    expect(p[0]!.message).not.toMatch(/[\u0000-\u001f]/);
    expect(p[0]!.message).toMatch(/\\u001b/);
  });
});

describe('validateDesign: the measurand is a unit symbol', () => {
  it('accepts A, mT, V, kPa, °C, %RH and m/s²', () => {
    for (const m of ['A', 'mT', 'V', 'kPa', '°C', '%RH', 'm/s²']) {
      const d = demo(); d.sensor.measurand = m;
      expect(validateDesign(d).ok, m).toBe(true);
    }
  });
  it('refuses a newline, a SPICE directive, spaces, quotes, a formula and control characters', () => {
    for (const m of ['A\n.inc x', 'A\r\nshell', '.inc', '* A', 'A B', '"A"', '=1+1', 'A\u0000', '', '\u001b[2J']) {
      const d = demo(); d.sensor.measurand = m;
      const p = problemsOf(d);
      expect(p.map((x) => x.path), JSON.stringify(m)).toEqual(['sensor.measurand']);
      expect(p[0]!.message).not.toMatch(/[\u0000-\u001f]/);
    }
  });
});

describe('validateDesign: physically sensible bounds', () => {
  it('refuses the tiny values of issue 14 at their fields', () => {
    const cases: Array<[string, (d: any) => void, string]> = [
      ['generic-sensor', (d) => { d.sensor.sourceResistance = 1e-200; }, 'sensor.sourceResistance'],
      ['generic-sensor', (d) => { d.sensor.sensitivity = 5e-324; }, 'sensor.sensitivity'],
      ['generic-sensor', (d) => { d.opamp.gbw = 1e-300; }, 'opamp.gbw'],
      ['generic-sensor', (d) => { d.target.scale = -1e-300; }, 'target.scale'],
      ['bench-clamp', (d) => { d.sensor.core.gap = 1e-300; }, 'sensor.core.gap'],
      ['bench-clamp', (d) => { d.supply.battery.capacity = 0; }, 'supply.battery.capacity'],
      ['appliance-ct', (d) => { d.sensor.inductanceFactor = 1e-300; }, 'sensor.inductanceFactor'],
    ];
    for (const [id, f, path] of cases) {
      const d = demo(id); f(d);
      expect(problemsOf(d).map((p) => p.path), path).toEqual([path]);
    }
  });
  it('still takes zero where zero means "none"', () => {
    const d = demo(); d.sensor.sourceResistance = 0; d.opamp.offsetVoltage = 0; d.target.bandwidth = 0;
    expect(validateDesign(d).ok).toBe(true);
  });
  it('a bound broken carries the bound, so that a screen can write it in its own unit', () => {
    const d = demo('bench-clamp'); d.supply.battery.capacity = 0.1;
    expect(problemsOf(d)[0]!.limit).toEqual({ kind: 'min', value: 0.36 });
  });
});

describe('validateDesign: cross-field rules name every field and the fix', () => {
  it('a 5 V regulator on a 3.3 V rail names the rail, the regulator and what to change', () => {
    const d = demo('bench-clamp'); d.supply.positive = 3.3; d.supply.battery = null;
    const p = problemsOf(d).find((x) => x.path === 'supply.regulated.voltage')!;
    expect(p.message).toMatch(/at least 5\.3 V/);
    expect(p.message).toMatch(/raise supply\.positive/);
    expect(p.other).toEqual(expect.arrayContaining(['supply.positive', 'supply.regulated']));
  });
  it('a lowest temperature above the design temperature sits at the lowest temperature', () => {
    const d = demo(); d.environment = { temperature: 298.15, temperatureMin: 323.15, temperatureMax: 333.15 };
    expect(problemsOf(d)).toEqual([expect.objectContaining({ path: 'environment.temperatureMin', other: ['environment.temperature'] })]);
  });
});
