import { describe, expect, it } from 'vitest';
import { OPAMP_ARCHETYPES } from '../../src/model/opamps.js';
import { DEMOS } from '../../src/model/demos.js';
import { validateDesign } from '../../src/model/design.js';

describe('archetypes and demos', () => {
  it('every op-amp archetype is generic, marked typical and from memory, and valid in a design', () => {
    for (const a of OPAMP_ARCHETYPES) {
      expect(a.spec.name).toMatch(/typical, from memory/);
      // No part numbers: no run of letters followed by three or more digits.
      expect(a.label + a.summary + a.spec.name).not.toMatch(/[A-Z]{2,}\d{3,}/);
      const d = structuredClone(DEMOS.find((x) => x.id === 'generic-sensor')!.document) as any;
      d.opamp = a.spec;
      d.supply = { positive: 12, negative: -12 };
      expect(validateDesign(d).ok, a.id).toBe(true);
    }
  });
  it('every demo says it is a scenario of our own invention', () => {
    for (const d of DEMOS) expect(String((d.document as any).notes)).toMatch(/of our own invention/);
  });
});
