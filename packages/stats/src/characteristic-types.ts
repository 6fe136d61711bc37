/**
 * Shapes shared by the characteristic-value methods (one file each: en1990-v-known.ts,
 * en1990-v-unknown.ts, characteristic-normal.ts, characteristic-lognormal.ts,
 * characteristic-weibull.ts, characteristic-order-statistic.ts) and by the headline rule.
 */
import type { FitResult, ModelName } from './fit-types.ts';

export type CharacteristicMethod =
  | 'en1990-v-known'
  | 'en1990-v-unknown'
  | 'tolerance-normal'
  | 'tolerance-lognormal'
  | 'tolerance-weibull'
  | 'order-statistic';

export interface CharacteristicValue {
  method: CharacteristicMethod;
  /** Proportion of the population above the value (0.95 for a 5 % fractile). */
  coverage: number;
  /** Confidence of the statement; null for the EN 1990 fractiles (a Bayesian prediction fractile). */
  confidence: number | null;
  /** The characteristic value in the property's unit, or null when the method does not apply. */
  value: number | null;
  note: string;
  /** The factor used (k_n, k, t, or the order-statistic rank r); null when not applicable. */
  factor: number | null;
  /** Smallest n at which the method gives a value here; null when the level admits none. */
  min_n: number | null;
}

export interface SummaryLevel {
  coverage: number;
  confidence: number;
}

/** What every method reads of one sample: the finite values sorted, their logs and the fits. */
export interface Sample {
  n: number;
  /** finite values, ascending */
  sorted: Float64Array;
  /** ln of `sorted` when every value is > 0, else null */
  logs: Float64Array | null;
  mean: number | null;
  /** sample standard deviation (divisor n − 1) */
  sd: number | null;
  cov: number | null;
  fits: FitResult[];
}

/** Model a catalog may name for a property's headline; `order-statistic` is the distribution-free bound. */
export type HeadlineModel = ModelName | 'order-statistic';

/** Smallest n for a distribution fit (and for an AD statistic). */
export const MIN_N_FIT = 3;
/** Below this n the AD p-values are not calibrated (Stephens 1974); no model is rejected below it. */
export const MIN_N_AD_P = 8;
/** Smallest n for a parametric (normal, lognormal, Weibull) tolerance limit here. */
export const MIN_N_TOLERANCE = 5;
/** The exact Weibull limit holds at any n ≥ 3; it is given from the same n as the others. */
export const MIN_N_WEIBULL_TOLERANCE = MIN_N_TOLERANCE;
/** EN 1990 Table D1 gives k_n for V unknown from n = 3 and for V known from n = 1. */
export const MIN_N_EN1990_UNKNOWN = 3;
export const MIN_N_EN1990_KNOWN = 1;

/** Three significant digits for notes. */
export function fmt(x: number, digits = 3): string {
  return Number.isFinite(x) ? x.toPrecision(digits) : String(x);
}

/** "coverage p, confidence γ" */
export function levelText(level: SummaryLevel): string {
  return `coverage ${level.coverage}, confidence ${level.confidence}`;
}
