/**
 * The core's layers (docs/architecture.md): a folder of src/ is a layer, and a file may import only from its
 * own layer or lower ones. The order, bottom first: model (file format, units, E-series, archetypes), physics
 * (sensor and stage closed forms, noise densities), circuit (MNA, netlist build), solve (the resistor solver),
 * analysis (figures from the circuit), present (words and formats), cli (the Node adapter). src/index.ts, the
 * barrel, sits above them all. Components (the Lit elements) may import the core only through the barrel.
 *
 * Read as text: every static `from '…'` and dynamic `import('…')` with a relative path.
 */
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';

const ROOT = resolve(__dirname, '..');
const LAYERS = ['model', 'physics', 'circuit', 'solve', 'analysis', 'present', 'cli'] as const;
/** Upward imports still being taken apart: none are left, and the list may only stay empty. */
const KNOWN_UPWARD = new Set<string>([]);

function filesUnder(dir: string): string[] {
  const out: string[] = [];
  for (const f of readdirSync(dir)) {
    const p = join(dir, f);
    if (statSync(p).isDirectory()) out.push(...filesUnder(p));
    else if (f.endsWith('.ts')) out.push(p);
  }
  return out;
}

/** Relative imports of a file, resolved to repository paths (`src/model/design.ts`). */
export function importsOf(file: string): string[] {
  const text = readFileSync(file, 'utf8');
  const out: string[] = [];
  for (const m of text.matchAll(/(?:from\s+|import\s*\(\s*)['"](\.{1,2}\/[^'"]+)['"]/g)) {
    out.push(relative(ROOT, resolve(dirname(file), m[1]!)).replace(/\.js$/, '.ts'));
  }
  return out;
}

/** The layer index of a path under src/ (the barrel is above every layer), or -1 outside src/. */
function layerOf(path: string): number {
  const parts = path.split('/');
  if (parts[0] !== 'src') return -1;
  if (parts.length === 2) return LAYERS.length; // src/index.ts
  return LAYERS.indexOf(parts[1] as (typeof LAYERS)[number]);
}

describe('layering of src/', () => {
  const files = filesUnder(join(ROOT, 'src')).map((f) => relative(ROOT, f));

  it('every file of src/ (but the barrel) lives in a known layer folder', () => {
    const stray = files.filter((f) => f !== 'src/index.ts' && layerOf(f) < 0);
    expect(stray).toEqual([]);
  });

  it('no file imports from a higher layer', () => {
    const upward: string[] = [];
    for (const f of files) {
      for (const target of importsOf(join(ROOT, f))) {
        const edge = `${f} -> ${target}`;
        if (layerOf(target) > layerOf(f) && !KNOWN_UPWARD.has(edge)) upward.push(edge);
      }
    }
    expect(upward).toEqual([]);
  });

  it('the check sees an upward import when there is one', () => {
    // Guards the guard: a path from a lower layer to a higher one must be classified as upward.
    expect(layerOf('src/present/bom.ts')).toBeGreaterThan(layerOf('src/model/design.ts'));
    expect(layerOf('src/index.ts')).toBeGreaterThan(layerOf('src/cli/cli.ts'));
    expect(importsOf(join(ROOT, 'src/index.ts')).length).toBeGreaterThan(5);
  });
});

describe('components use the core through its barrel', () => {
  const files = filesUnder(join(ROOT, 'components')).map((f) => relative(ROOT, f));
  it('no component imports a core file other than src/index.ts', () => {
    const deep: string[] = [];
    for (const f of files) {
      for (const target of importsOf(join(ROOT, f))) {
        // The unit engine is loaded lazily as its own chunk after first render, so it is imported by path.
        if (target.startsWith('src/') && target !== 'src/index.ts' && target !== 'src/model/units-mathjs.ts') deep.push(`${f} -> ${target}`);
      }
    }
    expect(deep).toEqual([]);
  });
});
