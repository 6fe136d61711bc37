/**
 * Sample-size planning for a characteristic value: how the value of one method at one level (or
 * the headline rule's lowest of the three model limits) is expected to move when m more tests are
 * added, taking the fitted model of the population as the truth (a parametric Monte Carlo, Efron & Tibshirani 1993, ch. 6; the factor's fall with n is
 * ISO 16269-6's, the estimate's narrowing the law of large numbers).
 *
 * For every m (0 first): R replicates append m values drawn from the model to the tests at hand
 * and recompute the characteristic value on the n + m values (characteristic-estimator.ts); the
 * rows give its mean (`expected`), its 5, 50 and 95 % points (Hyndman & Fan type 7) and the
 * expected gain over the value now. The same draws serve every m (common random numbers: the
 * first m of the largest m's draws), so the gains are smooth in m. Beside it, `sd_fresh` is the
 * standard deviation of the value computed from n + m tests drawn afresh from the model — the
 * spread of the estimate itself, which narrows with n. `population_fractile` is the model's
 * (1 − p)-quantile, the value a method for this model approaches as n grows; `value_large_n` is
 * where this method heads (lower where it assumes another family than the model's).
 *
 * In: the values of the property (its unit), the method and level, the model to draw from (the
 * fit that describes the data, e.g. the best fit by AIC), the numbers of added tests, R and a seed (seeded-generators.ts; the same seed gives the same
 * table). Degenerate input: no value at the current n, a bad count → error value.
 */
import { mean as ssMean, sampleStandardDeviation } from 'simple-statistics';
import { characteristicEstimator, type EstimatedMethod, type EstimatorFactors } from './characteristic-estimator.ts';
import type { SummaryLevel } from './characteristic-types.ts';
import type { FitResult } from './fit-types.ts';
import { modelQuantileOfScore } from './model-quantile.ts';
import { percentile } from './percentile.ts';
import { normalStream, streamSeed } from './seeded-generators.ts';
import { normalQuantile } from './special/normal.ts';

export interface PlanRow {
  /** tests added to those at hand */
  added: number;
  /** tests then */
  n: number;
  /** the method's factors at n: k (normal, lognormal), t (Weibull), r (order statistic) */
  factors: EstimatorFactors;
  /** mean of the characteristic value after adding the tests */
  expected: number | null;
  p05: number | null;
  p50: number | null;
  p95: number | null;
  /** expected − the value now */
  gain: number | null;
  /** standard deviation of the value from n tests drawn afresh from the model */
  sd_fresh: number | null;
}

export interface SampleSizePlan {
  method: EstimatedMethod;
  level: SummaryLevel;
  /** the model the added tests are drawn from */
  model: Pick<FitResult, 'model' | 'params'>;
  n_now: number;
  value_now: number;
  /** the model's quantile at 1 − coverage: the fractile the value stands for */
  population_fractile: number;
  /**
   * where the value heads as n grows: the method applied to LARGE_N model quantiles
   * Q((i − ½)/N), i = 1 … N; below the fractile where the method assumes another family than the
   * model's (the lowest-model rule on data that are not Weibull, for one)
   */
  value_large_n: number | null;
  replicates: number;
  seed: number;
  rows: PlanRow[];
}

export interface PlanOptions {
  added: readonly number[];
  /** Monte Carlo replicates per row (default 2000) */
  replicates?: number;
  seed?: number;
}

export const DEFAULT_PLAN_REPLICATES = 2000;
/** size of the model-quantile sample behind `value_large_n` */
export const LARGE_N = 20_000;

export function planSampleSize(
  values: ArrayLike<number>,
  method: EstimatedMethod,
  level: SummaryLevel,
  model: Pick<FitResult, 'model' | 'params'>,
  opts: PlanOptions,
): SampleSizePlan | { code: 'bad-count' | 'no-value'; message: string } {
  const R = opts.replicates ?? DEFAULT_PLAN_REPLICATES;
  const seed = opts.seed ?? 1;
  const added = [0, ...new Set(opts.added.filter((m) => m !== 0))].sort((a, b) => a - b);
  if (!(Number.isInteger(R) && R >= 2)) return { code: 'bad-count', message: `replicates must be a whole number ≥ 2, got ${R}` };
  if (added.some((m) => !(Number.isInteger(m) && m >= 0))) return { code: 'bad-count', message: 'added tests must be whole numbers ≥ 0' };
  const current: number[] = [];
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) current.push(values[i]);
  const n = current.length;
  const estimate = characteristicEstimator(method, level);
  const now = estimate(current, n);
  if (!Number.isFinite(now.value)) return { code: 'no-value', message: `no ${method} value at n = ${n}` };
  const q = modelQuantileOfScore(model);
  const maxM = added[added.length - 1];
  const conditional = added.map(() => new Float64Array(R));
  const fresh = added.map(() => new Float64Array(R));
  const buf = new Float64Array(n + maxM);
  buf.set(current);
  const freshBuf = new Float64Array(n + maxM);
  const zAdd = normalStream(streamSeed(seed, 0));
  const zFresh = normalStream(streamSeed(seed, 1));
  for (let r = 0; r < R; r++) {
    for (let i = 0; i < maxM; i++) buf[n + i] = q(zAdd());
    for (let i = 0; i < n + maxM; i++) freshBuf[i] = q(zFresh());
    added.forEach((m, row) => {
      conditional[row][r] = m === 0 ? now.value : estimate(buf, n + m).value;
      fresh[row][r] = estimate(freshBuf, n + m).value;
    });
  }
  const finite = (a: Float64Array) => a.filter((v) => Number.isFinite(v)).sort();
  const rows: PlanRow[] = added.map((m, row) => {
    const c = finite(conditional[row]);
    const f = finite(fresh[row]);
    const factors = estimate(buf, n + m).factors;
    const mean = c.length > 0 ? ssMean(Array.from(c)) : NaN;
    const sdFresh = f.length > 1 ? sampleStandardDeviation(Array.from(f)) : NaN;
    const orNull = (v: number) => (Number.isFinite(v) ? v : null);
    return {
      added: m,
      n: n + m,
      factors,
      expected: orNull(mean),
      p05: c.length ? percentile(c, 0.05) : null,
      p50: c.length ? percentile(c, 0.5) : null,
      p95: c.length ? percentile(c, 0.95) : null,
      gain: orNull(mean - now.value),
      sd_fresh: orNull(sdFresh),
    };
  });
  const grid = Float64Array.from({ length: LARGE_N }, (_, i) => q(normalQuantile((i + 0.5) / LARGE_N)));
  const large = estimate(grid, LARGE_N).value;
  return {
    method,
    level: { ...level },
    model: { model: model.model, params: { ...model.params } },
    n_now: n,
    value_now: now.value,
    population_fractile: q(normalQuantile(1 - level.coverage)),
    value_large_n: Number.isFinite(large) ? large : null,
    replicates: R,
    seed,
    rows,
  };
}
