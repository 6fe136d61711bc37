/**
 * The characteristic value of one method at one level as a bare function of the values, for
 * Monte Carlo studies that compute it many thousands of times (plan-sample-size.ts): the same
 * numbers as the full methods (characteristic-normal.ts, characteristic-lognormal.ts,
 * characteristic-weibull.ts, characteristic-order-statistic.ts, headline-rule.ts), without their
 * fits, goodness of fit and notes:
 *
 * - tolerance-normal: x̄ − k·s, k the exact noncentral-t factor (ISO 16269-6);
 * - tolerance-lognormal: exp(mean ln x − k·sd ln x);
 * - tolerance-weibull: λ̂·exp(−t/k̂) on the Weibull MLEs (Thoman, Bain & Antle; weibull-mle.ts);
 * - order-statistic: x_(r), r the largest rank that is a bound at the level (ISO 16269-6);
 * - lowest-model: the headline rule's lowest of the three tolerance limits (without its
 *   Anderson–Darling fallback, which the caller names separately).
 *
 * In: values (finite, unsorted; > 0 for the lognormal and Weibull), n = how many of them to use
 * (the first n). Out: the value in the data's unit and the factors used (k for the normal and
 * lognormal, t for the Weibull, r for the order statistic). Degenerate input: n below the
 * method's minimum or no spread → NaN. The values are not changed.
 */
import type { CharacteristicMethod, SummaryLevel } from './characteristic-types.ts';
import { MIN_N_TOLERANCE } from './characteristic-types.ts';
import { orderStatisticRank } from './order-statistic-bound.ts';
import { normalToleranceFactor } from './tolerance-factor.ts';
import { weibullMleFromLogs } from './weibull-mle.ts';
import { weibullToleranceFactor } from './weibull-tolerance-factor.ts';

export type EstimatedMethod = Extract<CharacteristicMethod, 'tolerance-normal' | 'tolerance-lognormal' | 'tolerance-weibull' | 'order-statistic'> | 'lowest-model';

export interface EstimatorFactors {
  /** normal tolerance factor (normal and lognormal limits) */
  k?: number;
  /** Weibull pivotal factor */
  t?: number;
  /** rank of the order statistic */
  r?: number;
}

export type Estimator = (values: ArrayLike<number>, n: number) => { value: number; factors: EstimatorFactors };

function meanSd(x: ArrayLike<number>, n: number, log: boolean): [number, number] {
  let s = 0;
  for (let i = 0; i < n; i++) s += log ? Math.log(x[i]) : x[i];
  const mean = s / n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += ((log ? Math.log(x[i]) : x[i]) - mean) ** 2;
  return [mean, Math.sqrt(ss / (n - 1))];
}

function normalLimit(level: SummaryLevel, log: boolean): Estimator {
  return (x, n) => {
    if (n < MIN_N_TOLERANCE) return { value: NaN, factors: {} };
    const [m, s] = meanSd(x, n, log);
    const k = normalToleranceFactor(n, level.coverage, level.confidence);
    if (!(s > 0)) return { value: NaN, factors: { k } };
    return { value: log ? Math.exp(m - k * s) : m - k * s, factors: { k } };
  };
}

function weibullLimit(level: SummaryLevel): Estimator {
  let work = new Float64Array(0);
  let logs = new Float64Array(0);
  return (x, n) => {
    if (n < MIN_N_TOLERANCE) return { value: NaN, factors: {} };
    if (logs.length < n) {
      logs = new Float64Array(n);
      work = new Float64Array(n);
    }
    for (let i = 0; i < n; i++) logs[i] = Math.log(x[i]);
    const f = weibullToleranceFactor(n, level.coverage, level.confidence);
    const mle = weibullMleFromLogs(logs.subarray(0, n), work);
    if (!mle || !f) return { value: NaN, factors: f ? { t: f.t } : {} };
    return { value: Math.exp(mle.logScale - f.t / mle.shape), factors: { t: f.t } };
  };
}

function orderStatistic(level: SummaryLevel): Estimator {
  return (x, n) => {
    const r = orderStatisticRank(n, level.coverage, level.confidence);
    if (r === null) return { value: NaN, factors: {} };
    const sorted = Float64Array.from({ length: n }, (_, i) => x[i]).sort();
    return { value: sorted[r - 1], factors: { r } };
  };
}

function lowestModel(level: SummaryLevel): Estimator {
  const parts = [normalLimit(level, false), normalLimit(level, true), weibullLimit(level)];
  return (x, n) => {
    let value = NaN;
    const factors: EstimatorFactors = {};
    for (const p of parts) {
      const e = p(x, n);
      Object.assign(factors, e.factors);
      if (Number.isFinite(e.value) && !(e.value >= value)) value = e.value;
    }
    return { value, factors };
  };
}

export function characteristicEstimator(method: EstimatedMethod, level: SummaryLevel): Estimator {
  switch (method) {
    case 'tolerance-normal':
      return normalLimit(level, false);
    case 'tolerance-lognormal':
      return normalLimit(level, true);
    case 'tolerance-weibull':
      return weibullLimit(level);
    case 'order-statistic':
      return orderStatistic(level);
    case 'lowest-model':
      return lowestModel(level);
  }
}
