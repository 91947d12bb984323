/**
 * Words for the parts of a stage: the role names, the value as a person reads it, the IEC 60062 code. The
 * core's parts carry numbers and codes only (src/circuit/network.ts); this is the one place that writes them.
 */
import type { Part, PartRole } from '../circuit/network.js';
import { significantFigures } from '../model/eseries.js';
import { formatEng, rkmCode } from '../model/units.js';

/** Plain name of each part's place in the stage. */
export const ROLE_NAMES: Record<PartRole, string> = {
  feedback: 'feedback',
  'ground-leg': 'ground leg',
  input: 'input',
  'plus-input': '+ input from the sensor',
  offset: 'offset from the reference',
  'reference-top': 'reference top',
  'reference-bottom': 'reference bottom',
  'gain-trim': 'span trimmer',
  'zero-trim': 'zero trimmer',
  'output-series': 'output series / isolation',
  'output-capacitor': 'output filter capacitor',
  burden: 'burden across the current transformer secondary (keep it fitted)',
};

/** Significant figures a part's value is written with: its series' (IEC 60063), two for trimmers and capacitors. */
function figuresOf(p: Part): number {
  return p.series === 'trimmer' || p.series === 'capacitor' ? 2 : significantFigures(p.series);
}

/** The part's value as written on a parts list: `4.7 kΩ`, `10 kΩ trimmer`, `10 nF`. */
export function partValue(p: Part): string {
  if (p.kind === 'capacitor') return formatEng(p.farads ?? 0, 'F', 2);
  const v = formatEng(p.ohms, 'Ω', figuresOf(p));
  return p.kind === 'trimmer' ? `${v} trimmer` : v;
}

/** IEC 60062 letter-and-digit code of a resistor or trimmer (`4K7`), empty for a capacitor. */
export function partCode(p: Part): string {
  return p.kind === 'capacitor' ? '' : rkmCode(p.ohms, figuresOf(p));
}

/** How two parts of an arm are joined in writing: `4.7 kΩ ∥ 10 kΩ` (parallel) or `4.7 kΩ + 100 Ω` (series). */
export function armJoint(arrangement: Part['arrangement']): string {
  return arrangement === 'parallel' ? ' ∥ ' : ' + ';
}

/** The role in words, with how the part joins its pair when its arm has two: `feedback (in series with its pair)`. */
export function partRole(p: Part): string {
  const join = p.arrangement === 'series' ? ' (in series with its pair)' : p.arrangement === 'parallel' ? ' (in parallel with its pair)' : '';
  return ROLE_NAMES[p.role] + join;
}
