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

/** The core's barrels: the public entry, and the part the app loads on demand (issue 23). Both sit above every layer. */
const BARRELS = ['src/index.ts', 'src/on-demand.ts'];

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
    const stray = files.filter((f) => !BARRELS.includes(f) && layerOf(f) < 0);
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
        if (target.startsWith('src/') && !BARRELS.includes(target) && target !== 'src/model/units-mathjs.ts') deep.push(`${f} -> ${target}`);
      }
    }
    expect(deep).toEqual([]);
  });
});

// Issue 23: what the first chunk holds is decided by the static imports from the app's entry. Whatever the app
// loads on demand (the on-demand barrel, the unit engine, Chart.js, the panels around the verdict) must be
// reached only through import(), or the bundler puts it back into the first chunk. The core behind the barrel
// is kept by name (the bundler drops what no one imports), so the names the first chunk's elements import
// from the barrel are checked against those of the on-demand barrel.
/** Static (non-type) imports of a file: [target, names], relative targets resolved to repository paths. */
export function staticImportsOf(file: string): Array<[string, string[]]> {
  const text = readFileSync(file, 'utf8');
  const out: Array<[string, string[]]> = [];
  for (const m of text.matchAll(/^\s*import\s+(?!type\b)(?:([^'";]*?)\sfrom\s*)?['"]([^'"]+)['"]/gm)) {
    const spec = m[2]!;
    const names = [...(m[1] ?? '').matchAll(/(?:^|[{,])\s*(?!type\s)([A-Za-z_$][\w$]*)/g)].map((n) => n[1]!);
    out.push([spec.startsWith('.') ? relative(ROOT, resolve(dirname(file), spec)).replace(/\.js$/, '.ts') : spec, names]);
  }
  return out;
}

/** Files and packages the app's elements reach by static imports from `entry`, and the names they take from the barrel. */
function staticClosure(entry: string): { reached: Set<string>; fromBarrel: Set<string> } {
  const reached = new Set<string>();
  const fromBarrel = new Set<string>();
  const todo = [entry];
  while (todo.length) {
    const f = todo.pop()!;
    if (reached.has(f)) continue;
    reached.add(f);
    if (!f.startsWith('components/') || !f.endsWith('.ts')) continue;
    for (const [t, names] of staticImportsOf(join(ROOT, f))) {
      if (t === 'src/index.ts') names.forEach((n) => fromBarrel.add(n));
      todo.push(t);
    }
  }
  return { reached, fromBarrel };
}

/** Names a barrel exports (`export { a, b as c } from …`). */
function exportedNames(file: string): string[] {
  const text = readFileSync(join(ROOT, file), 'utf8');
  return [...text.matchAll(/^export\s+\{([^}]*)\}\s+from/gm)].flatMap((m) => m[1]!.split(',').map((x) => x.trim().split(/\s+as\s+/).pop()!).filter(Boolean));
}

describe('the first chunk (issue 23)', () => {
  const { reached, fromBarrel } = staticClosure('components/main.ts');
  const onDemand = ['src/on-demand.ts', 'src/model/units-mathjs.ts', 'chart.js', 'mathjs', 'components/gw-opamp-compare.ts', 'components/gw-supply-options.ts',
    'components/gw-kit-editor.ts', 'components/gw-ranges.ts', 'components/gw-trade.ts', 'components/gw-bench.ts', 'components/gw-readings.ts',
    'components/gw-trace.ts', 'components/gw-build-sheet.ts'];
  it('nothing loaded on demand is reached by a static import from components/main.ts', () => {
    expect(onDemand.filter((f) => reached.has(f))).toEqual([]);
  });
  it('the first chunk\'s elements take nothing from the core\'s barrel that the on-demand barrel holds', () => {
    const later = exportedNames('src/on-demand.ts');
    expect(later).toContain('comparisonRows');
    expect(later.filter((n) => fromBarrel.has(n))).toEqual([]);
  });
  it('the walk sees the app, the verdict, the chart element, the barrel and Lit, and the names taken (a guard on the guard)', () => {
    for (const f of ['components/gw-app.ts', 'components/gw-verdicts.ts', 'components/gw-chart.ts', 'components/chart-controller.ts', 'src/index.ts', 'lit']) expect(reached.has(f), f).toBe(true);
    for (const n of ['analyse', 'completeReport', 'reportWords', 'allCharts', 'sameChart']) expect(fromBarrel.has(n), n).toBe(true);
    expect(staticImportsOf(join(ROOT, 'components/main.ts')).map(([t]) => t)).toEqual(['components/page.css', 'components/gw-app.ts']);
  });
});
