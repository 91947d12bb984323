/** Shared test helpers: demo designs (scenarios of our own) with a patch applied, validated. */
import { validateDesign, type Design } from '../src/design.js';
import { DEMOS } from '../src/demos.js';

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
