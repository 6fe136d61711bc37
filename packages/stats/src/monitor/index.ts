// Drift monitoring of supplier series: control charts, change points, capability, comparisons.
export type { SeriesPoint, BaselineSpec, MonitorOptions, EwmaParams, CusumParams, ChangePointOptions, MonitorError } from './types.ts';
export { orderSeriesPoints } from './series-order.ts';
export { createMonitorRandom } from './random.ts';
export type { MonitorRandom } from './random.ts';
export { selectBaseline, defaultBaseline, DEFAULT_BASELINE_TESTS } from './baseline.ts';
export { movingRanges, MR_D2, MR_D4 } from './moving-range.ts';
export { summarizeGroup, varianceComponents } from './variance-components.ts';
export type { GroupSummary, VarianceComponents } from './variance-components.ts';
export { chartStructure, DEFAULT_HEAT_EFFECT_ALPHA } from './chart-structure.ts';
export type { ChartStructure } from './chart-structure.ts';
export { chartPoints } from './heat-subgroups.ts';
export type { ChartPointInput } from './heat-subgroups.ts';
export { createSelfStarting, selfStartingScore, selfStartingLimit, limitFactor } from './self-starting.ts';
export type { ChartUnit, Prediction, SelfStarting } from './self-starting.ts';
export { siegmundArl, cusumDecisionInterval, shewhartLimit } from './cusum-design.ts';
export { ewmaChart, ewmaHalfWidth, ewmaRunLength, DEFAULT_EWMA } from './ewma.ts';
export type { EwmaChart, EwmaLimitKind } from './ewma.ts';
export { cusumChart, cusumRunLength, DEFAULT_CUSUM } from './cusum.ts';
export type { CusumChart } from './cusum.ts';
export { peltMeanChange, differenceSigma, changePointPenalty, DEFAULT_MIN_SEGMENT } from './change-points.ts';
export type { PeltOptions, PeltResult } from './change-points.ts';
export { describeChangePoints, locateSingleChange } from './change-point-uncertainty.ts';
export type { ChangePoint, ChangePointUncertaintyOptions } from './change-point-uncertainty.ts';
export { changeDetectionIndices, excludesZero } from './change-point-detection.ts';
export { rollingCapability } from './capability.ts';
export type { CapabilityPoint } from './capability.ts';
export { welchAnova } from './welch-anova.ts';
export type { WelchAnovaResult } from './welch-anova.ts';
export { gamesHowell, studentizedRangeQuantile, MAX_GROUPS_FOR_P } from './games-howell.ts';
export type { GamesHowellPair } from './games-howell.ts';
export { kruskalWallis } from './kruskal-wallis.ts';
export type { KruskalWallisResult } from './kruskal-wallis.ts';
export { holmAdjust, pairwiseDunn } from './pairwise.ts';
export type { PairwiseComparison } from './pairwise.ts';
export { boxSummary } from './box-summary.ts';
export type { BoxSummary } from './box-summary.ts';
export { compareGroups, compareGroupsChecked } from './compare-groups.ts';
export type { GroupComparison } from './compare-groups.ts';
export { flagEpisodes } from './alerts.ts';
export type { Alert } from './alerts.ts';
export {
  monitorSeries,
  DEFAULT_ARL0_TESTS,
  DEFAULT_SHEWHART_ARL0_TESTS,
  DEFAULT_DESIGN_SHIFT_SD,
  DEFAULT_WARMUP,
  DEFAULT_CAPABILITY_WINDOW,
  DEFAULT_CAPABILITY_MIN_TESTS,
  DEFAULT_MAX_FRACTION_BELOW,
} from './monitor-series.ts';
export type { ChartPoint, ChartDesign, SeriesChangePoint, SeriesMonitor } from './monitor-series.ts';
