/**
 * `gainwright report|compare DESIGN --kit KIT.json`: the design solved from a kit file's resistors. Designs
 * and kits are scenarios of our own; E12 and E6 values from IEC 60063 (published).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { run } from './run.js';
import { DEMOS } from '../../src/model/demos.js';
import { isMember } from '../../src/model/eseries.js';
import { serialiseKitFile } from '../../src/model/kit-file.js';

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'gw-kit-'));
  writeFileSync(join(dir, 'probe.json'), JSON.stringify(DEMOS.find((d) => d.id === 'generic-sensor')!.document));
  writeFileSync(join(dir, 'e12.json'), serialiseKitFile({ name: 'E12 box', kit: { series: 'E12', min: 10, max: 1e6, parts: [] } }));
  // Only values far below the demo's resistance window (1 kΩ to 1 MΩ): the design cannot take this kit.
  writeFileSync(join(dir, 'tiny.json'), serialiseKitFile({ name: 'tiny', kit: { min: 10, max: 1e6, parts: [{ ohms: 10 }, { ohms: 22 }] } }));
  writeFileSync(join(dir, 'bad.json'), JSON.stringify({ format: 'gainwright-kit', version: 1, name: 'x', kit: { series: 'E12', min: 1e5, max: 1e3 } }));
});

const fixed = (json: any) => json.parts.filter((p: any) => p.series !== 'trimmer' && p.series !== 'capacitor' && p.role !== 'output-series' && p.role !== 'burden');

describe('gainwright report DESIGN --kit KIT', () => {
  it('takes every fixed resistor from the kit file (an E12 box gives E12 values), and without --kit the design\'s E96', async () => {
    const withKit = await run(['report', join(dir, 'probe.json'), '--json', '--no-spread', '--kit', join(dir, 'e12.json')]);
    expect(withKit.code).toBe(0);
    const parts = fixed(JSON.parse(withKit.out));
    expect(parts.length).toBeGreaterThan(1);
    for (const p of parts) expect(isMember(p.ohms, 'E12')).toBe(true);
    const plain = await run(['report', join(dir, 'probe.json'), '--json', '--no-spread']);
    // The demo's own E96 pick is not all E12 (else the kit would prove nothing here).
    expect(fixed(JSON.parse(plain.out)).some((p: any) => !isMember(p.ohms, 'E12'))).toBe(true);
    const eq = await run(['report', join(dir, 'probe.json'), '--json', '--no-spread', `--kit=${join(dir, 'e12.json')}`]);
    expect(eq.out).toBe(withKit.out);
  });

  it('a bad kit file, a kit the design cannot take, a missing file, or --kit with another command: exit 2, one message, no report', async () => {
    const bad = await run(['report', join(dir, 'probe.json'), '--kit', join(dir, 'bad.json')]);
    expect(bad.code).toBe(2);
    expect(bad.out).toBe('');
    expect(bad.err).toMatch(/is not a valid kit file:\n {2}.*kit\.min/);
    const tiny = await run(['report', join(dir, 'probe.json'), '--kit', join(dir, 'tiny.json')]);
    expect(tiny.code).toBe(2);
    expect(tiny.err).toMatch(/cannot take the kit of .*tiny\.json/);
    const none = await run(['report', join(dir, 'probe.json'), '--kit', join(dir, 'nope.json')]);
    expect(none.code).toBe(2);
    expect(none.err).toMatch(/nope\.json: no such file/);
    const other = await run(['new', '--kit', join(dir, 'e12.json')]);
    expect(other.code).toBe(2);
    expect(other.err).toMatch(/--kit goes with report or compare/);
    const dangling = await run(['report', join(dir, 'probe.json'), '--kit']);
    expect(dangling.code).toBe(2);
    // A folder, or a device named like a kit, is refused before anything is read from it.
    const folder = await run(['report', join(dir, 'probe.json'), '--kit', dir]);
    expect([folder.code, folder.err]).toEqual([2, `gainwright: ${dir}: is a folder\n`]);
    const device = await run(['report', join(dir, 'probe.json'), '--kit', '/dev/zero']);
    expect([device.code, device.err]).toEqual([2, 'gainwright: /dev/zero: is not a regular file\n']);
  });

  it('a folder\'s report takes the kit for every design in it', async () => {
    const folder = join(dir, 'designs');
    mkdirSync(folder);
    writeFileSync(join(folder, 'a.json'), JSON.stringify(DEMOS.find((d) => d.id === 'generic-sensor')!.document));
    const r = await run(['report', folder, '--json', '--kit', join(dir, 'e12.json')]);
    expect(r.code).toBe(0);
    const line = JSON.parse(r.out.trim());
    expect(line.ok).toBe(true);
    for (const p of fixed(line)) expect(isMember(p.ohms, 'E12')).toBe(true);
    const refused = await run(['report', folder, '--json', '--kit', join(dir, 'tiny.json')]);
    expect(refused.code).toBe(2);
    expect(JSON.parse(refused.out.trim()).problems[0]).toMatch(/^target\.kit: /);
  });

  it('the example kit file (docs/examples/drawer-kit.json, our own) builds the example design within its counts', async () => {
    const ex = (f: string) => join(__dirname, '../../docs/examples', f);
    const r = await run(['report', ex('bench-clamp-from-readings.json'), '--json', '--no-spread', '--kit', ex('drawer-kit.json')]);
    expect(r.code).toBe(0);
    const parts = fixed(JSON.parse(r.out)).map((p: any) => p.ohms as number);
    expect(parts.length).toBeGreaterThan(1);
    // E12 (IEC 60063) or one of the listed odd values, and never more of one than the kit holds.
    const listed: Record<number, number> = { 4990: 2, 75000: 1, 200000: Infinity };
    for (const ohms of parts) {
      expect(isMember(ohms, 'E12') || ohms in listed).toBe(true);
      const held = (isMember(ohms, 'E12') ? 3 : 0) + (listed[ohms] ?? 0);
      expect(parts.filter((x: number) => x === ohms).length).toBeLessThanOrEqual(held);
    }
  });

  it('compare takes the kit too: every row solved from it', async () => {
    const r = await run(['compare', join(dir, 'probe.json'), '--json', '--kit', join(dir, 'tiny.json')]);
    expect(r.code).toBe(2);
    const ok = await run(['compare', join(dir, 'probe.json'), '--json', '--kit', join(dir, 'e12.json')]);
    expect(ok.code).toBe(0);
    expect(ok.out.trim().split('\n').length).toBeGreaterThan(1);
  });
});
