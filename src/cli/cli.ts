/**
 * The command line twin of the app. Node-only (reads files); the calculation is all in the core.
 *
 *   gainwright report FILE [--json] [--spice]   solve one design
 *   gainwright report FILE --spice-sensor       a closed-loop Hall sensor alone as a SPICE netlist
 *   gainwright report DIR --json                 one JSON line per design file in DIR
 *   gainwright new [DEMO]                        print a demo design to start from
 *   gainwright fit READINGS.csv [--json]         fit a sensor from bench readings
 *   gainwright trim DESIGN READINGS.csv [--json] trim a built probe from its readings
 *   gainwright compare DESIGN [--opamps FILE] [--json]  the design across op-amps, one row each
 *   gainwright compare DESIGN --supplies [--json]       the design across supply choices, one row each
 *   --kit FILE (report, compare)                 design from the resistors of a kit file ("gainwright-kit")
 *
 * Exit codes: 0 done, 1 the design was solved but fails a check (with --strict), 2 bad input, 3 a fault of
 * Gainwright's own (one line, never a stack trace). Every message is one line.
 */
import { readdirSync, statSync } from 'node:fs';
import { formatProblems, parseDesignText } from '../model/design.js';
import { oneLine, readDesign } from './files.js';
import { reportFolder } from './batch.js';
import { quoteText } from '../model/validate.js';
import { analyse } from '../analysis/report.js';
import { reportJson } from '../present/json.js';
import { sayFinding } from '../present/finding-words.js';
import { textReport } from '../present/text-report.js';
import { spiceNetlist } from '../present/spice.js';
import { positionLine, positionNetlist, positionReport } from '../present/ranges.js';
import { closedLoopSpiceNetlist } from '../present/spice-closed-loop.js';
import { DEMOS } from '../model/demos.js';
import { MAX_READINGS_TEXT, parseReadings, unitFactor, type ParsedReadings } from '../model/readings.js';
import { fitJson, fitReadings } from '../analysis/fit.js';
import { trimFromReadings, trimJson } from '../analysis/trim.js';
import { fitLines, trimLines } from '../present/readings.js';
import { comparisonJson, comparisonLines, comparisonRows, supplyChoices, supplyJson, supplyLines } from '../present/comparison.js';
import { MAX_OPAMP_LIST_BYTES, parseOpAmpListText } from '../model/opamp-list.js';
import { MAX_KIT_FILE_BYTES, designWithKit, parseKitFileText } from '../model/kit-file.js';
import type { Design, OpAmpSpec, ResistorKit } from '../model/design.js';
import { jsonText, terminalLine } from '../present/inert.js';
import { sensorFrontAtRail } from '../physics/sensors.js';
import { cautionsFor } from '../present/cautions.js';

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
  gainwright report FILE [--json] [--spice] [--no-spread] [--range=N]
                                         (--range=N: the range switch's position N alone, report or netlist)
  gainwright report FILE --spice-sensor  a closed-loop Hall sensor alone as a SPICE netlist
  gainwright report DIR --json           one JSON line per *.json design in DIR
  gainwright new [${DEMOS.map((d) => d.id).join('|')}]
  gainwright fit READINGS.csv [--json]   fit a sensor from readings (measurand, output volts)
  gainwright trim DESIGN.json READINGS.csv [--json] [--at=RV1=0.47,RV2=0.55]
                                         trimmer settings for a built probe from its readings
                                         (--at: where the trimmers sat while reading, if turned)
  gainwright compare DESIGN.json [--opamps FILE.json] [--json]
                                         the design with each op-amp (built-in and your own), passing first
  gainwright compare DESIGN.json --supplies [--json]
                                         the design on each way its battery can feed it, with a zero for
                                         the end of battery life and a rail-to-rail output op-amp beside them
  --kit KIT.json                         with report or compare: the resistors of a kit file
                                         ("gainwright-kit") take the place of the design's own target.kit
`;


/** A problem list as lines, each one line whatever the text in it. */
const problemLines = (problems: Array<{ path: string; message: string }>) => formatProblems(problems).split('\n').map(terminalLine);

/** Runs the CLI on `argv` (without node and the script), writing through `io`; resolves to the exit code (0 ok, 1 design fails, 2 bad input, 3 damaged files). */
export async function main(argv: string[], io: Io = nodeIo): Promise<number> {
  if (io === nodeIo) quietOnClosedPipe();
  try {
    return await run(argv, io);
  } catch (e) {
    // A bug must still not print a stack trace at a user.
    io.err(`gainwright: internal error: ${oneLine(e)}\n`);
    return 3;
  }
}


function run(argv: string[], io: Io): number | Promise<number> {
  const [cmd, ...given] = argv;
  // `--opamps FILE` (or `--opamps=FILE`): the person's own op-amps for `compare`.
  let opampsFile: string | null = null;
  // `--kit FILE` (or `--kit=FILE`): a kit file whose resistors the design is solved from (report, compare).
  let kitFile: string | null = null;
  const rest: string[] = [];
  for (let i = 0; i < given.length; i++) {
    const a = given[i]!;
    if (a === '--opamps' || a === '--kit') {
      if (i + 1 >= given.length) { io.err(`gainwright: ${a} takes a file\n${USAGE}`); return 2; }
      if (a === '--kit') kitFile = given[++i]!; else opampsFile = given[++i]!;
    } else if (a.startsWith('--opamps=')) opampsFile = a.slice('--opamps='.length);
    else if (a.startsWith('--kit=')) kitFile = a.slice('--kit='.length);
    else rest.push(a);
  }
  if (opampsFile !== null && cmd !== 'compare') { io.err(`gainwright: --opamps goes with compare\n${USAGE}`); return 2; }
  if (kitFile !== null && cmd !== 'report' && cmd !== 'compare') { io.err(`gainwright: --kit goes with report or compare\n${USAGE}`); return 2; }
  let kit: ResistorKit | null = null;
  if (kitFile !== null) {
    const read = readDesign(kitFile, MAX_KIT_FILE_BYTES, 'a kit file is a few kB');
    if (!read.ok) { io.err(`gainwright: ${shown(kitFile)}: ${read.message}\n`); return 2; }
    const parsed = parseKitFileText(read.text);
    if (!parsed.ok) { io.err(`gainwright: ${shown(kitFile)} is not a valid kit file:\n${problemLines(parsed.problems).map((l) => `  ${l}`).join('\n')}\n`); return 2; }
    kit = parsed.named.kit;
  }
  const kitName = kitFile;
  /** The design with the kit file's kit in place (checked again as a whole: the kit must hold a value in its window). */
  const withKit = (d: Design) => designWithKit(d, kit);
  const kitRefused = (file: string, problems: Array<{ path: string; message: string }>) =>
    `gainwright: ${shown(file)} cannot take the kit of ${shown(kitName ?? '')}:\n${problemLines(problems).map((l) => `  ${l}`).join('\n')}\n`;
  const flags = new Set(rest.filter((a) => a.startsWith('--')));
  const args = rest.filter((a) => !a.startsWith('--'));
  const known = new Set(['--json', '--spice', '--spice-sensor', '--no-spread', '--help', '--supplies']);
  // `--at=RV1=0.47,RV2=0.55`: where the trimmers sat while the probe readings were taken (gainwright trim).
  const atFlag = [...flags].find((fl) => fl.startsWith('--at='));
  if (atFlag) flags.delete(atFlag);
  // `--range=2`: the range switch's position 2 alone: its report, or with --spice its netlist (issue 19).
  const rangeFlag = [...flags].find((fl) => fl.startsWith('--range='));
  if (rangeFlag) flags.delete(rangeFlag);
  const rangeAt = rangeFlag ? Number(rangeFlag.slice('--range='.length)) : null;
  if (rangeAt !== null && !(Number.isInteger(rangeAt) && rangeAt >= 1 && rangeAt <= 4)) { io.err(`gainwright: --range takes a switch position, 1 to 4\n`); return 2; }
  for (const fl of flags) if (!known.has(fl)) { io.err(`gainwright: unknown option ${shown(fl)}\n${USAGE}`); return 2; }
  if (!cmd || cmd === '--help' || cmd === 'help') { io.out(USAGE); return cmd ? 0 : 2; }
  if (cmd === 'new') {
    const demo = DEMOS.find((d) => d.id === (args[0] ?? DEMOS[0]!.id));
    if (!demo) { io.err(`gainwright: no demo called ${quoteText(args[0] ?? '')}; choose one of ${DEMOS.map((d) => d.id).join(', ')}\n`); return 2; }
    io.out(jsonText(demo.document, 2) + '\n');
    return 0;
  }
  if (cmd === 'fit') return fitCommand(args, flags.has('--json'), io);
  if (cmd === 'trim') return trimCommand(args, flags.has('--json'), io, atFlag?.slice('--at='.length) ?? null);
  if (flags.has('--supplies') && (cmd !== 'compare' || opampsFile !== null)) { io.err(`gainwright: --supplies goes with compare, without --opamps\n${USAGE}`); return 2; }
  if (cmd === 'compare') return compareCommand(args, flags.has('--json'), io, opampsFile, withKit, kitRefused, flags.has('--supplies'));
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
    return reportFolder(path, files, spreadTrials ?? 0, io, kit);
  }
  const read = readDesign(path);
  if (!read.ok) { io.err(`gainwright: ${shown(path)}: ${read.message}\n`); return 2; }
  const v0 = parseDesignText(read.text);
  if (!v0.ok) { io.err(`gainwright: ${shown(path)} is not a valid design:\n${problemLines(v0.problems).map((l) => `  ${l}`).join('\n')}\n`); return 2; }
  const v = withKit(v0.design);
  if (!v.ok) { io.err(kitRefused(path, v.problems)); return 2; }
  if (flags.has('--spice-sensor')) {
    const net = closedLoopSpiceNetlist(v.design);
    if (!net) { io.err('gainwright: --spice-sensor exports a closed-loop Hall sensor (sensor.type "closed-loop-hall"); use --spice for the whole stage\n'); return 2; }
    io.out(net.netlist);
    return 0;
  }
  // The trade sweep (issue 19) is part of a single design's report; a folder's batch leaves it out.
  const r = analyse(v.design, { spreadTrials, trade: !flags.has('--spice') });
  if (flags.has('--spice')) {
    if (rangeAt !== null) {
      const pos = positionNetlist(r, rangeAt);
      if (!pos) { io.err(`gainwright: no range switch position ${rangeAt} to export in this design\n`); return 1; }
      io.out(pos);
      return 0;
    }
    const net = spiceNetlist(r);
    if (!net) { io.err(`gainwright: no circuit to export: ${oneLine(r.warnings.filter((w) => w.level === 'fail').map(sayFinding).join(' '))}\n`); return 1; }
    io.out(net);
    return 0;
  }
  if (rangeAt !== null) {
    // `--range=N` alone: that position's own report (its parts, its range), headed by which position it is.
    const pos = positionReport(r, rangeAt);
    if (!pos) { io.err(`gainwright: no range switch position ${rangeAt} in this design\n`); return 1; }
    const line = positionLine(r, rangeAt)!;
    io.out(flags.has('--json') ? jsonText({ rangePosition: rangeAt, rangePositionText: line, ...reportJson(pos) }, 2) + '\n' : `${terminalLine(line)}\n\n${textReport(pos)}`);
    return 0;
  }
  io.out(flags.has('--json') ? jsonText(reportJson(r), 2) + '\n' : textReport(r));
  return 0;
}

/** Reads a readings file; line problems go to stderr (the readable lines are kept). */
function readReadings(path: string, io: Io): ParsedReadings | null {
  const read = readDesign(path, MAX_READINGS_TEXT, 'a readings file is a few dozen lines');
  if (!read.ok) { io.err(`gainwright: ${read.message}\n`); return null; }
  const parsed = parseReadings(read.text);
  // Text from the file is shown inert: control characters are dropped before it reaches a terminal.
  for (const p of parsed.problems) io.err(`gainwright: ${shown(path)}: ${inert(p.path)}: ${inert(p.message)}\n`);
  return parsed;
}

const inert = terminalLine;

function fitCommand(args: string[], json: boolean, io: Io): number {
  if (args.length !== 1) { io.err(`gainwright: fit takes one readings file\n${USAGE}`); return 2; }
  const parsed = readReadings(args[0]!, io);
  if (!parsed) return 2;
  const fit = fitReadings(parsed.points);
  const measurand = inert(parsed.units[0] || 'unit');
  if (json) io.out(jsonText(fitJson(fit), 2) + '\n');
  else io.out(fitLines(fit, parsed.points, measurand).join('\n') + '\n');
  if (fit.problem) {
    if (json) io.err(`gainwright: ${fitLines(fit, parsed.points, measurand).join(' ')}\n`);
    return 2;
  }
  return 0;
}

/** Reads `RV1=0.47,RV2=0.55` (settings from 0 to 1, or percent with a % sign); null when it cannot be read. */
function parseAt(text: string): Array<[string, number]> | null {
  const out: Array<[string, number]> = [];
  for (const item of text.split(',').filter((x) => x.trim() !== '')) {
    const m = /^\s*([A-Za-z]{1,4}\d{1,3})\s*=\s*([0-9]*\.?[0-9]+)\s*(%?)\s*$/.exec(item);
    if (!m) return null;
    const v = Number(m[2]) / (m[3] ? 100 : 1);
    if (!(v >= 0 && v <= 1)) return null;
    out.push([m[1]!, v]);
  }
  return out;
}

function trimCommand(args: string[], json: boolean, io: Io, atText: string | null): number {
  if (args.length !== 2) { io.err(`gainwright: trim takes a design file and a readings file\n${USAGE}`); return 2; }
  const at = atText === null ? [] : parseAt(atText);
  if (!at) { io.err(`gainwright: --at takes trimmer settings like --at=RV1=0.47,RV2=55%\n`); return 2; }
  const read = readDesign(args[0]!);
  if (!read.ok) { io.err(`gainwright: ${read.message}\n`); return 2; }
  const v = parseDesignText(read.text);
  if (!v.ok) { io.err(`gainwright: ${shown(args[0]!)} is not a valid design:\n${problemLines(v.problems).map((l) => `  ${l}`).join('\n')}\n`); return 2; }
  const parsed = readReadings(args[1]!, io);
  if (!parsed) return 2;
  const m = v.design.sensor.measurand;
  const k = unitFactor(parsed.units[0], m);
  if (k === null) { io.err(`gainwright: ${shown(args[1]!)}: the readings are in "${inert(parsed.units[0])}" but the design measures ${m}\n`); return 2; }
  const points = parsed.points.map(([x, y]) => [x * k, y] as [number, number]);
  const r = analyse(v.design, { spreadTrials: 0 });
  const t = trimFromReadings({ design: r.design, front: r.front, stage: r.circuit ? r.stage : null }, points, at.length ? at : r.design.probeSettings ?? []);
  // The trim is done on a live probe: its cautions travel with it.
  const cautions = cautionsFor(r.design.sensor.type, r.front.cautions);
  if (json) io.out(jsonText({ ...trimJson(t), cautions }, 2) + '\n');
  else io.out([...trimLines(t, r.stage?.parts ?? [], m), '', 'Safety', '------', ...cautions.map((c) => `  ! ${c}`)].join('\n') + '\n');
  if (t.problem && t.problem.code !== 'out-of-reach') {
    if (json) io.err(`gainwright: ${trimLines(t, r.stage?.parts ?? [], m).join(' ')}\n`);
    return 1;
  }
  return 0;
}

function compareCommand(args: string[], json: boolean, io: Io, opampsFile: string | null,
  withKit: (d: Design) => ReturnType<typeof designWithKit>,
  kitRefused: (file: string, problems: Array<{ path: string; message: string }>) => string, supplies = false): number {
  if (args.length !== 1) { io.err(`gainwright: compare takes one design file\n${USAGE}`); return 2; }
  const read = readDesign(args[0]!);
  if (!read.ok) { io.err(`gainwright: ${shown(args[0]!)}: ${read.message}\n`); return 2; }
  const v0 = parseDesignText(read.text);
  if (!v0.ok) { io.err(`gainwright: ${shown(args[0]!)} is not a valid design:\n${problemLines(v0.problems).map((l) => `  ${l}`).join('\n')}\n`); return 2; }
  const v = withKit(v0.design);
  if (!v.ok) { io.err(kitRefused(args[0]!, v.problems)); return 2; }
  let own: OpAmpSpec[] = [];
  if (opampsFile !== null) {
    const list = readDesign(opampsFile, MAX_OPAMP_LIST_BYTES, 'an op-amp list is a few kB');
    if (!list.ok) { io.err(`gainwright: ${shown(opampsFile)}: ${list.message}\n`); return 2; }
    const parsed = parseOpAmpListText(list.text);
    if (!parsed.ok) { io.err(`gainwright: ${shown(opampsFile)} is not a valid op-amp list:\n${problemLines(parsed.problems).map((l) => `  ${l}`).join('\n')}\n`); return 2; }
    own = parsed.opamps;
  }
  if (supplies) return suppliesOutput(v.design, json, io);
  const rows = comparisonRows(v.design, own);
  if (json) {
    for (const r of rows) io.out(jsonText(comparisonJson(r)) + '\n');
    // stdout stays one JSON object per op-amp; the cautions go to the person on stderr.
    const d = v.design;
    for (const c of cautionsFor(d.sensor.type, sensorFrontAtRail(d.sensor, d).cautions)) io.err(`gainwright: caution: ${c}\n`);
    return 0;
  }
  const d = v.design;
  const cautions = cautionsFor(d.sensor.type, sensorFrontAtRail(d.sensor, d).cautions);
  const title = terminalLine(d.title);
  io.out([`${title}: op-amps compared`, '='.repeat(Math.min(title.length + 19, 80)), ...comparisonLines(rows, d.sensor.measurand, !!d.supply.battery), '', 'Safety', '------', ...cautions.map((c) => `  ${c}`)].join('\n') + '\n');
  return 0;
}

// --- issue 18, part 3: `gainwright compare DESIGN --supplies [--json]`.
/** The supply choices: one block each (or one JSON object per line), then the cautions (on stderr with --json). */
function suppliesOutput(d: Design, json: boolean, io: Io): number {
  const options = supplyChoices(d);
  const cautions = cautionsFor(d.sensor.type, sensorFrontAtRail(d.sensor, d).cautions);
  if (json) {
    for (const o of options) io.out(jsonText(supplyJson(o)) + '\n');
    if (!options.length) io.err('gainwright: the design runs from a bench supply (no supply.battery): there are no battery choices to compare\n');
    for (const c of cautions) io.err(`gainwright: caution: ${c}\n`);
    return 0;
  }
  const title = terminalLine(d.title);
  const body = options.length ? supplyLines(options, d.sensor.measurand) : ['The design runs from a bench supply (no supply.battery): there are no battery choices to compare.'];
  io.out([`${title}: supplies compared`, '='.repeat(Math.min(title.length + 19, 80)), ...body, '', 'Safety', '------', ...cautions.map((c) => `  ${c}`)].join('\n') + '\n');
  return 0;
}
// --- end issue 18, part 3
