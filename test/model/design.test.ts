import { describe, expect, it } from 'vitest';
import { formatProblems, parseDesignText, validateDesign } from '../../src/model/design.js';
import { DEMOS } from '../../src/model/demos.js';

const issueExample = () => ({
  format: 'gainwright-design', version: 1, title: 'Example',
  sensor: { type: 'voltage-output', measurand: 'A', sensitivity: 0.0125, quiescent: 2.5, outputMin: 0.25, outputMax: 4.75, sourceResistance: 50, noiseDensity: 4e-7, bandwidth: 1.2e5 },
  supply: { positive: 9, negative: 0 },
  opamp: { gbw: 1e6, slewRate: 5e5, openLoopGainDb: 100, inputLow: 0, inputHigh: 1.5, outputLow: 0.05, outputHigh: 1.5, voltageNoise: 3.5e-8, currentNoise: 1e-13, offsetVoltage: 3e-3, biasCurrent: 5e-8, supplyCurrent: 5e-4 },
  target: { scale: 0.1, zero: 4.5, range: [-20, 20], topology: 'auto', series: 'E96', tolerance: 0.01, arrangements: ['single', 'series', 'parallel'], resistanceMin: 1e3, resistanceMax: 1e6 },
});

describe('validateDesign', () => {
  it('accepts the documented example and fills defaults', () => {
    const v = validateDesign(issueExample());
    expect(v.ok).toBe(true);
    if (!v.ok) return;
    expect(v.design.output.load).toEqual({ resistance: 1e6, capacitance: 15e-12 });
    expect(v.design.environment.temperature).toBe(298.15);
    expect(v.design.analysis.spreadTrials).toBe(2000);
    expect(v.design.target.trim).toEqual({ gain: true, zero: true });
  });
  it('accepts every demo', () => {
    for (const d of DEMOS) expect(validateDesign(structuredClone(d.document)).ok, d.id).toBe(true);
  });
  it('is idempotent: a validated design validates again unchanged', () => {
    for (const d of DEMOS) {
      const once = validateDesign(structuredClone(d.document));
      if (!once.ok) throw new Error(d.id);
      const twice = validateDesign(JSON.parse(JSON.stringify(once.design)));
      expect(twice.ok, d.id).toBe(true);
      if (twice.ok) expect(twice.design).toEqual(once.design);
    }
  });
  it('names the field path: opamp.gbw must be a positive number of hertz', () => {
    const d = issueExample();
    (d.opamp as Record<string, unknown>).gbw = -1;
    const v = validateDesign(d);
    expect(v.ok).toBe(false);
    if (!v.ok) expect(formatProblems(v.problems)).toContain('opamp.gbw: must be a positive number of hertz');
  });
  it('reports every problem at once', () => {
    const d = issueExample() as Record<string, any>;
    d.opamp.gbw = 'fast';
    d.target.range = [20, -20];
    d.sensor.colour = 'red';
    delete d.supply.positive;
    const v = validateDesign(d);
    expect(v.ok).toBe(false);
    if (v.ok) return;
    const paths = v.problems.map((p) => p.path);
    expect(paths).toEqual(expect.arrayContaining(['opamp.gbw', 'sensor.colour', 'supply.positive']));
  });
  it('checks relations: reversed range, rails, zero sensitivity', () => {
    const d = issueExample() as Record<string, any>;
    d.target.range = [5, -5];
    d.sensor.sensitivity = 0;
    d.supply.negative = 12;
    const v = validateDesign(d);
    expect(v.ok).toBe(false);
    if (v.ok) return;
    const text = formatProblems(v.problems);
    expect(text).toContain('target.range[0]: must be below target.range[1]: the range runs from low to high');
    expect(text).toContain('supply.positive: must be above supply.negative');
  });
  it('refuses a wrong format and a newer version with a message', () => {
    const a = validateDesign({ ...issueExample(), format: 'something-else' });
    expect(!a.ok && a.problems[0]!.path).toBe('format');
    const b = validateDesign({ ...issueExample(), version: 7 });
    expect(!b.ok && b.problems[0]!.message).toMatch(/newer than this Gainwright/);
  });
  it('parseDesignText turns bad JSON and huge files into messages, not exceptions', () => {
    const bad = parseDesignText('{ not json');
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.problems[0]!.message).toMatch(/not valid JSON/);
    const huge = parseDesignText(' '.repeat(1_000_001));
    expect(!huge.ok && huge.problems[0]!.message).toMatch(/larger than 1 MB/);
    expect(validateDesign(null).ok).toBe(false);
    expect(validateDesign([1, 2]).ok).toBe(false);
  });
});

describe('contradictions inside a file', () => {
  it('an attenuating target is not a file error, whatever stage is asked for (the report says what fits)', () => {
    for (const topology of ['auto', 'non-inverting']) {
      const d = issueExample() as Record<string, any>;
      d.target.topology = topology;
      d.target.scale = 0.005; // 0.4 × the 12.5 mV/A sensor
      expect(validateDesign(d).ok).toBe(true);
    }
  });
});
