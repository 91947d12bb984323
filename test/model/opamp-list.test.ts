import { describe, expect, it } from 'vitest';
import { MAX_OPAMPS, parseOpAmpListText, serialiseOpAmpList, validateOpAmpList } from '../../src/model/opamp-list.js';
import { OPAMP_ARCHETYPES } from '../../src/model/opamps.js';
import { validateDesign } from '../../src/model/design.js';
import { DEMOS } from '../../src/model/demos.js';

const doc = (opamps: unknown[]) => ({ format: 'gainwright-opamps', version: 1, opamps });
/** An op-amp of our own with only the required fields (a scenario of our own). */
const minimal = { name: 'drawer part', gbw: 3e6, slewRate: 1e6, openLoopGainDb: 110, inputLow: 0, inputHigh: 1.2, outputLow: 0.1, outputHigh: 1.0, voltageNoise: 20e-9, currentNoise: 0.2e-12, offsetVoltage: 1e-3, biasCurrent: 20e-9, supplyCurrent: 0.8e-3 };

describe('validateOpAmpList(doc)', () => {
  it('reads a list and fills each entry\'s defaults exactly as a design\'s opamp is filled', () => {
    const v = validateOpAmpList(doc([minimal]));
    expect(v.ok).toBe(true);
    const d = structuredClone(DEMOS.find((x) => x.id === 'generic-sensor')!.document) as any;
    d.opamp = minimal;
    const asDesign = validateDesign(d);
    expect(asDesign.ok).toBe(true);
    if (!asDesign.ok || !v.ok) throw new Error('both must validate');
    expect(v.opamps).toHaveLength(1);
    // Defaults were filled (more keys than the minimal entry gave), and filled the same way as in a design.
    expect(Object.keys(v.opamps[0]!).length).toBeGreaterThan(Object.keys(minimal).length);
    expect(v.opamps[0]).toEqual(asDesign.design.opamp);
  });
  it('names each problem by its path in the list, with the design\'s own messages', () => {
    const v = validateOpAmpList(doc([minimal, { ...minimal, gbw: -1, extra: 1 }]));
    expect(v.ok).toBe(false);
    expect(!v.ok && v.problems.map((p) => p.path)).toEqual(['opamps[1].extra', 'opamps[1].gbw']);
    expect(!v.ok && v.problems[1]!.message).toBe('must be a positive number of hertz');
  });
  it('refuses another format, a wrong version, a missing list, unknown keys and too many entries', () => {
    expect(validateOpAmpList({ format: 'gainwright-design', version: 1, opamps: [] }).ok).toBe(false);
    expect(validateOpAmpList({ ...doc([]), version: 2 }).ok).toBe(false);
    expect(validateOpAmpList({ format: 'gainwright-opamps', version: 1 }).ok).toBe(false);
    expect(validateOpAmpList({ ...doc([]), __proto__: 1, more: 2 }).ok).toBe(false);
    expect(validateOpAmpList(doc(Array.from({ length: MAX_OPAMPS + 1 }, () => minimal))).ok).toBe(false);
    expect(validateOpAmpList(null).ok).toBe(false);
    expect(validateOpAmpList([]).ok).toBe(false);
  });
  it('an empty list is a valid list', () => expect(validateOpAmpList(doc([]))).toEqual({ ok: true, opamps: [] }));
});

describe('parseOpAmpListText(text)', () => {
  it('reads back what serialiseOpAmpList wrote (every archetype, figures unchanged)', () => {
    const specs = OPAMP_ARCHETYPES.map((a) => a.spec);
    expect(parseOpAmpListText(serialiseOpAmpList(specs))).toEqual({ ok: true, opamps: specs });
  });
  it('skips a byte-order mark, refuses a key given twice, text that is not JSON, and a huge file', () => {
    expect(parseOpAmpListText('\ufeff' + serialiseOpAmpList([])).ok).toBe(true);
    const twice = parseOpAmpListText('{"format":"gainwright-opamps","version":1,"opamps":[{"name":"a","name":"b"}]}');
    expect(!twice.ok && twice.problems[0]!.path).toBe('opamps[0].name');
    expect(parseOpAmpListText('{').ok).toBe(false);
    expect(parseOpAmpListText(' '.repeat(300_000)).ok).toBe(false);
  });
});
