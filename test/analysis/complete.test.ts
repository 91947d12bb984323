/**
 * completeReport (issue 23): the app's report in two steps must be the report `analyse()` gives in one. The
 * reference here is `analyse()` itself with the same options, compared field by field (not through a
 * serialisation that would hide NaN or a missing typed array), on every demo (scenarios of our own) and on
 * designs that take each of its paths: its own waveform, no spread asked, a figure that cannot be computed, a
 * design with no stage.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../src/analysis/report.js';
import { completeReport } from '../../src/analysis/complete.js';
import { DEMOS, demoDesign } from '../../src/model/demos.js';
import type { Design } from '../../src/model/design.js';
import { reportWords } from '../../src/present/report-words.js';
import { designFrom } from '../helpers.js';

const TRIALS = 300;
const twoSteps = (d: Design, trials = TRIALS) => completeReport(d, analyse(d, { spreadTrials: 0 }), trials);
const oneStep = (d: Design, trials = TRIALS) => analyse(d, { spreadTrials: trials, defaultWaveform: true });

describe('completeReport(design, analyse(design, { spreadTrials: 0 }), n) equals analyse(design, { defaultWaveform: true, spreadTrials: n })', () => {
  it.each(DEMOS.map((d) => d.id))('demo %s', (id) => {
    const d = demoDesign(id);
    const r = twoSteps(d);
    expect(r).toEqual(oneStep(d));
    // The demos are working designs: the two figures the second step adds are there.
    expect(r.spread?.trials).toBe(TRIALS);
    expect(r.waveform).not.toBeNull();
    expect(r.absent.spread).toBeUndefined();
    if (r.ranges?.ok) expect(r.ranges.value.positions[0]!.report).toBe(r);
  });

  it('a design that names its own waveform keeps it (a square), and the spread is added', () => {
    const d = designFrom('bench-clamp', (x) => { x.analysis = { ...x.analysis, waveform: { shape: 'square', low: -5, high: 5, frequency: 200, duty: 0.5 } }; });
    const r = twoSteps(d);
    expect(r).toEqual(oneStep(d));
    expect(r.waveformSpec?.shape).toBe('square');
  });

  it('with no spread asked (0 trials) the spread stays out, with the reason analyse() gives', () => {
    const d = demoDesign('generic-sensor');
    const r = twoSteps(d, 0);
    expect(r).toEqual(oneStep(d, 0));
    expect(r.spread).toBeNull();
    expect(r.absent.spread).toBe('the tolerance spread was not run');
  });

  it('a bandwidth that cannot be computed leaves the waveform out with analyse()\'s own reason', () => {
    const base = demoDesign('generic-sensor');
    // Goes around validation on purpose, as test/analysis/degrade.test.ts does: GBW 1e-300 Hz has no bandwidth.
    const d = { ...base, opamp: { ...base.opamp, gbw: 1e-300 } };
    const r = twoSteps(d);
    expect(r).toEqual(oneStep(d));
    expect(r.waveform).toBeNull();
    expect(r.absent.waveform).toMatch(/cannot be computed, because/);
  });

  it('a design the solver cannot build (no stage reaches the gain on its rails) is returned as the quick report was', () => {
    const d = designFrom('generic-sensor', (x) => { x.target.scale = 9e5; });
    const quick = analyse(d, { spreadTrials: 0 });
    expect(quick.circuit).toBeNull();
    const r = completeReport(d, quick, TRIALS);
    expect(r).toBe(quick);
    expect(r).toEqual(oneStep(d));
  });

  it('leaves the quick report as it was', () => {
    const d = demoDesign('bench-clamp');
    const quick = analyse(d, { spreadTrials: 0 });
    const before = structuredClone({ spread: quick.spread, waveform: quick.waveform, absent: quick.absent });
    completeReport(d, quick, TRIALS);
    expect({ spread: quick.spread, waveform: quick.waveform, absent: quick.absent }).toEqual(before);
  });

  // The app shows the verdict, findings, calibration and cautions from the first step and keeps them through the
  // second: they must not depend on the two figures the second step adds.
  it.each(DEMOS.map((d) => d.id))('the words of demo %s (verdicts, findings, calibration, cautions) are the same before and after the second step', (id) => {
    const d = demoDesign(id);
    const quick = analyse(d, { spreadTrials: 0 });
    const words = reportWords(quick);
    expect(words.verdicts.length).toBeGreaterThan(0);
    expect(reportWords(completeReport(d, quick, TRIALS))).toEqual(words);
  });
});
