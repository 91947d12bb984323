/**
 * Property-based tests (fast-check, fixed seed): random valid designs never make the report throw or show a
 * non-finite number; random invalid documents always come back as problems with field paths, and the CLI
 * exits 2 with them. FUZZ_RUNS raises the count (`npm run fuzz`).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { numberFields, validateDesign } from '../../src/model/design.js';
import { analyse, firstNonFinite, type Report } from '../../src/analysis/report.js';
import { textReport } from '../../src/present/text-report.js';
import { keyFigures } from '../../src/present/figures.js';
import { getPath, setPath } from '../../src/present/fields.js';
import { main } from '../../src/cli/cli.js';
import { DEMOS } from '../../src/model/demos.js';
import { parseQuantity } from '../../src/model/units.js';
import { COVERAGE, scaleStack, TRIMMER_TOLERANCE } from '../../src/solve/trimmers.js';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { verdictsOf } from '../../src/present/verdicts.js';
import { sayFinding } from '../../src/present/finding-words.js';

const RUNS = Number(process.env.FUZZ_RUNS ?? 2000);
const SEED = 20261201;

/**
 * Every reported figure of the report object itself (not its JSON, which turns NaN into null): the first one
 * that is not a finite number, or null. A figure the report leaves out must say why in `absent`. Clip limits
 * may be infinite on purpose (a limit that never binds); NaN is allowed nowhere.
 */
function badFigure(r: Report): string | null {
  const figures = {
    dc: r.dc?.out, clip: r.clip, transfer: r.transfer, response: r.response, speed: r.speed, noise: r.noise, errors: r.errors,
    supply: r.supply, battery: r.battery, spread: r.spread, drive: r.drive, sensitivity: r.front.sensitivity, sensor: r.front.figures,
    gain: r.stage && !r.absent.all ? r.stage.gain : 0, scaleError: r.stage && !r.absent.all ? r.stage.scaleError : 0,
  };
  const at = firstNonFinite(figures, ['limits']);
  if (at) return at;
  for (const l of r.clip?.limits ?? []) if (Number.isNaN(l.low) || Number.isNaN(l.high)) return '.clip.limits';
  for (const k of ['clip', 'speed', 'noise', 'errors', 'supply'] as const) if (r[k] === null && !r.absent[k] && !r.absent.all) return `${k} absent without a reason`;
  return null;
}

/** Words a person reads: verdicts, findings, key figures and the text report. */
const shownText = (r: Report) => [
  ...verdictsOf(r).map((v) => `${v.title} ${v.detail}`), ...r.warnings.map((w) => sayFinding(w)),
  ...keyFigures(r).map((f) => `${f.value} ${f.note ?? ''}`), textReport(r),
].join('\n');

/** A double in a range, with sizes below a microvolt written as 0 (the file refuses tiny non-zero sizes). */
const plain = (min: number, max: number) => fc.double({ min, max, noNaN: true }).map((x) => (Math.abs(x) < 1e-6 ? 0 : x));
const logUniform = (lo: number, hi: number) => fc.double({ min: Math.log10(lo), max: Math.log10(hi), noNaN: true }).map((e) => 10 ** e);

const sensorArb = fc.oneof(
  fc.record({ type: fc.constant('voltage-output'), measurand: fc.constant('A'), sensitivity: fc.oneof(logUniform(1e-4, 1), logUniform(1e-4, 1).map((v) => -v)), quiescent: plain(-5, 5), sourceResistance: logUniform(0.1, 1e4), noiseDensity: logUniform(1e-9, 1e-6), bandwidth: logUniform(1e2, 1e7) }),
  fc.record({ type: fc.constant('hall-gap-core'), measurand: fc.constant('A'), hallSensitivity: logUniform(1, 200), quiescent: plain(0.5, 4.5), linearField: logUniform(0.01, 0.5), turns: fc.integer({ min: 1, max: 20 }), core: fc.record({ pathLength: logUniform(0.02, 0.2), permeability: logUniform(100, 1e4), gap: logUniform(2e-4, 5e-3), saturation: logUniform(0.2, 0.5) }), bandwidth: logUniform(1e3, 1e6) }),
  fc.record({ type: fc.constant('current-transformer'), measurand: fc.constant('A'), secondaryTurns: fc.integer({ min: 100, max: 5000 }), burden: logUniform(1, 1000), inductanceFactor: logUniform(1e-7, 1e-5), windingResistance: logUniform(1, 300), quiescent: plain(-1, 3) }),
  fc.record({ type: fc.constant('shunt'), measurand: fc.constant('A'), resistance: logUniform(1e-3, 1), powerRating: logUniform(0.1, 5) }),
);

const designArb = fc.record({
  sensor: sensorArb,
  positive: plain(2.5, 30),
  split: fc.boolean(),
  gbw: logUniform(1e5, 1e8),
  slew: logUniform(1e5, 1e8),
  aol: plain(60, 140),
  inLo: plain(-0.3, 2),
  inHi: plain(-0.3, 2),
  outLo: plain(0, 1.5),
  outHi: plain(0, 1.5),
  scale: fc.oneof(logUniform(1e-3, 10), logUniform(1e-3, 10).map((v) => -v)),
  zeroFrac: plain(0.05, 0.95),
  span: logUniform(0.1, 100),
  topology: fc.constantFrom('auto', 'non-inverting', 'inverting'),
  series: fc.constantFrom('E12', 'E24', 'E96'),
  signal: fc.constantFrom('dc', 'ac-rms'),
  trimGain: fc.boolean(),
  trimZero: fc.boolean(),
  filter: fc.option(fc.record({ resistance: logUniform(10, 1e4), capacitance: fc.oneof(fc.constant(0), logUniform(1e-12, 1e-6)) }), { nil: null }),
  battery: fc.boolean(),
}).map((g) => {
  const negative = g.split ? -g.positive : 0;
  const zero = negative + (g.positive - negative) * g.zeroFrac;
  return {
    format: 'gainwright-design', version: 1, title: 'fuzz',
    sensor: g.sensor,
    supply: { positive: g.positive, negative, ...(g.battery && !g.split ? { battery: { fresh: g.positive * 1.05, endOfLife: g.positive * 0.6, capacity: 2000 } } : {}) },
    opamp: { gbw: g.gbw, slewRate: g.slew, openLoopGainDb: g.aol, inputLow: g.inLo, inputHigh: g.inHi, outputLow: g.outLo, outputHigh: g.outHi, voltageNoise: 1e-8, currentNoise: 1e-13, offsetVoltage: 1e-3, biasCurrent: 1e-8, supplyCurrent: 1e-3 },
    target: { scale: g.scale, zero, range: [-g.span, g.span], topology: g.topology, series: g.series, signal: g.signal, trim: { gain: g.trimGain, zero: g.trimZero } },
    output: { filter: g.filter, load: { resistance: 1e6, capacitance: 15e-12 } },
    analysis: { spreadTrials: 10 },
  };
});

describe('random valid designs', () => {
  it(`never throw and never report a non-finite number (${RUNS} cases)`, () => {
    let analysed = 0;
    fc.assert(fc.property(designArb, (doc) => {
      const v = validateDesign(doc);
      if (!v.ok) {
        // Cross-field rules (e.g. an input range wider than the rails) may refuse a generated design: that
        // must come back as problems with paths, never a throw.
        expect(v.problems.length).toBeGreaterThan(0);
        for (const p of v.problems) expect(p.path).toMatch(/^[a-zA-Z(]/);
        return;
      }
      analysed++;
      const r = analyse(v.design, { spreadTrials: 10, acPoints: 20 });
      expect(badFigure(r)).toBeNull();
      // A figure that is absent says why.
      if (r.clip === null) expect(Object.keys(r.absent).length).toBeGreaterThan(0);
      for (const verdict of verdictsOf(r)) expect(verdict.detail).not.toMatch(/NaN|Infinity/);
    }), { numRuns: RUNS, seed: SEED });
    expect(analysed).toBeGreaterThan(RUNS / 2);
  }, 600_000);
});

const base = () => structuredClone(DEMOS.find((d) => d.id === 'generic-sensor')!.document) as Record<string, any>;
const PATHS = ['sensor.sensitivity', 'sensor.quiescent', 'sensor.sourceResistance', 'supply.positive', 'supply.negative', 'opamp.gbw', 'opamp.slewRate', 'opamp.inputHigh', 'opamp.voltageNoise', 'target.scale', 'target.zero', 'target.range', 'target.series', 'target.resistanceMin', 'target.tolerance', 'title', 'sensor.type', 'format', 'version'];
const badValue = fc.oneof(
  fc.constant('12 volts'), fc.constant(null), fc.constant(-1), fc.constant(0), fc.constant(1e300), fc.constant(-1e300), fc.constant(1e-300),
  fc.constant([]), fc.constant({}), fc.constant(true), fc.constant('NaN'), fc.string({ maxLength: 8 }), fc.constant(undefined),
);

function setDeep(doc: Record<string, any>, path: string, value: unknown): void {
  const keys = path.split('.');
  let o = doc;
  for (const k of keys.slice(0, -1)) o = o[k];
  if (value === undefined) delete o[keys[keys.length - 1]!];
  else o[keys[keys.length - 1]!] = value;
}

const invalidArb = fc.oneof(
  // One or more fields broken.
  fc.array(fc.tuple(fc.constantFrom(...PATHS), badValue), { minLength: 1, maxLength: 4 }).map((muts) => {
    const d = base();
    for (const [p, v] of muts) setDeep(d, p, v);
    return d;
  }),
  // Unknown fields anywhere.
  fc.tuple(fc.constantFrom('', 'sensor.', 'opamp.', 'target.', 'supply.'), fc.string({ minLength: 1, maxLength: 6 }).filter((s) => /^[a-z]+$/.test(s) && !['type'].includes(s))).map(([pre, k]) => {
    const d = base();
    setDeep(d, `${pre}zz${k}`, 1);
    return d;
  }),
  // Reversed or impossible relations.
  fc.constantFrom(
    (d: any) => { d.target.range = [20, -20]; },
    (d: any) => { d.supply.positive = -9; d.supply.negative = 0; },
    (d: any) => { d.sensor.sensitivity = 0; },
    (d: any) => { d.target.resistanceMin = 1e6; d.target.resistanceMax = 1e3; },
    (d: any) => { d.version = 99; },
    (d: any) => { d.format = 'some-other-format'; },
  ).map((f) => { const d = base(); f(d); return d; }),
);

describe('random invalid documents', () => {
  it(`come back as problems with field paths, never a throw (${RUNS} cases)`, () => {
    fc.assert(fc.property(invalidArb, (doc) => {
      const v = validateDesign(doc);
      if (v.ok) return; // a mutation may happen to stay valid (e.g. a title string); nothing to check
      expect(v.problems.length).toBeGreaterThan(0);
      for (const p of v.problems) {
        expect(typeof p.path).toBe('string');
        expect(p.path.length).toBeGreaterThan(0);
        expect(p.message.length).toBeGreaterThan(3);
      }
    }), { numRuns: RUNS, seed: SEED });
  });

  it('most mutations are refused (the generator really produces bad documents)', () => {
    const samples = fc.sample(invalidArb, { numRuns: 500, seed: SEED });
    const refused = samples.filter((d) => !validateDesign(d).ok).length;
    expect(refused / samples.length).toBeGreaterThan(0.8);
  });

  it('the CLI exits 2 with the messages and no stack trace (200 files)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'gw-fuzz-'));
    const samples = fc.sample(invalidArb, { numRuns: 200, seed: SEED + 1 });
    let checked = 0;
    for (const [i, doc] of samples.entries()) {
      if (validateDesign(doc).ok) continue;
      const f = join(dir, `d${i}.json`);
      writeFileSync(f, JSON.stringify(doc));
      let err = '';
      const code = await main(['report', f, '--no-spread'], { out: () => {}, err: (s) => { err += s; } });
      expect(code).toBe(2);
      expect(err, err).toMatch(/^  [\w.\[\]()]+: \S/m);
      expect(err).not.toMatch(/\n\s+at /);
      checked++;
    }
    expect(checked).toBeGreaterThan(100);
  });
});

describe('typed text', () => {
  const DIMS = ['ohm', 'V', 'A', 'Hz', 's', 'm', 'T', 'K', 'F', 'C', 'W', 'H', 'V/A', 'V/T', 'V/s', 'V/Hz^0.5', 'A/Hz^0.5', 'V/K', '1/K', '1'] as const;
  const texty = fc.oneof(
    fc.string({ maxLength: 30 }),
    fc.tuple(fc.double({ noNaN: false }), fc.constantFrom('', ' k', 'k', ' mV/A', ' Ω', 'R', ' nV/√Hz', ' G', ' °C', ' mAh', ' %', ' ppm/K', 'e400', ' V/µs')).map(([x, u]) => `${x}${u}`),
    fc.constantFrom('4k7', '4K7K', 'R', 'KK', '1e308 MΩ', '-0', '1/0', 'Infinity V', '∞', '1,5 V', '0x10', '  ', '\u0000'),
  );
  it(`parseQuantity never throws and gives a finite number or a message (${RUNS} cases)`, () => {
    fc.assert(fc.property(texty, fc.constantFrom(...DIMS), (text, dim) => {
      const r = parseQuantity(text, dim);
      if (r.ok) expect(Number.isFinite(r.value)).toBe(true);
      else expect(r.message.length).toBeGreaterThan(5);
    }), { numRuns: RUNS, seed: SEED });
  });
});

describe('reachable targets are solved', () => {
  // Any target a topology can reach with a gain of 1.05…100 in a 1 k–1 M window gets parts, with both
  // trimmers covering their stacks (docs/method.md), from every demo's sensor.
  const target = fc.record({
    demo: fc.constantFrom('bench-clamp', 'generic-sensor', 'appliance-ct'),
    gain: fc.double({ min: 1.05, max: 100, noNaN: true }),
    sign: fc.constantFrom(1, -1),
    zeroFrac: fc.double({ min: 0.2, max: 0.8, noNaN: true }),
  });
  it(`solves every reachable target (${Math.max(400, Math.floor(RUNS / 10))} cases)`, () => {
    let solved = 0;
    fc.assert(fc.property(target, (t) => {
      const doc = structuredClone(DEMOS.find((d) => d.id === t.demo)!.document) as any;
      const v0 = validateDesign(doc);
      if (!v0.ok) throw new Error('demo invalid');
      const r0 = analyse(v0.design, { spreadTrials: 0 });
      doc.target.scale = t.sign * t.gain * Math.abs(r0.front.sensitivity);
      doc.target.zero = doc.supply.positive * t.zeroFrac;
      doc.target.range = [-0.1, 0.1];
      const v = validateDesign(doc);
      if (!v.ok) return;
      const r = analyse(v.design, { spreadTrials: 0 });
      if (!r.choice.chosen) return; // unreachable on these rails: guidance, checked elsewhere
      const codes = r.warnings.map((w) => w.code);
      // Over this narrow range (±0.1) the output spans a few mV; a reference within a hair of a rail (no pot can
      // centre there) may leave a zero just off by more than 0.1 % of it: a refusal that says what to change.
      const zeroOff = r.warnings.find((w) => w.code === 'zero-off-target');
      if (zeroOff) { expect(sayFinding(zeroOff)).toMatch(/move the zero|widen the range|zero trimmer/); return; }
      expect(codes, JSON.stringify(t)).not.toContain('gain-unrealisable');
      expect(codes).not.toContain('reference-unrealisable');
      // Near unity a span trimmer has little leverage ((G−1)/G per unit of Rf): where covering the stack would
      // take a trimmer of most of Rf's own size (capped there), the stage honestly reports it falls short.
      const st = r.stage!;
      const leverage = st.ideal.feedbackSensitivity;
      const trimOverRf = (COVERAGE * scaleStack(v.design, r.front, st.ideal)) / (leverage * (0.5 - TRIMMER_TOLERANCE));
      if (trimOverRf < 0.5) expect(codes).not.toContain('gain-trim-short');
      expect(Math.abs(r.stage!.scaleError)).toBeLessThan(0.01);
      // The circuit solver (finite open-loop gain, real load) agrees with the solver's closed form.
      expect(Math.abs(r.dc!.out[1] / r.stage!.ideal.deliveredScale - 1)).toBeLessThan(0.01);
      // Before trimming the zero lands within a quarter of the zero trimmer's reach, plus 0.2 % of the supply for
      // a wiper that had to stop short of its end (or within 5 % of the supply without a trimmer).
      // A zero trimmer that cannot centre (a reference pinned near a rail) must say so instead.
      const zt = r.stage!.network.reference.trim;
      if (!codes.includes('zero-trim-short')) expect(Math.abs(r.dc!.out[0] - doc.target.zero)).toBeLessThan(zt ? 0.25 * zt.halfSpan + 0.002 * doc.supply.positive : 0.05 * doc.supply.positive);
      solved++;
    }), { numRuns: Math.max(400, Math.floor(RUNS / 10)), seed: SEED });
    expect(solved).toBeGreaterThan(100);
  }, 900_000);
});

describe('tiny and huge finite values in every number field', () => {
  // Issue 14: 1e-200 Ω source resistance gave "phase NaN°", 5e-324 V/A sensitivity "a gain of Infinity",
  // 1e-300 Hz GBW "NaN %". Every number field of every sensor type gets values from the smallest subnormal to
  // the largest double, either sign, plus its own bounds: each is refused at that field (or by a cross-field
  // rule that names it), or the report's own figures are all finite or left out with the reason.
  const EXTREMES = [5e-324, 1e-300, 1e-200, 1e-30, 1e-15, 1e15, 1e30, 1e200, 1e300, Number.MAX_VALUE];
  const cases = DEMOS.flatMap((demo) => {
    const v = validateDesign(structuredClone(demo.document));
    if (!v.ok) throw new Error(demo.id);
    // Fields of an optional group that is off (no battery, no filter) have nothing to set.
    const present = (path: string) => { const parent = getPath(v.design, path.split('.').slice(0, -1).join('.')); return parent !== null && parent !== undefined; };
    return numberFields(v.design.sensor.type).filter((f) => present(f.path)).map((f) => ({ demo: demo.id, design: v.design, field: f }));
  });
  const valueArb = (f: (typeof cases)[number]['field']) => fc.oneof(
    fc.constantFrom(...EXTREMES, ...EXTREMES.map((x) => -x)),
    fc.constantFrom(...[f.min, f.max, f.maxAbs, f.minAbs].filter((x): x is number => x !== undefined).flatMap((x) => [x, -x, x * (1 + 1e-12), x * (1 - 1e-12)])),
    fc.double({ min: -Number.MAX_VALUE, max: Number.MAX_VALUE, noNaN: true, noDefaultInfinity: true }),
  );
  const caseArb = fc.integer({ min: 0, max: cases.length - 1 }).chain((i) => fc.tuple(fc.constant(i), valueArb(cases[i]!.field)));
  it(`every field, every extreme: refused at the field, or finite figures (${Math.max(600, Math.floor(RUNS / 4))} random cases, plus each field's own list)`, () => {
    const check = (i: number, value: number) => {
      const { demo, design, field } = cases[i]!;
      const doc = setPath(design, field.path, value);
      const v = validateDesign(doc);
      if (!v.ok) {
        const dotted = (p: string) => p.replace(/\[(\d+)\]/g, '.$1');
        const named = v.problems.some((p) => dotted(p.path) === field.path || (p.other ?? []).map(dotted).includes(field.path));
        expect(named, `${demo} ${field.path}=${value}: ${JSON.stringify(v.problems)}`).toBe(true);
        return 'refused';
      }
      expect(getPath(v.design, field.path)).toBe(value);
      const r = analyse(v.design, { spreadTrials: 10, acPoints: 20 });
      expect(badFigure(r), `${demo} ${field.path}=${value}`).toBeNull();
      expect(shownText(r), `${demo} ${field.path}=${value}`).not.toMatch(/NaN|Infinity/);
      return 'analysed';
    };
    // Each field's full list once, then random picks.
    const seen = { refused: 0, analysed: 0 };
    for (let i = 0; i < cases.length; i++) for (const x of [...EXTREMES, ...EXTREMES.map((y) => -y)]) seen[check(i, x)]++;
    fc.assert(fc.property(caseArb, ([i, x]) => { seen[check(i, x)]++; }), { numRuns: Math.max(600, Math.floor(RUNS / 4)), seed: SEED });
    // The property sees both outcomes (a generator that only produced refusals would prove nothing).
    expect(seen.refused).toBeGreaterThan(100);
    expect(seen.analysed).toBeGreaterThan(50);
  }, 600_000);
});
