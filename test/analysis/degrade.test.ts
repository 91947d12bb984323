/**
 * The report's last guard (issue 14): a figure that does not come out finite is left out with "cannot be
 * computed, because …", never reported as NaN or Infinity. The file's bounds refuse the values that caused
 * it; these designs go around validation on purpose, to test the guard behind it.
 */
import { describe, expect, it } from 'vitest';
import { analyse, firstNonFinite } from '../../src/analysis/report.js';
import { keyFigures } from '../../src/present/figures.js';
import { textReport } from '../../src/present/text-report.js';
import { demoDesign } from '../../src/model/demos.js';
import type { Design } from '../../src/model/design.js';
import { verdictsOf } from '../../src/present/verdicts.js';

const shown = (d: Design) => {
  const r = analyse(d, { spreadTrials: 20 });
  return { r, text: [textReport(r), ...keyFigures(r).map((f) => `${f.value} ${f.note ?? ''}`), ...verdictsOf(r).map((v) => `${v.title} ${v.detail}`)].join('\n') };
};

describe('analyse: tiny values that slip past validation degrade, they do not lie', () => {
  const base = demoDesign('generic-sensor');
  it.each([
    ['sourceResistance 1e-200 Ω', { ...base, sensor: { ...base.sensor, sourceResistance: 1e-200 } }],
    ['sensitivity 5e-324 V/A', { ...base, sensor: { ...base.sensor, sensitivity: 5e-324 } as Design['sensor'] }],
    ['GBW 1e-300 Hz', { ...base, opamp: { ...base.opamp, gbw: 1e-300 } }],
    ['slew rate 1e-300 V/s', { ...base, opamp: { ...base.opamp, slewRate: 1e-300 } }],
    ['load 1e-300 F', { ...base, output: { ...base.output, load: { resistance: 1e6, capacitance: 1e-300 } } }],
  ])('%s: no NaN or Infinity anywhere a person reads, and every missing figure says why', (_, d) => {
    const { r, text } = shown(d as Design);
    expect(text).not.toMatch(/NaN|Infinity/);
    for (const k of ['clip', 'speed', 'noise', 'errors', 'supply'] as const) {
      if (r[k] === null && !r.absent.all) expect(r.absent[k], k).toMatch(/cannot be computed, because|was not run/);
      if (r[k] !== null) expect(firstNonFinite(r[k], ['limits']), k).toBeNull();
    }
  });
  it('a figure that cannot be computed gets a caution verdict with the reason, not a pass', () => {
    const { r } = shown({ ...base, opamp: { ...base.opamp, gbw: 1e-300 } });
    // GBW 1e-300 Hz puts the −3 dB point near GBW / noise gain (single-pole op-amp; Sedra & Smith, Microelectronic
    // Circuits, the op-amp chapter on finite bandwidth, from memory), far below the 1 mHz the search starts at:
    // the bandwidth is absent, with its reason.
    expect(r.speed).toBeNull();
    expect(r.absent.speed).toMatch(/^the bandwidth cannot be computed, because .+/);
    const v = verdictsOf(r).find((x) => /Bandwidth/.test(x.title));
    expect(v).toBeDefined();
    expect(v!.level).toBe('caution');
    expect(v!.detail).toContain(r.absent.speed!);
    expect(v!.detail).not.toMatch(/NaN|Infinity/);
  });
});

describe('firstNonFinite', () => {
  it('finds NaN and infinities in objects, arrays and typed arrays, by path, and skips named keys', () => {
    expect(firstNonFinite({ a: 1, b: [2, { c: NaN }] })).toBe('.b[1].c');
    expect(firstNonFinite({ x: Float64Array.of(1, Infinity) })).toBe('.x[1]');
    expect(firstNonFinite({ limits: [{ low: -Infinity }], y: 3 }, ['limits'])).toBeNull();
    expect(firstNonFinite({ ok: 'text', n: null, m: 0 })).toBeNull();
  });
});
