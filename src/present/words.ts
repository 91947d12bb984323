/**
 * The words Gainwright uses for its codes, in one place (docs/vocabulary.md lists them). The core returns
 * codes; this module names them for the page, the printed sheet and the text report.
 */
import type { Topology } from '../model/design.js';

/** Each stage's name as a person reads it. */
export const STAGE_NAMES: Record<Topology, string> = {
  'non-inverting': 'non-inverting',
  inverting: 'inverting',
  'summing-non-inverting': 'summing non-inverting',
  'summing-inverting': 'summing inverting',
  difference: 'difference',
};

/** One line on what each stage is, for the stage choice. */
export const STAGE_HINTS: Record<Topology, string> = {
  'non-inverting': 'keeps the sign; reference at the foot of the ground leg',
  inverting: 'flips the sign; reference at the + input',
  'summing-non-inverting': 'keeps the sign, can attenuate; offset summed at the + input',
  'summing-inverting': 'flips the sign; offset summed at the − input',
  difference: 'either sign; reads a differential sensor or a high-side shunt',
};
