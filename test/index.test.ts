import { describe, expect, it } from 'vitest';
import * as core from '../src/index.js';

describe('the public entry', () => {
  it('solves a demo end to end through the barrel alone', () => {
    const v = core.validateDesign(structuredClone(core.DEMOS[2]!.document));
    expect(v.ok).toBe(true);
    if (!v.ok) return;
    const j = core.reportJson(core.analyse(v.design, { spreadTrials: 0 }));
    expect(j.format).toBe('gainwright-report');
    expect(core.isMember(4700, 'E12')).toBe(true);
  });
});
