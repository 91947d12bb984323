/**
 * Gainwright's calculation core: the one public entry. Pure TypeScript, no DOM; SI units throughout.
 * Import `./units-mathjs.js` once as well to read unit expressions beyond the common forms.
 */
export { validateDesign, parseDesignText, serialiseDesign, formatProblems, migrate, DESIGN_FORMAT, DESIGN_VERSION, MAX_DESIGN_BYTES } from './design.js';
export type { Design, SensorSpec, SensorType, Supply, OpAmpSpec, Target, Output, Environment, AnalysisOptions, Topology, TopologyChoice, Arrangement, Problem } from './design.js';
export { analyse, reportJson, verdictsOf, SAFETY_CAUTIONS } from './report.js';
export type { Report, Verdict, AnalyseOptions } from './report.js';
export { textReport } from './text-report.js';
export { spiceNetlist } from './spice.js';
export { bomRows, bomCsv, powerRating } from './bom.js';
export { calibrationSteps } from './calibration.js';
export { allCharts } from './charts.js';
export { schematic } from './schematic.js';
export { keyFigures } from './figures.js';
export { parseQuantity, formatEng, rkmCode, parseRkm, colourBands, toleranceLetter, setUnitEngine, unitEngineReady } from './units.js';
export { nearest, neighbours, isMember, usualTolerance, valuesInRange, mantissas, SERIES_NAMES, TRIMMER_VALUES } from './eseries.js';
export type { SeriesName } from './eseries.js';
export { sensorFront, sensorFrontAtRail, gapFieldPerAmp } from './sensors.js';
export { chooseTopology, idealStage, nonInvertingOutput, invertingOutput } from './topology.js';
export { solveStage, standardTrimmer } from './solver.js';
export { armTable, searchPairs, searchPairsExhaustive } from './search.js';
export { thermalNoise, enbwSinglePole, nonInvertingNoise, peakToPeak } from './noise.js';
export { DEMOS, demoDesign } from './demos.js';
export { OPAMP_ARCHETYPES, archetype } from './opamps.js';
export { BOLTZMANN, ELEMENTARY_CHARGE, MU0 } from './constants.js';
