/**
 * The kit file ("gainwright-kit"): our own format, read by the design's own kit schema. Kits are scenarios of
 * our own; E12 values from IEC 60063 (published).
 */
import { describe, expect, it } from 'vitest';
import {
  KIT_FILE_FORMAT, MAX_KIT_FILE_BYTES, MAX_SHELF_KITS, parseKitFileText, parseKitShelf, serialiseKitFile, serialiseKitShelf, shelveKit, validateKitFile,
  type NamedKit,
} from '../../src/model/kit-file.js';
import { validateDesign } from '../../src/model/design.js';
import { designFrom } from '../helpers.js';

const drawer: NamedKit = { name: 'drawer (scenario of our own)', kit: { series: 'E12', min: 10, max: 1e6, count: 5, parts: [{ ohms: 4700, count: 2 }, { ohms: 150e3 }] } };

describe('parseKitFileText(serialiseKitFile(kit))', () => {
  it('reads back the kit and its name as written', () => {
    const text = serialiseKitFile(drawer);
    expect(JSON.parse(text).format).toBe(KIT_FILE_FORMAT);
    expect(parseKitFileText(text)).toEqual({ ok: true, named: drawer });
    // A byte-order mark before the JSON is not part of it.
    expect(parseKitFileText('\ufeff' + text)).toEqual({ ok: true, named: drawer });
  });

  it('fills the defaults of the design\'s kit schema (min 10 Ω, max 1 MΩ, no parts) and a name', () => {
    const r = validateKitFile({ format: 'gainwright-kit', version: 1, kit: { series: 'E6' } });
    expect(r).toEqual({ ok: true, named: { name: 'my kit', kit: { series: 'E6', min: 10, max: 1e6, parts: [] } } });
  });

  it('the kit it reads is one a design takes as target.kit unchanged', () => {
    const d = designFrom('generic-sensor');
    const v = validateDesign({ ...d, target: { ...d.target, kit: drawer.kit } });
    expect(v.ok && v.design.target.kit).toEqual(drawer.kit);
  });
});

describe('parseKitFileText refuses', () => {
  const problems = (text: string) => { const r = parseKitFileText(text); return r.ok ? [] : r.problems.map((p) => `${p.path}: ${p.message}`); };
  const doc = (o: object) => JSON.stringify({ format: 'gainwright-kit', version: 1, name: 'k', ...o });
  it('text that is not JSON, another format, a wrong version, a field it does not know, a key twice', () => {
    expect(problems('{ "format": ')).toEqual(['(file): is not valid JSON']);
    expect(problems('[1, 2]')).toEqual(['(document): must be a JSON object']);
    expect(problems(JSON.stringify({ format: 'gainwright-opamps', version: 1, opamps: [] }))).toEqual(['format: must be "gainwright-kit"']);
    expect(problems(doc({ version: 2, kit: { series: 'E12' } }))).toEqual(['version: must be 1']);
    expect(problems(doc({ kit: { series: 'E12' }, extra: 1 }))).toEqual(['extra: is not a field this format knows']);
    expect(problems('{"format":"gainwright-kit","version":1,"name":"a","name":"b","kit":{"series":"E12"}}')).toEqual(['name: appears twice in the file: keep the one you mean and delete the other']);
  });
  it('a kit the design would refuse: a count that is not whole, limits reversed, an unknown series, nothing in it, no kit', () => {
    expect(problems(doc({ kit: { parts: [{ ohms: 1e4, count: 1.5 }] } }))[0]).toMatch(/^kit\.parts\[0\]\.count: /);
    expect(problems(doc({ kit: { series: 'E12', min: 1e5, max: 1e3 } }))).toEqual(['kit.min: must be below kit.max']);
    expect(problems(doc({ kit: { series: 'E7' } }))[0]).toMatch(/^kit\.series: /);
    expect(problems(doc({ kit: { parts: [] } }))[0]).toMatch(/^kit\.parts: is empty/);
    expect(problems(doc({}))[0]).toMatch(/^kit: is missing/);
    expect(problems(doc({ name: 'x'.repeat(81), kit: { series: 'E12' } }))[0]).toMatch(/^name: /);
  });
  it('a file larger than the limit, before parsing it', () => {
    expect(problems(' '.repeat(MAX_KIT_FILE_BYTES + 1))[0]).toMatch(/^\(file\): is larger than 100 kB/);
  });
  it('keeps a name with control characters as plain data (the views write it inert)', () => {
    const r = parseKitFileText(doc({ name: 'evil \u001b[2J <b>x</b>', kit: { series: 'E12' } }));
    expect(r.ok && r.named.name).toBe('evil \u001b[2J <b>x</b>');
  });
});

describe('the shelf of kits kept in the browser', () => {
  it('reads back what it wrote; an entry that no longer reads is left out and counted, the others kept', () => {
    const two = [drawer, { name: 'E6 box', kit: { series: 'E6' as const, min: 100, max: 1e6, parts: [] } }];
    expect(parseKitShelf(serialiseKitShelf(two))).toEqual({ kits: two, dropped: 0 });
    const damaged = JSON.parse(serialiseKitShelf(two));
    damaged[0].kit.min = 'ten';
    expect(parseKitShelf(JSON.stringify(damaged))).toEqual({ kits: [two[1]], dropped: 1 });
    expect(parseKitShelf('not json')).toEqual({ kits: [], dropped: 1 });
  });
  it('shelveKit replaces a kit of the same name in place, adds a new one last, and refuses one more than the limit', () => {
    const a = { name: 'a', kit: { series: 'E12' as const, min: 10, max: 1e6, parts: [] } };
    const b = { name: 'b', kit: { series: 'E6' as const, min: 10, max: 1e6, parts: [] } };
    const a2 = { name: 'a', kit: { min: 10, max: 1e6, parts: [{ ohms: 1e3 }] } };
    expect(shelveKit([a, b], a2)).toEqual([a2, b]);
    expect(shelveKit([a], b)).toEqual([a, b]);
    const full = Array.from({ length: MAX_SHELF_KITS }, (_, i) => ({ ...a, name: `k${i}` }));
    expect(shelveKit(full, b)).toBeNull();
    expect(shelveKit(full, { ...b, name: 'k3' })![3]!.kit).toEqual(b.kit);
  });
});
