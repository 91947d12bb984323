/**
 * The parts of the core that the app loads on demand, as their own chunk (issue 23): the op-amp comparison and
 * supply choices (each a full report per row), the person's op-amp list file, and the exporters (SPICE netlists,
 * the parts list as CSV). Nothing the verdict or the transfer plot needs is here.
 *
 * The app reaches this file only through `import()` (components/on-demand.ts); test/architecture.test.ts checks
 * that no static import from the app's entry leads here. The CLI and the tests use src/index.ts, which exports
 * all of this as well.
 */
export { comparisonRows, supplyChoices, SUPPLY_WORDS } from './present/comparison.js';
export { optionDesign } from './analysis/supply-options.js';
export { parseOpAmpListText, serialiseOpAmpList } from './model/opamp-list.js';
export { spiceNetlist } from './present/spice.js';
export { positionNetlist } from './present/ranges.js';
export { bomCsv } from './present/bom.js';
