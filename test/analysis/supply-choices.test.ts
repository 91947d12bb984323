/**
 * Issue 18, part 3: the whole front end on a regulator, a zero for the end of battery life and the best
 * rail-to-rail output op-amp, checked against closed forms worked by hand. Every design here is a scenario of
 * our own invention.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../src/analysis/report.js';
import { batteryRails, chargeDrawnTo, endOfLifeVoltage } from '../../src/analysis/analysis.js';
import { bestRailToRail, centredZero, optionDesign, withSupply, worstHeadroom, type SupplyOption } from '../../src/analysis/supply-options.js';
import { comparisonRows, supplyChoices, worstVerdict } from '../../src/present/comparison.js';
import { sayFinding } from '../../src/present/finding-words.js';
import { validateDesign } from '../../src/model/design.js';
import { archetype } from '../../src/model/opamps.js';
import { designFrom } from '../helpers.js';

// 9 V alkaline: fresh up to 9.6 V, about 565 mAh (Wikipedia "Nine-volt battery", citing IEC 60086-2); the
// 6.0 V end point is our scenario's (a scope probe that must still read well), 5.4 V is 0.9 V per cell
// (common practice).
const battery = { fresh: 9.6, endOfLife: 6.0, capacity: 565e-3 * 3600 };
const spec = (id: string) => archetype(id)!.spec;

/**
 * Our own 9 V scenario: the generic 12.5 mV/A sensor (2.5 V at zero) read at 0.1 V/A about a 4.5 V zero over
 * ±20 A, the sensor and the offset reference on a 5 V regulator (so the zero holds as the battery sags), and
 * an op-amp whose output stops `outputHigh` short of the + rail and 0.05 V above 0 V.
 */
const onNineVolts = (opamp = 'bipolar-general') => designFrom('generic-sensor', (x) => {
  x.supply = { positive: 9, negative: 0, regulated: { voltage: 5, tolerance: 0.02, quiescentCurrent: 5e-6 }, sensorRail: 'regulated', referenceRail: 'regulated', battery };
  x.opamp = { ...spec(opamp) };
});

/**
 * Our own shunt scenario: a 10 mΩ low-side shunt read at 0.5 V/A from 0 V (0.1 A to 5 A), a rail-to-rail op-amp
 * (0.1 mA quiescent, typical from memory). At zero current every node of the stage sits at 0 V, so no network
 * draws current and the supply current is the op-amp's and the regulator's alone.
 */
const shuntOnBattery = (bat: object = battery) => designFrom('generic-sensor', (x) => {
  x.sensor = { type: 'shunt', measurand: 'A', resistance: 0.01, powerRating: 1 };
  x.supply = { positive: 9, negative: 0, battery: bat };
  x.opamp = { ...spec('cmos-rail-to-rail') };
  x.target = { ...x.target, scale: 0.5, zero: 0, range: [0.1, 5] };
});

const row = (options: SupplyOption[], kind: SupplyOption['kind']) => {
  const o = options.find((x) => x.kind === kind);
  if (!o) throw new Error(`no ${kind} row among ${options.map((x) => x.kind).join(', ')}`);
  return o;
};

describe('the battery as it is, on our 9 V scenario', () => {
  // Closed form of the offset stage: Vout = zero + scale·x (non-inverting stage with the reference at the foot
  // of the ground leg; Franco, Design with Operational Amplifiers, summing and difference amplifiers, from
  // memory). A general-purpose output stops 1.5 V short of the + rail and 0.05 V above 0 V (common practice
  // for such parts). At end of life (6.0 V) it tops out at 4.5 V, the zero itself:
  // high end (4.5 − 4.5)/0.1 = 0 A, low end (0.05 − 4.5)/0.1 = −44.5 A.
  it('loses the upper half of the range at end of life', () => {
    const asIs = row(supplyChoices(onNineVolts()), 'as-is');
    expect(asIs.endOfLifeHigh!).toBeCloseTo(0, 1);
    expect(asIs.endOfLifeLow!).toBeCloseTo(-44.5, 0);
    expect(asIs.fits).toBe(false);
  });
});

describe('a zero for the end of battery life', () => {
  // Equal headroom below and above the range at end of life (closed form): z = (0.05 + 4.5)/2 = 2.275 V, to
  // 10 mV 2.27 or 2.28 V; the range then runs (0.05 − z)/0.1 … (4.5 − z)/0.1 ≈ −22.3 … 22.2 A.
  it('centres the range in the end-of-life swing and buys back the whole ±20 A', () => {
    const options = supplyChoices(onNineVolts());
    const z = row(options, 'zero');
    expect(Math.abs(z.zero - 2.275)).toBeLessThanOrEqual(0.0051);
    expect(z.endOfLifeLow!).toBeCloseTo((0.05 - z.zero) / 0.1, 0);
    expect(z.endOfLifeHigh!).toBeCloseTo((4.5 - z.zero) / 0.1, 0);
    expect(z.fits).toBe(true);
    expect(z.gainsAtEndOfLife).toBe(true);
    // Only the zero changes: the supply and the op-amp are the design's.
    expect(z.supply).toEqual(onNineVolts().supply);
    expect(z.opamp).toBeNull();
    // Its note carries the numbers of both rows.
    expect(z.notes.map((n) => n.code)).toEqual(['supply-zero-centred']);
    expect(z.notes[0]!.data).toMatchObject({ from: 4.5, to: z.zero, endOfLife: 6, newLow: z.endOfLifeLow, newHigh: z.endOfLifeHigh });
    expect(sayFinding(z.notes[0]!)).toMatch(/instead of 4\.50 V/);
  });

  it('centredZero(report) is the closed form, and the full report of that zero confirms more headroom', () => {
    const r = analyse(onNineVolts(), { spreadTrials: 0 });
    const z = centredZero(r)!;
    expect(Math.abs(z - 2.275)).toBeLessThanOrEqual(0.0051);
    const moved = analyse({ ...r.design, target: { ...r.design.target, zero: z } }, { spreadTrials: 0 });
    // Headroom at end of life: below z − 0.05 − 2.0 and above 4.5 − z − 2.0, both about 0.225 V (closed form).
    expect(worstHeadroom(moved)).toBeCloseTo(0.225, 1);
    expect(worstHeadroom(moved)).toBeGreaterThan(worstHeadroom(r));
  });

  it('is not offered when the design already covers the range at end of life, or when the zero follows the battery', () => {
    // The shunt scenario covers 0.1 … 5 A on any rail above 2.52 V.
    expect(supplyChoices(shuntOnBattery()).map((o) => o.kind)).not.toContain('zero');
    // The generic demo's reference hangs from the battery, so its zero rises as the battery sags (to
    // 20 − 15.5·6/9 = 9.67 V at 6 V, closed form of the divider): no zero brings the range back.
    const refOnBattery = designFrom('generic-sensor', (x) => { x.supply.battery = battery; });
    expect(supplyChoices(refOnBattery).map((o) => o.kind)).not.toContain('zero');
  });
});

describe('the best rail-to-rail output op-amp', () => {
  // A rail-to-rail output stops 0.02 V from each rail (typical, from memory): at end of life it reaches
  // 6.0 − 0.02 = 5.98 V, i.e. (5.98 − 4.5)/0.1 = 14.8 A, and (0.02 − 4.5)/0.1 = −44.8 A below.
  it('buys back part of the range on the same battery', () => {
    const r2r = row(supplyChoices(onNineVolts()), 'rail-to-rail');
    expect(r2r.opamp!.outputHigh).toBeLessThanOrEqual(0.1);
    expect(r2r.endOfLifeHigh!).toBeCloseTo((6.0 - r2r.opamp!.outputHigh - 4.5) / 0.1, 0);
    expect(r2r.endOfLifeLow!).toBeCloseTo((r2r.opamp!.outputLow - 4.5) / 0.1, 0);
    expect(r2r.gainsAtEndOfLife).toBe(true);
    expect(r2r.zero).toBe(4.5);
  });

  it('is taken from the op-amp comparison when it is at hand (the same row, not worked out again)', () => {
    const d = onNineVolts();
    const rows = comparisonRows(d);
    const best = bestRailToRail(d, worstVerdict, rows)!;
    expect(rows).toContain(best);
    // Without the rows it is worked out from the rail-to-rail archetypes: the same op-amp and figures.
    const own = bestRailToRail(d, worstVerdict)!;
    expect(own.opamp).toEqual(best.opamp);
    expect(own.endOfLifeHigh).toBe(best.endOfLifeHigh);
    expect(row(supplyChoices(d, undefined, rows), 'rail-to-rail').endOfLifeHigh).toBe(best.endOfLifeHigh);
  });

  it('is not offered when the design\'s op-amp is rail-to-rail already', () => {
    expect(supplyChoices(onNineVolts('cmos-rail-to-rail')).map((o) => o.kind)).not.toContain('rail-to-rail');
  });
});

describe('the whole front end on a regulator', () => {
  // The rails become 0 … 5 V. The general-purpose output reaches 0.05 … 3.5 V there, so the 4.5 V zero no
  // longer fits and moves to the centred one, (0.05 + 3.5)/2 = 1.775 V; the range is then ±17.25 A fresh and
  // at end of life alike, since the regulated rails do not sag (closed form as above).
  it('runs the op-amp from the regulated rail, moves a zero that no longer fits, and holds the range to end of life', () => {
    const o = row(supplyChoices(onNineVolts()), 'front-end-regulated');
    expect([o.supply.positive, o.supply.negative, o.supply.regulated!.voltage, o.supply.battery!.rails]).toEqual([5, 0, 5, 'regulated']);
    expect(Math.abs(o.zero - 1.775)).toBeLessThanOrEqual(0.0051);
    expect(o.endOfLifeHigh!).toBeCloseTo((3.5 - o.zero) / 0.1, 0);
    expect(o.endOfLifeLow!).toBeCloseTo((0.05 - o.zero) / 0.1, 0);
    expect(o.endOfLifeHigh).toBeCloseTo(o.measurandHigh!, 9);
    expect(o.fits).toBe(false);
    expect(o.notes[0]!.data).toMatchObject({ voltage: 5, endOfLife: 6, batteryEnd: 6, zeroFrom: 4.5, zeroTo: o.zero });
    // The design it makes is a valid file.
    expect(validateDesign(structuredClone(optionDesign(onNineVolts(), o))).ok).toBe(true);
  });

  // With a rail-to-rail output (0.02 … 4.98 V) the centred zero is 2.5 V and the range ±24.8 A: it fits.
  it('with a rail-to-rail output it covers ±20 A to the end of the battery', () => {
    const o = row(supplyChoices(onNineVolts('cmos-rail-to-rail')), 'front-end-regulated');
    expect(o.zero).toBeCloseTo(2.5, 9);
    expect(o.endOfLifeHigh!).toBeCloseTo(24.8, 0);
    expect(o.endOfLifeLow!).toBeCloseTo(-24.8, 0);
    expect(o.fits).toBe(true);
  });

  // Battery life = capacity / current (t = Q/I). The shunt stage draws nothing at zero current, so the
  // current is the op-amp's 0.1 mA plus the regulator's own (0.1 mA unless stated, common practice, from
  // memory): 565 mAh / 0.2 mA = 2825 h.
  it('counts the regulator\'s quiescent current in the battery life', () => {
    const o = row(supplyChoices(shuntOnBattery()), 'front-end-regulated');
    expect(o.zero).toBe(0);
    expect(o.supplyCurrent!).toBeCloseTo(0.2e-3, 12);
    expect(o.batteryLife!).toBeCloseTo(2825, 6);
    const r = analyse(optionDesign(shuntOnBattery(), o), { spreadTrials: 0 });
    expect(r.supply!.parts.find((p) => p.name === 'regulator quiescent')!.current).toBe(1e-4);
  });

  // End of life where the battery falls to the regulator's output plus its dropout (common practice), when
  // that comes before the battery's own end point: 5 V + 1.2 V dropout = 6.2 V above a 5.4 V end point. With
  // the voltage falling linearly with the charge drawn (the report's battery model), the life is
  // 2825 h × (9.6 − 6.2)/(9.6 − 5.4) = 2286.9 h.
  it('ends the battery\'s life where the regulator drops out when that comes first', () => {
    const bat = { fresh: 9.6, endOfLife: 5.4, capacity: 565e-3 * 3600 };
    const d = withSupply(shuntOnBattery(bat), 'front-end-regulated')!.design;
    const lowDropout = analyse(d, { spreadTrials: 0 });
    expect(endOfLifeVoltage(d)).toBe(5.4);
    expect(lowDropout.supply!.batteryLife!).toBeCloseTo(2825, 6);
    const old = { ...d, supply: { ...d.supply, regulated: { ...d.supply.regulated!, dropout: 1.2 } } };
    expect(validateDesign(structuredClone(old)).ok).toBe(true);
    expect(endOfLifeVoltage(old)).toBeCloseTo(6.2, 12);
    const r = analyse(old, { spreadTrials: 0 });
    expect(r.supply!.batteryLife!).toBeCloseTo(2825 * 3.4 / 4.2, 6);
    expect(r.battery[r.battery.length - 1]!.voltage).toBeCloseTo(6.2, 12);
    // The rails hold to the end: the last sweep step is still regulated, the range unchanged.
    expect(r.battery.every((s) => s.regulated)).toBe(true);
  });

  // A low-dropout regulator past dropout passes its input less the dropout (common practice).
  it('batteryRails follows the regulator: its output while it holds, the battery less the dropout below', () => {
    const d = withSupply(shuntOnBattery(), 'front-end-regulated')!.design;
    expect(batteryRails(d, 9)).toEqual([5, 0]);
    const [p] = batteryRails(d, 5.1);
    expect(p).toBeCloseTo(4.8, 12);
  });

  it('chargeDrawnTo is linear from fresh to the battery\'s own end point', () => {
    // (9.6 − 7.8)/(9.6 − 6.0) = 0.5 (the report's straight-line battery model).
    expect(chargeDrawnTo(battery, 7.8)).toBeCloseTo(0.5, 12);
    expect(chargeDrawnTo(battery, 6.0)).toBeCloseTo(1, 12);
  });

  it('the file refuses a front end on the regulator without one, off its voltage, over a negative rail or above the battery', () => {
    const d = withSupply(shuntOnBattery(), 'front-end-regulated')!.design;
    const paths = (patch: (x: any) => void) => {
      const doc = structuredClone(d) as any;
      patch(doc);
      const v = validateDesign(doc);
      return v.ok ? [] : v.problems.map((p) => p.path);
    };
    expect(paths(() => {})).toEqual([]);
    expect(paths((x) => { x.supply.regulated = null; x.supply.sensorRail = 'positive'; x.supply.referenceRail = 'positive'; })).toEqual(['supply.battery.rails']);
    expect(paths((x) => { x.supply.positive = 9; })).toEqual(['supply.positive']);
    expect(paths((x) => { x.supply.negative = -5; })).toContain('supply.negative');
    expect(paths((x) => { x.supply.regulated.voltage = 9.5; x.supply.positive = 9.5; })).toEqual(['supply.regulated.voltage']);
  });
});

describe('every new row is the full report of the design it makes', () => {
  it('figures equal those of analyse(optionDesign(design, row))', () => {
    const design = onNineVolts();
    for (const o of supplyChoices(design).filter((x) => x.kind === 'zero' || x.kind === 'rail-to-rail' || x.kind === 'front-end-regulated')) {
      const r = analyse(optionDesign(design, o), { spreadTrials: 0 });
      const end = r.battery[r.battery.length - 1]!;
      expect({ endLow: o.endOfLifeLow, endHigh: o.endOfLifeHigh, life: o.batteryLife, low: o.measurandLow, high: o.measurandHigh })
        .toEqual({ endLow: end.measurandLow, endHigh: end.measurandHigh, life: r.supply!.batteryLife, low: r.clip!.measurandLow, high: r.clip!.measurandHigh });
    }
  });
});

describe('bad input never shows NaN or Infinity', () => {
  it('every row of every demo on a 9 V battery (and on a 3 V one, too low for any regulator) has finite figures or none', async () => {
    const { DEMOS } = await import('../../src/model/demos.js');
    const { supplyJson } = await import('../../src/present/comparison.js');
    const { nonFinitePaths } = await import('../helpers.js');
    const checked: string[] = [];
    for (const demo of DEMOS) {
      for (const bat of [battery, { fresh: 3.2, endOfLife: 2.0, capacity: 1000 }]) {
        const doc = structuredClone(demo.document) as any;
        const positive = bat.fresh > 9 ? 9 : 3;
        doc.supply = { ...doc.supply, positive, negative: 0, battery: bat, regulated: null, sensorRail: 'positive', referenceRail: 'positive' };
        const v = validateDesign(doc);
        if (!v.ok) continue; // a demo whose op-amp or sensor cannot sit on these rails at all is refused by the file
        const options = supplyChoices(v.design);
        checked.push(`${demo.id}@${positive}`);
        expect(options[0]!.kind).toBe('as-is');
        for (const o of options) expect(nonFinitePaths(supplyJson(o)), `${demo.id} ${o.kind}`).toEqual([]);
        // No regulator fits under a 3 V battery: no regulated rows there (5 V or 3.3 V plus 0.3 V dropout > 3 V).
        if (positive === 3) expect(options.map((o) => o.kind)).not.toContain('front-end-regulated');
      }
    }
    // The open-loop demos are checked on 9 V (the closed-loop one keeps its own rails' rules); on 3 V those whose op-amp fits there.
    expect(checked.filter((c) => c.endsWith('@9'))).toEqual(expect.arrayContaining(['bench-clamp@9', 'appliance-ct@9', 'generic-sensor@9', 'two-range-clamp@9']));
    expect(checked.some((c) => c.endsWith('@3'))).toBe(true);
  });
});

describe('a choice the file would refuse is not offered', () => {
  // Our own 3.3 V sensor (specified for 3.0 … 3.6 V) with the low-noise bipolar archetype, whose inputs stop
  // 2 V from each rail (typical, from memory): on a 3.3 V regulated rail 2 + 2 > 3.3 V leaves it no input
  // range, so the whole front end cannot sit on the regulator; sensor and reference alone can.
  it('leaves out the whole front end on a 3.3 V regulator for an op-amp that needs 4 V of headroom', () => {
    const d = designFrom('generic-sensor', (x) => {
      x.sensor = { ...x.sensor, supplyMin: 3.0, supplyMax: 3.6 };
      x.supply = { positive: 9, negative: 0, battery };
      x.opamp = { ...spec('low-noise-bipolar') };
    });
    const v = withSupply(d, 'front-end-regulated')!;
    expect(v.design.supply.positive).toBe(3.3);
    expect(validateDesign(structuredClone(v.design)).ok).toBe(false);
    const kinds = supplyChoices(d).map((o) => o.kind);
    expect(kinds).not.toContain('front-end-regulated');
    expect(kinds).toContain('regulator');
  });
});
