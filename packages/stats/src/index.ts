// Population statistics. Characteristic values, fits and correlation live at this level;
// control charts, change points and supplier comparison under ./monitor.
export * from './monitor/index.ts';
export { normalQuantile, normalCdf, normalPdf } from './special/normal.ts';
export { studentTQuantile, studentTCdf } from './special/student-t.ts';
export { noncentralTCdf, noncentralTSf, noncentralTQuantile } from './special/noncentral-t.ts';
export { normalToleranceFactor } from './tolerance-factor.ts';
export { en1990Kn } from './en1990-fractile.ts';
export { orderStatisticMinN, orderStatisticConfidence, orderStatisticRank } from './order-statistic-bound.ts';
export { percentile } from './percentile.ts';
export { normalLogCdf } from './special/normal.ts';
export type { FitResult, ModelName } from './fit-types.ts';
export { fitNormal, fitLognormal } from './fit-normal.ts';
export { fitWeibull } from './fit-weibull.ts';
export { andersonDarlingStatistic, andersonDarlingPNormal, andersonDarlingPWeibull, WEIBULL_AD_TABLE } from './anderson-darling.ts';
export { normalLowerToleranceLimit, lognormalLowerToleranceLimit, weibullLowerToleranceLimit, SEV_INVERSE_INFORMATION } from './tolerance-limit.ts';
export {
  summarizeProperty,
  modelCdf,
  DEFAULT_LEVELS,
  DEFAULT_PRIOR_V,
  BEST_FIT_RULE,
  MIN_N_FIT,
  MIN_N_AD_P,
  MIN_N_TOLERANCE,
  MIN_N_WEIBULL_TOLERANCE,
  MIN_N_EN1990_KNOWN,
  MIN_N_EN1990_UNKNOWN,
} from './summarize-property.ts';
export type {
  CharacteristicMethod,
  CharacteristicValue,
  SummaryLevel,
  SummaryOptions,
  Compliance,
  FitSummary,
  PropertySummary,
} from './summarize-property.ts';
export { correlationMatrices, MIN_N_CORRELATION } from './correlation.ts';
export type { CorrelationMatrices } from './correlation.ts';
export { isotonicNonDecreasing } from './isotonic.ts';
export { sampleCorrelated } from './sample-correlated.ts';
export type { CorrelatedSample, SampleError } from './sample-correlated.ts';
