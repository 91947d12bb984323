import { describe, expect, it } from 'vitest';
import { analyse } from '../../src/analysis/report.js';
import { designForRange, positionFigures, type RangeSwitch } from '../../src/analysis/ranges.js';
import { reportJson } from '../../src/present/json.js';
import { verdictsOf } from '../../src/present/verdicts.js';
import { validateDesign } from '../../src/model/design.js';
import { nonInvertingOutput, invertingOutput } from '../../src/physics/topology.js';
import { designFrom, nonFinitePaths } from '../helpers.js';

const switchOf = (r: ReturnType<typeof analyse>): RangeSwitch => {
  if (!r.ranges?.ok) throw new Error(`no switch: ${JSON.stringify(r.ranges)}`);
  return r.ranges.value;
};

describe('the two-range bench clamp demo (a scenario of our own)', () => {
  const d = designFrom('two-range-clamp');
  const r = analyse(d, { spreadTrials: 0 });
  const sw = switchOf(r);
  it('takes two poles because one would move the zero by more than the 20 mV allowed, and holds the zero on both ranges', () => {
    expect(sw.wiring).toBe('two-pole');
    expect(sw.decidedBy).toBe('zero-moves');
    expect(sw.singlePoleShift).toBeGreaterThan(0.02);
    expect(sw.poles).toBe(2);
    expect(sw.throws).toBe(2);
    for (const p of sw.positions) {
      expect(p.unbuilt).toBeNull();
      // The zero is solved on the exact transfer; the report's own circuit (MNA) agrees to far below a microvolt.
      expect(Math.abs(p.report!.dc!.out[0] - 4.5)).toBeLessThan(1e-6);
    }
  });
  it('each range gives its scale: 100 mV/A and 40 mV/A before trim, within a tenth of the part tolerance', () => {
    const [a, b] = sw.positions;
    expect(Math.abs(a!.report!.dc!.out[1] / 0.1 - 1)).toBeLessThan(0.001);
    expect(Math.abs(b!.report!.dc!.out[1] / 0.04 - 1)).toBeLessThan(0.001);
  });
  it('each range covers its own span; the second reaches ±50 A', () => {
    const f = positionFigures(sw.positions[1]!);
    expect(f.clip!.measurandLow).toBeLessThan(-50);
    expect(f.clip!.measurandHigh).toBeGreaterThan(50);
  });
  it('the parts list holds the shared leg once and each position\'s own feedback arm, span and zero trimmer', () => {
    const refs = sw.parts.map((p) => p.ref);
    expect(new Set(refs).size).toBe(refs.length);
    expect(sw.parts.filter((p) => p.role === 'ground-leg').length).toBe(1);
    expect(sw.parts.filter((p) => p.role === 'gain-trim').length).toBe(2);
    expect(sw.parts.filter((p) => p.role === 'zero-trim').length).toBe(2);
    // Every part a position uses is in the list.
    for (const p of sw.positions) for (const q of p.parts) expect(refs).toContain(q.ref);
  });
  it('the JSON lists each range with the issue\'s fields; the first is the top-level figures', () => {
    const j = reportJson(r) as any;
    expect(j.ranges.length).toBe(2);
    expect(j.ranges[0].scale).toBe(j.scale);
    expect(j.ranges[0].zero).toBe(j.zero);
    expect(j.ranges[0].bandwidth.smallSignal).toBe(j.bandwidth.smallSignal);
    for (const k of ['scale', 'zero', 'clip', 'bandwidth', 'noise', 'errors']) expect(j.ranges[1]).toHaveProperty(k);
    for (const k of ['measurandLow', 'measurandHigh', 'first']) expect(j.ranges[1].clip).toHaveProperty(k);
    expect(j.rangeSwitch.wiring).toBe('two-pole');
    expect(nonFinitePaths(j.ranges)).toEqual([]);
    expect(j.warnings.map((w: any) => w.code)).toContain('range-wiring');
  });
  // The check: a range's figures are those of a single-range design of that range built with the same
  // parts. The single-range design is written as its own document (its target that range, no switch), read by
  // the validator, and analysed with the position's parts; every figure the JSON gives must agree.
  it('each range\'s figures equal a single-range design of that range built with the same parts', () => {
    const j = reportJson(r) as any;
    sw.positions.forEach((p, i) => {
      const doc = structuredClone(d) as any;
      doc.target.scale = p.scale; doc.target.range = p.range; delete doc.target.ranges; doc.target.topology = p.report!.stage!.ideal.topology;
      const v = validateDesign(doc);
      if (!v.ok) throw new Error(JSON.stringify(v.problems));
      const single = reportJson(analyse(v.design, { spreadTrials: 0, stage: p.report!.stage! })) as any;
      expect(j.ranges[i].scale).toBeCloseTo(single.scale, 12);
      expect(j.ranges[i].zero).toBeCloseTo(single.zero, 12);
      expect(j.ranges[i].clip.measurandLow).toBeCloseTo(single.clip.measurandLow, 9);
      expect(j.ranges[i].clip.measurandHigh).toBeCloseTo(single.clip.measurandHigh, 9);
      expect(j.ranges[i].clip.first).toBe(single.clip.first);
      expect(j.ranges[i].bandwidth.smallSignal / single.bandwidth.smallSignal).toBeCloseTo(1, 9);
      expect(j.ranges[i].noise.referredRms / Math.abs(single.noise.referredRms)).toBeCloseTo(1, 9);
      expect(j.ranges[i].errors.afterTrim / single.errors.afterTrim).toBeCloseTo(1, 9);
    });
  });
  it('two poles leave the other position\'s divider across its rail: each position\'s supply counts it, by Ohm\'s law, and its battery life is capacity ÷ current', () => {
    // The divider's rail span over its whole chain (top + trimmer + bottom) is the current it draws (Ohm's law).
    const rail = d.supply.referenceRail === 'regulated' && d.supply.regulated ? d.supply.regulated.voltage : d.supply.positive - d.supply.negative;
    const draw = (i: number) => { const ref = sw.positions[i]!.network.reference; return rail / ((ref.top?.ohms ?? 0) + (ref.trim?.ohms ?? 0) + (ref.bottom?.ohms ?? 0)); };
    sw.positions.forEach((p, i) => {
      const single = analyse(designForRange(d, i, p.report!.stage!.ideal.topology), { spreadTrials: 0, stage: p.report!.stage! });
      const other = draw(1 - i);
      expect(p.report!.supply!.current - single.supply!.current).toBeCloseTo(other, 12);
      // Battery life: capacity (A·s) ÷ current, in hours (definition of capacity; 3600 s an hour).
      expect(p.report!.supply!.batteryLife! / (d.supply.battery!.capacity / p.report!.supply!.current / 3600)).toBeCloseTo(1, 12);
      expect(p.report!.batteryClip!.hoursToEnd).toBe(p.report!.supply!.batteryLife);
    });
    expect(r.supply!.current).toBe(sw.positions[0]!.report!.supply!.current);
    expect(sw.idleCurrent).toBeCloseTo(Math.max(draw(0), draw(1)), 12);
  });
  it('every verdict line of a range names it', () => {
    const titles = verdictsOf(r).map((x) => x.title);
    expect(titles.filter((t) => t.startsWith('Range 1 (100 mV/A): ')).length).toBeGreaterThanOrEqual(5);
    expect(titles.filter((t) => t.startsWith('Range 2 (40.0 mV/A): ')).length).toBeGreaterThanOrEqual(5);
  });
});

describe('a single-pole switch: the zero moves by the closed form of the stage', () => {
  // The closed forms by superposition (Franco, Design with Operational Amplifiers and Analog Integrated Circuits,
  // 4th ed., ch. 1, from memory; the method's stage table): non-inverting
  // z = G·Vq − (G − 1)·Vref, so a new gain moves the zero by (G₂ − G₁)·(Vq − Vref); inverting
  // z = (1 + G)·Vp − G·Vq, by (G₂ − G₁)·(Vp − Vq). The exact circuit adds only the finite open-loop gain
  // (100 dB here) and the output resistance into the load: a few parts in 10⁵.
  it('non-inverting (the demo asked for one pole): the zero shift agrees with (G₂ − G₁)·(Vq − Vref)', () => {
    const r = analyse(designFrom('two-range-clamp', (x) => { x.target.rangeSwitch = 'single-pole'; }), { spreadTrials: 0 });
    const sw = switchOf(r);
    expect(sw.wiring).toBe('single-pole');
    expect(sw.decidedBy).toBe('asked');
    const [a, b] = sw.positions;
    const g1 = a!.report!.stage!.gain, g2 = b!.report!.stage!.gain;
    const vq = r.front.quiescent, vref = a!.network.reference.voltage;
    // The closed form itself, from the stage functions, at the pin; the load divider (100 Ω into 1 MΩ) applied.
    const k = 1e6 / (1e6 + 100);
    const closed = (nonInvertingOutput(g2, vq, vref) - nonInvertingOutput(g1, vq, vref)) * k;
    expect(b!.zeroShiftClosedForm! / closed).toBeCloseTo(1, 12);
    expect(Math.abs(b!.zeroShift / closed - 1)).toBeLessThan(2e-4);
    expect(Math.abs(b!.zeroShift)).toBeGreaterThan(1);
    // The zero is shared: one reference network and one zero trimmer; each range has its own span trimmer.
    expect(sw.parts.filter((p) => p.role === 'zero-trim').length).toBe(1);
    expect(sw.parts.filter((p) => p.role === 'gain-trim').length).toBe(2);
    expect(r.warnings.map((w) => w.code)).toContain('range-zero-shift');
    // The shared zero trimmer leaves a stated residual on the second range, and it is in that range's error.
    expect(b!.sharedTrimResidual).toBeGreaterThan(0);
    const f = positionFigures(b!);
    expect(f.afterTrim!).toBeGreaterThan(b!.report!.errors!.afterTrim);
  });
  it('inverting (a voltage-output sensor of our own, 9 V rail): the zero shift agrees with (G₂ − G₁)·(Vp − Vq)', () => {
    const r = analyse(designFrom('generic-sensor', (x) => { x.target.topology = 'inverting'; x.target.scale = -0.1; x.target.ranges = [{ scale: -0.05, range: [-40, 40] }]; x.target.rangeSwitch = 'single-pole'; }), { spreadTrials: 0 });
    const sw = switchOf(r);
    const [a, b] = sw.positions;
    expect(a!.report!.stage!.ideal.topology).toBe('inverting');
    const g1 = a!.report!.stage!.gain, g2 = b!.report!.stage!.gain;
    const vq = r.front.quiescent, vp = a!.network.reference.voltage;
    // No output resistor: the instrument sees the pin.
    const closed = invertingOutput(g2, vq, vp) - invertingOutput(g1, vq, vp);
    expect(b!.zeroShiftClosedForm! / closed).toBeCloseTo(1, 12);
    expect(Math.abs(closed)).toBeGreaterThan(0.5);
    // The zero is a difference of terms near 25 V here ((1 + G)·Vp and G·Vq): Black's factor NG/A0 ≈ 5e-5 on each
    // leaves up to about a millivolt between the ideal closed form and the exact circuit.
    expect(Math.abs(b!.zeroShift - closed)).toBeLessThan(1e-3);
    expect(Math.abs(b!.report!.dc!.out[1] / -0.05 - 1)).toBeLessThan(0.01);
  });
  it('with the zero at the sensor\'s own quiescent (Vref = Vq) one pole moves nothing, and auto takes it', () => {
    const r = analyse(designFrom('two-range-clamp', (x) => { x.target.zero = 2.5; delete x.supply.battery; }), { spreadTrials: 0 });
    const sw = switchOf(r);
    expect(sw.wiring).toBe('single-pole');
    expect(sw.decidedBy).toBe('zero-holds');
    expect(Math.abs(sw.positions[1]!.zeroShift)).toBeLessThan(0.02);
  });
});

describe('range switch edge cases', () => {
  it('a summing stage gets no switch, with a failing finding that says why', () => {
    const r = analyse(designFrom('generic-sensor', (x) => { x.target.topology = 'summing-non-inverting'; x.target.zero = 2; x.target.scale = 0.005; x.target.range = [-100, 100]; x.target.ranges = [{ scale: 0.0025, range: [-150, 150] }]; }), { spreadTrials: 0 });
    expect(r.stage?.ideal.topology).toBe('summing-non-inverting');
    expect(r.ranges?.ok).toBe(false);
    expect(r.warnings.find((w) => w.code === 'range-stage')?.level).toBe('fail');
  });
  it('a range that would need the non-inverting stage to attenuate is named as unbuildable', () => {
    const r = analyse(designFrom('two-range-clamp', (x) => { x.target.ranges = [{ scale: 0.01, range: [-90, 90] }]; x.target.rangeSwitch = 'single-pole'; }), { spreadTrials: 0 });
    const sw = switchOf(r);
    expect(sw.positions[1]!.unbuilt).toBe('range-gain-unreachable');
    expect(r.warnings.find((w) => w.code === 'range-unbuilt')?.level).toBe('fail');
    expect(nonFinitePaths(reportJson(r).ranges)).toEqual([]);
  });
  it('designForRange gives the position\'s target without the switch', () => {
    const d = designFrom('two-range-clamp');
    const p = designForRange(d, 1);
    expect(p.target.scale).toBe(0.04);
    expect(p.target.range).toEqual([-50, 50]);
    expect(p.target.ranges).toBeUndefined();
  });
  it('the file refuses a range of the opposite polarity, a reversed range and a fifth range', () => {
    const bad = (patch: (x: any) => void) => { try { designFrom('two-range-clamp', patch); return null; } catch (e) { return String(e); } };
    expect(bad((x) => { x.target.ranges[0].scale = -0.04; })).toMatch(/same sign/);
    expect(bad((x) => { x.target.ranges[0].range = [50, -50]; })).toMatch(/low to high/);
    expect(bad((x) => { x.target.ranges = [1, 2, 3, 4].map(() => ({ scale: 0.04, range: [-1, 1] })); })).toMatch(/ranges/);
  });
});
