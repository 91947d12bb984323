import { describe, expect, it, beforeAll } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../src/cli/cli.js';
import { DEMOS } from '../../src/model/demos.js';
import { isMember } from '../../src/model/eseries.js';

const run = async (args: string[]) => {
  let out = '', err = '';
  const code = await main(args, { out: (s) => { out += s; }, err: (s) => { err += s; } });
  return { code, out, err };
};

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'gw-cli-'));
  // A design of our own: 12.5 mV/A sensor at 2.5 V, 100 mV/A wanted, 9 V single supply.
  writeFileSync(join(dir, 'probe.json'), JSON.stringify(DEMOS.find((d) => d.id === 'generic-sensor')!.document));
  writeFileSync(join(dir, 'bad.json'), JSON.stringify({ format: 'gainwright-design', version: 1, sensor: { type: 'shunt' }, supply: {}, opamp: { gbw: -5 }, target: {} }));
  writeFileSync(join(dir, 'broken.json'), '{ "format": ');
});

describe('gainwright report', () => {
  it('--json solves 12.5 mV/A → 100 mV/A with E96 parts and scale error under 0.5 %', async () => {
    const r = await run(['report', join(dir, 'probe.json'), '--json', '--no-spread']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.format).toBe('gainwright-report');
    expect(j.version).toBe(1);
    expect(j.topology).toBe('non-inverting');
    for (const p of j.parts.filter((x: any) => x.series === 'E96')) expect(isMember(p.ohms, 'E96')).toBe(true);
    expect(j.parts.filter((x: any) => x.series === 'E96').length).toBeGreaterThan(2);
    expect(Math.abs(j.scaleError)).toBeLessThan(0.005);
    for (const k of ['ref', 'role', 'ohms', 'series', 'tolerance', 'arrangement', 'code']) expect(j.parts[0]).toHaveProperty(k);
    for (const k of ['clip', 'headroom', 'bandwidth', 'noise', 'errors', 'supply', 'spread', 'gain', 'noiseGain', 'zero', 'reference', 'warnings']) expect(j).toHaveProperty(k);
    expect(j.clip.measurandHigh).toBeCloseTo(30, 0);
  });
  it('prints a text report with verdicts, parts, calibration and cautions', async () => {
    const r = await run(['report', join(dir, 'probe.json'), '--no-spread']);
    expect(r.code).toBe(0);
    for (const s of ['Verdict', 'Parts', 'Calibration', 'Safety', 'insulated conductors', 'measurement-category']) expect(r.out).toContain(s);
  });
  it('--spice prints a netlist with the parts and the header', async () => {
    const r = await run(['report', join(dir, 'probe.json'), '--spice', '--no-spread']);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^\* Gainwright netlist: /);
    expect(r.out).toMatch(/ISO 8601/);
    expect(r.out).toMatch(/^R1 /m);
    expect(r.out).toMatch(/^\.end$/m);
  });
  it('a bad design exits 2 naming each field, with no stack trace', async () => {
    const r = await run(['report', join(dir, 'bad.json')]);
    expect(r.code).toBe(2);
    expect(r.err).toContain('opamp.gbw: must be a positive number of hertz');
    expect(r.err).toContain('sensor.resistance: is missing');
    expect(r.err).not.toMatch(/at .*\.ts:\d+/);
  });
  it('broken JSON, a missing file and unknown options exit 2 with a message', async () => {
    expect((await run(['report', join(dir, 'broken.json')])).err).toMatch(/not valid JSON/);
    const missing = await run(['report', join(dir, 'nope.json')]);
    expect(missing.code).toBe(2);
    expect(missing.err).toMatch(/no such file/);
    expect((await run(['report', join(dir, 'probe.json'), '--frobnicate'])).code).toBe(2);
    expect((await run([])).code).toBe(2);
  });
  it('a folder with --json gives one line per design', async () => {
    const sub = join(dir, 'batch');
    mkdirSync(sub);
    for (const d of DEMOS) writeFileSync(join(sub, `${d.id}.json`), JSON.stringify(d.document));
    const r = await run(['report', sub, '--json']);
    const lines = r.out.trim().split('\n').map((l) => JSON.parse(l));
    expect(lines.length).toBe(DEMOS.length);
    expect(lines.every((l) => l.ok && l.format === 'gainwright-report')).toBe(true);
  });
  it('new prints a demo that validates', async () => {
    const r = await run(['new', 'appliance-ct']);
    expect(JSON.parse(r.out).sensor.type).toBe('current-transformer');
  });
  it('the installed bin runs (built by npm install) and exits 2 on a bad file', () => {
    execFileSync('npx', ['tsc', '-p', 'tsconfig.cli.json'], { stdio: 'ignore' });
    const ok = spawnSync('node', ['bin/gainwright.mjs', 'report', join(dir, 'probe.json'), '--json', '--no-spread'], { encoding: 'utf8' });
    expect(ok.status).toBe(0);
    expect(JSON.parse(ok.stdout).topology).toBe('non-inverting');
    const bad = spawnSync('node', ['bin/gainwright.mjs', 'report', join(dir, 'bad.json')], { encoding: 'utf8' });
    expect(bad.status).toBe(2);
    expect(bad.stderr).not.toMatch(/node:internal|\n\s+at /);
  });
});
