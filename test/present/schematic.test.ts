import { describe, expect, it } from 'vitest';
import { schematic } from '../../src/present/schematic.js';
import { analyse } from '../../src/analysis/report.js';
import { DEMOS } from '../../src/model/demos.js';
import { designFrom } from '../helpers.js';

describe('schematic', () => {
  it.each(DEMOS.map((d) => d.id))('%s: every designator in the parts list appears in the drawing, values included', (id) => {
    const r = analyse(designFrom(id), { spreadTrials: 0 });
    const s = schematic(r)!;
    // Parts are resistor and capacitor symbols; the CT's burden (RB) is named at the sensor symbol.
    const labels = s.prims.flatMap((p) => (p.t === 'res' || p.t === 'cap' ? [`${p.ref} ${p.value}`] : p.t === 'source' ? [p.label.replace(/^CT \+ /, '')] : []));
    for (const part of r.stage!.parts) expect(labels.some((l) => l.split(/ [∥+] | /).includes(part.ref)), part.ref).toBe(true);
    for (const p of s.prims) if (p.t === 'res') expect(p.value).not.toMatch(/NaN|—/);
  });
  it('draws nothing for a design with no stage', () => {
    expect(schematic(analyse(designFrom('generic-sensor', (x) => { x.target.scale = 0.005; x.target.zero = 2.5; x.target.topology = 'non-inverting'; }), { spreadTrials: 0 }))).toBeNull();
  });
});
