import { describe, expect, it } from 'vitest';
import { analyse, reportJson } from '../../src/analysis/report.js';
import { DEMOS } from '../../src/model/demos.js';
import { designFrom, nonFinitePaths, shuntOnSplitSupply } from '../helpers.js';

const design = designFrom;

const allFinite = nonFinitePaths;

describe('transfer and clipping', () => {
  // Demo scenario of our own: 9 V single supply, op-amp output stops 1.5 V below the + rail. With 100 mV/A
  // around 4.5 V the output reaches 7.5 V at (7.5 − 4.5)/0.1 = 30 A: the report must show that clip point.
  it('on 9 V with a 1.5 V output drop, the probe clips at +30 A and allows −44.5 A … +30 A', () => {
    const r = analyse(design('generic-sensor'), { spreadTrials: 0 });
    expect(r.clip!.firstHigh).toBe('opamp-output');
    expect(r.clip!.measurandHigh).toBeCloseTo(30, 0);
    expect(r.clip!.outputHigh).toBeCloseTo(7.5, 2);
    // Low side: 0.05 V above the negative rail → (0.05 − 4.5)/0.1 = −44.5 A.
    expect(r.clip!.measurandLow).toBeCloseTo(-44.5, 0);
    // Headroom at +20 A: 7.5 − 6.5 = 1.0 V.
    expect(r.clip!.headroom.high).toBeCloseTo(1.0, 2);
  });
  it('a range beyond the clip point gives negative headroom and a fail finding', () => {
    const r = analyse(design('generic-sensor', (x) => { x.target.range = [-20, 40]; }), { spreadTrials: 0 });
    expect(r.clip!.headroom.high).toBeLessThan(0);
    expect(r.warnings.map((w) => w.code)).toContain('clips-in-range-high');
    expect(r.verdicts[0]!.level).toBe('fail');
  });
  it('an AC range given in rms is checked at its √2 peak, and the report says so', () => {
    const r = analyse(design('generic-sensor', (x) => { x.target.signal = 'ac-rms'; x.target.range = [-20, 20]; }), { spreadTrials: 0 });
    expect(r.clip!.rangePeak[1]).toBeCloseTo(20 * Math.SQRT2, 12);
    expect(r.warnings.map((w) => w.code)).toContain('ac-peak');
  });
  it('an input range that stops short of the + rail is caught (opamp-input)', () => {
    const r = analyse(design('generic-sensor', (x) => { x.opamp.inputHigh = 6.2; x.target.topology = 'non-inverting'; }), { spreadTrials: 0 });
    // Inputs follow the sensor up to 2.75 V; the input range ends at 9 − 6.2 = 2.8 V → clips at (2.8 − 2.5)/0.0125 = 24 A.
    expect(r.clip!.limits.find((l) => l.cause === 'opamp-input')!.high).toBeCloseTo(24, 1);
  });
  it('the sensor\'s own output limit clips first when it is nearer', () => {
    const r = analyse(design('generic-sensor', (x) => { x.sensor.outputMax = 2.7; }), { spreadTrials: 0 });
    expect(r.clip!.firstHigh).toBe('sensor');
    expect(r.clip!.measurandHigh).toBeCloseTo(16, 6);
  });
});

describe('speed', () => {
  // −3 dB ≈ GBW / noise gain (ECEN 457 eq. 2): 1 MHz / 8 = 125 kHz, with no sensor pole and no filter.
  it('bandwidth of a gain-8 stage on a 1 MHz part is about 125 kHz', () => {
    const r = analyse(design('generic-sensor', (x) => { delete x.sensor.bandwidth; x.output = { filter: null, load: { resistance: 1e6, capacitance: 0 } }; }), { spreadTrials: 0 });
    expect(r.speed!.smallSignal / 125e3).toBeCloseTo(1, 2);
    // Rise time ln 9/(2π·BW) ≈ 0.35/BW.
    expect(r.speed!.riseTime * r.speed!.smallSignal).toBeCloseTo(Math.log(9) / (2 * Math.PI), 9);
  });
  // Textbook full-power bandwidth SR/(2π·Vp) (e.g. Sedra & Smith, on slew rate; from memory):
  // 2 V/µs at 12 V peak → 2e6/(2π·12) = 26.5 kHz. GBW 10 MHz keeps the small-signal bandwidth above it.
  it('full-power bandwidth SR/(2π·Vp): 2 V/µs at 12 V peak is 26.5 kHz', () => {
    const r = analyse(design('generic-sensor', (x) => {
      x.supply = { positive: 15, negative: -15 };
      x.opamp.gbw = 10e6; x.opamp.slewRate = 2e6; x.opamp.inputLow = 1; x.opamp.inputHigh = 1; x.opamp.outputLow = 1; x.opamp.outputHigh = 1;
      x.target.scale = 0.6; x.target.zero = 0; x.target.range = [-20, 20]; x.sensor.quiescent = 0;
      x.sensor.outputMin = -10; x.sensor.outputMax = 10;
    }), { spreadTrials: 0 });
    expect(r.speed!.peakSwing).toBeCloseTo(12, 1);
    expect(r.speed!.fullPower / 26.5e3).toBeCloseTo(1, 2);
  });
  it('a GBW of 1 Hz gives a full-power bandwidth no higher than the small-signal one (issue 14)', () => {
    const r = analyse(design('generic-sensor', (x) => { x.opamp.gbw = 1; }), { spreadTrials: 0 });
    expect(r.speed!.smallSignal).toBeLessThan(1);
    expect(r.speed!.fullPower).toBeLessThanOrEqual(r.speed!.smallSignal);
  });
  it('warns when the wanted bandwidth cannot be had', () => {
    const r = analyse(design('generic-sensor', (x) => { x.target.bandwidth = 500e3; }), { spreadTrials: 0 });
    expect(r.warnings.map((w) => w.code)).toContain('bandwidth-short');
  });
});

describe('noise and errors', () => {
  it('referred noise is output noise divided by the scale', () => {
    const r = analyse(design('generic-sensor'), { spreadTrials: 0 });
    expect(r.noise!.referredRms).toBeCloseTo(r.noise!.rms / Math.abs(r.speed!.passband), 12);
    // The sensor's 400 nV/√Hz × gain 8 dominates at 1 kHz: 3.2 µV/√Hz (plus a little from the rest).
    expect(r.noise!.densityAt1kHz / (400e-9 * 8)).toBeGreaterThan(1);
    expect(r.noise!.densityAt1kHz / (400e-9 * 8)).toBeLessThan(1.02);
  });
  // Sivakumar, Linear Integrated Circuits, ex. 5.1 form: output offset = Vos × noise gain.
  it('the offset term is Vos × noise gain / scale', () => {
    const r = analyse(design('generic-sensor', (x) => { x.opamp.biasCurrent = 0; }), { spreadTrials: 0 });
    const t = r.errors!.terms.find((x) => x.name === 'op-amp offset voltage')!;
    expect(t.value).toBeCloseTo((3e-3 * r.stage!.gain) / 0.1, 2);
  });
  it('trimming removes the static terms and leaves drift', () => {
    const r = analyse(design('generic-sensor'), { spreadTrials: 0 });
    expect(r.errors!.afterTrim).toBeLessThan(r.errors!.worstCase);
    expect(r.errors!.afterTrim).toBeGreaterThan(0);
  });
});

describe('tolerance spread', () => {
  // First-order propagation: for G = 1 + Rf/Rg, ∂lnG/∂lnRf = −∂lnG/∂lnRg = (G−1)/G; a uniform ±t part has
  // σ = t/√3, so σ_G/G = (G−1)/G · t/√3 · √2 (any metrology text, GUM §5.1.2).
  it('Monte Carlo standard deviation of the scale matches first-order propagation', () => {
    const d = design('generic-sensor', (x) => {
      x.target.trim = { gain: false, zero: false };
      x.target.arrangements = ['single'];
      // A gain single E96 parts land exactly (1 + 20 kΩ/2.87 kΩ), a sensor centred on 0 V on ±15 V and a zero
      // at 0 V: the reference is ground itself, tied with no divider.
      const g = 1 + 20000 / 2870;
      x.sensor = { ...x.sensor, sensitivity: 0.1 / g, quiescent: 0 } as typeof x.sensor;
      x.target.zero = 0;
      x.supply.positive = 15; x.supply.negative = -15; x.target.range = [-5, 5]; x.target.scale = 0.1;
    });
    const r = analyse(d, { spreadTrials: 4000 });
    expect(r.stage!.network.reference.kind).toBe('rail');
    const g = r.stage!.gain;
    const sigma = ((g - 1) / g) * (0.01 / Math.sqrt(3)) * Math.SQRT2 * Math.abs(r.dc!.out[1]);
    expect(r.spread!.scaleStd / sigma).toBeGreaterThan(0.94);
    expect(r.spread!.scaleStd / sigma).toBeLessThan(1.06);
    expect(Math.abs(r.spread!.scaleMean - r.dc!.out[1])).toBeLessThan((4 * sigma) / Math.sqrt(4000));
  });
  it('is repeatable with the same seed', () => {
    const a = analyse(design('generic-sensor'), { spreadTrials: 300 });
    const b = analyse(design('generic-sensor'), { spreadTrials: 300 });
    expect(a.spread!.scaleStd).toBe(b.spread!.scaleStd);
  });
});

describe('battery and instrument', () => {
  it('the bench clamp sweep shows the high-side clip falling as the battery sags, zero held by the regulator', () => {
    const r = analyse(design('bench-clamp'), { spreadTrials: 0 });
    expect(r.battery.length).toBe(9);
    expect(r.battery[0]!.measurandHigh).toBeGreaterThan(r.battery[4]!.measurandHigh);
    expect(Math.abs(r.battery[3]!.zeroShift)).toBeLessThan(1e-6);
    expect(r.supply!.batteryLife).toBeGreaterThan(10);
    // Battery life = capacity / current (565 mAh = 2034 C).
    expect(r.supply!.batteryLife! * r.supply!.current * 3600).toBeCloseTo(2034, 6);
  });
  it('a reference taken from the battery moves the zero as it sags', () => {
    const r = analyse(design('generic-sensor', (x) => { x.supply.battery = { fresh: 9.6, endOfLife: 7, capacity: 2034 }; }), { spreadTrials: 0 });
    expect(Math.abs(r.battery[r.battery.length - 1]!.zeroShift)).toBeGreaterThan(0.1);
    expect(r.warnings.map((w) => w.code)).toContain('battery-zero-shift');
  });
  it('with a 100 Ω output resistor a 50 Ω input sees a third of the scale', () => {
    const r = analyse(design('bench-clamp'), { spreadTrials: 0 });
    expect(r.drive!.scaleAt50 / r.drive!.scaleAt1M).toBeCloseTo(50 / 150, 3);
    expect(r.drive!.probeRatio).toBe(10);
  });
});

describe('every demo reports finite numbers', () => {
  it.each(DEMOS.map((d) => d.id))('%s', (id) => {
    const r = analyse(design(id), { spreadTrials: 200 });
    const j = reportJson(r);
    expect(allFinite(j)).toEqual([]);
    expect(j.parts).not.toEqual([]);
    expect(r.calibration.length).toBeGreaterThan(4);
  });
});

describe('sensor output drive', () => {
  it('an inverting input network that draws more than the sensor can drive is a failure', () => {
    // Inverting: the sensor drives (Vs − Vp)/(Rin + Rs); with a 1 µA drive limit that is exceeded.
    const r = analyse(design('generic-sensor', (x) => { x.target.scale = -0.1; x.sensor.outputDrive = 1e-6; }), { spreadTrials: 0 });
    expect(r.warnings.map((w) => w.code)).toContain('sensor-drive');
  });
  it('a non-inverting stage draws only bias current from the sensor', () => {
    const r = analyse(design('generic-sensor', (x) => { x.sensor.outputDrive = 1e-6; }), { spreadTrials: 0 });
    expect(r.warnings.map((w) => w.code)).not.toContain('sensor-drive');
  });
});

describe('a shunt design reaches the full report', () => {
  it('with parts, limits, calibration and the low-side note', () => {
    const r = analyse(design('generic-sensor', shuntOnSplitSupply), { spreadTrials: 100 });
    expect(r.stage!.parts.length).toBeGreaterThan(1);
    expect(r.clip!.limits.map((l) => l.cause)).toContain('burden');
    expect(r.calibration.some((c) => c.text.startsWith('Span'))).toBe(true);
    expect(r.warnings.map((w) => w.code)).toContain('low-side-only');
    // Scale 0.5 V/A from 10 mV/A: gain 50 (the shunt's 10 mΩ is its own source resistance).
    expect(r.dc!.out[1]).toBeCloseTo(0.5, 3);
  });
});

describe('verdict thresholds (our own: noise p-p within 1 % of the range end passes, error after calibration within 1 %)', () => {
  it('a noisy sensor turns the noise line to caution or fail', () => {
    const quiet = analyse(design('generic-sensor'), { spreadTrials: 0 });
    const noisy = analyse(design('generic-sensor', (x) => { x.sensor.noiseDensity = 20e-6; }), { spreadTrials: 0 });
    const line = (r: typeof quiet) => r.verdicts.find((v) => v.title.startsWith('Noise'))!;
    expect(line(quiet).level).toBe('pass');
    expect(line(noisy).level).not.toBe('pass');
  });
  it('large drift after calibration is flagged', () => {
    const r = analyse(design('generic-sensor', (x) => { x.opamp.offsetDrift = 1e-3; }), { spreadTrials: 0 });
    expect(r.verdicts.find((v) => v.title.startsWith('Error'))!.level).toBe('fail');
  });
});

describe('bias current at the output (Sivakumar, Linear Integrated Circuits, ch. 5 form)', () => {
  // With the + input driven from a stiff source, the − input's bias current flows through the feedback
  // resistance only: output error I_b·R_f (the form of Sivakumar ex. 5.1, where I_os·R_2 = 150 nA × 500 kΩ = 75 mV).
  it('is I_b × R_f, in measurand units divided by the scale', () => {
    const r = analyse(design('generic-sensor', (x) => { x.sensor.sourceResistance = 0; x.opamp.offsetVoltage = 0; x.opamp.biasCurrent = 150e-9; }), { spreadTrials: 0 });
    const net = r.stage!.network;
    const rf = net.feedback!.ohms + net.gainTrim!.ohms * net.gainTrim!.setting;
    const term = r.errors!.terms.find((t) => t.name === 'op-amp bias current')!;
    expect(term.value * Math.abs(r.dc!.out[1]) / (150e-9 * rf)).toBeCloseTo(1, 3);
  });
});

describe('current transformer at mains frequency', () => {
  // A single high-pass corner f_c reads 1/√(1 + (f_c/f)²) of the passband at f (first-order high-pass,
  // any circuits text): a 9.55 Hz corner reads 1.8 % low at 50 Hz.
  it('reports how far below the passband it reads at 50 Hz', () => {
    const r = analyse(design('appliance-ct', (x) => { x.sensor.burden = 100; x.sensor.secondaryTurns = 1000; x.sensor.inductanceFactor = 2e-6; x.sensor.windingResistance = 20; x.target.scale = -0.1; x.target.range = [-5, 5]; x.output = { filter: null, load: { resistance: 1e6, capacitance: 0 } }; }), { spreadTrials: 0 });
    const w = r.warnings.find((x) => x.code === 'ac-low-frequency')!;
    const fc = r.speed!.lowCorner;
    const expected = 1 - 1 / Math.sqrt(1 + (fc / 50) ** 2);
    const shown = Number(/reading is ([\d.]+) %/.exec(w.message)![1]) / 100;
    expect(shown).toBeCloseTo(expected, 3);
    expect(w.level).toBe(expected > 0.01 ? 'caution' : 'info');
  });
});
