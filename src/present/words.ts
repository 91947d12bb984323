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

