/**
 * Trimming a built probe from its readings. After building, a person reads the probe's output at two or
 * more known measurand values with the trimmers where the parts list puts them. From the design and those
 * readings this module finds the built stage's scale and zero, the part that most likely differs, and the
 * trimmer settings that bring scale and zero onto the target, solved together on the circuit (src/circuit)
 * because in most stages each trimmer moves both. Numbers only; src/present/trim.ts words them.
 *
 * 1. Measured: the least-squares line through the readings (src/analysis/fit.ts) gives scale and zero at
 *    the instrument.
 * 2. Explain: every part that can differ (each fixed resistor by its tolerance, the sensor's
 *    sensitivity and zero by theirs, the op-amp's offset) is a candidate deviation δ_c with a spread σ_c.
 *    The circuit's (zero, scale) is linearised in all of them at the built values; each pair of candidates
 *    that can produce the measured (zero, scale) is solved exactly (2 × 2), then refined on the circuit by
 *    Newton's method, and scored by Σ(δ_c/σ_c)². The lowest score is the most likely explanation (least
 *    squares in tolerance units: the maximum-likelihood pair when deviations are independent and normal
 *    with σ proportional to the tolerance).
 * 3. Solve: on the explained circuit, Newton's method in the two wiper settings (finite-difference
 *    Jacobian) brings the circuit's (zero, scale) to the target. A setting outside the reliable travel
 *    (WIPER_MIN … WIPER_MAX) cannot be reached: the fixed resistor that sets that quantity is changed to the
 *    standard value that puts the trimmer nearest mid travel, and the settings are solved again.
 * 4. Order: the trimmer whose turn disturbs the other quantity less is turned last; after each turn the
 *    reading to expect is the explained circuit's output with the turns made so far.
 */
import type { Design } from '../model/design.js';
import { nearest } from '../model/eseries.js';
import type { Reading } from '../model/readings.js';
import type { Part } from '../circuit/network.js';
import { buildCircuit } from '../circuit/build.js';
import type { SensorFront } from '../physics/sensors.js';
import { WIPER_MAX, WIPER_MIN } from '../solve/reference.js';
import type { SolvedStage } from '../solve/stage.js';
import { dcLinear } from './analysis.js';
import { leastSquares } from './fit.js';

/** What a candidate deviation is: a part by its reference, or the sensor or op-amp figure. */
export type CauseKind = 'resistor' | 'sensor-sensitivity' | 'sensor-zero' | 'opamp-offset';

export interface Deviation {
  kind: CauseKind;
  /** Part reference for a resistor, null otherwise. */
  ref: string | null;
  /** Relative for resistors and sensitivity (0.02 = 2 % high); volts for zero and offset. */
  value: number;
  /** The same in units of the candidate's tolerance. */
  tolerances: number;
}

export interface Explanation {
  deviations: Deviation[];
  /** Σ(δ/σ)²: lower is likelier. */
  score: number;
}

export interface TrimSetting {
  ref: string;
  role: 'gain-trim' | 'zero-trim';
  /** Wiper setting to turn to (0…1) and where it was when the readings were taken. */
  setting: number;
  from: number;
}

export interface TrimStep {
  ref: string;
  /** Measurand to apply while turning, and the output to expect once the turn is made, V. */
  measurand: number;
  output: number;
}

export type TrimProblem =
  | { code: 'no-stage' }
  | { code: 'ac-design' }
  | { code: 'too-few-readings'; have: number; need: number }
  | { code: 'no-trimmers' }
  | { code: 'unexplained' }
  | { code: 'no-solution' }
  /** Even with the resistors changed, these trimmers would have to go past their travel (settings are then only a direction). */
  | { code: 'out-of-reach'; trimmers: string[] };

export interface TrimResult {
  problem: TrimProblem | null;
  /** The built probe as measured: scale (V per measurand unit) and zero (V) at the instrument. */
  scale: number;
  zero: number;
  target: { scale: number; zero: number };
  /** Explanations, likeliest first (at most five). */
  explanations: Explanation[];
  /** Trimmer settings in the order to turn them. */
  settings: TrimSetting[];
  /** Fixed resistors to change first, with their new standard values. */
  replace: Array<{ ref: string; ohms: number; from: number }>;
  /** The reading to expect after each turn, in the order of `settings`. */
  steps: TrimStep[];
  /** Output the trimmed probe should give at each measurand of the readings. */
  checks: Array<{ measurand: number; output: number }>;
  /** Predicted after trimming: scale error (fraction) and zero error (V), and what one settable step moves. */
  after: { scaleError: number; zeroError: number };
  step: { scale: number; zero: number };
}

/** What the trim needs of a report (a solved design). */
export interface TrimInput {
  design: Design;
  front: SensorFront;
  stage: SolvedStage | null;
}

interface Model {
  scale: Record<string, number>;
  sensitivity: number;
  quiescent: number;
  offset: number;
  parts: Part[];
}

interface Candidate {
  kind: CauseKind;
  ref: string | null;
  sigma: number;
  apply(m: Model, d: number): Model;
}

const withScale = (m: Model, names: string[], d: number): Model => {
  const scale = { ...m.scale };
  for (const n of names) scale[n] = (scale[n] ?? 1) * (1 + d);
  return { ...m, scale };
};

/** (zero, scale) at the instrument for a model of the built stage, from the circuit; null if it cannot be solved. */
function evaluate(input: TrimInput, m: Model): [number, number] | null {
  const front = { ...input.front, sensitivity: m.sensitivity, quiescent: m.quiescent };
  const sc = buildCircuit(input.design, { network: input.stage!.network, parts: m.parts }, front, { scale: m.scale, front });
  if (m.offset !== 0) {
    const vos = sc.circuit.elements.find((e) => e.role === 'opamp-offset');
    if (vos) vos.dc0 = m.offset;
  }
  const dc = dcLinear(sc, !front.passesDc);
  return dc && Number.isFinite(dc.out[0]) && Number.isFinite(dc.out[1]) ? [dc.out[0], dc.out[1]] : null;
}

function candidatesOf(input: TrimInput): Candidate[] {
  const { design, front, stage } = input;
  const out: Candidate[] = [];
  for (const p of stage!.parts) {
    if (p.kind === 'resistor' && p.tolerance > 0) out.push({ kind: 'resistor', ref: p.ref, sigma: p.tolerance, apply: (m, d) => withScale(m, [p.ref], d) });
    // A trimmer's own value is not a candidate: at the one setting the readings were taken at, its
    // deviation looks exactly like a different setting, which the trim absorbs anyway.
  }
  if (design.sensor.type === 'shunt') {
    out.push({ kind: 'sensor-sensitivity', ref: null, sigma: front.sensitivityTolerance || 0.01, apply: (m, d) => withScale(m, ['RSH'], d) });
  } else {
    if (front.sensitivityTolerance > 0) out.push({ kind: 'sensor-sensitivity', ref: null, sigma: front.sensitivityTolerance, apply: (m, d) => ({ ...m, sensitivity: m.sensitivity * (1 + d) }) });
    if (front.quiescentTolerance > 0) out.push({ kind: 'sensor-zero', ref: null, sigma: front.quiescentTolerance, apply: (m, d) => ({ ...m, quiescent: m.quiescent + d }) });
  }
  if (design.opamp.offsetVoltage > 0) out.push({ kind: 'opamp-offset', ref: null, sigma: design.opamp.offsetVoltage, apply: (m, d) => ({ ...m, offset: m.offset + d }) });
  return out;
}

const withSetting = (m: Model, role: 'gain-trim' | 'zero-trim', s: number): Model => ({ ...m, parts: m.parts.map((p) => (p.role === role ? { ...p, setting: s } : p)) });

/**
 * The built stage as the design with its sensor's sensitivity and zero (for a shunt: its resistance and the
 * op-amp's offset) moved so that the circuit gives the measured (zero, scale); Newton's method on the circuit.
 */
function equivalentOf(input: TrimInput, nominal: Model, base: [number, number], want: [number, number]): Model | null {
  const shunt = input.design.sensor.type === 'shunt';
  const apply = (d: [number, number]): Model => shunt
    ? { ...withScale(nominal, ['RSH'], d[0]), offset: d[1] }
    : { ...nominal, sensitivity: nominal.sensitivity * (1 + d[0]), quiescent: nominal.quiescent + d[1] };
  const target: [number, number] = [base[0] + want[0], base[1] + want[1]];
  let d: [number, number] = [0, 0];
  for (let it = 0; it < 20; it++) {
    const v = evaluate(input, apply(d));
    if (!v) return null;
    const r0 = target[0] - v[0], r1 = target[1] - v[1];
    if (Math.abs(r0) < 1e-12 * Math.max(Math.abs(target[0]), 1) && Math.abs(r1) < 1e-12 * Math.max(Math.abs(target[1]), 1e-9)) break;
    const h = 1e-6;
    const vs = evaluate(input, apply([d[0] + h, d[1]])), vq = evaluate(input, apply([d[0], d[1] + h]));
    if (!vs || !vq) return null;
    const step = solve2((vs[0] - v[0]) / h, (vq[0] - v[0]) / h, (vs[1] - v[1]) / h, (vq[1] - v[1]) / h, r0, r1);
    if (!step) return null;
    d = [d[0] + step[0], d[1] + step[1]];
    if (!(d[0] > -0.99)) return null;
  }
  return apply(d);
}

/** Solves a 2 × 2 system; null when singular. */
function solve2(a: number, b: number, c: number, d: number, e: number, f: number): [number, number] | null {
  const det = a * d - b * c;
  if (!(Math.abs(det) > 1e-300)) return null;
  return [(e * d - b * f) / det, (a * f - c * e) / det];
}

/**
 * Trims a built probe from its readings (measurand, output volts at the instrument), taken with the trimmers
 * at the settings of the parts list, or at those given in `settingsAt` ([reference, setting 0…1]; a second round
 * after turning). See the module comment for the method.
 */
export function trimFromReadings(input: TrimInput, readings: readonly Reading[], settingsAt: ReadonlyArray<readonly [string, number]> = []): TrimResult {
  const { design, stage } = input;
  const target = { scale: design.target.scale, zero: design.target.zero };
  const res: TrimResult = {
    problem: null, scale: NaN, zero: NaN, target, explanations: [], settings: [], replace: [], steps: [], checks: [],
    after: { scaleError: NaN, zeroError: NaN }, step: { scale: NaN, zero: NaN },
  };
  if (design.target.signal !== 'dc') { res.problem = { code: 'ac-design' }; return res; }
  const usable = readings.filter((r) => Array.isArray(r) && Number.isFinite(r[0]) && Number.isFinite(r[1]));
  const distinct = new Set(usable.map((r) => r[0])).size;
  if (distinct < 2) { res.problem = { code: 'too-few-readings', have: distinct, need: 2 }; return res; }
  const line = leastSquares(usable.map((r) => r[0]), usable.map((r) => r[1]));
  if (!line) { res.problem = { code: 'too-few-readings', have: 1, need: 2 }; return res; }
  res.scale = line.slope;
  res.zero = line.intercept;
  res.checks = usable.map((r) => ({ measurand: r[0], output: target.zero + target.scale * r[0] }));
  if (!stage) { res.problem = { code: 'no-stage' }; return res; }
  const gainPart = stage.parts.find((p) => p.role === 'gain-trim');
  const zeroPart = stage.parts.find((p) => p.role === 'zero-trim');
  res.step = {
    scale: (stage.network.gainTrim?.step ?? NaN) * Math.abs(target.scale),
    zero: stage.network.reference.trim?.step ?? NaN,
  };

  // 2. The likeliest explanation of the measured (zero, scale).
  const settingAt = (p: Part) => {
    const given = settingsAt.find(([ref]) => ref === p.ref);
    return given && Number.isFinite(given[1]) ? Math.min(Math.max(given[1], 0), 1) : p.setting;
  };
  const nominal: Model = {
    scale: {}, sensitivity: input.front.sensitivity, quiescent: input.front.quiescent, offset: 0,
    parts: stage.parts.map((p) => (p.kind === 'trimmer' ? { ...p, setting: settingAt(p) } : { ...p })),
  };
  const base = evaluate(input, nominal);
  if (!base) { res.problem = { code: 'no-stage' }; return res; }
  const want: [number, number] = [res.zero - base[0], res.scale - base[1]];
  const cands = candidatesOf(input);
  const cols = cands.map((c) => {
    const h = c.sigma * 1e-3;
    const v = evaluate(input, c.apply(nominal, h));
    return v ? [(v[0] - base[0]) / h, (v[1] - base[1]) / h] as [number, number] : null;
  });
  const zScale = Math.max(Math.abs(target.zero), 1e-3), sScale = Math.max(Math.abs(target.scale), 1e-12);
  const explained: Array<{ model: Model; exp: Explanation }> = [];
  for (let i = 0; i < cands.length; i++) {
    for (let j = i + 1; j < cands.length; j++) {
      const a = cols[i], b = cols[j];
      if (!a || !b) continue;
      // Scaled so that a nearly singular pair (both move only the zero) is recognised as such.
      const det = (a[0] / zScale) * (b[1] / sScale) - (b[0] / zScale) * (a[1] / sScale);
      if (Math.abs(det) * cands[i]!.sigma * cands[j]!.sigma < 1e-9) continue;
      let d = solve2(a[0], b[0], a[1], b[1], want[0], want[1]);
      if (!d) continue;
      // Newton on the circuit from the linear solution (the circuit is not quite linear in a leg resistor).
      let model = cands[j]!.apply(cands[i]!.apply(nominal, d[0]), d[1]);
      for (let it = 0; it < 4; it++) {
        const v = evaluate(input, model);
        if (!v) break;
        const r0 = res.zero - v[0], r1 = res.scale - v[1];
        if (Math.abs(r0) < 1e-9 * zScale && Math.abs(r1) < 1e-9 * sScale) break;
        const step = solve2(a[0], b[0], a[1], b[1], r0, r1);
        if (!step) break;
        d = [d[0] + step[0], d[1] + step[1]];
        model = cands[j]!.apply(cands[i]!.apply(nominal, d[0]), d[1]);
      }
      const devs: Deviation[] = [
        { kind: cands[i]!.kind, ref: cands[i]!.ref, value: d[0], tolerances: d[0] / cands[i]!.sigma },
        { kind: cands[j]!.kind, ref: cands[j]!.ref, value: d[1], tolerances: d[1] / cands[j]!.sigma },
      ].sort((x, y) => Math.abs(y.tolerances) - Math.abs(x.tolerances));
      if (!devs.every((x) => Number.isFinite(x.value)) || devs.some((x) => (x.kind === 'resistor' || x.kind === 'sensor-sensitivity') && x.value <= -0.9)) continue;
      explained.push({ model, exp: { deviations: devs, score: devs[0]!.tolerances ** 2 + devs[1]!.tolerances ** 2 } });
    }
  }
  explained.sort((x, y) => x.exp.score - y.exp.score);
  res.explanations = explained.slice(0, 5).map((x) => x.exp);
  if (!gainPart && !zeroPart) { res.problem = { code: 'no-trimmers' }; return res; }
  // The settings are solved with the measured difference carried by the sensor's sensitivity and zero:
  // readings at one wiper setting cannot tell a trimmer's own value or leverage, and this equivalent leaves
  // every trimmer's leverage as designed (a fixed resistor off in the feedback arm moves none of it).
  const equivalent = equivalentOf(input, nominal, base, want);
  const built = equivalent;
  if (!built) { res.problem = { code: 'unexplained' }; return res; }

  // 3. The settings, with a fixed resistor changed where a trimmer cannot reach.
  const from = { gain: (gainPart && settingAt(gainPart)) ?? 0.5, zero: (zeroPart && settingAt(zeroPart)) ?? 0.5 };
  let model = built;
  let sol = solveSettings(input, model, from, target);
  const replaceFor = (quantity: 'gain' | 'zero'): boolean => {
    const roles = quantity === 'gain' ? ['feedback'] : ['reference-top', 'reference-bottom', 'offset'];
    let best: { model: Model; sol: Solved; ref: string; ohms: number; from: number; off: number } | null = null;
    for (const p of model.parts.filter((x) => roles.includes(x.role) && x.kind === 'resistor')) {
      const ohms = valueFor(input, model, p.ref, quantity, target, sol?.settings ?? from);
      if (ohms === null) continue;
      const std = nearest(ohms, design.target.series);
      if (!Number.isFinite(std)) continue;
      const scale = { ...model.scale };
      delete scale[p.ref]; // the new part is taken at its value
      const m2: Model = { ...model, scale, parts: model.parts.map((x) => (x.ref === p.ref ? { ...x, ohms: std } : x)) };
      const s2 = solveSettings(input, m2, from, target);
      // The gain's replacement comes first and need only bring the gain trimmer into reach.
      if (!s2 || s2.outOfRange.includes(quantity) || (quantity === 'zero' && !s2.inRange)) continue;
      const off = Math.abs((quantity === 'gain' ? s2.settings.gain : s2.settings.zero) - 0.5);
      if (!best || off < best.off) best = { model: m2, sol: s2, ref: p.ref, ohms: std, from: p.ohms, off };
    }
    if (!best) return false;
    model = best.model;
    sol = best.sol;
    res.replace.push({ ref: best.ref, ohms: best.ohms, from: best.from });
    return true;
  };
  if (gainPart && (!sol || sol.outOfRange.includes('gain'))) replaceFor('gain');
  if (zeroPart && sol && sol.outOfRange.includes('zero')) replaceFor('zero');
  if (!sol) { res.problem = { code: 'no-solution' }; return res; }
  if (!sol.inRange) res.problem = { code: 'out-of-reach', trimmers: sol.outOfRange.map((q) => (q === 'gain' ? gainPart : zeroPart)!.ref) };
  const settings = sol.settings;

  // 4. Order and the readings to expect.
  const at = (g: number, z: number) => {
    let m = model;
    if (gainPart) m = withSetting(m, 'gain-trim', g);
    if (zeroPart) m = withSetting(m, 'zero-trim', z);
    return evaluate(input, m) ?? [NaN, NaN];
  };
  const final = at(settings.gain, settings.zero);
  res.after = { scaleError: final[1] / target.scale - 1, zeroError: final[0] - target.zero };
  const xCal = usable.reduce((x, r) => (Math.abs(r[0]) > Math.abs(x) ? r[0] : x), 0);
  const gainSetting: TrimSetting | null = gainPart ? { ref: gainPart.ref, role: 'gain-trim', setting: settings.gain, from: from.gain } : null;
  const zeroSetting: TrimSetting | null = zeroPart ? { ref: zeroPart.ref, role: 'zero-trim', setting: settings.zero, from: from.zero } : null;
  let order: TrimSetting[];
  if (gainSetting && zeroSetting) {
    // Turning the zero trimmer last disturbs the scale by this much (in settable steps) …
    const zeroLast = Math.abs(at(from.gain, settings.zero)[1] - at(from.gain, from.zero)[1]) / (res.step.scale || 1e-12);
    // … turning the gain trimmer last disturbs the zero by this much.
    const gainLast = Math.abs(at(settings.gain, from.zero)[0] - at(from.gain, from.zero)[0]) / (res.step.zero || 1e-12);
    order = zeroLast <= gainLast ? [gainSetting, zeroSetting] : [zeroSetting, gainSetting];
  } else {
    order = [gainSetting ?? zeroSetting!];
  }
  let g = from.gain, z = from.zero;
  for (const s of order) {
    if (s.role === 'gain-trim') g = s.setting; else z = s.setting;
    const v = at(g, z);
    const x = s.role === 'gain-trim' ? xCal : 0;
    res.steps.push({ ref: s.ref, measurand: x, output: v[0] + v[1] * x });
  }
  res.settings = order;
  return res;
}

interface Solved { settings: { gain: number; zero: number }; inRange: boolean; outOfRange: Array<'gain' | 'zero'> }

/** Newton's method in the wiper settings (finite-difference Jacobian) for the target (zero, scale). */
function solveSettings(input: TrimInput, model: Model, from: { gain: number; zero: number }, target: { scale: number; zero: number }): Solved | null {
  const parts = input.stage!.parts;
  const hasG = parts.some((p) => p.role === 'gain-trim'), hasZ = parts.some((p) => p.role === 'zero-trim');
  const f = (g: number, z: number) => {
    let m = model;
    if (hasG) m = withSetting(m, 'gain-trim', g);
    if (hasZ) m = withSetting(m, 'zero-trim', z);
    return evaluate(input, m);
  };
  let g = from.gain, z = from.zero;
  const h = 1e-5;
  for (let it = 0; it < 30; it++) {
    const v = f(g, z);
    if (!v) return null;
    const r0 = target.zero - v[0], r1 = target.scale - v[1];
    let dg = 0, dz = 0;
    if (hasG && hasZ) {
      const vg = f(g + h, z), vz = f(g, z + h);
      if (!vg || !vz) return null;
      const s = solve2((vg[0] - v[0]) / h, (vz[0] - v[0]) / h, (vg[1] - v[1]) / h, (vz[1] - v[1]) / h, r0, r1);
      if (!s) return null;
      [dg, dz] = s;
    } else if (hasG) {
      const vg = f(g + h, z);
      if (!vg) return null;
      const d = (vg[1] - v[1]) / h;
      if (!(Math.abs(d) > 0)) return null;
      dg = r1 / d;
    } else {
      const vz = f(g, z + h);
      if (!vz) return null;
      const d = (vz[0] - v[0]) / h;
      if (!(Math.abs(d) > 0)) return null;
      dz = r0 / d;
    }
    // Settings far outside the travel mean the trimmer cannot reach; keep the iteration in a sane box.
    g = Math.min(Math.max(g + dg, -5), 6);
    z = Math.min(Math.max(z + dz, -5), 6);
    if (Math.abs(dg) < 1e-12 && Math.abs(dz) < 1e-12) break;
  }
  if (!Number.isFinite(g) || !Number.isFinite(z)) return null;
  const outOfRange: Array<'gain' | 'zero'> = [];
  // A rheostat cannot go below zero ohms or past its value, and the ends of a track are not reliable.
  if (hasG && (g < WIPER_MIN || g > WIPER_MAX)) outOfRange.push('gain');
  if (hasZ && (z < WIPER_MIN || z > WIPER_MAX)) outOfRange.push('zero');
  return { settings: { gain: hasG ? g : from.gain, zero: hasZ ? z : from.zero }, inRange: outOfRange.length === 0, outOfRange };
}

/**
 * The value of part `ref` (Ω) with which the quantity's trimmer at mid travel gives the target (the other
 * trimmer at `settings`): secant iteration on log R, within a decade either way.
 */
function valueFor(input: TrimInput, model: Model, ref: string, quantity: 'gain' | 'zero', target: { scale: number; zero: number }, settings: { gain: number; zero: number }): number | null {
  const part = model.parts.find((p) => p.ref === ref)!;
  const k0 = model.scale[ref] ?? 1;
  const role = quantity === 'gain' ? 'gain-trim' : 'zero-trim';
  const other = quantity === 'gain' ? 'zero-trim' : 'gain-trim';
  const errAt = (ohms: number) => {
    const scale = { ...model.scale };
    delete scale[ref];
    let m: Model = { ...model, scale, parts: model.parts.map((x) => (x.ref === ref ? { ...x, ohms } : x)) };
    m = withSetting(withSetting(m, role, 0.5), other, quantity === 'gain' ? settings.zero : settings.gain);
    const v = evaluate(input, m);
    if (!v) return NaN;
    return quantity === 'gain' ? v[1] / target.scale - 1 : v[0] - target.zero;
  };
  let x0 = Math.log(part.ohms * k0), x1 = x0 + 0.01;
  let e0 = errAt(Math.exp(x0)), e1 = errAt(Math.exp(x1));
  for (let it = 0; it < 40; it++) {
    if (!Number.isFinite(e0) || !Number.isFinite(e1) || e1 === e0) return null;
    const x2 = x1 - (e1 * (x1 - x0)) / (e1 - e0);
    x0 = x1; e0 = e1;
    x1 = Math.min(Math.max(x2, Math.log(part.ohms / 10)), Math.log(part.ohms * 10));
    e1 = errAt(Math.exp(x1));
    if (Math.abs(x1 - x0) < 1e-10) break;
  }
  return Number.isFinite(e1) ? Math.exp(x1) : null;
}

/**
 * The trim as the CLI's JSON object (format "gainwright-trim", version 1): the measured scale and zero,
 * the settings in the order to turn them, the resistors to change, and the reading to expect after each
 * turn (same order as the settings). Numbers that cannot be computed are null.
 */
export function trimJson(t: TrimResult): Record<string, unknown> {
  const num = (x: number) => (Number.isFinite(x) ? x : null);
  return {
    format: 'gainwright-trim',
    version: 1,
    scale: num(t.scale),
    zero: num(t.zero),
    settings: t.settings.map((s) => ({ ref: s.ref, setting: num(s.setting) })),
    replace: t.replace.map((r) => ({ ref: r.ref, ohms: num(r.ohms) })),
    expected: t.steps.map((s) => ({ measurand: num(s.measurand), output: num(s.output) })),
  };
}
