import { describe, expect, it } from 'vitest';
import { displayValue, FIELDS, fieldsFor, getPath, parseField, setPath } from '../../src/present/fields.js';
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
