import { describe, expect, it, beforeAll } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { run } from './run.js';
import { DEMOS } from '../../src/model/demos.js';


let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'gw-trade-'));
  const clamp = structuredClone(DEMOS.find((d) => d.id === 'bench-clamp')!.document) as any;
  clamp.sensor.core.width = 0.01; clamp.sensor.core.depth = 0.01;
  writeFileSync(join(dir, 'clamp.json'), JSON.stringify(clamp));
  writeFileSync(join(dir, 'probe.json'), JSON.stringify(DEMOS.find((d) => d.id === 'generic-sensor')!.document));
});

describe('gainwright report: the trade sweep (issue 19)', () => {
  it('--json carries trade rows with the issue\'s fields; the design\'s own point matches the top-level figures', async () => {
    const r = await run(['report', join(dir, 'clamp.json'), '--json', '--no-spread']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.trade.length).toBe(15);
    const own = j.trade.find((p: any) => p.current && p.sweep === 'turns');
    for (const k of ['turns', 'sensitivity', 'coreSaturation', 'sensorLinear', 'gain', 'bandwidth', 'noiseReferred', 'insertionInductance']) expect(own).toHaveProperty(k);
    expect(own.bandwidth / j.bandwidth.smallSignal).toBeCloseTo(1, 9);
    expect(own.sensitivity / j.sensor.sensitivity).toBeCloseTo(1, 12);
    expect(own.insertionInductance).toBeGreaterThan(0);
  });
  it('the text report prints the trade as a table', async () => {
    const r = await run(['report', join(dir, 'clamp.json'), '--no-spread']);
    expect(r.out).toMatch(/What each turn buys \(gap held\)/);
    expect(r.out).toMatch(/Inductance added/);
  });
  it('a voltage-output sensor has no trade: an empty list', async () => {
    const j = JSON.parse((await run(['report', join(dir, 'probe.json'), '--json', '--no-spread'])).out);
    expect(j.trade).toEqual([]);
  });
});

describe('gainwright report --range=N (issue 19): one position of the range switch', () => {
  // The two-range demo (our own invention): position 2 is 40 mV/A over ±50 A.
  const two = () => { const p = join(dir, 'two.json'); writeFileSync(p, JSON.stringify(DEMOS.find((d) => d.id === 'two-range-clamp')!.document)); return p; };
  it('without --spice prints that position\'s own report, headed by which position it is; --json carries its figures', async () => {
    const text = await run(['report', two(), '--range=2', '--no-spread']);
    expect(text.code).toBe(0);
    expect(text.out.split('\n')[0]).toMatch(/^Range switch SW1 .* at position 2 of 2: 40\.00 mV\/A over -50\.00 A to 50\.00 A/);
    expect(text.out).toMatch(/Verdict/);
    const j = JSON.parse((await run(['report', two(), '--range=2', '--json', '--no-spread'])).out);
    expect(j.rangePosition).toBe(2);
    // The position's report is a single-range design of 40 mV/A, equal to what the whole report lists for it.
    const whole = JSON.parse((await run(['report', two(), '--json', '--no-spread'])).out);
    const p2 = whole.ranges.find((x: any) => x.position === 2);
    expect(j.scale).toBeCloseTo(0.04, 5);
    expect(j.scale).toBe(p2.scale);
    expect(j.scale).not.toBe(whole.scale);
  });
  it('a position the design does not have is exit 1 with one line; a position out of 1…4 is exit 2', async () => {
    const r = await run(['report', two(), '--range=3']);
    expect(r.code).toBe(1);
    expect(r.err.trim().split('\n')).toHaveLength(1);
    expect((await run(['report', two(), '--range=9'])).code).toBe(2);
  });
});
