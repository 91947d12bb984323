import { describe, expect, it } from 'vitest';
import { analyse } from '../../src/analysis/report.js';
import { batteryRails } from '../../src/analysis/analysis.js';
import { optionDesign, regulatorVoltage, withSupply } from '../../src/analysis/supply-options.js';
import { supplyChoices } from '../../src/present/comparison.js';
import { verdictsOf } from '../../src/present/verdicts.js';
import { validateDesign } from '../../src/model/design.js';
import { archetype } from '../../src/model/opamps.js';
import { designFrom, shuntOnSplitSupply } from '../helpers.js';

const battery = { fresh: 9.6, endOfLife: 6.0, capacity: 565e-3 * 3600 }; // 9 V alkaline figures, Wikipedia "Nine-volt battery" (IEC 60086-2)
const spec = (id: string) => archetype(id)!.spec;

/**
 * Scenario of our own: a 10 mΩ low-side shunt read at 0.5 V/A about 0 V over ±5 A (gain 50, no offset to
 * make, so the zero needs no rail), on one 9 V battery split by a rail splitter.
 */
const shuntOnSplitBattery = (opamp: string) => designFrom('generic-sensor', (x) => {
  shuntOnSplitSupply(x);
  x.supply = { positive: 4.5, negative: -4.5, battery: { ...battery, rails: 'split' } };
  x.opamp = { ...spec(opamp) };
});

describe('batteryRails(design, v)', () => {
  // A rail splitter puts ground at the battery's middle: ±v/2; a second battery below ground: ±v (by construction).
  it('gives v over the negative rail for one battery, ±v/2 split, ±v for a pair', () => {
    const d = designFrom('bench-clamp');
    expect(batteryRails(d, 7)).toEqual([7, 0]);
    expect(batteryRails({ ...d, supply: { ...d.supply, battery: { ...d.supply.battery!, rails: 'split' } } }, 7)).toEqual([3.5, -3.5]);
    expect(batteryRails({ ...d, supply: { ...d.supply, battery: { ...d.supply.battery!, rails: 'pair' } } }, 7)).toEqual([7, -7]);
  });
});

describe('a split battery in the report', () => {
  // At end of life the rails are ±3.0 V. A rail-to-rail output (20 mV short of each rail) reaches ±2.98 V,
  // i.e. ±2.98/0.5 = ±5.96 A; an output 1.5 V short of the + rail reaches 1.5 V, i.e. 3 A (closed form
  // Vout = scale·x of the zero-offset stage; the swing figures are common practice for such parts).
  it('sweeps both rails: the rail-to-rail part covers ±5 A at end of life, the general-purpose one stops near 3 A', () => {
    const r2r = analyse(shuntOnSplitBattery('cmos-rail-to-rail'), { spreadTrials: 0 });
    const gp = analyse(shuntOnSplitBattery('bipolar-general'), { spreadTrials: 0 });
    const end = (r: typeof r2r) => r.battery[r.battery.length - 1]!;
    expect(end(r2r).voltage).toBeCloseTo(6, 9);
    expect(end(r2r).measurandHigh).toBeCloseTo(5.96, 1);
    expect(end(r2r).measurandLow).toBeCloseTo(-5.96, 1);
    expect(end(gp).measurandHigh).toBeCloseTo(3, 1);
    expect(end(gp).first).toBe('opamp-output');
  });
  it('adds the rail splitter\'s current to the drain (1 mA unless stated)', () => {
    const split = analyse(shuntOnSplitBattery('cmos-rail-to-rail'), { spreadTrials: 0 });
    expect(split.supply!.parts.find((p) => p.name === 'rail splitter')!.current).toBe(1e-3);
    const d = shuntOnSplitBattery('cmos-rail-to-rail');
    const own = analyse({ ...d, supply: { ...d.supply, battery: { ...d.supply.battery!, splitterCurrent: 2e-4 } } }, { spreadTrials: 0 });
    expect(split.supply!.current - own.supply!.current).toBeCloseTo(8e-4, 12);
  });
  it('a split or paired battery needs symmetric rails in the file', () => {
    const doc = structuredClone(shuntOnSplitBattery('cmos-rail-to-rail')) as any;
    doc.supply.negative = -4;
    const v = validateDesign(doc);
    expect(!v.ok && v.problems.map((p) => p.path)).toEqual(['supply.negative']);
  });
});

describe('supplyChoices(design)', () => {
  it('each option is the full report of its own design: figures equal, and the design is a valid file', () => {
    for (const design of [designFrom('bench-clamp'), designFrom('generic-sensor', (x) => { x.supply.battery = battery; })]) {
      const options = supplyChoices(design);
      expect(options.length).toBeGreaterThanOrEqual(3);
      for (const o of options) {
        // The design adopting the row makes (its supply, zero and, for the rail-to-rail row, op-amp).
        const d = o.kind === 'as-is' ? design : optionDesign(design, o);
        if (o.kind === 'regulator' || o.kind === 'split' || o.kind === 'pair') expect(d).toEqual(withSupply(design, o.kind)!.design);
        expect(validateDesign(structuredClone(d)).ok).toBe(true);
        expect(d.supply).toEqual(o.supply);
        const r = analyse(d, { spreadTrials: 0 });
        const end = r.battery[r.battery.length - 1]!;
        expect({ low: o.measurandLow, high: o.measurandHigh, endLow: o.endOfLifeLow, endHigh: o.endOfLifeHigh, life: o.batteryLife, clip: o.hoursToClip, verdict: o.verdict })
          .toEqual({ low: r.clip!.measurandLow, high: r.clip!.measurandHigh, endLow: end.measurandLow, endHigh: end.measurandHigh, life: r.supply!.batteryLife, clip: r.batteryClip!.hoursToClip, verdict: verdictsOf(r)[0]!.level });
      }
    }
  });
  // Scenario of our own: the generic sensor on a 9 V battery, zero 4.5 V, 100 mV/A, a general-purpose op-amp
  // 1.5 V short of the + rail. On a regulator the zero holds at 4.5 V, so at 6.0 V the output tops out at
  // 4.5 V, the zero itself: the high end of the range falls to (4.5 − 4.5)/0.1 = 0 A (closed form).
  it('a regulator holds the zero but cannot buy back the swing the battery loses', () => {
    const d = designFrom('generic-sensor', (x) => { x.supply.battery = battery; });
    const reg = supplyChoices(d).find((o) => o.kind === 'regulator')!;
    expect(reg.supply.regulated!.voltage).toBe(5);
    expect(reg.supply.sensorRail).toBe('regulated');
    expect(reg.endOfLifeHigh!).toBeCloseTo(0, 1);
    expect(reg.fits).toBe(false);
  });
  it('split rails re-centre the zero on the new ground and leave out a regulator that cannot fit under the + rail', () => {
    const d = designFrom('bench-clamp');
    const split = supplyChoices(d).find((o) => o.kind === 'split')!;
    expect([split.supply.positive, split.supply.negative, split.zero]).toEqual([4.5, -4.5, 0]);
    // 5 V plus 0.3 V dropout does not fit under a 4.5 V rail.
    expect(split.regulatorDropped).toBe(true);
    expect(split.supply.regulated).toBeNull();
    const pair = supplyChoices(d).find((o) => o.kind === 'pair')!;
    expect([pair.supply.positive, pair.supply.negative, pair.zero, pair.regulatorDropped]).toEqual([9, -9, 0, false]);
  });
  it('the choice already in the design is not offered twice; no battery, no options', () => {
    // The bench clamp's sensor and reference already sit on its regulator; the zero and rail-to-rail rows and the
    // whole front end on the regulator are offered beside the supplies (issue 18, part 3).
    expect(supplyChoices(designFrom('bench-clamp')).map((o) => o.kind)).toEqual(['as-is', 'zero', 'rail-to-rail', 'front-end-regulated', 'split', 'pair']);
    expect(supplyChoices(designFrom('generic-sensor'))).toEqual([]);
    // A split battery of 9 V: a 5 V regulator needs 5.3 V under a 4.5 V rail, so the 3.3 V one is offered.
    const onSplit = supplyChoices(shuntOnSplitBattery('cmos-rail-to-rail'));
    expect(onSplit.map((o) => o.kind)).toEqual(['as-is', 'regulator', 'front-end-regulated', 'pair']);
    expect(onSplit[1]!.supply.regulated!.voltage).toBe(3.3);
  });
  it('regulatorVoltage picks the sensor\'s ratiometric supply, else 5 V or 3.3 V as the rail allows, else none', () => {
    expect(regulatorVoltage(designFrom('bench-clamp'), 9)).toBe(5);
    const d = designFrom('generic-sensor');
    expect(regulatorVoltage(d, 9)).toBe(5);
    expect(regulatorVoltage(d, 5)).toBe(3.3);
    expect(regulatorVoltage(d, 3)).toBeNull();
  });
});
