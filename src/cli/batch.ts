/**
 * `gainwright report DIR --json`: one JSON line per design file, in the order of the sorted file names. The
 * designs are independent, so a folder of many is shared among worker threads, one per core (at most eight),
 * each reporting its files in turn; the lines are printed in order as they come. A folder of a few, or a run
 * where the workers cannot be started, is reported in this thread: the lines are the same either way.
 */
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { parseDesignText, type ResistorKit } from '../model/design.js';
import { designWithKit } from '../model/kit-file.js';
import { analyse } from '../analysis/report.js';
import { reportJson } from '../present/json.js';
import { jsonText } from '../present/inert.js';
import { oneLine, readDesign } from './files.js';
import type { Io } from './cli.js';

/** 0: reported; 2: the file is not a design; 3: a fault of ours while reporting it. */
export type FolderStatus = 0 | 2 | 3;

/**
 * One file's line of a folder's report (with its newline) and how it went. Never throws. `kit`: a kit file's
 * kit in place of each design's own (`--kit`), or null.
 */
export function folderLine(dir: string, file: string, spreadTrials: number, kit: ResistorKit | null = null): { line: string; status: FolderStatus } {
  const read = readDesign(join(dir, file));
  if (!read.ok) return { line: jsonText({ file, ok: false, problems: [read.message] }) + '\n', status: 2 };
  const v0 = parseDesignText(read.text);
  const v = v0.ok ? designWithKit(v0.design, kit) : v0;
  if (!v.ok) return { line: jsonText({ file, ok: false, problems: v.problems.map((q) => `${q.path}: ${q.message}`) }) + '\n', status: 2 };
  // One design that trips a fault of ours must not cost the report of the files after it.
  try {
    const r = analyse(v.design, { spreadTrials, acPoints: 50 });
    return { line: jsonText({ file, ok: true, ...reportJson(r) }) + '\n', status: 0 };
  } catch (e) {
    return { line: jsonText({ file, ok: false, problems: [`internal error: ${oneLine(e)}`] }) + '\n', status: 3 };
  }
}

/** Fewer files than this are reported in this thread (starting a worker costs about a tenth of a second). */
const WORKERS_FROM = 32;

/** What a worker is given: the folder, its files (by index into the sorted list) and the trials. */
export interface BatchJob { dir: string; files: string[]; indices: number[]; spreadTrials: number; kit: ResistorKit | null }
/** What a worker sends for each file. */
export interface BatchResult { index: number; line: string; status: FolderStatus }

/** The exit code of a folder's run: 3 if any file hit a fault of ours, else 2 if any was not a design, else 0. */
const exitOf = (statuses: Iterable<FolderStatus>) => { let worst = 0; for (const s of statuses) if (s === 3 || (s === 2 && worst === 0)) worst = s; return worst; };

/** Reports every file of a folder, in order, through `io`; resolves to the exit code. */
export async function reportFolder(dir: string, files: string[], spreadTrials: number, io: Io, kit: ResistorKit | null = null): Promise<number> {
  const workerFile = new URL('./batch-worker.js', import.meta.url);
  const threads = Math.min(availableParallelism(), 8, Math.ceil(files.length / (WORKERS_FROM / 2)));
  // The worker is the compiled file beside this one; run from the TypeScript sources (tests) there is none.
  if (files.length < WORKERS_FROM || threads < 2 || workerFile.protocol !== 'file:' || !existsSync(fileURLToPath(workerFile))) {
    const statuses: FolderStatus[] = [];
    for (const f of files) { const r = folderLine(dir, f, spreadTrials, kit); io.out(r.line); statuses.push(r.status); }
    return exitOf(statuses);
  }
  const results: Array<BatchResult | undefined> = new Array(files.length);
  let next = 0;
  const flush = () => { while (next < files.length && results[next]) io.out(results[next++]!.line); };
  // Files dealt round the workers in turn, so that each has a share of every kind of design and the lines
  // arrive close to their order.
  const jobs = Array.from({ length: threads }, (_, w) => files.map((_, i) => i).filter((i) => i % threads === w));
  await Promise.all(jobs.map((indices) => new Promise<void>((done) => {
    const job: BatchJob = { dir, files: indices.map((i) => files[i]!), indices, spreadTrials, kit };
    let worker: Worker;
    const finish = () => {
      // A worker that stopped early (it could not start, or died) leaves its files to this thread.
      for (const i of indices) if (!results[i]) results[i] = { index: i, ...folderLine(dir, files[i]!, spreadTrials, kit) };
      flush();
      done();
    };
    try { worker = new Worker(workerFile, { workerData: job }); } catch { finish(); return; }
    worker.on('message', (m: BatchResult) => { results[m.index] = m; flush(); });
    worker.on('error', () => { /* its files are done here in `finish` */ });
    worker.on('exit', finish);
  })));
  flush();
  return exitOf(results.map((r) => r!.status));
}
