// Population statistics. Characteristic values, fits and correlation live at this level;
// control charts, change points and supplier comparison under ./monitor.
export * from './monitor/index.ts';
export { normalQuantile, normalCdf, normalPdf } from './special/normal.ts';
export { studentTQuantile, studentTCdf } from './special/student-t.ts';
export { pairedDifferences, type PairedDifferences } from './paired-differences.ts';
export { noncentralTCdf, noncentralTSf, noncentralTQuantile } from './special/noncentral-t.ts';
export { normalToleranceFactor } from './tolerance-factor.ts';
export { en1990Kn } from './en1990-fractile.ts';
export { orderStatisticMinN, orderStatisticConfidence, orderStatisticRank } from './order-statistic-bound.ts';
export { percentile } from './percentile.ts';
export { normalLogCdf } from './special/normal.ts';
export type { FitResult, ModelName } from './fit-types.ts';
export { fitNormal, fitLognormal } from './fit-normal.ts';
export { fitWeibull } from './fit-weibull.ts';
export { weibullMleFromLogs } from './weibull-mle.ts';
export { andersonDarlingStatistic, andersonDarlingPNormal, andersonDarlingPWeibull, WEIBULL_AD_TABLE } from './anderson-darling.ts';
export { normalLowerToleranceLimit, lognormalLowerToleranceLimit, weibullLowerToleranceLimit } from './tolerance-limit.ts';
export { SEV_INVERSE_INFORMATION } from './sev-information.ts';
export { simulateWeibullPivots, pivotSeed } from './weibull-pivot.ts';
export type { WeibullPivots } from './weibull-pivot.ts';
export { weibullToleranceFactor, pivotFactor, WEIBULL_TABLE_SAMPLES, ON_DEMAND_SAMPLES } from './weibull-tolerance-factor.ts';
export type { WeibullFactor } from './weibull-tolerance-factor.ts';
export { WEIBULL_FACTOR_TABLE } from './weibull-factor-table.ts';
export { summarizeProperty } from './summarize-property.ts';
export { DEFAULT_LEVELS, HEADLINE_LEVEL } from './default-levels.ts';
export type { SummaryOptions, FitSummary, PropertySummary } from './summarize-property.ts';
export {
  MIN_N_FIT,
  MIN_N_AD_P,
  MIN_N_TOLERANCE,
  MIN_N_WEIBULL_TOLERANCE,
  MIN_N_EN1990_KNOWN,
  MIN_N_EN1990_UNKNOWN,
} from './characteristic-types.ts';
export type { CharacteristicMethod, CharacteristicValue, SummaryLevel, Sample, HeadlineModel } from './characteristic-types.ts';
export { describeSample } from './describe-sample.ts';
export { bestFitByAic, BEST_FIT_RULE } from './best-fit.ts';
export { modelCdf } from './model-cdf.ts';
export { isRejected, REJECTION_LEVEL } from './model-rejection.ts';
export { en1990VKnown, priorVUpperBound, DEFAULT_PRIOR_V_CHECK_LEVEL } from './en1990-v-known.ts';
export { en1990VUnknown } from './en1990-v-unknown.ts';
export { normalCharacteristic } from './characteristic-normal.ts';
export { lognormalCharacteristic } from './characteristic-lognormal.ts';
export { weibullCharacteristic } from './characteristic-weibull.ts';
export { orderStatisticCharacteristic } from './characteristic-order-statistic.ts';
export { chooseHeadline, headlineRuleText } from './headline-rule.ts';
export type { HeadlineBasis, HeadlineChoice } from './headline-rule.ts';
export { complianceOf } from './compliance.ts';
export type { Compliance } from './compliance.ts';
export { correlationMatrices, MIN_N_CORRELATION } from './correlation.ts';
export type { CorrelationMatrices } from './correlation.ts';
export { isotonicNonDecreasing } from './isotonic.ts';
export { sampleCorrelated } from './sample-correlated.ts';
export type { CorrelatedSample, SampleError } from './sample-correlated.ts';
export { nearestCorrelation } from './nearest-correlation.ts';
export type { NearestCorrelation, NearestCorrelationOptions } from './nearest-correlation.ts';
export type { CopulaRepair } from './sample-correlated.ts';
export type { WeibullFactorTable } from './weibull-tolerance-factor.ts';
export { modelQuantileOfScore } from './model-quantile.ts';
export { normalStream, uniformStream, streamSeed } from './seeded-generators.ts';
export { mleCovariance } from './mle-covariance.ts';
export type { ParameterCovariance } from './mle-covariance.ts';
export { normalScoreCorrelation } from './normal-score-correlation.ts';
export { bootstrapModel, bootstrapCovariance, bootstrapSpearmanSe, BOOTSTRAP_METHOD, PARAMETER_NAMES } from './bootstrap-model.ts';
export type { ModelBootstrap, BootstrapReplicate } from './bootstrap-model.ts';
export { drawParameters } from './draw-parameters.ts';
export { sampleWithUncertainty } from './sample-with-uncertainty.ts';
export type { ParameterUncertainty, UncertainModel, UncertainSample } from './sample-with-uncertainty.ts';
export { characteristicEstimator } from './characteristic-estimator.ts';
export type { EstimatedMethod, Estimator, EstimatorFactors } from './characteristic-estimator.ts';
export { planSampleSize, DEFAULT_PLAN_REPLICATES } from './plan-sample-size.ts';
export type { PlanRow, SampleSizePlan, PlanOptions } from './plan-sample-size.ts';
export { normalizedLogCurve } from './normalized-curve.ts';
export type { NormalizedCurve } from './normalized-curve.ts';
export { fitCurveModel, CURVE_MODEL_METHOD, MIN_CURVES } from './curve-model.ts';
export type { CurveModel, CurveModelError, CurveModelOptions, CurveInput } from './curve-model.ts';
export { sampleCurves } from './sample-curves.ts';
export type { SampledCurves, SampleCurvesOptions } from './sample-curves.ts';
export { gaussianCopulaCorrelation } from './copula-correlation.ts';
export type { GaussianCopula } from './copula-correlation.ts';
export { mleParameters } from './mle-parameters.ts';
