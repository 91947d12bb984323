import { describe, expect, it } from 'vitest';
import { validateDesign } from '../../src/model/design.js';
import { DEMOS } from '../../src/model/demos.js';

const doc = (waveform: unknown) => ({ ...structuredClone(DEMOS.find((d) => d.id === 'generic-sensor')!.document), analysis: { waveform } });
const problems = (waveform: unknown) => {
  const v = validateDesign(doc(waveform));
  return v.ok ? [] : v.problems.map((p) => `${p.path}: ${p.message}`);
};

describe('analysis.waveform in the design file', () => {
  it('defaults to null and fills frequency 0 and duty 0.5 for a step', () => {
    const v = validateDesign(structuredClone(DEMOS[0]!.document));
    expect(v.ok && v.design.analysis.waveform).toBeNull();
    const s = validateDesign(doc({ shape: 'step', low: 0, high: 5 }));
    expect(s.ok && s.design.analysis.waveform).toEqual({ shape: 'step', low: 0, high: 5, frequency: 0, duty: 0.5 });
  });
  it('refuses an unknown shape, a missing level, equal levels, a periodic wave without a frequency and a duty at an end', () => {
    expect(problems({ shape: 'sawtooth', low: 0, high: 1 })).toEqual(['analysis.waveform.shape: must be one of "step", "sine", "square", "triangle" (got "sawtooth")']);
    expect(problems({ shape: 'step', high: 1 })).toEqual(['analysis.waveform.low: is missing']);
    expect(problems({ shape: 'step', low: 1, high: 1 })).toEqual(['analysis.waveform.high: must differ from analysis.waveform.low']);
    expect(problems({ shape: 'sine', low: 0, high: 1 })).toEqual(['analysis.waveform.frequency: must be a positive number of hertz for a sine wave']);
    expect(problems({ shape: 'square', low: 0, high: 1, frequency: 50, duty: 1 })).toEqual(['analysis.waveform.duty: must lie between 0 and 1 (not at either end)']);
    expect(problems({ shape: 'triangle', low: 0, high: 1, frequency: -5 })).toEqual(['analysis.waveform.frequency: must be zero or a positive number of hertz']);
    expect(problems({ shape: 'step', low: '1 A', high: 2 })[0]).toMatch(/^analysis\.waveform\.low: must be a number of measurand units/);
    expect(problems({ shape: 'step', low: 0, high: 1, extra: 1 })).toEqual(['analysis.waveform.extra: is not a field this format knows']);
  });
});
