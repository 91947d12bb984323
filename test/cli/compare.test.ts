import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { run } from './run.js';
import { DEMOS } from '../../src/model/demos.js';
import { OPAMP_ARCHETYPES, archetype } from '../../src/model/opamps.js';
import { serialiseOpAmpList } from '../../src/model/opamp-list.js';


let dir: string;
const bipolar = archetype('bipolar-general')!.spec;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'gw-compare-'));
  // Scenarios of our own: the generic demo with the built-in general-purpose op-amp over ±35 A (the output
  // must reach 8 V on 9 V), and a list of two op-amps of a person's own, one named with a terminal escape.
  const doc = structuredClone(DEMOS.find((d) => d.id === 'generic-sensor')!.document) as any;
  doc.opamp = { ...bipolar };
  doc.target.range = [-35, 35];
  writeFileSync(join(dir, 'probe.json'), JSON.stringify(doc));
  writeFileSync(join(dir, 'mine.json'), serialiseOpAmpList([
    { ...bipolar, name: 'drawer part A', outputHigh: 0.8 },
    { ...bipolar, name: 'evil \u001b[2J\u001b]0;owned\u0007 part', outputHigh: 0.3 },
  ]));
  writeFileSync(join(dir, 'bad-list.json'), JSON.stringify({ format: 'gainwright-opamps', version: 1, opamps: [{ ...bipolar, gbw: 'fast' }] }));
});

describe('gainwright compare', () => {
  it('--json prints one object per op-amp with the named fields, passing first', async () => {
    const r = await run(['compare', join(dir, 'probe.json'), '--json']);
    expect(r.code).toBe(0);
    const rows = r.out.trim().split('\n').map((l) => JSON.parse(l));
    expect(rows).toHaveLength(OPAMP_ARCHETYPES.length);
    for (const row of rows) for (const k of ['name', 'fits', 'measurandLow', 'measurandHigh', 'bandwidth', 'noiseReferred', 'errorAfterTrim', 'batteryLife', 'verdict']) expect(row).toHaveProperty(k);
    // The general-purpose part clips at (7.5 − 4.5)/0.1 = 30 A (non-inverting closed form; common practice
    // for a swing 1.5 V short of the rail): it fails and sorts after the rail-to-rail part.
    const gp = rows.find((x) => x.id === 'bipolar-general');
    expect(gp.fits).toBe(false);
    expect(gp.verdict).toBe('fail');
    expect(gp.measurandHigh).toBeCloseTo(30, 0);
    const r2r = rows.find((x) => x.id === 'cmos-rail-to-rail');
    expect(r2r.fits).toBe(true);
    expect(rows.indexOf(r2r)).toBeLessThan(rows.indexOf(gp));
    const rank = rows.map((x) => ({ pass: 0, caution: 1, fail: 2 })[x.verdict as 'pass']);
    expect(rank).toEqual([...rank].sort((a, b) => a - b));
    expect(gp.batteryLife).toBeNull();
  });
  it('--opamps FILE adds the person\'s own op-amps as rows (either spelling of the option)', async () => {
    for (const args of [['--opamps', join(dir, 'mine.json')], [`--opamps=${join(dir, 'mine.json')}`]]) {
      const r = await run(['compare', join(dir, 'probe.json'), ...args, '--json']);
      expect(r.code).toBe(0);
      const rows = r.out.trim().split('\n').map((l) => JSON.parse(l));
      expect(rows.filter((x) => x.source === 'own').map((x) => x.name).sort()).toEqual(['drawer part A', 'evil \u001b[2J\u001b]0;owned\u0007 part']);
      // 0.8 V short of the rail: (8.2 − 4.5)/0.1 = 37 A ≥ 35 A, so this one fits.
      expect(rows.find((x) => x.name === 'drawer part A').fits).toBe(true);
    }
  });
  it('the text table shows a hostile name inert (no escape character reaches the terminal) and carries the cautions', async () => {
    const r = await run(['compare', join(dir, 'probe.json'), '--opamps', join(dir, 'mine.json')]);
    expect(r.code).toBe(0);
    expect(r.out).not.toMatch(/[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/);
    expect(r.out).toContain('evil \\u001b[2J\\u001b]0;owned\\u0007 part');
    expect(r.out).toContain('fits: no (high end: output swing)');
    for (const s of ['insulated conductors', 'measurement-category']) expect(r.out).toContain(s);
  });
  it('refuses a bad list by path, a missing list argument, --opamps on another command, and a missing design', async () => {
    const bad = await run(['compare', join(dir, 'probe.json'), '--opamps', join(dir, 'bad-list.json')]);
    expect(bad.code).toBe(2);
    expect(bad.err).toContain('opamps[0].gbw: must be a positive number of hertz');
    expect((await run(['compare', join(dir, 'probe.json'), '--opamps'])).code).toBe(2);
    expect((await run(['report', join(dir, 'probe.json'), '--opamps', join(dir, 'mine.json')])).code).toBe(2);
    expect((await run(['compare', join(dir, 'nothing.json')])).code).toBe(2);
    expect((await run(['compare'])).code).toBe(2);
  });
});
