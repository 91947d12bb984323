/**
 * The command line twin of the app. Node-only (reads files); the calculation is all in the core.
 *
 *   gainwright report FILE [--json] [--spice]   solve one design
 *   gainwright report DIR --json                 one JSON line per design file in DIR
 *   gainwright new [DEMO]                        print a demo design to start from
 *
 * Exit codes: 0 done, 1 the design was solved but fails a check (with --strict), 2 bad input, 3 a fault of
 * Gainwright's own (one line, never a stack trace). Every message is one line.
 */
import { closeSync, constants, fstatSync, openSync, readSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import '../model/units-mathjs.js';
import { decodeDesignBytes, formatProblems, MAX_DESIGN_BYTES, parseDesignText } from '../model/design.js';
import { quoteText } from '../model/validate.js';
import { analyse, reportJson } from '../analysis/report.js';
import { textReport } from '../present/text-report.js';
import { spiceNetlist } from '../present/spice.js';
import { DEMOS } from '../model/demos.js';

export interface Io {
  out: (s: string) => void;
  err: (s: string) => void;
}

const nodeIo: Io = { out: (s) => { process.stdout.write(s); }, err: (s) => { process.stderr.write(s); } };

/**
 * A reader that stops reading (`report DIR --json | head -1`) closes the pipe: the rest of the output has
 * nowhere to go, which is not an error worth a word, and certainly not a stack trace.
 */
function quietOnClosedPipe(): void {
  const onError = (e: NodeJS.ErrnoException) => {
    if (e.code === 'EPIPE' || e.code === 'ERR_STREAM_DESTROYED') { process.stdout.destroy(); return; }
    process.stderr.write(`gainwright: cannot write the output (${e.code ?? 'error'})\n`);
    process.exit(2);
  };
  if (!process.stdout.listeners('error').length) process.stdout.on('error', onError);
}

/** A path or name as it appears in a message: as it is when plain, quoted with escapes otherwise. */
const shown = (path: string) => (/^[\w./\\:~+-]+$/.test(path) ? path : quoteText(path, 200));

const USAGE = `usage:
  gainwright report FILE [--json] [--spice] [--no-spread]
  gainwright report DIR --json           one JSON line per *.json design in DIR
  gainwright new [${DEMOS.map((d) => d.id).join('|')}]
`;

/**
 * Reads a design file: only a regular file, and at most the 1 MB limit plus one byte whatever its stated size
 * (a device or a FIFO states 0). Opened without blocking, so that a FIFO named like a design cannot hang
 * the run; decoded as UTF-8 or UTF-16 the way the app decodes a file.
 */
function readDesign(path: string): { ok: true; text: string } | { ok: false; message: string } {
  let fd = -1;
  try {
    const first = statSync(path);
    if (!first.isFile()) return { ok: false, message: first.isDirectory() ? 'is a folder' : 'is not a regular file' };
    fd = openSync(path, constants.O_RDONLY | (constants.O_NONBLOCK ?? 0));
    const st = fstatSync(fd);
    if (!st.isFile()) return { ok: false, message: 'is not a regular file' };
    if (st.size > MAX_DESIGN_BYTES) return { ok: false, message: 'is larger than 1 MB; a design file is a few kB' };
    const buf = Buffer.alloc(MAX_DESIGN_BYTES + 1);
    let n = 0;
    for (let got = 1; got > 0 && n < buf.length; n += got) got = readSync(fd, buf, n, buf.length - n, null);
    if (n > MAX_DESIGN_BYTES) return { ok: false, message: 'is larger than 1 MB; a design file is a few kB' };
    const text = decodeDesignBytes(buf.subarray(0, n));
    if (!text.ok) return { ok: false, message: text.problems[0]!.message };
    return { ok: true, text: text.text };
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    return { ok: false, message: code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a folder' : `cannot be read (${code ?? 'error'})` };
  } finally {
    if (fd >= 0) closeSync(fd);
  }
}

/** A problem list as lines, each one line whatever the text in it. */
const problemLines = (problems: Array<{ path: string; message: string }>) => formatProblems(problems).split('\n').map((l) => l.replace(/[\u0000-\u001f\u007f-\u009f]/g, ' '));

export async function main(argv: string[], io: Io = nodeIo): Promise<number> {
  if (io === nodeIo) quietOnClosedPipe();
  try {
    return run(argv, io);
  } catch (e) {
    // A bug must still not print a stack trace at a user.
    io.err(`gainwright: internal error: ${oneLine(e)}\n`);
    return 3;
  }
}

const oneLine = (e: unknown) => String(e instanceof Error ? e.message : e).replace(/\s+/g, ' ').slice(0, 300);

function run(argv: string[], io: Io): number {
  const [cmd, ...rest] = argv;
  const flags = new Set(rest.filter((a) => a.startsWith('--')));
  const args = rest.filter((a) => !a.startsWith('--'));
  const known = new Set(['--json', '--spice', '--no-spread', '--help']);
  for (const fl of flags) if (!known.has(fl)) { io.err(`gainwright: unknown option ${shown(fl)}\n${USAGE}`); return 2; }
  if (!cmd || cmd === '--help' || cmd === 'help') { io.out(USAGE); return cmd ? 0 : 2; }
  if (cmd === 'new') {
    const demo = DEMOS.find((d) => d.id === (args[0] ?? DEMOS[0]!.id));
    if (!demo) { io.err(`gainwright: no demo called ${quoteText(args[0] ?? '')}; choose one of ${DEMOS.map((d) => d.id).join(', ')}\n`); return 2; }
    io.out(JSON.stringify(demo.document, null, 2) + '\n');
    return 0;
  }
  if (cmd !== 'report') { io.err(`gainwright: unknown command ${quoteText(cmd)}\n${USAGE}`); return 2; }
  if (args.length !== 1) { io.err(`gainwright: report takes one design file or folder\n${USAGE}`); return 2; }
  const path = args[0]!;
  let isDir = false;
  try { isDir = statSync(path).isDirectory(); } catch { /* reported by readDesign */ }
  const spreadTrials = flags.has('--no-spread') ? 0 : undefined;
  if (isDir) {
    if (!flags.has('--json')) { io.err('gainwright: a folder is reported with --json (one line per design)\n'); return 2; }
    let files: string[];
    try { files = readdirSync(path).filter((f) => f.endsWith('.json')).sort(); } catch { io.err(`gainwright: ${shown(path)}: cannot be listed\n`); return 2; }
    let bad = 0, broken = 0;
    for (const f of files) {
      const p = join(path, f);
      const read = readDesign(p);
      if (!read.ok) { io.out(JSON.stringify({ file: f, ok: false, problems: [read.message] }) + '\n'); bad++; continue; }
      const v = parseDesignText(read.text);
      if (!v.ok) { io.out(JSON.stringify({ file: f, ok: false, problems: v.problems.map((q) => `${q.path}: ${q.message}`) }) + '\n'); bad++; continue; }
      // One design that trips a fault of ours must not cost the report of the files after it.
      try {
        const r = analyse(v.design, { spreadTrials: spreadTrials ?? 0, acPoints: 50 });
        io.out(JSON.stringify({ file: f, ok: true, ...reportJson(r) }) + '\n');
      } catch (e) {
        io.out(JSON.stringify({ file: f, ok: false, problems: [`internal error: ${oneLine(e)}`] }) + '\n');
        broken++;
      }
    }
    return broken ? 3 : bad ? 2 : 0;
  }
  const read = readDesign(path);
  if (!read.ok) { io.err(`gainwright: ${shown(path)}: ${read.message}\n`); return 2; }
  const v = parseDesignText(read.text);
  if (!v.ok) { io.err(`gainwright: ${shown(path)} is not a valid design:\n${problemLines(v.problems).map((l) => `  ${l}`).join('\n')}\n`); return 2; }
  const r = analyse(v.design, { spreadTrials });
  if (flags.has('--spice')) {
    const net = spiceNetlist(r);
    if (!net) { io.err(`gainwright: no circuit to export: ${oneLine(r.warnings.filter((w) => w.level === 'fail').map((w) => w.message).join(' '))}\n`); return 1; }
    io.out(net);
    return 0;
  }
  io.out(flags.has('--json') ? JSON.stringify(reportJson(r), null, 2) + '\n' : textReport(r));
  return 0;
}
