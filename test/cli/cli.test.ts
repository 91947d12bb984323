import { describe, expect, it, beforeAll } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { run } from './run.js';
import { DEMOS } from '../../src/model/demos.js';
import { isMember } from '../../src/model/eseries.js';


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
    // Output limit 7.5 V (1.5 V below the 9 V rail) at 100 mV/A about 4.5 V: (7.5 − 4.5)/0.1 = 30 A, within a
    // tolerance ±0.05 A (toBeCloseTo(·, 1)): the solver builds the scale within 0.1 % (0.03 A at 30 A), and the op-amp's
    // 50 Ω output resistance drops about 2 mV (≈ 40 µA into the feedback arm and load; Ohm's law) at the clip, 0.02 A at 100 mV/A.
    expect(j.clip.measurandHigh).toBeCloseTo(30, 1);
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
  it('--spice-sensor prints the closed-loop sensor alone; another sensor type exits 2 saying why', async () => {
    writeFileSync(join(dir, 'closed.json'), JSON.stringify(DEMOS.find((d) => d.id === 'closed-loop-clamp')!.document));
    const r = await run(['report', join(dir, 'closed.json'), '--spice-sensor']);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^\* Gainwright closed-loop Hall sensor alone: /);
    for (const el of ['ISIG', 'LM', 'V_LM_SENSE', 'HHALL', 'RI', 'CI', 'RZ', 'EDRV', 'RW', 'RM']) expect(r.out).toMatch(new RegExp(`^${el} `, 'm'));
    expect(r.out).toMatch(/^\* CAUTION: Never break the compensation winding/m);
    expect(r.out).toMatch(/^\* CAUTION: Clamp only onto insulated conductors/m);
    const other = await run(['report', join(dir, 'probe.json'), '--spice-sensor']);
    expect(other.code).toBe(2);
    expect(other.err).toMatch(/closed-loop-hall/);
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
    // Compiling the CLI is slow on a loaded machine: the limit only guards against a hang, it measures nothing.
  }, 600_000);
  it('a folder of 40 files through the installed bin (shared among worker threads) gives the same lines, in order, as one thread', async () => {
    if (!existsSync('build/cli/batch-worker.js')) execFileSync('npx', ['tsc', '-p', 'tsconfig.cli.json'], { stdio: 'ignore' });
    const many = join(dir, 'many');
    mkdirSync(many, { recursive: true });
    // Every demo, each with its scale moved a little (our own scenarios), and one file that is not a design.
    for (let i = 0; i < 39; i++) {
      const doc = structuredClone(DEMOS[i % DEMOS.length]!.document) as any;
      doc.target.scale *= 1 + i / 100;
      writeFileSync(join(many, `d${String(i).padStart(2, '0')}.json`), JSON.stringify(doc));
    }
    writeFileSync(join(many, 'd39.json'), '{ "format": ');
    const bin = spawnSync('node', ['bin/gainwright.mjs', 'report', many, '--json'], { encoding: 'utf8', maxBuffer: 1 << 28 });
    const here = await run(['report', many, '--json']);
    expect(here.code).toBe(2);
    expect(bin.status).toBe(here.code);
    expect(bin.stdout.split('\n').length).toBe(41);
    expect(bin.stdout).toBe(here.out);
  }, 600_000);
});

describe('gainwright fit and trim on the example files (docs/examples, our own invented readings)', () => {
  const ex = (f: string) => join(__dirname, '../../docs/examples', f);
  it('fit --json gives the gainwright-fit object: the misread 10 A reading is an outlier, the flattened top is outside the linear range', async () => {
    const r = await run(['fit', ex('sensor-readings.csv'), '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(Object.keys(j)).toEqual(['format', 'version', 'slope', 'intercept', 'slopeStdError', 'interceptStdError', 'residualStd', 'linear', 'points', 'used', 'outliers']);
    expect(j.format).toBe('gainwright-fit');
    expect(j.points).toBe(16);
    expect(j.outliers).toEqual([8]);
    expect(j.linear[0]).toBe(-30);
    expect(j.linear[1]).toBeGreaterThanOrEqual(25);
    expect(j.linear[1]).toBeLessThanOrEqual(35);
    // The invented line is 22.6 mV/A around 2.49 V.
    expect(Math.abs(j.slope - 0.0226)).toBeLessThan(4 * j.slopeStdError);
    expect(Math.abs(j.intercept - 2.49)).toBeLessThan(4 * j.interceptStdError);
  });
  it('fit prints the line, the linear range and the outlier in words', async () => {
    const r = await run(['fit', ex('sensor-readings.csv')]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/Sensitivity 22\.\d+ mV\/A/);
    expect(r.out).toMatch(/Linear from -30\.00 A to/);
    expect(r.out).toMatch(/Reading 9 \(10\.0 A\) lies off the line/);
  });
  it('fit with two readings says what is missing and exits 2', async () => {
    writeFileSync(join(dir, 'two.csv'), 'A,V\n0,2.5\n10,2.7\n');
    const r = await run(['fit', join(dir, 'two.csv')]);
    expect(r.code).toBe(2);
    expect(r.out).toMatch(/2 usable readings: a fit with standard errors needs at least 3; take 1 more/);
  });
  it('trim --json gives the gainwright-trim object with both trimmers in turning order', async () => {
    const r = await run(['trim', ex('bench-clamp-from-readings.json'), ex('probe-readings.csv'), '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(Object.keys(j)).toEqual(['format', 'version', 'scale', 'zero', 'settings', 'replace', 'expected', 'cautions']);
    expect(j.cautions.join(' ')).toMatch(/measurement-category/);
    expect(j.format).toBe('gainwright-trim');
    expect(j.settings.map((s: any) => s.ref).sort()).toEqual(['RV1', 'RV2']);
    for (const s of j.settings) { expect(s.setting).toBeGreaterThan(0); expect(s.setting).toBeLessThan(1); }
    expect(j.expected).toHaveLength(2);
    expect(j.replace).toEqual([]);
  });
  it('trim refuses readings in a unit the design does not measure', async () => {
    writeFileSync(join(dir, 'mt.csv'), 'x,y\nmT,V\n0,4.5\n10,5.5\n');
    const r = await run(['trim', ex('bench-clamp-from-readings.json'), join(dir, 'mt.csv')]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/readings are in "mT" but the design measures A/);
  });
  it('trim reads milliamperes as amperes for an ampere design', async () => {
    writeFileSync(join(dir, 'ma.csv'), 'I,U\nmA;V\n');
    writeFileSync(join(dir, 'ma.csv'), 'I;U\nmA;V\n0;4,5735\n5000;5,0791\n10000;5,5846\n');
    const a = await run(['trim', ex('bench-clamp-from-readings.json'), join(dir, 'ma.csv'), '--json']);
    const b = await run(['trim', ex('bench-clamp-from-readings.json'), ex('probe-readings.csv'), '--json']);
    expect(JSON.parse(a.out).scale).toBeCloseTo(JSON.parse(b.out).scale, 9);
  });
  it('a readings file that is not readings gives line problems on stderr, never a stack trace', async () => {
    writeFileSync(join(dir, 'junk.csv'), 'hello\n\u001b[31mred\u0007,1\n');
    const r = await run(['fit', join(dir, 'junk.csv')]);
    expect(r.code).toBe(2);
    expect(r.err).not.toMatch(/\u001b|\u0007|at .*\.ts/);
  });
});

describe('gainwright trim --at', () => {
  const ex = (f: string) => join(__dirname, '../../docs/examples', f);
  it('readings taken after turning are trimmed from where the trimmers sat', async () => {
    const plain = JSON.parse((await run(['trim', ex('bench-clamp-from-readings.json'), ex('probe-readings.csv'), '--json'])).out);
    const turned = await run(['trim', ex('bench-clamp-from-readings.json'), ex('probe-readings.csv'), '--json', '--at=RV1=0.4,RV2=60%']);
    expect(turned.code).toBe(0);
    const j = JSON.parse(turned.out);
    expect(j.settings.find((s: any) => s.ref === 'RV1').setting).not.toBeCloseTo(plain.settings.find((s: any) => s.ref === 'RV1').setting, 3);
  });
  it('a setting that cannot be read exits 2 with what --at takes', async () => {
    const r = await run(['trim', ex('bench-clamp-from-readings.json'), ex('probe-readings.csv'), '--at=RV1=lots']);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/--at takes trimmer settings/);
  });
});

describe('design text stays inert on the terminal', () => {
  it('trim with a design whose format holds an escape sequence prints it as a visible \\u escape, never raw', async () => {
    writeFileSync(join(dir, 'evil.json'), JSON.stringify({ format: 'x\u001b[2J\u009b31m', version: 1 }));
    const r = await run(['trim', join(dir, 'evil.json'), join(__dirname, '../../docs/examples', 'probe-readings.csv')]);
    expect(r.code).toBe(2);
    expect(r.err).not.toMatch(/[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/);
    expect(r.err).toContain('\\u001b');
  });
  it('report --json writes a title with C1 controls and a direction override as \\u escapes that parse back', async () => {
    const doc = { ...DEMOS.find((d) => d.id === 'generic-sensor')!.document, title: 'clamp\u009b2J\u202eevil' };
    writeFileSync(join(dir, 'c1.json'), JSON.stringify(doc));
    const r = await run(['report', join(dir, 'c1.json'), '--json']);
    expect(r.out).not.toMatch(/[\u0080-\u009f\u202a-\u202e]/);
    expect(JSON.parse(r.out).title).toBe('clamp\u009b2J\u202eevil');
  });
});
