import { describe, expect, it, beforeAll } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../src/cli/cli.js';
import { DEMOS } from '../../src/model/demos.js';

const run = async (args: string[]) => {
  let out = '', err = '';
  const code = await main(args, { out: (s) => { out += s; }, err: (s) => { err += s; } });
  return { code, out, err };
};

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
