import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../src/cli/cli.js';
import { DEMOS } from '../../src/model/demos.js';

describe('gainwright report with a waveform', () => {
  it('--json carries the samples and figures; the text report the figures', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'gw-cli-wave-'));
    // Our own scenario: the generic demo looked at with a 1 kHz square over ±10 A.
    const d = { ...structuredClone(DEMOS.find((x) => x.id === 'generic-sensor')!.document), analysis: { waveform: { shape: 'square', low: -10, high: 10, frequency: 1000, duty: 0.5 } } };
    writeFileSync(join(dir, 'sq.json'), JSON.stringify(d));
    let out = '';
    expect(await main(['report', join(dir, 'sq.json'), '--json', '--no-spread'], { out: (s) => { out += s; }, err: () => {} })).toBe(0);
    const w = JSON.parse(out).waveform;
    expect(Object.keys(w).sort()).toEqual(['clipped', 'droop', 'ideal', 'measurand', 'output', 'overshoot', 'riseTime', 'settlingTime', 'slewLimited', 't'].sort());
    expect(w.t.length).toBe(2000);
    expect(w.output.every((v: unknown) => typeof v === 'number')).toBe(true);
    expect(w.measurand[0]).toBe(10);
    expect(w.riseTime).toBeGreaterThan(0);
    let text = '';
    await main(['report', join(dir, 'sq.json'), '--no-spread'], { out: (s) => { text += s; }, err: () => {} });
    expect(text).toMatch(/Waveform at the instrument/);
    expect(text).toMatch(/Rise time \(10–90 %\): \d/);
  });
});
