/**
 * The CLI against hostile input (issue 14): special files, a FIFO, a closed pipe, byte-order marks and
 * UTF-16, whole-number fields, terminal escapes; every message one line, no stack trace.
 */
import { describe, expect, it, beforeAll } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, mkdirSync, symlinkSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { run } from './run.js';
import { DEMOS } from '../../src/model/demos.js';

const demo = (id = 'generic-sensor') => structuredClone(DEMOS.find((d) => d.id === id)!.document) as Record<string, any>;

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'gw-cli-hostile-'));
  execFileSync('npx', ['tsc', '-p', 'tsconfig.cli.json'], { stdio: 'ignore' });
}, 180_000);

describe('gainwright report: special files', () => {
  it('refuses /dev/zero with exit 2 in one line instead of reading it', async () => {
    const r = await run(['report', '/dev/zero']);
    expect(r.code).toBe(2);
    expect(r.err).toBe('gainwright: /dev/zero: is not a regular file\n');
  });
  it('a .json symlink to /dev/zero and a FIFO named p.json in a folder are reported as such, and the files after them too', async () => {
    const sub = join(dir, 'special');
    mkdirSync(sub);
    symlinkSync('/dev/zero', join(sub, 'a-zero.json'));
    execFileSync('mkfifo', [join(sub, 'p.json')]);
    writeFileSync(join(sub, 'z-good.json'), JSON.stringify(demo()));
    const r = await run(['report', sub, '--json']);
    const lines = r.out.trim().split('\n').map((l) => JSON.parse(l));
    expect(lines.map((l) => [l.file, l.ok])).toEqual([['a-zero.json', false], ['p.json', false], ['z-good.json', true]]);
    expect(lines[0].problems).toEqual(['is not a regular file']);
    expect(lines[1].problems).toEqual(['is not a regular file']);
    expect(r.code).toBe(2);
  });
  it('a FIFO given by name is refused without waiting for a writer', async () => {
    const fifo = join(dir, 'lone.json');
    execFileSync('mkfifo', [fifo]);
    const r = await run(['report', fifo]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/is not a regular file/);
  });
});

describe('gainwright report: encodings and one-line errors', () => {
  const text = JSON.stringify(demo());
  it('reads UTF-8 with a byte-order mark and UTF-16 LE/BE as the app does', async () => {
    const files: Array<[string, Buffer]> = [
      ['bom.json', Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(text, 'utf8')])],
      ['le.json', Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')])],
      ['be.json', Buffer.concat([Buffer.from([0xfe, 0xff]), Buffer.from(text, 'utf16le').swap16()])],
    ];
    for (const [name, bytes] of files) {
      writeFileSync(join(dir, name), bytes);
      const r = await run(['report', join(dir, name), '--json', '--no-spread']);
      expect(r.code, `${name}: ${r.err}`).toBe(0);
      expect(JSON.parse(r.out).topology).toBe('non-inverting');
    }
  });
  it('bad JSON is one line with no raw control characters', async () => {
    writeFileSync(join(dir, 'ctl.json'), '{"a": \u0000\u001b[2J\n\n}');
    const r = await run(['report', join(dir, 'ctl.json')]);
    expect(r.code).toBe(2);
    expect(r.err.trimEnd().split('\n').length).toBe(2);
    expect(r.err).not.toMatch(/[\u0000-\u0009\u000b-\u001f]/);
    expect(r.err).toMatch(/not valid JSON \(at line 1, column 7\)/);
  });
  it('a file name with a newline and an escape is written escaped', async () => {
    const r = await run(['report', join(dir, 'x\n\u001b[2J.json')]);
    expect(r.code).toBe(2);
    expect(r.err.trimEnd().split('\n')).toHaveLength(1);
    expect(r.err).not.toMatch(/\u001b/);
  });
  it('target.alternative 0.5 is refused (exit 2), and in a folder the files after it are still reported', async () => {
    const d = demo(); d.target.alternative = 0.5;
    writeFileSync(join(dir, 'alt.json'), JSON.stringify(d));
    const r = await run(['report', join(dir, 'alt.json')]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/target\.alternative: must be a whole number/);
    const sub = join(dir, 'alts');
    mkdirSync(sub);
    writeFileSync(join(sub, 'a.json'), JSON.stringify(d));
    writeFileSync(join(sub, 'b.json'), JSON.stringify(demo()));
    const lines = (await run(['report', sub, '--json'])).out.trim().split('\n').map((l) => JSON.parse(l));
    expect(lines.map((l) => [l.file, l.ok])).toEqual([['a.json', false], ['b.json', true]]);
  });
  it('keys named like object properties and duplicate keys are refused by path', async () => {
    writeFileSync(join(dir, 'proto.json'), text.replace('"opamp":{', '"opamp":{"__proto__":{"gbw":1},"toString":1,'));
    const r = await run(['report', join(dir, 'proto.json')]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/opamp\.__proto__: is not a field/);
    expect(r.err).toMatch(/opamp\.toString: is not a field/);
    writeFileSync(join(dir, 'twice.json'), text.replace('"gbw":1000000', '"gbw":1000000,"gbw":1'));
    expect((await run(['report', join(dir, 'twice.json')])).err).toMatch(/opamp\.gbw: appears twice/);
  });
  it('a title with terminal escapes prints escaped in the text report', async () => {
    const d = demo(); d.title = 'x\u001b[2J\u001b]0;owned\u0007\u0000\rdone';
    writeFileSync(join(dir, 'esc.json'), JSON.stringify(d));
    const r = await run(['report', join(dir, 'esc.json'), '--no-spread']);
    expect(r.code).toBe(0);
    expect(r.out).not.toMatch(/[\u0000-\u0009\u000b-\u001f]/);
    expect(r.out).toMatch(/^x\\u001b\[2J/);
  });
});

describe('gainwright report: a closed pipe', () => {
  it('report DIR --json | head -1 prints one line and no stack trace', () => {
    const sub = join(dir, 'many');
    mkdirSync(sub);
    for (let i = 0; i < 12; i++) writeFileSync(join(sub, `d${String(i).padStart(2, '0')}.json`), JSON.stringify(demo(DEMOS[i % DEMOS.length]!.id)));
    const r = spawnSync('bash', ['-c', `set -o pipefail; node bin/gainwright.mjs report '${sub}' --json | head -c 200 >/dev/null; echo "exit \${PIPESTATUS[0]}" >&2`], { encoding: 'utf8' });
    expect(r.stderr).not.toMatch(/EPIPE|node:internal|\n\s+at /);
    expect(r.stderr).toMatch(/^exit 0$/m);
  }, 60_000);
});
