import { describe, expect, it } from 'vitest';
import { allCharts, noiseChart, noiseLabel, transferChart } from '../../src/present/charts.js';
import { integratePower } from '../../src/physics/noise.js';
import { noiseSpectrum } from '../../src/circuit/noise.js';
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
  it('noise sources are named by what they stand for (role, then part), never by a netlist designator', () => {
    expect(noiseLabel({ name: 'X9', role: 'opamp-offset' })).toBe('op-amp voltage noise');
    expect(noiseLabel({ name: 'X9', role: 'signal' })).toBe('sensor');
    expect(noiseLabel({ name: 'RV1A', part: 'RV1' })).toBe('RV1 thermal');
    const labels = noiseChart(r)!.series.slice(1).map((s) => s.label);
    expect(labels.every((l) => !/^(VOS|IBP|IBN|VSIG|RS|RLOAD)\b/.test(l))).toBe(true);
    expect(new Set(labels).size).toBe(labels.length);
  });
  it('a trimmer\'s two halves are one noise source: its power is the sum of both halves (sources add in power)', () => {
    // The demo's zero trimmer is two resistors in the circuit, one part in the list.
    const halves = r.circuit!.circuit.elements.filter((e) => e.kind === 'R' && e.part && r.circuit!.circuit.elements.filter((x) => x.part === e.part).length === 2);
    expect(halves.length).toBe(2);
    const part = halves[0]!.part!;
    const sources = r.noise!.spectrum.sources.filter((x) => x.part === part);
    expect(sources).toHaveLength(1);
    // The same circuit with the halves told apart: their densities add in power to the part's.
    const c = r.circuit!.circuit;
    const apart = noiseSpectrum({ ...c, elements: c.elements.map((e) => (e.part === part ? { ...e, part: undefined } : e)) }, r.circuit!.nodes.out, r.noise!.spectrum.freqs, r.design.environment.temperature);
    const [a, b] = halves.map((h) => apart.sources.find((x) => x.name === h.name)!.density);
    sources[0]!.density.forEach((v, k) => expect(v ** 2 / (a![k]! ** 2 + b![k]! ** 2)).toBeCloseTo(1, 12));
    const share = r.noise!.shares.find((x) => x.part === part)!;
    expect(share.rms ** 2 / integratePower(r.noise!.spectrum.freqs, sources[0]!.density)).toBeCloseTo(1, 12);
    const sum = r.noise!.shares.reduce((a, x) => a + x.fraction, 0);
    expect(sum).toBeCloseTo(1, 12);
  });
});
