/**
 * The public API of the pipeline: the stages (reduce, aggregate, design, monitor, sample, plan,
 * cross-check, and run-all over them), their options and results, and the helpers the command
 * line, the queue and the scripts call. Everything else is internal; the light modules the command
 * line loads at start have their own subpath exports (package.json).
 */
export { type GroupField, GroupingError, parseGroupBy } from './aggregate/grouping.ts';
export {
  type AggregateOptions, type AggregateResult, aggregateRows, type CorrelationResult, type Level,
  runAggregate, type StatsRow,
} from './aggregate/stage.ts';
export { type Catalog, CatalogError, GRADE_KEYS, loadCatalog, parseCatalog, SPEC_KEYS } from './catalog.ts';
export { type CrossCheckResult, type CrossCheckRow, runCrossCheck } from './crosscheck/crosscheck-stage.ts';
export { bandStatement } from './design/band-statement.ts';
export { STRESS_UNITS, type StressUnit } from './design/fe-table.ts';
export { type CurvesStageOptions, type CurvesStageResult, runCurves } from './design/stage.ts';
export type { DesignCurve, DesignOptions } from './design/types.ts';
export { groupSlug, writeCurveFiles } from './exports/curve-files.ts';
export { csvTable } from './exports/export-format.ts';
export {
  type ExportInputs, PROPERTY_CSV_COLUMNS, PROPERTY_NOTES, propertyCsvRows, writeExports,
  type WrittenExports,
} from './exports/write-exports.ts';
export { withheldByFlags } from './flag-rules.ts';
export { AlertStateError, recordAlertAction } from './monitor/alert-state.ts';
export {
  analyzeDrift, type DriftAlert, driftContract, type DriftOptions, type DriftResult, latestDriftAlerts,
  runDrift,
} from './monitor/stage.ts';
export { DEFAULT_PLAN_PROPERTIES, planGroups } from './planning/plan-groups.ts';
export { runPlan, type RunPlanOptions } from './planning/run-plan.ts';
export { applyPopulationRules, leftOutCounts, type Population, type PopulationOptions } from './population.ts';
export {
  contractView, currentCatalog, currentReduceHashes, loadProperties, NUMERIC_PROPERTIES, type PropertyFilter,
  type PropertyKey, type PropertyRow,
} from './properties.ts';
export { type IngestReduction, type IngestReductionOptions, startIngestReduction } from './reduce/at-ingest.ts';
export type { ReduceOverrides } from './reduce/settings.ts';
export { type ReduceStageOptions, type ReduceStageSummary, runReduce, runReduceBatch } from './reduce/stage.ts';
export { channelBuffers, type ReduceTask } from './reduce/task.ts';
export { assembleReport, type ReportInputs } from './report/assemble-report.ts';
export { runAll, type RunAllOptions, type RunAllResult } from './run-all.ts';
export { runStage } from './runs.ts';
export { distributionExport } from './sample/distribution-export.ts';
export { distributionModels } from './sample/distribution-model.ts';
export { sampleGroups } from './sample/property-sets.ts';
export { randomCurvesExport, type RandomCurvesExport, randomCurvesTable } from './sample/random-curves-export.ts';
export { randomCurves } from './sample/random-curves.ts';
export {
  type CurveModelStageOptions, type CurveModelStageResult, DEFAULT_SAMPLE_PROPERTIES,
  type DistributionStageOptions, type DistributionStageResult, runCurveModels, runDistributions,
} from './sample/stage.ts';
