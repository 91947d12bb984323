import { describe, expect, it } from 'vitest';
import { allCharts, noiseChart, transferChart } from '../../src/present/charts.js';
import { analyse } from '../../src/analysis/report.js';
import { designFrom } from '../helpers.js';

describe('chart data', () => {
  const r = analyse(designFrom('bench-clamp'), { spreadTrials: 200 });
  it('builds all five plots with labelled axes and finite points only', () => {
    const charts = allCharts(r);
    expect(charts.map((c) => c.id)).toEqual(['transfer', 'response', 'noise', 'battery', 'spread']);
    for (const c of charts) {
      expect(c.x.label).toMatch(/\(.+\)/);
      expect(c.y.label).toMatch(/\(.+\)/);
      for (const s of c.series) for (const p of s.points) expect(Number.isFinite(p.x) && Number.isFinite(p.y)).toBe(true);
    }
  });
  it('transfer: the linear part follows zero + scale·x, the saturated part sits at the clip level, the rails are drawn', () => {
    const t = transferChart(r)!;
    const lin = t.series.find((s) => s.role === 'main')!.points;
    for (const p of lin) expect(p.y).toBeCloseTo(r.dc!.out[0] + r.dc!.out[1] * p.x, 9);
    const clipped = t.series.find((s) => s.role === 'clipped')!.points;
    expect(clipped.length).toBeGreaterThan(0);
    for (const p of clipped.filter((q) => q.x > 0)) expect(p.y).toBeCloseTo(r.clip!.outputHigh, 9);
    expect(t.series.find((s) => s.label === 'Positive rail')!.points[0]!.y).toBe(9);
  });
  it('noise: the total is at least each source (power adds)', () => {
    const n = noiseChart(r)!;
    const total = n.series[0]!.points;
    for (const s of n.series.slice(1)) s.points.forEach((p, i) => expect(p.y).toBeLessThanOrEqual(total[i]!.y * (1 + 1e-9)));
  });
});
