import { describe, expect, it } from 'vitest';
import { analyse } from '../../src/analysis/report.js';
import { timeUnit, traceDrawing, waveformChart } from '../../src/present/charts.js';
import { waveformFigures, waveformLine } from '../../src/present/figures.js';
import { textReport } from '../../src/present/text-report.js';
import { spiceNetlist, TRAN_STEP_DIVISOR } from '../../src/present/spice.js';
import { groupDefault } from '../../src/present/fields.js';
import { designFrom } from '../helpers.js';

const withWave = (w: object) => designFrom('generic-sensor', (d) => { d.analysis = { waveform: w }; });

describe('waveform presentation', () => {
  const step = analyse(withWave({ shape: 'step', low: -20, high: 20 }), { spreadTrials: 0 });

  it('timeUnit(3.2e-5) reads in µs, timeUnit(0.04) in ms, timeUnit(2) in s', () => {
    expect(timeUnit(3.2e-5)).toEqual([1e6, 'µs']);
    expect(timeUnit(0.04)).toEqual([1e3, 'ms']);
    expect(timeUnit(2)).toEqual([1, 's']);
  });

  it('waveformChart plots output and ideal against time in the chosen unit, with the clip levels', () => {
    const c = waveformChart(step)!;
    const w = step.waveform!;
    expect(c.id).toBe('waveform');
    expect(c.x.label).toBe('Time (µs)');
    expect(c.series[0]!.points.length).toBe(w.t.length);
    expect(c.series[0]!.points[100]!.x).toBeCloseTo(w.t[100]! * 1e6, 9);
    expect(c.series[0]!.points[100]!.y).toBe(w.output[100]);
    expect(c.series[1]!.points[1999]!.y).toBe(w.ideal[1999]);
    expect(c.series.filter((s) => s.role === 'limit').map((s) => s.points[0]!.y)).toEqual([step.clip!.outputHigh, step.clip!.outputLow]);
  });

  it('waveformChart is null without a waveform', () => {
    expect(waveformChart(analyse(designFrom('generic-sensor'), { spreadTrials: 0 }))).toBeNull();
  });

  it('traceDrawing scales every series into the box, y upwards', () => {
    const t = traceDrawing({ id: 'waveform', title: 't', x: { label: 'x' }, y: { label: 'y' }, series: [{ label: 'a', role: 'main', points: [{ x: 0, y: 0 }, { x: 2, y: 10 }] }] }, 200, 100)!;
    // y runs 0…10 padded by 5 % each side: 0 maps to 100 − 100·0.5/11.
    expect(t.lines[0]!.points).toBe(`0.0,${(100 - (0.5 / 11) * 100).toFixed(1)} 200.0,${((0.5 / 11) * 100).toFixed(1)}`);
    expect(traceDrawing({ id: 'waveform', title: 't', x: { label: 'x' }, y: { label: 'y' }, series: [] }, 200, 100)).toBeNull();
  });

  it('waveformFigures give the rise, overshoot, settling and flags as text without NaN', () => {
    const rows = waveformFigures(step);
    const by = (l: string) => rows.find((r) => r.label === l)!;
    expect(by('Measurand').value).toBe('step');
    expect(by('Slew-limited').value).toBe(step.waveform!.slewLimited ? 'yes' : 'no');
    expect(by('Rise time (10–90 %)').value).toMatch(/s$/);
    for (const r of rows) expect(`${r.value} ${r.note ?? ''}`).not.toMatch(/NaN|Infinity|undefined/);
  });

  it('waveformLine puts the printed sheet\'s figures in one line, the range first', () => {
    const line = waveformLine(step);
    expect(line).toMatch(/^step -20\.0 A → 20\.0 A; Rise time \(10–90 %\): /);
    expect(line).toMatch(/Slew-limited: (yes|no)/);
    expect(line).not.toMatch(/Output swings|NaN/);
  });

  it('the text report has a waveform section only when there is a waveform', () => {
    expect(textReport(step)).toMatch(/Waveform at the instrument\n-+\n  Measurand: step/);
    expect(textReport(analyse(designFrom('generic-sensor'), { spreadTrials: 0 }))).not.toMatch(/Waveform at the instrument/);
  });

  it('the SPICE netlist carries the waveform on the signal source and a .tran, and none without one', () => {
    const sq = analyse(withWave({ shape: 'square', low: -10, high: 10, frequency: 1000, duty: 0.25 }), { spreadTrials: 0 });
    const net = spiceNetlist(sq, { date: '2026-12-01' })!;
    expect(net).toMatch(/^VSIG .* PULSE\(2\.375 2\.625 0 \S+ \S+ \S+ 0\.001\)$/m);
    expect(net).toMatch(/^tran \S+ \S+ \S+ \S+$/m);
    // tran TSTEP TSTOP TSTART TMAX (the ngspice manual's .tran line): TMAX a tenth of the sample spacing TSTEP.
    const [tstep, , , tmax] = /^tran (\S+) (\S+) (\S+) (\S+)$/m.exec(net)!.slice(1).map(Number);
    expect(tmax! / tstep!).toBeCloseTo(1 / TRAN_STEP_DIVISOR, 3);
    expect(spiceNetlist(withWaveStep(), { date: '2026-12-01' })!).toMatch(/^VSIG .* PWL\(0 2\.25 /m);
    const plain = spiceNetlist(analyse(designFrom('generic-sensor'), { spreadTrials: 0 }), { date: '2026-12-01' })!;
    expect(plain).not.toMatch(/^tran /m);
    expect(plain).not.toMatch(/PULSE|PWL|SIN\(/);
  });

  it('groupDefault offers a step over the range for the scope waveform', () => {
    const d = designFrom('generic-sensor');
    expect(groupDefault('analysis.waveform', d)).toEqual({ shape: 'step', low: -20, high: 20, frequency: 1000, duty: 0.5 });
    expect(groupDefault('output.filter', d)).toEqual({ resistance: 100, capacitance: 0 });
  });
});

function withWaveStep() { return analyse(withWave({ shape: 'step', low: -20, high: 20 }), { spreadTrials: 0 }); }
