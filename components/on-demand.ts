/**
 * What the app loads on demand (issue 23): the panels added around the verdict and the parts of the core only
 * they need. Each `import()` here is a chunk of its own, fetched when a panel is opened, when the design needs
 * it, or once the first render has painted; the verdict and the transfer plot never wait for them.
 * A tag rendered before its module arrives is an empty element until it is defined; Lit keeps the properties
 * set on it meanwhile and applies them when it upgrades.
 */

/** The core's on-demand part: comparisons, supply choices, the op-amp list file, the exporters. */
export type OnDemandCore = typeof import('../src/on-demand.js');

let core: Promise<OnDemandCore> | null = null;
/** Loads the core's on-demand part once; later calls get the same promise. */
export const onDemandCore = (): Promise<OnDemandCore> =>
  (core ??= import('../src/on-demand.js').catch((e: unknown) => { core = null; throw e; }));

/** Each panel element's module, by tag. */
const PANELS = {
  'gw-opamp-compare': () => import('./gw-opamp-compare.js'),
  'gw-supply-options': () => import('./gw-supply-options.js'),
  'gw-kit-editor': () => import('./gw-kit-editor.js'),
  'gw-ranges': () => import('./gw-ranges.js'),
  'gw-trade': () => import('./gw-trade.js'),
  'gw-bench': () => import('./gw-bench.js'),
  'gw-trace': () => import('./gw-trace.js'),
  'gw-build-sheet': () => import('./gw-build-sheet.js'),
} as const;

/** A panel loaded on demand. */
export type PanelTag = keyof typeof PANELS;

const loading = new Map<PanelTag, Promise<unknown>>();

/** Loads a panel's module once (its tag is defined when the promise settles). */
export function loadPanel(tag: PanelTag): Promise<unknown> {
  let p = loading.get(tag);
  if (!p) {
    // A failed fetch (the server gone for a moment) is forgotten, so that the next need tries again.
    p = PANELS[tag]().catch((e: unknown) => { loading.delete(tag); throw e; });
    loading.set(tag, p);
  }
  return p;
}

/** The panels every page shows (collapsed or not), loaded once the first render has painted. */
export const PANELS_AFTER_FIRST_RENDER: readonly PanelTag[] = ['gw-kit-editor', 'gw-opamp-compare', 'gw-supply-options', 'gw-bench', 'gw-trace', 'gw-build-sheet'];
