/**
 * The closed-loop Hall sensor inside the whole report: the stage's circuit (modified nodal analysis) carries
 * the loop, so its DC transfer must give the zero-flux balance N_p·I_p = N_s·I_s (Ampère's law) less the finite
 * loop gain's share; the held current is where the output stops; the step on the sensor alone rings only when
 * the phase margin is small (Franklin, Powell & Emami-Naeini, Feedback Control of Dynamic Systems: a small
 * phase margin means a lightly damped closed loop); the battery life falls with the measured current.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../src/analysis/report.js';
import { closedLoopStep } from '../../src/analysis/closed-loop.js';
import { reportJson } from '../../src/present/json.js';
import { textReport } from '../../src/present/text-report.js';
import { keyFigures } from '../../src/present/figures.js';
import { bomRows, bomCsv } from '../../src/present/bom.js';
import { calibrationSteps } from '../../src/present/calibration.js';
import { schematic } from '../../src/present/schematic.js';
import { spiceNetlist } from '../../src/present/spice.js';
import { closedLoopSpiceNetlist } from '../../src/present/spice-closed-loop.js';
import { validateDesign, type ClosedLoopHallSensor } from '../../src/model/design.js';
import { DEMOS } from '../../src/model/demos.js';
import { designFrom, nonFinitePaths } from '../helpers.js';

const demo = () => designFrom('closed-loop-clamp');

describe('closed-loop Hall sensor in the report', () => {
  it('the stage circuit\'s DC transfer at R_M is (N_p/N_s)·R_M·T0/(1+T0): 82 mV/A less 47 ppm', () => {
    const r = analyse(demo(), { spreadTrials: 0 });
    const sc = r.circuit!;
    const k = sc.nodes.sensor - 1;
    const slope = r.dc!.c1[k]!, zero = r.dc!.c0[k]!;
    expect(Math.abs(slope / r.front.sensitivity - 1)).toBeLessThan(1e-9);
    expect(Math.abs(slope / 0.082 - 1)).toBeLessThan(1e-4);
    expect(Math.abs(slope / 0.082 - 1)).toBeGreaterThan(1e-5);
    expect(Math.abs(zero)).toBeLessThan(1e-9);
    // The stage then scales it to the target: 100 mV/A within the solver's tolerance.
    expect(Math.abs(r.dc!.out[1] / 0.1 - 1)).toBeLessThan(1e-3);
  });

  it('a range past the held current clips at it, naming the driver, and says what happens beyond', () => {
    const d = designFrom('closed-loop-clamp', (x) => { x.target.range = [-40, 40]; x.target.scale = 0.05; });
    const r = analyse(d, { spreadTrials: 0 });
    expect(r.clip!.firstHigh).toBe('driver');
    expect(r.clip!.measurandHigh).toBeCloseTo(34.5027, 3);
    const j = reportJson(r) as any;
    const codes = j.warnings.map((w: any) => w.code);
    expect(codes).toContain('clips-in-range-high');
    const over = j.warnings.find((w: any) => w.code === 'closed-loop-overload');
    expect(over.message).toMatch(/saturates at 339 A and the output collapses/);
  });

  it('JSON carries the four sensor figure keys, finite, and the closed-loop summary', () => {
    const j = reportJson(analyse(demo(), { spreadTrials: 0 })) as any;
    const fig = (key: string) => j.sensor.figures.find((f: any) => f.key === key)?.value;
    expect(fig('sensitivity')).toBeCloseTo(0.082, 4);
    expect(fig('maxCurrent')).toBeCloseTo(34.50, 2);
    expect(fig('phaseMargin')).toBeGreaterThan(55);
    expect(fig('bandwidth')).toBeGreaterThan(1e4);
    expect(nonFinitePaths(j)).toEqual([]);
    expect(j.closedLoop.trade.length).toBe(10);
    expect(j.closedLoop.proposal).toBe(1500);
    expect(j.cautions.some((c: string) => /compensation winding/.test(c))).toBe(true);
  });

  it('the step on the sensor alone: the demo settles without ringing; a pure integrator (6.6° margin) rings', () => {
    const s = demo().sensor as ClosedLoopHallSensor;
    const good = closedLoopStep(s, demo().supply, 10)!;
    expect(good.crossings).toBeLessThanOrEqual(3);
    expect(good.tailRipple).toBeLessThan(1e-3);
    expect(good.overshoot).toBeLessThan(0.05);
    // The sag at the hand-over is the flatness dip, about 1/(1 + T_p) (derived): 1.5 % here.
    expect(good.sag).toBeGreaterThan(0.005);
    expect(good.sag).toBeLessThan(0.03);
    const bad = closedLoopStep({ ...s, compensation: { ...s.compensation, zeroResistance: 0 } }, demo().supply, 10)!;
    expect(bad.crossings).toBeGreaterThan(10);
    expect(bad.tailRipple).toBeGreaterThan(10 * good.tailRipple);
  });

  it('battery life depends on what is measured: capacity/(I_zero + |I|·N_p/N_s)', () => {
    const d = designFrom('closed-loop-clamp', (x) => {
      x.supply = { positive: 9, negative: 0, battery: { fresh: 9.6, endOfLife: 7.2, capacity: 565e-3 * 3600 } };
      delete x.sensor.reference;
      x.target = { ...x.target, zero: 4.5, range: [-20, 20] };
    });
    const r = analyse(d, { spreadTrials: 0 });
    const c = r.closedLoop!;
    expect(c.supplyAtRangeEnd - c.supplyAtZero).toBeCloseTo(20 / 1000, 12);
    // 9 V alkaline about 565 mAh (Wikipedia "Nine-volt battery", citing IEC 60086-2).
    expect(c.batteryLifeAtRangeEnd!).toBeCloseTo(0.565 / c.supplyAtRangeEnd, 6);
    expect(c.batteryLifeAtRangeEnd!).toBeLessThan(c.batteryLifeAtZero! / 2);
  });

  it('parts list, calibration, schematic, text and SPICE all carry the loop', () => {
    const r = analyse(demo(), { spreadTrials: 0 });
    const rows = bomRows(r);
    const w1 = rows.find((x) => x.ref === 'W1')!;
    expect(w1.value).toBe('1000 turns');
    expect(w1.spec).toMatch(/250 µm enamelled copper/);
    const rm = rows.find((x) => x.ref === 'RM')!;
    // Rated for the driver's largest current through it: (34.5 mA)²·82 Ω = 97.6 mW, 50 % derated → 0.25 W.
    expect(rm.dissipation!).toBeCloseTo(0.0345027 ** 2 * 82, 5);
    expect(rm.rating).toBe(0.25);
    expect(rows.some((x) => x.ref === 'Q1, Q2')).toBe(true);
    expect(bomCsv(r)).toMatch(/compensation winding/);
    const cal = calibrationSteps(r).map((s) => s.text).join('\n');
    expect(cal).toMatch(/swap W1's two leads/);
    expect(cal).toMatch(/clamp only round an insulated conductor/);
    const sch = schematic(r)!;
    expect(sch.prims.some((p) => p.t === 'res' && p.ref === 'W1')).toBe(true);
    expect(sch.prims.some((p) => p.t === 'res' && p.ref === 'RM')).toBe(true);
    expect(textReport(r)).toMatch(/Turns trade/);
    // The printed sheet and the app read the same key figures: the held current, the step and the proposal.
    const rowsShown = keyFigures(r).map((x) => `${x.label}: ${x.value}`).join('\n');
    expect(rowsShown).toMatch(/Largest current held at zero flux \(the smaller way\): 34\.5 A/);
    expect(rowsShown).toMatch(/Sensor step \(half the range\): sag 1\.\d\d %/);
    expect(rowsShown).toMatch(/Proposed winding: 1500 turns/);
    const net = spiceNetlist(r)!;
    expect(net).toMatch(/^HHALL /m);
    expect(net).toMatch(/^V_LM_SENSE /m);
    // The driver's pole and its output held within its voltage room (±3.3 V about the reference on the demo's ±5 V).
    expect(net).toMatch(/^B_EDRV_GM /m);
    expect(net).toMatch(/^B_EDRV cldo \S+ V=max\(-3\.3, min\(3\.3, V\(cldo_pole\)\)\)$/m);
    expect(closedLoopSpiceNetlist(r.design)!.netlist).toMatch(/^tran /m);
    expect(closedLoopSpiceNetlist(designFrom('bench-clamp'))).toBeNull();
  });

  it('validation: the winding needs a resistance or a wire, the reference lies between the rails', () => {
    const doc = structuredClone(DEMOS.find((x) => x.id === 'closed-loop-clamp')!.document) as any;
    delete doc.sensor.wire;
    let v = validateDesign(structuredClone(doc));
    expect(v.ok).toBe(false);
    if (!v.ok) expect(v.problems.map((p) => p.path)).toContain('sensor.windingResistance');
    doc.sensor.wire = { turnLength: 0.036 };
    v = validateDesign(structuredClone(doc));
    expect(v.ok).toBe(false);
    if (!v.ok) expect(v.problems.map((p) => p.path)).toContain('sensor.wire.diameter');
    doc.sensor.wire = null;
    doc.sensor.windingResistance = 12;
    doc.sensor.reference = 6;
    v = validateDesign(structuredClone(doc));
    expect(v.ok).toBe(false);
    if (!v.ok) expect(v.problems.map((p) => p.path)).toContain('sensor.reference');
    doc.sensor.reference = 0;
    expect(validateDesign(structuredClone(doc)).ok).toBe(true);
  });
});

describe('closed-loop Hall sensor on a sagging battery', () => {
  it('the held range shrinks with the rail and a mid-rail reference follows it: (V/2 − swing − drop)/(R_o + R_w + R_M)·N_s', () => {
    const d = designFrom('closed-loop-clamp', (x) => {
      x.supply = { positive: 9, negative: 0, battery: { fresh: 9.6, endOfLife: 7.2, capacity: 565e-3 * 3600 } };
      delete x.sensor.reference;
      x.target = { ...x.target, zero: 4.5, range: [-20, 20] };
    });
    const r = analyse(d, { spreadTrials: 0 });
    const s = d.sensor as ClosedLoopHallSensor;
    const loop = 1 + 0.35123 * 36 + 82; // R_o + R_w (0.25 mm copper, IEC 60028) + R_M
    const fresh = r.battery[0]!, end = r.battery[r.battery.length - 1]!;
    expect(fresh.voltage).toBeCloseTo(9.6, 9);
    expect(fresh.measurandHigh).toBeCloseTo(((9.6 / 2 - 1.7) / loop) * s.compensationTurns, 1);
    expect(end.measurandHigh).toBeCloseTo(((7.2 / 2 - 1.7) / loop) * s.compensationTurns, 1);
    // A rail splitter at V/2: the zero at R_M moves by half the sag, times the stage's gain on it.
    expect(Math.abs(end.zeroShift)).toBeGreaterThan(0.5);
  });
});
