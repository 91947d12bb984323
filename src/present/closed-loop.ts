/**
 * The closed-loop Hall sensor in words and tables: its parts (the winding as a part with its turns and wire),
 * its extra calibration steps, and the report lines (the step, the supply at the range end, the turns trade).
 */
import type { Report } from '../analysis/report.js';
import type { BomRow } from './bom.js';
import type { Prim } from './schematic.js';
import { formatEng } from '../model/units.js';
import { closedLoopParts } from '../physics/closed-loop.js';
import { rkmCode } from '../model/units.js';

const f = (x: number, u: string) => formatEng(x, u, 3);

/** The sensor's own parts, after the sensor row: winding, measurement resistor, compensation, driver, core. */
export function closedLoopBomRows(r: Report, dissipation: Map<string, number>, rating: (w: number) => number): BomRow[] {
  const d = r.design;
  const s = d.sensor;
  if (s.type !== 'closed-loop-hall') return [];
  const p = closedLoopParts(s, d.supply);
  const rows: BomRow[] = [];
  const wire = s.wire
    ? `${f(s.wire.diameter, 'm')} enamelled copper, ${f(s.wire.turnLength, 'm')} mean turn, ${f(s.compensationTurns * s.wire.turnLength, 'm')} of wire, about ${f(p.windingResistance, 'Ω')} at 20 °C`
    : `copper, ${f(p.windingResistance, 'Ω')} as given`;
  rows.push({ ref: 'W1', value: `${s.compensationTurns} turns`, code: '', spec: `${wire}; ${f(p.inductance, 'H')} on this core`, dissipation: dissipation.get('RW') ?? null, rating: null, quantity: 1, role: 'compensation winding, spread evenly round the core; its lead order sets the loop\'s polarity' });
  rows.push({ ref: 'T1', value: 'gapped core', code: '', spec: `${f(s.core.pathLength, 'm')} mean path, ${f(s.core.area * 1e6, '')} mm² section, ${f(s.core.gap, 'm')} gap, μr ${s.core.permeability}`, dissipation: null, rating: null, quantity: 1, role: 'the clamp\'s core; the Hall sensor sits in its gap' });
  const rmW = dissipation.get('RM') ?? 0;
  const held = Math.max(r.clip ? Math.abs(r.clip.measurandHigh) : 0, r.clip ? Math.abs(r.clip.measurandLow) : 0);
  // Past the range end the driver can still push its largest current through R_M: rate for that.
  const rmWorst = Math.max(rmW, ((held * s.primaryTurns) / s.compensationTurns) ** 2 * s.measurementResistance);
  rows.push({ ref: 'RM', value: f(s.measurementResistance, 'Ω'), code: rkmCode(s.measurementResistance, 3), spec: `±${+(d.target.tolerance * 100).toFixed(2)} % metal film, low tempco: it sets the scale`, dissipation: rmWorst, rating: rating(rmWorst), quantity: 1, role: 'measurement resistor (the output is across it)' });
  rows.push({ ref: 'RI', value: f(s.compensation.inputResistance, 'Ω'), code: rkmCode(s.compensation.inputResistance, 2), spec: '±1 % metal film', dissipation: null, rating: 0.125, quantity: 1, role: 'loop compensation: integrator input' });
  rows.push({ ref: 'CI', value: f(s.compensation.capacitance, 'F'), code: '', spec: 'ceramic C0G/NP0 or film ±5 %', dissipation: null, rating: null, quantity: 1, role: 'loop compensation: integrator capacitor' });
  if (s.compensation.zeroResistance > 0) rows.push({ ref: 'RZ', value: f(s.compensation.zeroResistance, 'Ω'), code: rkmCode(s.compensation.zeroResistance, 2), spec: '±1 % metal film', dissipation: null, rating: 0.125, quantity: 1, role: 'loop compensation: zero, in series with CI' });
  rows.push({ ref: 'U3', value: 'driver op-amp', code: '', spec: `GBW ${f(s.driver.gbw, 'Hz')}, ${s.driver.openLoopGainDb} dB open loop, output within ${f(s.driver.swing, 'V')} of each rail`, dissipation: null, rating: null, quantity: 1, role: 'loop driver: integrates the Hall sensor\'s output' });
  if (s.driver.outputStage === 'push-pull') {
    rows.push({ ref: 'Q1, Q2', value: 'NPN + PNP pair', code: '', spec: `complementary pair for at least ${f(s.driver.currentLimit, 'A')} and ${f(d.supply.positive - d.supply.negative, 'V')}; worst dissipation ${f(r.front.figures.find((x) => x.key === 'driverDissipation')?.value ?? 0, 'W')} shared by the two`, dissipation: null, rating: null, quantity: 1, role: 'driver output stage inside the loop' });
  }
  rows.push({ ref: 'RV3', value: '10 kΩ trimmer', code: '103', spec: 'single-turn cermet, with fixed resistors either side to span about ±0.1 V', dissipation: null, rating: null, quantity: 1, role: `sets the driver's + input to the Hall zero (${f(s.quiescent, 'V')}): the probe's coarse zero` });
  if (d.supply.negative === 0) {
    rows.push({ ref: 'U4', value: 'rail splitter', code: '', spec: `op-amp follower holding ${f(p.reference, 'V')} that can sink and source ${f(s.driver.currentLimit, 'A')}`, dissipation: null, rating: null, quantity: 1, role: 'R_M\'s low end: returns the compensation current on a single supply' });
  }
  return rows;
}

/** The closed-loop sensor's own calibration steps, before the stage's span and zero. */
export function closedLoopCalibrationSteps(r: Report): string[] {
  const d = r.design;
  const s = d.sensor;
  if (s.type !== 'closed-loop-hall') return [];
  const p = closedLoopParts(s, d.supply);
  return [
    `Loop first, with no current in the conductor: measure across RM (${f(s.measurementResistance, 'Ω')}). If it sits at either end of the driver's swing, the compensation winding is connected the wrong way round: switch off and swap W1's two leads.`,
    `Coarse zero: with no current, turn RV3 until the voltage across RM is within ±${f(0.001 * s.measurementResistance * (s.primaryTurns / s.compensationTurns) * Math.max(Math.abs(d.target.range[0]), Math.abs(d.target.range[1])), 'V')} of 0 V (${f(p.reference, 'V')} at RM's top, its low end). The stage's zero trimmer then sets the output's zero.`,
    `Check the loop holds: with the calibration current applied, the voltage across RM should be ${f(s.measurementResistance * s.primaryTurns / s.compensationTurns, 'V')} per ampere-turn through the core; if it stays near 0 V, the driver is at its limit or the winding is open.`,
  ];
}

/** Lines for the text report: the step, the supply at the range end and the turns trade. */
export function closedLoopLines(r: Report): string[] {
  const c = r.closedLoop;
  if (!c) return [];
  const m = r.design.sensor.measurand;
  const out: string[] = [];
  if (c.step) {
    const st = c.step;
    out.push(`  Step of ${f(st.step, m)} primary: the winding carries the edge at once; sag at the hand-over ${(st.sag * 100).toFixed(2)} %, overshoot ${(st.overshoot * 100).toFixed(2)} %, settled within 1 % ${st.settlingTime === null ? 'not within the view' : `after ${f(st.settlingTime, 's')}`}; ${st.crossings > 3 ? `it rings (${st.crossings} crossings of its settled value)` : 'no sustained ringing'}`);
  }
  out.push(`  Whole probe's supply current: ${f(c.supplyAtZero, 'A')} at zero, ${f(c.supplyAtRangeEnd, 'A')} at the range end${c.batteryLifeAtZero !== null ? `; battery life ${f(c.batteryLifeAtZero, 'h')} idle, ${f(c.batteryLifeAtRangeEnd ?? 0, 'h')} at the range end` : ''}`);
  out.push('  Turns trade (R_M the largest E24 value that keeps the range end + 20 % inside the driver\'s room; compensation for a 60° margin):');
  out.push('    turns    R_M      scale       supply at end  inductance  corner     margin  holds');
  for (const o of c.trade) {
    out.push(`  ${c.proposal?.turns === o.turns ? '*' : ' '} ${String(o.turns).padEnd(7)}  ${f(o.measurementResistance, 'Ω').padEnd(7)}  ${f(o.sensitivity, `V/${m}`).padEnd(10)}  ${f(o.supplyCurrent, 'A').padEnd(13)}  ${f(o.inductance, 'H').padEnd(10)}  ${f(o.windingCorner, 'Hz').padEnd(9)}  ${o.phaseMargin === null ? '—' : `${o.phaseMargin.toFixed(0)}°`.padEnd(6)}  ${o.fits ? f(o.maxCurrent, m) : 'no'}`);
  }
  if (c.proposal) {
    const q = c.proposal;
    out.push(`  Proposed: ${q.turns} turns, R_M ${f(q.measurementResistance, 'Ω')}, R_i ${f(q.compensation.inputResistance, 'Ω')}, C_i ${f(q.compensation.capacitance, 'F')}, R_z ${f(q.compensation.zeroResistance, 'Ω')}: more turns draw less supply current and drop less across R_M, but their inductance grows as N² and the hand-over tail L/R lengthens.`);
  }
  return out;
}

/**
 * The sensor's own loop as drawing primitives, below the stage (from y0 down): the Hall sensor into RI,
 * the driver op-amp with CI and RZ back from its output, the compensation winding W1 on the core, and RM
 * from the output node to the reference.
 */
export function closedLoopPrims(r: Report, y0: number): Prim[] {
  const s = r.design.sensor;
  if (s.type !== 'closed-loop-hall') return [];
  const P: Prim[] = [];
  const W = (...pts: Array<[number, number]>) => P.push({ t: 'wire', pts: pts.map(([x, y]) => [x, y + y0] as [number, number]) });
  const y = (v: number) => v + y0;
  const ohms = (x: number) => formatEng(x, 'Ω', 3).replace(' ', '');
  P.push({ t: 'text', x: 20, y: y(0), text: `Sensor loop: the core is held at zero flux (${s.compensationTurns} turns on T1, ${s.primaryTurns} primary pass${s.primaryTurns > 1 ? 'es' : ''})` });
  P.push({ t: 'source', x: 40, y: y(90), label: 'Hall in gap' });
  W([70, 90], [90, 90]);
  P.push({ t: 'res', x: 140, y: y(90), vertical: false, ref: 'RI', value: ohms(s.compensation.inputResistance), trimmer: false });
  W([190, 90], [300, 90]);
  P.push({ t: 'dot', x: 250, y: y(90) });
  P.push({ t: 'opamp', x: 340, y: y(110), invertingOnTop: true });
  W([300, 130], [270, 130]);
  P.push({ t: 'terminal', x: 265, y: y(130), label: `Hall zero ${formatEng(s.quiescent, 'V', 3)} (RV3)` });
  W([250, 90], [250, 70]);
  P.push({ t: 'cap', x: 250, y: y(55), ref: 'CI', value: formatEng(s.compensation.capacitance, 'F', 2).replace(' ', '') });
  if (s.compensation.zeroResistance > 0) {
    W([250, 40], [250, 30], [290, 30]);
    P.push({ t: 'res', x: 340, y: y(30), vertical: false, ref: 'RZ', value: ohms(s.compensation.zeroResistance), trimmer: false });
    W([390, 30], [420, 30], [420, 110]);
  } else {
    W([250, 40], [250, 30], [420, 30], [420, 110]);
  }
  W([380, 110], [470, 110]);
  P.push({ t: 'dot', x: 420, y: y(110) });
  P.push({ t: 'text', x: 400, y: y(150), text: s.driver.outputStage === 'push-pull' ? 'U3 + Q1/Q2' : 'U3' });
  P.push({ t: 'res', x: 520, y: y(110), vertical: false, ref: 'W1', value: `${s.compensationTurns} t`, trimmer: false });
  W([570, 110], [640, 110]);
  P.push({ t: 'dot', x: 600, y: y(110) });
  P.push({ t: 'terminal', x: 645, y: y(110), label: 'to the stage' });
  W([600, 110], [600, 125]);
  P.push({ t: 'res', x: 600, y: y(160), vertical: true, ref: 'RM', value: ohms(s.measurementResistance), trimmer: false });
  W([600, 195], [600, 205]);
  const ref = closedLoopParts(s, r.design.supply).reference;
  if (ref === 0) P.push({ t: 'ground', x: 600, y: y(205) });
  else P.push({ t: 'rail', x: 600, y: y(210), label: `${formatEng(ref, 'V', 3)} (U4)` });
  return P;
}
