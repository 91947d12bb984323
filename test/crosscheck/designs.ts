/** Designs for the simulator cross-check: scenarios of our own invention, patched from the demos. */
import { validateDesign, type Design } from '../../src/model/design.js';
import { DEMOS } from '../../src/model/demos.js';
import { OPAMP_ARCHETYPES } from '../../src/model/opamps.js';

const arche = (id: string) => ({ ...OPAMP_ARCHETYPES.find((a) => a.id === id)!.spec });

function from(id: string, patch: (d: any) => void = () => {}): Design {
  const doc = structuredClone(DEMOS.find((d) => d.id === id)!.document) as any;
  patch(doc);
  const v = validateDesign(doc);
  if (!v.ok) throw new Error(`${id}: ${JSON.stringify(v.problems)}`);
  return v.design;
}

export const CROSSCHECK_DESIGNS: Array<[string, Design]> = [
  ['voltage sensor, non-inverting, divider with trimmers', from('generic-sensor')],
  ['voltage sensor, divider without trimmer', from('generic-sensor', (d) => { d.target.trim = { gain: false, zero: false }; })],
  ['voltage sensor, inverting', from('generic-sensor', (d) => { d.target.scale = -0.1; })],
  ['Hall clamp, regulated reference, output resistor', from('bench-clamp')],
  ['Hall clamp, 3 turns, RC output filter', from('bench-clamp', (d) => { d.sensor.turns = 3; d.target.zero = 2.5; d.target.range = [-10, 10]; d.output.filter = { resistance: 1000, capacitance: 10e-9 }; })],
  ['current transformer, inverting, RC filter', from('appliance-ct')],
  ['shunt, split supply, reference tied to ground', from('generic-sensor', (d) => {
    d.sensor = { type: 'shunt', measurand: 'A', resistance: 0.01, powerRating: 1 };
    d.supply = { positive: 5, negative: -5 }; d.opamp = arche('cmos-rail-to-rail');
    d.target = { ...d.target, scale: 0.5, zero: 0, range: [-5, 5], trim: { gain: false, zero: false } };
  })],
  ['shunt, split supply, zero trim between the rails', from('generic-sensor', (d) => {
    d.sensor = { type: 'shunt', measurand: 'A', resistance: 0.01, powerRating: 1 };
    d.supply = { positive: 5, negative: -5 }; d.opamp = arche('cmos-rail-to-rail');
    d.target = { ...d.target, scale: 0.5, zero: 0.5, range: [-5, 5] };
  })],
  ['voltage sensor, split supply, inverting, RC filter into 10 kΩ', from('generic-sensor', (d) => {
    d.supply = { positive: 12, negative: -12 }; d.sensor.quiescent = 0; d.sensor.outputMin = -10; d.sensor.outputMax = 10;
    d.opamp.inputLow = 1.5; d.opamp.outputLow = 1.5;
    d.target = { ...d.target, scale: -0.2, zero: 0, range: [-40, 40] };
    d.output = { filter: { resistance: 470, capacitance: 1e-9 }, load: { resistance: 10e3, capacitance: 100e-12 } };
  })],
  ['Hall sensor, fast CMOS at 5 V, capacitive load', from('bench-clamp', (d) => {
    d.opamp = arche('fast-cmos'); d.supply = { positive: 5, negative: 0, sensorRail: 'positive', referenceRail: 'positive' };
    d.target = { ...d.target, scale: 0.05, zero: 2.5, range: [-20, 20], bandwidth: 0 };
    d.output = { filter: { resistance: 47, capacitance: 0 }, load: { resistance: 10e3, capacitance: 100e-12 } };
  })],
  ['voltage sensor, low-noise op-amp, gain 40, split supply', from('generic-sensor', (d) => {
    d.opamp = arche('low-noise-bipolar'); d.supply = { positive: 15, negative: -15 }; d.sensor.quiescent = 0; d.sensor.outputMin = -10; d.sensor.outputMax = 10;
    d.target = { ...d.target, scale: 0.5, zero: 0, range: [-20, 20] };
  })],
  ['current transformer, non-inverting, split supply', from('appliance-ct', (d) => {
    d.supply = { positive: 5, negative: -5 };
    d.target = { ...d.target, scale: 0.2, zero: 0, topology: 'non-inverting', trim: { gain: false, zero: false } };
    d.output = { filter: null, load: { resistance: 1e6, capacitance: 15e-12 } };
  })],
  // The stages that sum an offset through their own resistor, and the difference stage (two designs each).
  ['summing non-inverting: low-side shunt on 5 V, zero 0.5 V above ground, trims', from('generic-sensor', (d) => {
    d.sensor = { type: 'shunt', measurand: 'A', resistance: 0.01, powerRating: 5 };
    d.supply = { positive: 5, negative: 0 }; d.opamp = arche('cmos-rail-to-rail');
    d.target = { ...d.target, scale: 0.2, zero: 0.5, range: [-2, 20] };
  })],
  ['summing non-inverting: attenuating a 12.5 mV/A sensor to 5 mV/A, no trims', from('generic-sensor', (d) => {
    d.target = { ...d.target, scale: 0.005, zero: 2.5, trim: { gain: false, zero: false } };
  })],
  ['summing inverting: ±5 V, zero −2 V for a positive sensor swing', from('generic-sensor', (d) => {
    d.supply = { positive: 5, negative: -5 }; d.opamp = arche('cmos-rail-to-rail');
    d.target = { ...d.target, scale: -0.1, zero: -2, range: [-10, 10], topology: 'summing-inverting' };
  })],
  ['summing inverting: ±12 V, no trims, RC output filter', from('generic-sensor', (d) => {
    d.supply = { positive: 12, negative: -12 };
    d.target = { ...d.target, scale: -0.2, zero: -3, range: [-20, 20], topology: 'summing-inverting', trim: { gain: false, zero: false } };
    d.output = { filter: { resistance: 470, capacitance: 1e-9 }, load: { resistance: 1e6, capacitance: 15e-12 } };
  })],
  ['difference: bridge with a 2.5 V common mode on 9 V', from('generic-sensor', (d) => {
    d.sensor.commonMode = 2.5; d.sensor.quiescent = 0; d.sensor.sourceResistance = 1000; d.sensor.outputMin = -5; d.sensor.outputMax = 5;
    d.target = { ...d.target, scale: 0.1, zero: 4.5, range: [-20, 20] };
  })],
  ['difference: high-side shunt at 12 V on 15 V, negative scale, no trims', from('generic-sensor', (d) => {
    d.sensor = { type: 'shunt', measurand: 'A', resistance: 0.01, powerRating: 5, commonMode: 12 };
    d.supply = { positive: 15, negative: 0 };
    d.target = { ...d.target, scale: -0.1, zero: 12, range: [0, 10], topology: 'difference', trim: { gain: false, zero: false } };
  })],
  // --- closed-loop Hall sensor (issue #20): the whole loop is in the stage's netlist ---
  ...CLOSED_LOOP_DESIGNS(),
];

/** Closed-loop Hall sensors of our own invention: the demo on ±5 V, and a 9 V battery clamp with the op-amp driving the winding alone. */
export function CLOSED_LOOP_DESIGNS(): Array<[string, Design]> {
  return [
    ['closed-loop Hall, ±5 V, push-pull driver (demo)', from('closed-loop-clamp')],
    ['closed-loop Hall, 9 V battery, op-amp driver, reference at mid-rail', from('closed-loop-clamp', (d) => {
      d.supply = { positive: 9, negative: 0, battery: { fresh: 9.6, endOfLife: 7.2, capacity: 565e-3 * 3600 } };
      delete d.sensor.reference;
      d.sensor.compensationTurns = 1500; d.sensor.measurementResistance = 150; d.sensor.wire = { diameter: 0.2e-3, turnLength: 0.036 };
      d.sensor.driver = { outputStage: 'op-amp', gbw: 3e6, openLoopGainDb: 110, swing: 1, drop: 0, currentLimit: 0.03, quiescentCurrent: 1e-3, outputResistance: 20 };
      d.sensor.compensation = { inputResistance: 10e3, capacitance: 330e-12, zeroResistance: 2.4e6 };
      d.target = { ...d.target, scale: 0.1, zero: 4.5, range: [-20, 20] };
    })],
  ];
}
