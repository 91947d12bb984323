import { describe, expect, it } from 'vitest';
import { calibrationCurrent } from '../../src/present/calibration.js';
import { analyse } from '../../src/analysis/report.js';
import { demoDesign } from '../../src/model/demos.js';
import { designFrom, shuntOnSplitSupply } from '../helpers.js';
import { calibrationSteps } from '../../src/present/calibration.js';

describe('calibration', () => {
  it('turns multiply a small bench current to half the range end (≤ 2 A from the bench; common practice)', () => {
    expect(calibrationCurrent(20)).toEqual([5, 2]);
    expect(calibrationCurrent(2)).toEqual([1, 1]);
    const [n, i] = calibrationCurrent(400);
    expect(n * i).toBeCloseTo(200, 6);
  });
  it('sets the span from a difference first, then the zero; names the trimmers and states the expected readings', () => {
    const r = analyse(demoDesign('generic-sensor'), { spreadTrials: 0 });
    const zero = calibrationSteps(r).findIndex((s) => s.text.startsWith('Zero'));
    const span = calibrationSteps(r).findIndex((s) => s.text.startsWith('Span'));
    expect(span).toBeGreaterThan(0);
    expect(zero).toBeGreaterThan(span);
    const zt = r.stage!.parts.find((p) => p.role === 'zero-trim')!.ref;
    const gt = r.stage!.parts.find((p) => p.role === 'gain-trim')!.ref;
    expect(calibrationSteps(r)[zero]!.trimmer).toBe(zt);
    expect(calibrationSteps(r)[span]!.trimmer).toBe(gt);
    // No turns for a sensor with its own current path: 2 A from the bench → the output rises by scale × 2 A.
    expect(calibrationSteps(r)[span]!.expect).toBeCloseTo(r.dc!.out[1] * 2, 9);
    expect(calibrationSteps(r)[span]!.text).toMatch(/zero and span do not interact/);
    expect(calibrationSteps(r).map((c) => c.text).join(' ')).toMatch(/set RV\d \(span trimmer\) to \d+ %/);
  });
  it('a shunt is never wound through a probe nor clamped; a DC design on a split supply checks the reverse', () => {
    const r = analyse(designFrom('generic-sensor', shuntOnSplitSupply), { spreadTrials: 0 });
    const text = calibrationSteps(r).map((c) => c.text).join('\n');
    expect(text).not.toMatch(/turns|probe only|insulated conductor/);
    expect(text).toMatch(/through the shunt from a current-limited bench supply/);
    expect(text).toMatch(/Reverse the bench supply leads/);
    expect(text).not.toMatch(/fV|NaN/);
  });
  it('a current transformer is calibrated with AC from an isolating transformer, never DC, and keeps its burden fitted', () => {
    const r = analyse(demoDesign('appliance-ct'), { spreadTrials: 0 });
    const text = calibrationSteps(r).map((c) => c.text).join('\n');
    expect(text).toMatch(/isolating low-voltage transformer/);
    expect(text).toMatch(/never a DC supply/);
    expect(text).not.toMatch(/current-limited bench supply/);
    expect(text).toMatch(/never open it while the primary carries current/);
    expect(text).toMatch(/AC rms reading/);
    // The instrument is the design's: a 100 MΩ ADC input here, not a scope's 1 MΩ.
    expect(text).toMatch(/100 MΩ input/);
    expect(text).not.toMatch(/DC coupling|Reverse/);
  });
  it('a single-supply design whose other polarity clips says there is no reverse check instead of a reading beyond the rail', () => {
    const r = analyse(designFrom('generic-sensor', (x) => { x.target.zero = 0.1; x.target.range = [0, 20]; x.opamp.outputLow = 0.02; }), { spreadTrials: 0 });
    const text = calibrationSteps(r).map((c) => c.text).join('\n');
    expect(text).toMatch(/reads only one polarity/);
  });
});
