import { describe, expect, it } from 'vitest';
import { chooseTopology, idealStage, invertingOutput, nonInvertingOutput } from '../../src/physics/topology.js';
import { sensorFront } from '../../src/physics/sensors.js';
import type { Design } from '../../src/model/design.js';
import { designFrom } from '../helpers.js';
import { guidanceWords, stageReasonWords } from '../../src/present/finding-words.js';

const design = (patch: (d: any) => void = () => {}): Design => designFrom('generic-sensor', patch);

describe('closed forms', () => {
  // Non-inverting with the reference at the foot of the ground leg: superposition of G·Vs and −(G−1)·Vref
  // (non-inverting gain 1+Rf/Rg, inverting gain −Rf/Rg: Sedra & Smith, Microelectronic Circuits, the ideal op-amp
  // chapter; Horowitz & Hill, The Art of Electronics, the op-amp chapter; both from memory).
  it('non-inverting: Vout = G·Vs − (G−1)·Vref', () => {
    expect(nonInvertingOutput(8, 2.5, 2.5)).toBeCloseTo(2.5, 12);
    expect(nonInvertingOutput(8, 2.5 + 0.0125 * 20, 15.5 / 7)).toBeCloseTo(6.5, 12);
  });
  it('inverting: Vout = (1+G)·Vp − G·Vs', () => {
    expect(invertingOutput(4, 1, 1)).toBeCloseTo(1, 12);
    expect(invertingOutput(4, 0, 1)).toBeCloseTo(5, 12);
  });
});

describe('idealStage and chooseTopology', () => {
  it('12.5 mV/A to 100 mV/A at 4.5 V: non-inverting, G = 8, Vref = (8·2.5 − 4.5)/7', () => {
    const d = design();
    const s = idealStage('non-inverting', d, sensorFront(d.sensor, d));
    expect(s.feasible).toBe(true);
    // Load factor 1 MΩ / (1 MΩ + 0): the pin scale equals the target.
    expect(s.gain).toBeCloseTo(8, 9);
    expect(s.reference).toBeCloseTo(15.5 / 7, 9);
    expect(chooseTopology(d, sensorFront(d.sensor, d)).chosen?.topology).toBe('non-inverting');
  });
  it('an opposite-polarity target picks the inverting stage and says why', () => {
    const d = design((x) => { x.target.scale = -0.1; });
    const c = chooseTopology(d, sensorFront(d.sensor, d));
    expect(c.chosen?.topology).toBe('inverting');
    expect(c.considered[0]!.reasons).toContainEqual({ code: 'polarity-wrong', keeps: true });
    // Vp = (zero + G·Vq)/(1+G) with G = 8.
    expect(c.chosen!.reference).toBeCloseTo((4.5 + 8 * 2.5) / 9, 9);
  });
  // Inverting gain is −Rf/Rin (Sedra & Smith, Microelectronic Circuits, the inverting configuration, from memory): with a positive sensor it cannot give a positive scale.
  it('an inverting stage asked for the sensor\'s own sign is explained by its polarity, not the rails', () => {
    const d = design((x) => { x.target.topology = 'inverting'; x.target.scale = 0.1; });
    const c = chooseTopology(d, sensorFront(d.sensor, d));
    expect(c.chosen).toBeNull();
    expect(c.guidance).toEqual([{ code: 'polarity-cause', topology: 'inverting', rises: false, other: 'non-inverting', measurand: 'A' }]);
    const text = c.guidance.map(guidanceWords).join(' ');
    expect(text).toMatch(/polarity is the cause/);
    expect(text).toMatch(/Reverse the conductor/);
    expect(text).toMatch(/non-inverting stage/);
    expect(text).not.toMatch(/rail-to-rail/);
  });
  it('a gain below 1 with the same polarity is met by the summing non-inverting stage, which attenuates', () => {
    const d = design((x) => { x.target.scale = 0.005; x.target.zero = 2.5; });
    const c = chooseTopology(d, sensorFront(d.sensor, d));
    expect(c.chosen!.topology).toBe('summing-non-inverting');
    // m = 0.005/0.0125 = 0.4, b = 2.5 − 0.4·2.5 = 1.5 V; from the 9 V rail K = 0.4 + 1.5/9 < 1, so the
    // reference is lowered to give K = 1.25 − m/4 = 1.15, α = m/K (closed form in src/physics/topology.ts).
    expect(c.chosen!.gain).toBeCloseTo(0.4, 12);
    expect(c.chosen!.noiseGain).toBeCloseTo(1.15, 12);
    expect(c.chosen!.split).toBeCloseTo(0.4 / 1.15, 12);
    expect(c.chosen!.reference).toBeCloseTo(1.5 / (1.15 - 0.4), 12);
  });
  it('a gain below 1 with the same polarity asked of the non-inverting stage fits nothing and gives guidance', () => {
    const d = design((x) => { x.target.scale = 0.005; x.target.zero = 2.5; x.target.topology = 'non-inverting'; });
    const c = chooseTopology(d, sensorFront(d.sensor, d));
    expect(c.chosen).toBeNull();
    expect(c.guidance.map((g) => g.code)).toContain('attenuate-same-polarity');
    expect(c.guidance.map(guidanceWords).join(' ')).toMatch(/reverse the conductor/i);
  });
  it('inputs that leave the op-amp input range rule out the non-inverting stage', () => {
    // The sensor swings to 2.5 + 0.0125·400 = 7.5 V … but the input stops at 9 − 3 = 6 V.
    const d = design((x) => { x.opamp.inputHigh = 3; x.target.range = [-100, 300]; x.target.scale = 0.0125 * 1.2; x.target.zero = 3; x.opamp.outputHigh = 0.1; });
    const s = idealStage('non-inverting', d, sensorFront(d.sensor, d));
    expect(s.feasible).toBe(false);
    const why = s.reasons.find((x) => x.code === 'inputs-outside');
    expect(why).toMatchObject({ what: 'follow-sensor', inputHigh: 6 });
    expect(stageReasonWords(why!)).toMatch(/input range/);
  });
  it('a unity buffer is feasible only when the zero already matches', () => {
    const d = design((x) => { x.target.scale = 0.0125; x.target.zero = 2.5; });
    const s = idealStage('non-inverting', d, sensorFront(d.sensor, d));
    expect(s.feasible).toBe(true);
    expect(s.needsReference).toBe(false);
    const d2 = design((x) => { x.target.scale = 0.0125; x.target.zero = 3; });
    expect(idealStage('non-inverting', d2, sensorFront(d2.sensor, d2)).feasible).toBe(false);
  });
});
