/** Shared test helpers: demo designs (scenarios of our own) with a patch applied, validated. */
import { validateDesign, type Design } from '../src/model/design.js';
import { DEMOS } from '../src/model/demos.js';

/** The demo `id` with `patch` applied to a copy of its document, validated (throws on a broken patch). */
export function designFrom(id: string, patch: (d: any) => void = () => {}): Design {
  const doc = structuredClone(DEMOS.find((d) => d.id === id)!.document) as any;
  patch(doc);
  const v = validateDesign(doc);
  if (!v.ok) throw new Error(`${id}: ${JSON.stringify(v.problems)}`);
  return v.design;
}

/** Paths of every non-finite number inside a JSON-like value. */
export function nonFinitePaths(x: unknown, path = ''): string[] {
  if (typeof x === 'number') return Number.isFinite(x) ? [] : [path];
  if (Array.isArray(x)) return x.flatMap((v, i) => nonFinitePaths(v, `${path}[${i}]`));
  if (x && typeof x === 'object') return Object.entries(x).flatMap(([k, v]) => nonFinitePaths(v, `${path}.${k}`));
  return [];
}

/** Our own shunt scenario: a 10 mΩ low-side shunt, ±5 V rails, a rail-to-rail op-amp, 0.5 V/A around 0 V. */
export const shuntOnSplitSupply = (x: any): void => {
  x.sensor = { type: 'shunt', measurand: 'A', resistance: 0.01, powerRating: 1 };
  x.supply = { positive: 5, negative: -5 };
  x.opamp.inputLow = -0.1; x.opamp.inputHigh = -0.1; x.opamp.outputLow = 0.05; x.opamp.outputHigh = 0.05;
  x.target = { ...x.target, scale: 0.5, zero: 0, range: [-5, 5] };
};
