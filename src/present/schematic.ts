/**
 * The schematic of a solved stage as drawing primitives (wires, resistors, the op-amp …) on a 640 × 340
 * grid. The app draws them as SVG; designators and values come from the same parts list as the BOM.
 */
import type { Report } from '../analysis/report.js';
import type { Part, PartRole } from '../circuit/network.js';
import { armJoint, partValue } from './parts.js';
import { STAGE_NAMES } from './words.js';
import { formatEng } from '../model/units.js';
import { closedLoopPrims } from './closed-loop.js';

export type Prim =
  | { t: 'wire'; pts: Array<[number, number]> }
  | { t: 'res'; x: number; y: number; vertical: boolean; ref: string; value: string; trimmer: boolean }
  | { t: 'cap'; x: number; y: number; ref: string; value: string }
  | { t: 'opamp'; x: number; y: number; invertingOnTop: boolean }
  | { t: 'ground'; x: number; y: number }
  | { t: 'rail'; x: number; y: number; label: string }
  | { t: 'source'; x: number; y: number; label: string }
  | { t: 'terminal'; x: number; y: number; label: string }
  | { t: 'dot'; x: number; y: number }
  /** A vertical wire hopping over a horizontal one at (x, y): the two do not connect. */
  | { t: 'hop'; x: number; y: number }
  | { t: 'text'; x: number; y: number; text: string };

export interface Schematic {
  width: number;
  height: number;
  prims: Prim[];
}

/** One symbol per arm: its designators and values joined as the parts list writes them. */
function arm(parts: Part[], role: PartRole): { ref: string; value: string } | null {
  const ps = parts.filter((p) => p.role === role);
  if (!ps.length) return null;
  const joint = armJoint(ps[0]!.arrangement);
  return { ref: ps.map((p) => p.ref).join(joint), value: ps.map((p) => formatEng(p.ohms, 'Ω', 3).replace(' ', '')).join(joint) };
}

/** The stage drawn as primitives (lines, resistors, trimmers, the op-amp, labels) in its own coordinates; null without a stage. */
export function schematic(r: Report): Schematic | null {
  const s = r.stage;
  if (!s) return null;
  const parts = s.parts;
  const P: Prim[] = [];
  const W = (...pts: Array<[number, number]>) => P.push({ t: 'wire', pts });
  const topo = s.ideal.topology;
  const inv = topo === 'inverting';
  const railTop = s.network.reference.topRail === 'regulated' ? `+${formatEng(r.design.supply.regulated?.voltage ?? 0, 'V')} reg` : `+${formatEng(r.design.supply.positive, 'V')}`;
  const negLabel = r.design.supply.negative < 0 ? `${formatEng(r.design.supply.negative, 'V')}` : null;
  // Op-amp: − input on top at (300,150), + at (300,190), output at (380,170).
  P.push({ t: 'opamp', x: 340, y: 170, invertingOnTop: true });
  // The burden is a listed part (RB): the CT symbol names it with its value.
  const burden = parts.find((p) => p.role === 'burden');
  const sensorLabel = r.design.sensor.type === 'closed-loop-hall' ? 'Sensor loop (below)' : r.design.sensor.type === 'hall-gap-core' ? 'Hall sensor' : r.design.sensor.type === 'current-transformer' ? `CT + ${burden ? `${burden.ref} ${partValue(burden)}` : 'burden'}` : r.design.sensor.type === 'shunt' ? 'Shunt' : 'Sensor';
  const sensorY = inv || topo === 'summing-inverting' ? 150 : 190;
  P.push({ t: 'source', x: 40, y: sensorY, label: sensorLabel });
  const fb = arm(parts, 'feedback');
  const gt = parts.find((p) => p.role === 'gain-trim');
  const follower = !fb && !gt;
  // Feedback path above the op-amp, from the − input node (250,150) to the output node (420,170).
  // Issue 19: with a range switch, one feedback row per position stacked upwards, each from its throw of the
  // switch's first pole (SW1a) to the output; the lever rests on position 1.
  const rs = r.ranges?.ok ? r.ranges.value : null;
  if (rs && (fb || gt)) {
    const rowY = (j: number) => 80 - 50 * j;
    W([250, 150], [250, 112]);
    P.push({ t: 'dot', x: 250, y: 112 });
    W([250, 112], [262, rowY(0) + 4]);
    P.push({ t: 'text', x: 196, y: 108, text: `${rs.switchRef}${rs.poles > 1 ? 'a' : ''}` });
    rs.positions.forEach((pos, j) => {
      const y = rowY(j);
      const pf = arm(pos.parts, 'feedback');
      const pg = pos.parts.find((q) => q.role === 'gain-trim');
      P.push({ t: 'dot', x: 262, y });
      P.push({ t: 'text', x: 240, y: y - 4, text: String(j + 1) });
      if (pf) P.push({ t: 'res', x: pg ? 312 : 340, y, vertical: false, ...pf, trimmer: false });
      if (pg) P.push({ t: 'res', x: pf ? 377 : 340, y, vertical: false, ref: pg.ref, value: formatEng(pg.ohms, 'Ω', 2), trimmer: true });
      if (j > 0) P.push({ t: 'dot', x: 420, y: rowY(j - 1) });
    });
    W([420, rowY(rs.positions.length - 1)], [420, 170]);
    P.push({ t: 'dot', x: 420, y: 170 });
  } else if (fb || gt) {
    W([250, 150], [250, 80]);
    if (fb) P.push({ t: 'res', x: gt ? 300 : 335, y: 80, vertical: false, ...fb, trimmer: false });
    if (gt) P.push({ t: 'res', x: fb ? 375 : 335, y: 80, vertical: false, ref: gt.ref, value: formatEng(gt.ohms, 'Ω', 2), trimmer: true });
    W([420, 80], [420, 170]);
    P.push({ t: 'dot', x: 420, y: 170 });
  } else if (!inv) {
    W([250, 150], [250, 80], [420, 80], [420, 170]);
    P.push({ t: 'dot', x: 420, y: 170 });
  }
  W([250, 150], [300, 150]);
  W([380, 170], [420, 170]);
  /** A vertical arm from (x, top) down to the reference node's row, the resistor in its middle part. */
  const downArm = (x: number, top: number, a: { ref: string; value: string } | null) => {
    if (!a) { W([x, top], [x, 325]); return; }
    W([x, top], [x, 220]);
    P.push({ t: 'res', x, y: 255, vertical: true, ...a, trimmer: false });
    W([x, 290], [x, 325]);
  };
  /**
   * The ground leg from the − node down, hopping over the + input's wire: to ground (summing non-inverting) or
   * on to the reference node's row (non-inverting).
   */
  const legDown = (toGround: boolean) => {
    const leg = arm(parts, 'ground-leg');
    if (!leg) return;
    P.push({ t: 'dot', x: 250, y: 150 });
    W([250, 150], [210, 150], [210, 184]);
    P.push({ t: 'hop', x: 210, y: 190 });
    W([210, 196], [210, 200]);
    P.push({ t: 'res', x: 210, y: 235, vertical: true, ...leg, trimmer: false });
    if (toGround) { W([210, 270], [210, 280]); P.push({ t: 'ground', x: 210, y: 280 }); } else W([210, 270], [210, 325]);
  };
  /** A horizontal arm at height y from the sensor's lead to x = 180, then a wire on to `to`. */
  const inputArm = (y: number, a: { ref: string; value: string } | null, to: number) => {
    if (a) { W([70, y], [80, y]); P.push({ t: 'res', x: 130, y, vertical: false, ...a, trimmer: false }); W([180, y], [to, y]); } else W([70, y], [to, y]);
  };
  let refX = 210;
  if (topo === 'non-inverting') {
    // + input from the sensor; ground leg from the − node down to the reference.
    W([70, 190], [300, 190]);
    if (arm(parts, 'ground-leg')) {
      legDown(false);
    } else if (s.network.reference.kind !== 'none') {
      W([250, 150], [210, 150], [210, 184]);
      P.push({ t: 'hop', x: 210, y: 190 });
      W([210, 196], [210, 325]);
    }
  } else if (inv) {
    const rin = arm(parts, 'input');
    if (rin) {
      W([70, 150], [110, 150]);
      P.push({ t: 'res', x: 160, y: 150, vertical: false, ...rin, trimmer: false });
      W([210, 150], [250, 150]);
    } else W([70, 150], [250, 150]);
    P.push({ t: 'dot', x: 250, y: 150 });
    W([300, 190], [270, 190], [270, 325], [210, 325]);
  } else if (topo === 'summing-non-inverting') {
    // Sensor through its arm and the reference through the offset arm meet at the + input; the ground leg
    // (or, for a follower, a wire) closes the loop from the − input.
    W([70, 190], [80, 190]);
    const plus = arm(parts, 'plus-input');
    if (plus) P.push({ t: 'res', x: 130, y: 190, vertical: false, ...plus, trimmer: false });
    if (follower) W([180, 190], [300, 190]);
    else { W([180, 190], [204, 190]); W([216, 190], [300, 190]); legDown(true); }
    P.push({ t: 'dot', x: 290, y: 190 });
    refX = 290;
    downArm(290, 190, arm(parts, 'offset'));
  } else if (topo === 'summing-inverting') {
    inputArm(150, arm(parts, 'input'), 250);
    P.push({ t: 'dot', x: 250, y: 150 });
    P.push({ t: 'dot', x: 215, y: 150 });
    refX = 215;
    W([215, 150], [215, 220]);
    const off = arm(parts, 'offset');
    if (off) P.push({ t: 'res', x: 215, y: 255, vertical: true, ...off, trimmer: false });
    W([215, 290], [215, 325]);
    W([300, 190], [290, 190], [290, 200]);
    P.push({ t: 'ground', x: 290, y: 200 });
  } else {
    // Difference: one terminal through Rin to the − input, the other through R3 to the + input, R4 from the
    // + input down to the reference. Which terminal goes where follows the polarity asked for.
    const swapped = s.network.swapped === true;
    W([40, 174], [40, 150], [70, 150]);
    P.push({ t: 'text', x: 50, y: 145, text: swapped ? '+' : '−' });
    P.push({ t: 'text', x: 50, y: 205, text: swapped ? '−' : '+' });
    inputArm(150, arm(parts, 'input'), 250);
    P.push({ t: 'dot', x: 250, y: 150 });
    inputArm(190, arm(parts, 'plus-input'), 300);
    P.push({ t: 'dot', x: 260, y: 190 });
    refX = 260;
    downArm(260, 190, arm(parts, 'offset'));
  }
  // Reference network below, its node at (210,300).
  const ref = s.network.reference;
  // Reference network below, its node at (210,325); the divider stands in a column at x = 120.
  const NODE_Y = 325;
  if (ref.kind === 'divider') {
    const top = arm(parts, 'reference-top');
    const bot = arm(parts, 'reference-bottom');
    const zt = parts.find((p) => p.role === 'zero-trim');
    P.push({ t: 'dot', x: refX, y: NODE_Y });
    P.push({ t: 'rail', x: 120, y: 220, label: railTop });
    if (top) P.push({ t: 'res', x: 120, y: 255, vertical: true, ...top, trimmer: false });
    else W([120, 220], [120, 290]);
    if (zt) {
      P.push({ t: 'res', x: 120, y: 325, vertical: true, ref: zt.ref, value: formatEng(zt.ohms, 'Ω', 2), trimmer: true });
      W([127, 325], [refX, 325]);
    } else W([120, 290], [120, 360]), W([120, NODE_Y], [refX, NODE_Y]);
    if (bot) P.push({ t: 'res', x: 120, y: 395, vertical: true, ...bot, trimmer: false });
    else W([120, 360], [120, 430]);
    if (negLabel) P.push({ t: 'rail', x: 120, y: 430, label: negLabel }); else P.push({ t: 'ground', x: 120, y: 430 });
  } else if (ref.kind === 'rail') {
    // The tie goes to the nearest of the two rails and (on split rails) ground, as the circuit wires it.
    const toGround = ref.voltage === 0 || (ref.railBottom === 0 && Math.abs(ref.voltage - ref.railBottom) < Math.abs(ref.voltage - ref.railTop));
    if (toGround) P.push({ t: 'ground', x: refX, y: NODE_Y });
    else if (Math.abs(ref.voltage - ref.railBottom) < Math.abs(ref.voltage - ref.railTop)) P.push({ t: 'rail', x: refX, y: NODE_Y, label: negLabel ?? '0 V' });
    else P.push({ t: 'rail', x: refX, y: NODE_Y, label: railTop });
  }
  // Output network.
  const os = parts.find((p) => p.role === 'output-series');
  const oc = parts.find((p) => p.role === 'output-capacitor');
  if (os) {
    P.push({ t: 'res', x: 475, y: 170, vertical: false, ref: os.ref, value: formatEng(os.ohms, 'Ω', 3), trimmer: false });
    W([420, 170], [425, 170]);
    W([525, 170], [600, 170]);
    if (oc) {
      P.push({ t: 'dot', x: 560, y: 170 });
      W([560, 170], [560, 215]);
      P.push({ t: 'cap', x: 560, y: 230, ref: oc.ref, value: partValue(oc) });
      W([560, 245], [560, 260]);
      P.push({ t: 'ground', x: 560, y: 260 });
    }
  } else {
    W([420, 170], [600, 170]);
  }
  P.push({ t: 'terminal', x: 610, y: 170, label: 'To instrument' });
  P.push({ t: 'text', x: 400, y: 440, text: `U1 ${STAGE_NAMES[topo]}` });
  // --- closed-loop Hall sensor (issue #20): its loop drawn below the stage ---
  if (r.design.sensor.type === 'closed-loop-hall') return { width: 700, height: 700, prims: [...P, ...closedLoopPrims(r, 470)] };
  // Issue 19: the switch's second pole picks each range's reference divider (drawn for range 1 above).
  if (rs && rs.poles > 1) {
    P.push({ t: 'text', x: 20, y: 465, text: `${rs.switchRef}b picks the reference divider ${topo === 'inverting' ? 'at the + input' : "at the ground leg's foot"}:` });
    rs.positions.forEach((pos, j) => {
      const refs = (['reference-top', 'zero-trim', 'reference-bottom'] as const).map((role) => pos.parts.filter((q) => q.role === role).map((q) => q.ref).join(' + ')).filter((x) => x);
      P.push({ t: 'text', x: 30, y: 481 + 16 * j, text: `${j + 1}: ${refs.join(', ')}` });
    });
    return { width: 660, height: 490 + 16 * rs.positions.length, prims: P };
  }
  return { width: 660, height: 450, prims: P };
}

/** Width of a label in drawing units, at the 11-unit type the drawing is made for (about 0.6 em a character). */
const textWidth = (s: string) => s.length * 6.6;

/**
 * The box the drawing actually covers, with a margin: the grid is larger than most stages need, so a view
 * cropped to this box draws the same schematic larger (readable at print size). Extents per primitive
 * follow the symbol sizes the app draws (resistor body 50 × 14 with 25-unit leads, op-amp 80 × 80, labels).
 */
export function drawingBounds(d: Schematic, margin = 12): { x: number; y: number; width: number; height: number } {
  let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity;
  const add = (x: number, y: number) => { x0 = Math.min(x0, x); y0 = Math.min(y0, y); x1 = Math.max(x1, x); y1 = Math.max(y1, y); };
  for (const p of d.prims) {
    switch (p.t) {
      case 'wire': for (const [x, y] of p.pts) add(x, y); break;
      case 'res':
        if (p.vertical) { add(p.x - 20, p.y - 35); add(p.x + 24 + textWidth(p.value.length > p.ref.length ? p.value : p.ref), p.y + 35); }
        else { add(p.x - 50, p.y - 24); add(Math.max(p.x + 50, p.x - 25 + textWidth(p.value)), p.y + 26); }
        break;
      case 'cap': add(p.x - 12, p.y - 15); add(p.x + 16 + textWidth(p.value), p.y + 15); break;
      case 'opamp': add(p.x - 40, p.y - 40); add(p.x + 40, p.y + 40); break;
      case 'ground': add(p.x - 10, p.y); add(p.x + 10, p.y + 10); break;
      case 'rail': add(p.x - 10, p.y - 8); add(p.x + 12 + textWidth(p.label), p.y + 6); break;
      case 'source': add(p.x - 24, p.y - 16); add(Math.max(p.x + 30, p.x - 24 + textWidth(p.label)), p.y + 36); break;
      case 'terminal': add(p.x - 40, p.y - 5); add(Math.max(p.x + 5, p.x - 40 + textWidth(p.label)), p.y + 26); break;
      case 'text': add(p.x, p.y - 10); add(p.x + textWidth(p.text), p.y + 3); break;
      default: add(p.x - 6, p.y - 6); add(p.x + 6, p.y + 6);
    }
  }
  if (!Number.isFinite(x0)) return { x: 0, y: 0, width: d.width, height: d.height };
  return { x: x0 - margin, y: y0 - margin, width: x1 - x0 + 2 * margin, height: y1 - y0 + 2 * margin };
}
