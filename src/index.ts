/**
 * Gainwright's calculation core: the one public entry. Pure TypeScript, no DOM; SI units throughout.
 * Import `./units-mathjs.js` once as well to read unit expressions beyond the common forms.
 */
export { validateDesign, parseDesignText, serialiseDesign, formatProblems, migrate, DESIGN_FORMAT, DESIGN_VERSION, MAX_DESIGN_BYTES, tooLargeMessage } from './model/design.js';
export type { Design, SensorSpec, SensorType, Supply, OpAmpSpec, Target, Output, Environment, AnalysisOptions, MeasurandWaveform, Topology, TopologyChoice, Arrangement, Problem } from './model/design.js';
export { analyse } from './analysis/report.js';
export { completeReport } from './analysis/complete.js'; // issue 23: the report in two steps, for the app
export type { Report, AnalyseOptions } from './analysis/report.js';
export { reportJson } from './present/json.js';
export { verdictsOf } from './present/verdicts.js';
export type { Verdict } from './present/verdicts.js';
export { SAFETY_CAUTIONS, cautionsFor } from './present/cautions.js';
export { reportWords } from './present/report-words.js';
export { pageText } from './present/inert.js';
export type { ReportWords, WordedFinding } from './present/report-words.js';
export { sayFinding, findingTitle, topologyWhy, stageReasonWords } from './present/finding-words.js';
export type { Finding, FindingCode, FindingLevel } from './model/findings.js';
export { textReport } from './present/text-report.js';
export { spiceNetlist } from './present/spice.js';
export { bomRows, bomCsv, powerRating } from './present/bom.js';
export { calibrationSteps } from './present/calibration.js';
export { allCharts, chartText, waveformChart, traceDrawing, sameChart } from './present/charts.js';
export { sheetStatus, errorBudgetRows, trimmerStarts } from './present/sheet.js';
export { schematic, drawingBounds } from './present/schematic.js';
export { keyFigures, waveformFigures, waveformLine } from './present/figures.js';
export { closedLoopTradeRows } from './present/closed-loop.js';
export { parseQuantity, formatEng, rkmCode, parseRkm, colourBands, toleranceLetter, setUnitEngine, unitEngineReady } from './model/units.js';
export { nearest, neighbours, isMember, usualTolerance, valuesInRange, mantissas, SERIES_NAMES, TRIMMER_VALUES } from './model/eseries.js';
export type { SeriesName } from './model/eseries.js';
export { sensorFront, sensorFrontAtRail, gapFieldPerAmp, gapAreaRatio, gappedCorePerAmp } from './physics/sensors.js';
export { chooseTopology, idealStage, nonInvertingOutput, invertingOutput } from './physics/topology.js';
export { solveStage } from './solve/stage.js';
export { standardTrimmer } from './solve/trimmers.js';
export { armTable, searchPairs, searchPairsExhaustive } from './solve/search.js';
export { thermalNoise, enbwSinglePole, nonInvertingNoise, peakToPeak } from './physics/noise.js';
export { DEMOS, demoDesign } from './model/demos.js';
export { OPAMP_ARCHETYPES, archetype } from './model/opamps.js';
export { BOLTZMANN, ELEMENTARY_CHARGE, MU0 } from './model/constants.js';

// What the app's elements use besides the above (they import the core only through this file).
export type { BomRow } from './present/bom.js';
export type { PairCandidate } from './solve/search.js';
export type { Prim, Schematic } from './present/schematic.js';
export type { ChartData, Series, TraceDrawing, ChartText } from './present/charts.js';
export type { FigureRow } from './present/figures.js';
export { FIELDS, GROUP_DEFAULTS, groupDefault, groupOff, parseField, readField, fieldHint, setPath, displayValue, fieldsFor, getPath, SENSOR_TYPES, fieldForPath, problemWords } from './present/fields.js';
export type { FieldEdit } from './present/fields.js';
export type { FieldDef, Section } from './present/fields.js';
export { AUTOSAVE_KEY, DAMAGED_KEY, HISTORY_KEY, HISTORY_SIZE, autosaveEntry, designFromFragment, fileName, historyText, readHistory, restoreAutosave, shareFragment, withHistory } from './model/persist.js';
export type { HistoryEntry, RestoreResult } from './model/persist.js';
export { decodeDesignBytes } from './model/design.js';
export { sensorTemplate } from './model/templates.js';
export { parseReadings, readingsCsv, unitFactor, MAX_READINGS } from './model/readings.js';
export type { Reading, ParsedReadings } from './model/readings.js';
export { fitReadings, fitJson, leastSquares } from './analysis/fit.js';
export type { ReadingsFit, LineFit } from './analysis/fit.js';
export { trimFromReadings, trimJson } from './analysis/trim.js';
export type { TrimResult } from './analysis/trim.js';
export type { SensorFromReadings } from './analysis/sensor-readings.js';
export { fitLines, sensorReadingsLines, trimLines, residualChart, probeSheetRows } from './present/readings.js';

// Issue 19: the turns / gap (or turns / burden) trade.
export { tradeSweep, adoptTradePoint } from './analysis/trade.js';
export type { TradeResult, TradePoint, HallTradePoint, CtTradePoint } from './analysis/trade.js';
export { tradeCharts, tradeTable, tradeLines, tradeNotes, tradeSweeps, sweepPoints, tradeJson } from './present/trade.js';
export { gappedCoreInductance, ctSaturationCurrent, coreCrossSection } from './physics/magnetics.js';
// Issue 19: the range switch.
export { rangeTable, rangeLines, rangesJson, positionNetlist } from './present/ranges.js';
export type { RangeTable } from './present/ranges.js';
export type { RangeSwitch, RangePosition } from './analysis/ranges.js';
// Op-amps side by side and supply choices (issue 18).
export { candidates, withOpAmp } from './analysis/compare.js';
export type { ComparisonRow, Misfit, OpAmpCandidate, RowFigures } from './analysis/compare.js';
export { optionDesign, withSupply } from './analysis/supply-options.js';
export type { SupplyKind, SupplyOption } from './analysis/supply-options.js';
export { OPAMP_LIST_KEY, MAX_OPAMPS, MAX_OPAMP_LIST_BYTES, parseOpAmpListText, serialiseOpAmpList } from './model/opamp-list.js';
export { LIMIT_WORDS, SOURCE_WORDS, SUPPLY_WORDS, comparisonRows, hoursText, misfitWords, railsText, rangeText, supplyChoices, worstVerdict } from './present/comparison.js';
export { KIT_SHAPES, kitListText, parseKitList } from './model/kit.js';
export { KIT_SHELF_KEY, MAX_KIT_FILE_BYTES, MAX_SHELF_KITS, parseKitFileText, parseKitShelf, serialiseKitFile, serialiseKitShelf, shelveKit } from './model/kit-file.js';
export type { NamedKit } from './model/kit-file.js';
export type { ResistorKit } from './model/design.js';
