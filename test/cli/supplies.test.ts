/**
 * `gainwright compare DESIGN --supplies [--json]` (issue 18, part 3): the supply choices in the terminal and as
 * JSON lines. Designs are scenarios of our own invention.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { run } from './run.js';
import { DEMOS } from '../../src/model/demos.js';
import { archetype } from '../../src/model/opamps.js';
import { supplyChoices } from '../../src/present/comparison.js';
import { designFrom } from '../helpers.js';

let dir: string;
// Our own 9 V scenario: the generic 12.5 mV/A sensor to 0.1 V/A about 4.5 V over ±20 A, sensor and reference
// on a 5 V regulator, a general-purpose op-amp; a 9 V alkaline (fresh 9.6 V, 565 mAh: Wikipedia "Nine-volt
// battery", citing IEC 60086-2) run down to 6.0 V. The title carries a terminal escape, which must stay inert.
const patch = (x: any) => {
  x.title = 'probe \u001b[2J on 9 V';
  x.supply = { positive: 9, negative: 0, regulated: { voltage: 5, tolerance: 0.02, quiescentCurrent: 5e-6 }, sensorRail: 'regulated', referenceRail: 'regulated', battery: { fresh: 9.6, endOfLife: 6.0, capacity: 565e-3 * 3600 } };
  x.opamp = { ...archetype('bipolar-general')!.spec };
};
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'gw-supplies-'));
  const doc = structuredClone(DEMOS.find((d) => d.id === 'generic-sensor')!.document) as any;
  patch(doc);
  writeFileSync(join(dir, 'battery.json'), JSON.stringify(doc));
  writeFileSync(join(dir, 'bench.json'), JSON.stringify(DEMOS.find((d) => d.id === 'generic-sensor')!.document));
});

describe('gainwright compare --supplies', () => {
  it('--json prints one object per supply choice, the core\'s rows in the core\'s order, with the documented keys', async () => {
    const r = await run(['compare', join(dir, 'battery.json'), '--supplies', '--json']);
    expect(r.code).toBe(0);
    const rows = r.out.trim().split('\n').map((l) => JSON.parse(l));
    const expected = supplyChoices(designFrom('generic-sensor', patch));
    expect(rows.map((x) => x.kind)).toEqual(expected.map((o) => o.kind));
    expect(rows.map((x) => x.kind)).toEqual(['as-is', 'zero', 'rail-to-rail', 'front-end-regulated', 'split', 'pair']);
    for (const row of rows) {
      for (const k of ['kind', 'name', 'current', 'positive', 'negative', 'regulated', 'batteryRails', 'zero', 'opamp', 'fits', 'misfits', 'measurandLow', 'measurandHigh', 'endOfLifeLow', 'endOfLifeHigh', 'supplyCurrent', 'batteryLife', 'hoursToClip', 'verdict', 'findings', 'notes']) expect(row).toHaveProperty(k);
    }
    // The zero for end of life: (0.05 + 4.5)/2 = 2.275 V to 10 mV, linear (0.05 − z)/0.1 … (4.5 − z)/0.1 at 6.0 V
    // (closed form Vout = zero + scale·x; a general-purpose output 1.5 V short of the + rail, common practice).
    const zero = rows.find((x) => x.kind === 'zero');
    expect(Math.abs(zero.zero - 2.275)).toBeLessThanOrEqual(0.0051);
    expect(zero.endOfLifeHigh).toBeCloseTo((4.5 - zero.zero) / 0.1, 0);
    expect(zero.notes[0].code).toBe('supply-zero-centred');
    expect(zero.notes[0].text).toMatch(/instead of 4\.50 V/);
    // The whole front end on the regulator: one 5 V rail over ground.
    const reg = rows.find((x) => x.kind === 'front-end-regulated');
    expect([reg.positive, reg.negative, reg.regulated, reg.batteryRails]).toEqual([5, 0, 5, 'regulated']);
    // The rail-to-rail row names its op-amp; at end of life (6.0 − 0.02 − 4.5)/0.1 = 14.8 A (typical swing, from memory).
    const r2r = rows.find((x) => x.kind === 'rail-to-rail');
    expect(r2r.opamp).toBe(archetype('cmos-rail-to-rail')!.spec.name);
    expect(r2r.endOfLifeHigh).toBeCloseTo(14.8, 0);
    for (const s of ['insulated conductors', 'measurement-category']) expect(r.err).toContain(s);
  });

  it('the text form lists each choice with its notes, keeps the title inert and carries the cautions', async () => {
    const r = await run(['compare', join(dir, 'battery.json'), '--supplies']);
    expect(r.code).toBe(0);
    expect(r.out).not.toMatch(/[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/);
    expect(r.out).toContain('supplies compared');
    expect(r.out).toContain('The battery as it is, zero for the end of its life');
    expect(r.out).toContain('The whole front end on a regulator');
    expect(r.out).toMatch(/The battery is spent at 6\.00 V/);
    for (const s of ['insulated conductors', 'measurement-category']) expect(r.out).toContain(s);
  });

  it('says so for a design on a bench supply, and refuses --supplies with --opamps or on another command', async () => {
    const bench = await run(['compare', join(dir, 'bench.json'), '--supplies']);
    expect(bench.code).toBe(0);
    expect(bench.out).toMatch(/bench supply/);
    const benchJson = await run(['compare', join(dir, 'bench.json'), '--supplies', '--json']);
    expect(benchJson.out).toBe('');
    expect(benchJson.err).toMatch(/bench supply/);
    expect((await run(['compare', join(dir, 'battery.json'), '--supplies', '--opamps', join(dir, 'battery.json')])).code).toBe(2);
    expect((await run(['report', join(dir, 'battery.json'), '--supplies'])).code).toBe(2);
  });
});
