import { describe, expect, it } from 'vitest';
import { displayValue, FIELDS, fieldHint, fieldsFor, getPath, groupDefault, groupOff, parseField, problemWords, readField, setPath } from '../../src/present/fields.js';
import { designFrom } from '../helpers.js';
import { DEMOS } from '../../src/model/demos.js';
import { sensorFrontAtRail } from '../../src/physics/sensors.js';
import { demoDesign } from '../../src/model/demos.js';
import { validateDesign } from '../../src/model/design.js';

const f = (path: string) => FIELDS.find((x) => x.path === path)!;

describe('fields', () => {
  it('every field of every demo is shown and written back readably (no NaN, no Infinity)', () => {
    for (const id of ['bench-clamp', 'appliance-ct', 'generic-sensor']) {
      const d = demoDesign(id);
      for (const fd of fieldsFor(d)) {
        if (fd.kind === 'bool' || fd.kind === 'select') continue;
        const text = displayValue(fd, getPath(d, fd.path));
        expect(text, fd.path).not.toMatch(/NaN|Infinity/);
      }
    }
  });
  it('a displayed value reads back to the same number (round trip through the text a person sees)', () => {
    const d = demoDesign('bench-clamp');
    for (const fd of fieldsFor(d).filter((x) => x.kind === 'number')) {
      const v = getPath(d, fd.path);
      if (typeof v !== 'number') continue;
      const back = parseField(fd, displayValue(fd, v), d);
      expect(back.ok, `${fd.path}: ${displayValue(fd, v)}`).toBe(true);
      if (back.ok) expect(Math.abs(back.value - v)).toBeLessThanOrEqual(Math.abs(v) * 1e-3 + 1e-12);
    }
  });
  it('a bare number means percent in a percent field, °C in a temperature field, mAh for capacity', () => {
    expect(parseField(f('target.tolerance'), '1')).toEqual({ ok: true, value: 0.01 });
    expect(parseField(f('environment.temperature'), '25')).toEqual({ ok: true, value: 298.15 });
    expect(parseField(f('supply.battery.capacity'), '565')).toEqual({ ok: true, value: 565 * 3.6 });
  });
  it('setPath copies and never mutates; undefined deletes', () => {
    const d = demoDesign('generic-sensor');
    const e = setPath(d, 'opamp.gbw', 2e6);
    expect(d.opamp.gbw).toBe(1e6);
    expect(e.opamp.gbw).toBe(2e6);
    expect(e.sensor).toBe(d.sensor);
    const r = setPath(d, 'target.range.1', 30);
    expect(r.target.range).toEqual([-20, 30]);
    expect(d.target.range).toEqual([-20, 20]);
    const g = setPath(d, 'sensor.ratiometricSupply', undefined) as any;
    expect('ratiometricSupply' in g.sensor).toBe(false);
    expect(validateDesign(r).ok).toBe(true);
  });
  it('optional groups show their fields only when switched on', () => {
    const d = demoDesign('generic-sensor');
    expect(fieldsFor(d).some((x) => x.path === 'supply.battery.fresh')).toBe(false);
    const b = setPath(d, 'supply.battery', { fresh: 9.6, endOfLife: 6, capacity: 2034 });
    expect(fieldsFor(b).some((x) => x.path === 'supply.battery.fresh')).toBe(true);
  });
});

describe('per-measurand units', () => {
  it('a scale is written per the design\'s measurand and reads back', () => {
    const d = setPath(setPath(demoDesign('generic-sensor'), 'sensor.measurand', 'mT'), 'target.scale', 0.025);
    const text = displayValue(f('target.scale'), 0.025, d);
    expect(text).toBe('25 mV/mT');
    expect(parseField(f('target.scale'), text, d)).toEqual({ ok: true, value: 0.025 });
  });
});

describe('per-measurand units are checked', () => {
  it('a scale typed per another unit than the measurand is refused, not silently taken', () => {
    const d = setPath(demoDesign('generic-sensor'), 'sensor.measurand', 'mT');
    expect(parseField(f('target.scale'), '25 mV/mT', d)).toEqual({ ok: true, value: 0.025 });
    expect(parseField(f('target.scale'), '25 mV/A', d).ok).toBe(false);
  });
});

describe('problemWords: a refusal in the field\'s own words, never a field path', () => {
  const words = (id: string, mut: (d: any) => void) => {
    const d = structuredClone(DEMOS.find((x) => x.id === id)!.document) as any;
    mut(d);
    const v = validateDesign(d);
    if (v.ok) throw new Error('expected a refusal');
    const base = validateDesign(structuredClone(DEMOS.find((x) => x.id === id)!.document));
    return v.problems.map((p) => problemWords(p, base.ok ? base.design : undefined));
  };
  const PATH = /\b(sensor|supply|opamp|target|output|environment|analysis)\.[a-zA-Z]/;
  it('a 3.3 V rail under a 5 V regulator names the regulator, the rail and the fix by their labels', () => {
    const w = words('bench-clamp', (d) => { d.supply.positive = 3.3; d.supply.battery = null; });
    expect(w).toContain('Regulated voltage needs “Positive rail” of at least 5.3 V (its 5 V plus 0.3 V dropout): raise “Positive rail”, lower “Regulated voltage” or switch “Regulated rail” off');
    for (const x of w) expect(x).not.toMatch(PATH);
  });
  it('a lowest temperature above the design temperature is said at the lowest temperature, with both labels', () => {
    const w = words('generic-sensor', (d) => { d.environment = { temperature: 298.15, temperatureMin: 323.15, temperatureMax: 333.15 }; });
    expect(w).toEqual(['Lowest temperature must not be above “Design temperature”: lower “Lowest temperature” or raise “Design temperature”']);
  });
  it('a bound is written in the unit the field shows: a battery capacity in mAh, a temperature in °C', () => {
    expect(words('bench-clamp', (d) => { d.supply.battery.capacity = 0; })).toEqual(['Capacity must be at least 0.1 mAh']);
    expect(words('generic-sensor', (d) => { d.environment = { temperature: 2000 }; })[0]).toBe('Design temperature must be at most 726.85 °C');
  });
  it('a document entry that is no field is named as an entry, not as a dotted path', () => {
    expect(problemWords({ path: 'opamp.__proto__', message: 'is not a field this format knows' })).toBe('The entry “__proto__” in opamp is not a field this format knows');
  });
});

// SI Brochure, 9th ed., table 7 (prefixes): 25 mV/mT = 25 V/T, 0.5 V/µs = 5e5 V/s, 35 nV/√Hz = 3.5e-8 V/√Hz.
describe('fields are shown in the trade\'s units and read bare numbers in them', () => {
  const d = demoDesign('bench-clamp');
  it.each([
    ['sensor.hallSensitivity', 25, '25 mV/mT'], ['opamp.slewRate', 5e5, '0.5 V/µs'], ['opamp.voltageNoise', 3.5e-8, '35 nV/√Hz'],
    ['opamp.voltageNoise', 0, '0 nV/√Hz'], ['sensor.core.gap', 0.0015, '1.5 mm'], ['target.scale', 0.1, '100 mV/A'], ['target.scale', -2.05, '-2050 mV/A'],
  ] as const)('displayValue(%s, %d) is %j', (path, v, text) => {
    expect(displayValue(f(path), v, d)).toBe(text);
  });
  it('a bare number is in the shown unit: 100 in the scale is 100 mV/A, 1.5 in the gap is 1.5 mm, 0.5 in the slew rate is 0.5 V/µs', () => {
    expect(parseField(f('target.scale'), '100', d)).toEqual({ ok: true, value: 0.1 });
    expect(parseField(f('sensor.core.gap'), '1.5', d)).toEqual({ ok: true, value: 0.0015 });
    expect(parseField(f('opamp.slewRate'), '0.5', d)).toEqual({ ok: true, value: 5e5 });
  });
  it('readField says how a value was read when it was not typed in the shown unit', () => {
    expect(readField(f('sensor.core.gap'), '0.0015 m', d)).toEqual({ ok: true, path: 'sensor.core.gap', value: 0.0015, readAs: '1.5 mm' });
    expect(readField(f('sensor.core.pathLength'), '0.06 m', d)).toEqual({ ok: true, path: 'sensor.core.pathLength', value: 0.06, readAs: '60 mm' });
    expect(readField(f('sensor.core.gap'), '1.5 mm', d)).toMatchObject({ ok: true, readAs: null });
    expect(readField(f('supply.positive'), '9 v', d)).toMatchObject({ ok: true, value: 9, readAs: '9 V' });
  });
  it('a gain is another way to state the target: it writes the scale gain × sensor sensitivity, with the sign as polarity', () => {
    const sens = sensorFrontAtRail(d.sensor, d).sensitivity;
    const r = readField(f('target.gain'), '100', d);
    expect(r).toMatchObject({ ok: true, path: 'target.scale' });
    if (r.ok) expect(r.value / (100 * sens)).toBeCloseTo(1, 12);
    const back = setPath(d, 'target.scale', r.ok ? r.value : 0);
    expect(displayValue(f('target.gain'), undefined, back)).toBe('100');
    expect(fieldHint(f('target.scale'), back)).toMatch(/gain 100: keeps the sensor's polarity/);
    const inv = setPath(d, 'target.scale', -100 * sens);
    expect(fieldHint(f('target.gain'), inv)).toMatch(/inverts the sensor's polarity/);
  });
});

describe('a range switch in the editor (issue 19): further ranges one after the other', () => {
  it('a third range is offered only once there is a second, and starts at the same step from it (2.5 × the span, scale ÷ 2.5)', () => {
    const d = designFrom('two-range-clamp');
    const paths = fieldsFor(d).map((f) => f.path);
    expect(paths).toContain('target.ranges.1');
    expect(paths).not.toContain('target.ranges.2');
    const third = groupDefault('target.ranges.1', d) as { scale: number; range: [number, number] };
    const second = d.target.ranges![0]!;
    expect(third.scale).toBeCloseTo(second.scale / 2.5, 12);
    expect(third.range[1]).toBeCloseTo(second.range[1] * 2.5, 12);
    const single = designFrom('generic-sensor');
    expect(fieldsFor(single).map((f) => f.path)).not.toContain('target.ranges.1');
  });
  it('switching a range off takes it out of the list (the ones after it move up); the last one off leaves no list', () => {
    const d = designFrom('two-range-clamp');
    const three = setPath(d, 'target.ranges.1', groupDefault('target.ranges.1', d));
    expect(three.target.ranges).toHaveLength(2);
    expect(setPath(three, 'target.ranges.0', groupOff('target.ranges.0')).target.ranges).toEqual([three.target.ranges![1]]);
    expect(setPath(d, 'target.ranges', groupOff('target.ranges')).target.ranges).toBeUndefined();
  });
});
