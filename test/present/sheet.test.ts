import { describe, expect, it } from 'vitest';
import { errorBudgetRows, sheetStatus, trimmerStarts } from '../../src/present/sheet.js';
import { chartText } from '../../src/present/charts.js';
import { analyse } from '../../src/analysis/report.js';
import { designFrom } from '../helpers.js';
import { verdictsOf } from '../../src/present/verdicts.js';

describe('build sheet rows', () => {
  it('sheetStatus marks a design with a failing verdict as failed and names the failures', () => {
    // A design that cannot be built: the sensor gives 12.5 mV/A, the target asks 5 mV/A, a gain of 0.4, and a
    // non-inverting stage's gain is 1 + Rf/Rg ≥ 1 (Sedra & Smith, Microelectronic Circuits, the op-amp chapter, from memory).
    const bad = analyse(designFrom('generic-sensor', (x) => { x.target.scale = 0.005; x.target.zero = 2.5; x.target.topology = 'non-inverting'; }), { spreadTrials: 0 });
    expect(bad.design.sensor.type === 'voltage-output' && bad.design.sensor.sensitivity).toBe(0.0125);
    expect(bad.stage).toBeNull();
    expect(sheetStatus(bad)).toMatchObject({ failed: true });
    expect(sheetStatus(bad).line).toMatch(/^FAILED DESIGN: do not build\. No design/);
    // The generic demo (a scenario of our own) is buildable: 100 mV/A from 12.5 mV/A is a gain of 8, well within
    // reach of one stage. It must not be marked failed; its line says it builds (with or without cautions).
    const good = analyse(designFrom('generic-sensor'), { spreadTrials: 0 });
    expect(good.stage).not.toBeNull();
    expect(sheetStatus(good).failed).toBe(false);
    expect(sheetStatus(good).line).toMatch(/^(Passes every check\.|Builds, with \d+ cautions? below\.)$/);
    expect(verdictsOf(good).some((v) => v.level === 'fail')).toBe(false);
  });
  it('errorBudgetRows lists every term of the budget, then the totals before and after calibration', () => {
    const r = analyse(designFrom('bench-clamp'), { spreadTrials: 0 });
    const rows = errorBudgetRows(r);
    expect(rows.length).toBe(r.errors!.terms.length + 2);
    expect(rows.map((x) => x.term)).toEqual([...r.errors!.terms.map((t) => t.name), 'worst case / RSS, before calibration', 'after calibration, worst case / RSS']);
    for (const x of rows) expect(x.value).toMatch(/^±/);
  });
  it('trimmerStarts gives each trimmer its solver setting as a percentage and ohms from one end', () => {
    const r = analyse(designFrom('bench-clamp'), { spreadTrials: 0 });
    const trims = r.stage!.parts.filter((p) => p.kind === 'trimmer');
    const rows = trimmerStarts(r);
    expect(rows.map((x) => x.ref)).toEqual(trims.map((p) => p.ref));
    rows.forEach((x, i) => expect(x.setting.startsWith(`${(trims[i]!.setting! * 100).toFixed(0)} %`)).toBe(true));
  });
});

describe('chartText', () => {
  it('summarises each series by its extent and thins the table to at most 25 rows a series, keeping the last point', () => {
    const points = Array.from({ length: 101 }, (_, i) => ({ x: i, y: 2 * i }));
    const t = chartText({ id: 'transfer', title: 'T', x: { label: 'X' }, y: { label: 'Y' }, series: [{ label: 'line', role: 'main', points }] });
    expect(t.summary).toBe('T. line: X 0 to 100, Y 0 to 200.');
    expect(t.rows.length).toBeLessThanOrEqual(26);
    expect(t.rows[0]).toEqual(['line', '0', '0']);
    expect(t.rows.at(-1)).toEqual(['line', '100', '200']);
  });
  it('a chart with no points says so rather than printing Infinity', () => {
    const t = chartText({ id: 'spread', title: 'S', x: { label: 'X' }, y: { label: 'Y' }, series: [{ label: 'none', role: 'main', points: [] }] });
    expect(t.summary).toBe('S: no data.');
    expect(t.rows).toEqual([]);
  });
});
