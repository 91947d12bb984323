import { describe, expect, it } from 'vitest';
import { calibrationCurrent } from '../../src/present/calibration.js';
import { analyse } from '../../src/analysis/report.js';
import { demoDesign } from '../../src/model/demos.js';

describe('calibration', () => {
  it('turns multiply a small bench current to half the range end (≤ 2 A from the bench; common practice)', () => {
    expect(calibrationCurrent(20)).toEqual([5, 2]);
    expect(calibrationCurrent(2)).toEqual([1, 1]);
    const [n, i] = calibrationCurrent(400);
    expect(n * i).toBeCloseTo(200, 6);
  });
  it('orders zero before span, names the trimmers and states the expected readings', () => {
    const r = analyse(demoDesign('generic-sensor'), { spreadTrials: 0 });
    const zero = r.calibration.findIndex((s) => s.text.startsWith('Zero'));
    const span = r.calibration.findIndex((s) => s.text.startsWith('Span'));
    expect(zero).toBeGreaterThan(0);
    expect(span).toBeGreaterThan(zero);
    const zt = r.stage!.parts.find((p) => p.role === 'zero-trim')!.ref;
    const gt = r.stage!.parts.find((p) => p.role === 'gain-trim')!.ref;
    expect(r.calibration[zero]!.trimmer).toBe(zt);
    expect(r.calibration[span]!.trimmer).toBe(gt);
    // 5 turns × 2 A = 10 A → zero + scale × 10.
    expect(r.calibration[span]!.expect).toBeCloseTo(r.dc!.out[0] + r.dc!.out[1] * 10, 9);
    expect(r.calibration[0]!.text).toMatch(/insulated conductor/);
  });
});
