import { describe, expect, it } from 'vitest';
import { tradeSweep } from '../../src/analysis/trade.js';
import { tradeCharts, tradeLines, tradeTable, unbuiltWords } from '../../src/present/trade.js';
import { chartText } from '../../src/present/charts.js';
import { designFrom } from '../helpers.js';

const hall = tradeSweep(designFrom('bench-clamp', (d) => { d.sensor.core.width = 0.01; d.sensor.core.depth = 0.01; }));
const ct = tradeSweep(designFrom('appliance-ct', (d) => { d.sensor.core = { width: 0.01, depth: 0.01, saturation: 0.3 }; }));

describe('tradeCharts', () => {
  it('a Hall trade gives a turns chart and a gap chart, every point finite, markers on, pickable', () => {
    const c = tradeCharts(hall, 'A');
    expect(c.map((x) => x.id)).toEqual(['trade-turns', 'trade-gap']);
    for (const chart of c) {
      expect(chart.markers && chart.pickable).toBe(true);
      expect(chart.y.log).toBe(true);
      for (const s of chart.series) for (const p of s.points) { expect(Number.isFinite(p.x)).toBe(true); expect(Number.isFinite(p.y)).toBe(true); }
    }
    const core = c[0]!.series.find((s) => s.label === 'Core saturates at')!;
    expect(core.points.map((p) => p.x)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    // Ampère's law (Umans §1.1): saturation current ∝ 1/N, so the plotted curve's product with N is flat.
    for (const p of core.points) expect(p.x * p.y / core.points[0]!.y).toBeCloseTo(1, 9);
    expect(c[1]!.x.label).toBe('Gap (mm)');
    expect(c[0]!.series.find((s) => s.label === 'Gain needed')!.axis).toBe('y2');
    expect(c[0]!.series.find((s) => s.label === 'Range end')!.points.every((p) => p.y === 20)).toBe(true);
  });
  it('a CT trade plots the saturation at the lowest frequency and the low corner on the right axis', () => {
    const c = tradeCharts(ct, 'A');
    expect(c.map((x) => x.id)).toEqual(['trade-turns', 'trade-burden']);
    expect(c[0]!.series[0]!.label).toBe('Core saturates at 50.0 Hz');
    expect(c[0]!.series.find((s) => s.axis === 'y2')!.label).toMatch(/corner/);
    expect(chartText(c[0]!).summary).not.toMatch(/NaN|Infinity/);
  });
  it('no trade, no charts', () => {
    expect(tradeCharts(null, 'A')).toEqual([]);
    expect(tradeTable(null, 'A')).toBeNull();
    expect(tradeLines(null, 'A')).toEqual([]);
  });
});

describe('tradeTable and tradeLines', () => {
  it('one row per point, the design\'s own marked, the inductance in henries', () => {
    const t = tradeTable(hall, 'A')!;
    expect(t.rows.length).toBe(hall!.points.length);
    expect(t.rows.filter((r) => r.current).length).toBe(2);
    // One pass through a 10 × 10 mm section with a 1.5 mm gap and fringed area (11.5 mm)²: L = μ0·A_c/(g/F + l/μr)
    // = 1.25663706127e-6 × 1e-4 / (1.5e-3/1.3225 + 3e-5) = 107.9 nH (by hand from the formula).
    expect(t.rows.find((r) => r.current && r.sweep === 'turns')!.cells[8]).toBe('108 nH');
    for (const r of t.rows) for (const c of r.cells) expect(c).not.toMatch(/NaN|Infinity|undefined/);
  });
  it('the terminal table has a heading per sweep and marks the design\'s rows with *', () => {
    const lines = tradeLines(ct, 'A');
    expect(lines).toContain('What each secondary turn buys (burden held)');
    expect(lines).toContain('What the burden buys (turns held)');
    expect(lines.filter((l) => l.startsWith('  *')).length).toBe(2);
    expect(lines.join('\n')).toMatch(/Core saturates at \(50\.0 Hz\)/);
  });
  it('names why a point cannot be built', () => {
    expect(unbuiltWords('no-topology')).toMatch(/no single stage/);
    expect(unbuiltWords('gain-unrealisable')).toMatch(/gain-unrealisable/);
  });
});
