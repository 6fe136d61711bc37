/**
 * Population summary of one property in one group: descriptive statistics, distribution fits,
 * characteristic (lower-fractile) values and compliance with minima/maxima.
 *
 * Methods (sources in the files named):
 * - percentiles: Hyndman & Fan type 7, numpy's default 'linear' (percentile.ts);
 * - fits: normal, lognormal, two-parameter Weibull by maximum likelihood, each with its
 *   Anderson–Darling A² and p-value (fit-normal.ts, fit-weibull.ts, anderson-darling.ts);
 * - best fit rule (BEST_FIT_RULE): the lowest AIC; all three models have two parameters, so this is
 *   the highest log-likelihood on the scale of the data. Ties go to normal, then lognormal, then
 *   Weibull. A warning is added when the chosen model is itself rejected by AD at 5 %.
 * - characteristic values (CharacteristicValue.method):
 *   `en1990-v-known`   EN 1990 Annex D (D7.2), X_k = m_X (1 − k_n V), V = priorV, normal model;
 *   `en1990-v-unknown` EN 1990 Annex D, X_k = m_X − k_n s_X, normal model;
 *   `tolerance-normal`, `tolerance-lognormal` exact one-sided tolerance limits (ISO 16269-6);
 *   `tolerance-weibull` approximate large-sample limit (Lawless 2003; Meeker & Escobar 1998);
 *   `order-statistic`  distribution-free bound (ISO 16269-6): the largest order statistic that is
 *   still a bound with the stated confidence; null with the smallest n needed when n is too small.
 *   One value per method for EN 1990 (5 % fractile), one per method and level otherwise.
 * - compliance (when a lower and/or upper limit is given), keys:
 *   `lower`, `upper` the limits (null if absent); `n_below` count < lower; `n_above` count > upper;
 *   `fraction_outside` (n_below + n_above)/n; `tail_below` the best model's P(X < lower);
 *   `tail_above` its P(X > upper); `cpk` = min((x̄ − lower)/3s, (upper − x̄)/3s) over the limits
 *   given (sample mean and standard deviation, divisor n − 1).
 *
 * Input: values in the property's unit; NaN or ±∞ are treated as missing and counted in n_missing.
 * Output numbers are in that unit (cov dimensionless). Degenerate input: numbers that cannot be
 * computed are null, and `warnings` says why; nothing throws.
 * No resampling: cost is a sort and a few passes over the data (well under 1 ms at n = 500).
 */
import { mean as ssMean, sampleStandardDeviation } from 'simple-statistics';
import { en1990Kn } from './en1990-fractile.ts';
import { fitLognormalSortedLogs, fitNormalSorted } from './fit-normal.ts';
import type { FitResult, ModelName } from './fit-types.ts';
import { fitWeibullSortedLogs } from './fit-weibull.ts';
import { orderStatisticConfidence, orderStatisticMinN, orderStatisticRank } from './order-statistic-bound.ts';
import { percentile } from './percentile.ts';
import { normalCdf } from './special/normal.ts';
import { normalToleranceFactor } from './tolerance-factor.ts';
import { weibullLowerToleranceLimit } from './tolerance-limit.ts';

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
  /** The factor used (k_n, k, or the order-statistic rank r); null when not applicable. */
  factor: number | null;
  /** Smallest n at which the method gives a value here; null when the level admits none. */
  min_n: number | null;
}

export interface SummaryLevel {
  coverage: number;
  confidence: number;
}

export interface SummaryOptions {
  /** Tolerance levels; the first is the headline. Default DEFAULT_LEVELS. */
  levels?: SummaryLevel[];
  /**
   * Coefficient of variation assumed known for `en1990-v-known`. Default DEFAULT_PRIOR_V = 0.07,
   * the value commonly assumed for the yield strength of structural steel (common practice;
   * JCSS Probabilistic Model Code part 3.2, from memory). Set it from prior data of the grade.
   */
  priorV?: number;
  /** Specified minimum (same unit as the values); null or absent for none. */
  lower?: number | null;
  /** Specified maximum; null or absent for none. */
  upper?: number | null;
}

export interface Compliance {
  lower: number | null;
  upper: number | null;
  n_below: number | null;
  n_above: number | null;
  fraction_outside: number;
  tail_below: number | null;
  tail_above: number | null;
  cpk: number | null;
}

export interface FitSummary {
  model: ModelName;
  params: Record<string, number>;
  ad: number;
  p: number | null;
  p_method: FitResult['p_method'];
  loglik: number;
  aic: number;
}

export interface PropertySummary {
  n: number;
  n_missing: number;
  mean: number | null;
  sd: number | null;
  cov: number | null;
  min: number | null;
  max: number | null;
  median: number | null;
  /** Percentile definition: Hyndman & Fan type 7 (numpy 'linear'). */
  percentiles: { p05: number | null; p50: number | null; p95: number | null };
  percentile_method: 'linear (Hyndman-Fan type 7)';
  fits: FitSummary[];
  best_fit: ModelName | null;
  best_fit_rule: string;
  characteristic: CharacteristicValue[];
  /** The best-fit model's tolerance limit at the first level (tolerance-normal if no fit). */
  headline: CharacteristicValue | null;
  compliance: Compliance | null;
  warnings: string[];
}

export const DEFAULT_LEVELS: readonly SummaryLevel[] = [
  { coverage: 0.95, confidence: 0.75 },
  { coverage: 0.99, confidence: 0.95 },
  { coverage: 0.9, confidence: 0.95 },
];
export const DEFAULT_PRIOR_V = 0.07;
export const BEST_FIT_RULE =
  'lowest AIC (equal parameter counts, so highest log-likelihood); ties: normal, lognormal, weibull';

/** Smallest n for a distribution fit (and for an AD statistic). */
export const MIN_N_FIT = 3;
/** Below this n the AD p-value formulas and tables are not calibrated (Stephens 1974). */
export const MIN_N_AD_P = 8;
/** Smallest n for a parametric (normal / lognormal) tolerance limit here. */
export const MIN_N_TOLERANCE = 5;
/** Smallest n for the large-sample Weibull tolerance limit. */
export const MIN_N_WEIBULL_TOLERANCE = 20;
/** EN 1990 Table D1 gives k_n for V unknown from n = 3 and for V known from n = 1. */
export const MIN_N_EN1990_UNKNOWN = 3;
export const MIN_N_EN1990_KNOWN = 1;

const MODEL_ORDER: ModelName[] = ['normal', 'lognormal', 'weibull'];

function fmt(x: number, digits = 3): string {
  return Number.isFinite(x) ? x.toPrecision(digits) : String(x);
}

export function summarizeProperty(values: ArrayLike<number>, opts: SummaryOptions = {}): PropertySummary {
  const levels = opts.levels && opts.levels.length > 0 ? opts.levels : DEFAULT_LEVELS;
  const priorV = opts.priorV ?? DEFAULT_PRIOR_V;
  const lower = opts.lower ?? null;
  const upper = opts.upper ?? null;
  const warnings: string[] = [];

  const finite: number[] = [];
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) finite.push(values[i]);
  const n = finite.length;
  const nMissing = values.length - n;
  const sorted = Float64Array.from(finite).sort();

  const mean = n >= 1 ? ssMean(finite) : null;
  const sd = n >= 2 ? sampleStandardDeviation(finite) : null;
  const cov = mean !== null && sd !== null && mean !== 0 ? sd / Math.abs(mean) : null;
  const pct = (q: number): number | null => (n >= 1 ? percentile(sorted, q) : null);

  if (n === 0) warnings.push('no values');
  else if (n < 2) warnings.push('n = 1: no standard deviation, fits or characteristic values');
  if (nMissing > 0) warnings.push(`${nMissing} missing or non-finite value(s) ignored`);
  if (sd === 0) warnings.push('all values equal: no spread, no fits');

  // Fits.
  const allPositive = n > 0 && sorted[0] > 0;
  let logs: Float64Array | null = null;
  if (allPositive) {
    logs = new Float64Array(n);
    for (let i = 0; i < n; i++) logs[i] = Math.log(sorted[i]);
  }
  const fitList: FitResult[] = [];
  if (n >= MIN_N_FIT && sd !== null && sd > 0) {
    const fn = fitNormalSorted(sorted);
    if (fn) fitList.push(fn);
    if (logs) {
      const fl = fitLognormalSortedLogs(logs);
      if (fl) fitList.push(fl);
      const fw = fitWeibullSortedLogs(logs);
      if (fw) fitList.push(fw);
    } else {
      warnings.push('values ≤ 0 present: lognormal and Weibull not fitted');
    }
    if (n < MIN_N_AD_P) warnings.push(`n = ${n} < ${MIN_N_AD_P}: Anderson–Darling p-values are not calibrated for so few values`);
  } else if (n >= 1 && n < MIN_N_FIT) {
    warnings.push(`n = ${n} < ${MIN_N_FIT}: no distribution fits`);
  }
  let best: FitResult | null = null;
  for (const m of MODEL_ORDER) {
    const f = fitList.find((x) => x.model === m);
    if (f && (best === null || f.aic < best.aic)) best = f;
  }
  if (best && best.p !== null && best.p < 0.05) {
    warnings.push(`best-fit model (${best.model}) is rejected by Anderson–Darling at 5 % (p = ${fmt(best.p, 2)}): model-based values are doubtful`);
  }
  const fitOf = (m: ModelName): FitResult | undefined => fitList.find((f) => f.model === m);
  const rejectionNote = (m: ModelName): string => {
    const f = fitOf(m);
    if (!f || f.p === null || n < MIN_N_AD_P) return '';
    return f.p < 0.05 ? `; the ${m} model is rejected by Anderson–Darling at 5 % (p ${f.p_method === 'table-bound' ? '≤' : '='} ${fmt(f.p, 2)})` : '';
  };

  // Characteristic values.
  const characteristic: CharacteristicValue[] = [];
  {
    const priorOk = priorV > 0 && priorV < 1;
    const ok = n >= MIN_N_EN1990_KNOWN && mean !== null && priorOk;
    const kn = ok ? en1990Kn(n, true) : NaN;
    characteristic.push({
      method: 'en1990-v-known',
      coverage: 0.95,
      confidence: null,
      value: ok ? mean * (1 - kn * priorV) : null,
      note: ok
        ? `EN 1990 Annex D 5 % fractile, normal model, V known = ${priorV} (prior), k_n = ${fmt(kn, 4)}${rejectionNote('normal')}`
        : priorOk
          ? 'no values'
          : `the prior V must lie in (0, 1), got ${priorV}`,
      factor: ok ? kn : null,
      min_n: MIN_N_EN1990_KNOWN,
    });
  }
  {
    const ok = n >= MIN_N_EN1990_UNKNOWN && mean !== null && sd !== null;
    const kn = ok ? en1990Kn(n, false) : NaN;
    characteristic.push({
      method: 'en1990-v-unknown',
      coverage: 0.95,
      confidence: null,
      value: ok ? mean - kn * sd : null,
      note: ok
        ? `EN 1990 Annex D 5 % fractile, normal model, V unknown (sample V = ${fmt(cov ?? NaN)}), k_n = ${fmt(kn, 4)}${rejectionNote('normal')}`
        : `EN 1990 Table D1 gives no k_n for V unknown below n = ${MIN_N_EN1990_UNKNOWN} (n = ${n})`,
      factor: ok ? kn : null,
      min_n: MIN_N_EN1990_UNKNOWN,
    });
  }
  const fl = fitOf('lognormal');
  const fw = fitOf('weibull');
  // Sample sd of ln x (divisor n − 1) for the exact lognormal tolerance limit.
  const sdLog = fl ? fl.params.sigma * Math.sqrt(n / (n - 1)) : NaN;
  for (const { coverage, confidence } of levels) {
    const lvl = `coverage ${coverage}, confidence ${confidence}`;
    const canTol = n >= MIN_N_TOLERANCE && mean !== null && sd !== null && sd > 0;
    const k = canTol ? normalToleranceFactor(n, coverage, confidence) : NaN;
    characteristic.push({
      method: 'tolerance-normal',
      coverage,
      confidence,
      value: canTol ? mean - k * sd : null,
      note: canTol
        ? `one-sided normal tolerance limit x̄ − k·s, exact noncentral t (ISO 16269-6), k = ${fmt(k, 5)}, ${lvl}${rejectionNote('normal')}`
        : `needs n ≥ ${MIN_N_TOLERANCE} and spread (n = ${n})`,
      factor: canTol ? k : null,
      min_n: MIN_N_TOLERANCE,
    });
    const canLog = canTol && fl !== undefined;
    characteristic.push({
      method: 'tolerance-lognormal',
      coverage,
      confidence,
      value: canLog ? Math.exp(fl.params.mu - k * sdLog) : null,
      note: canLog
        ? `one-sided lognormal tolerance limit exp(mean(ln x) − k·sd(ln x)), exact (ISO 16269-6 on ln x), k = ${fmt(k, 5)}, ${lvl}${rejectionNote('lognormal')}`
        : !allPositive && n > 0
          ? 'needs all values > 0'
          : `needs n ≥ ${MIN_N_TOLERANCE} and spread (n = ${n})`,
      factor: canLog ? k : null,
      min_n: MIN_N_TOLERANCE,
    });
    const canW = n >= MIN_N_WEIBULL_TOLERANCE && fw !== undefined;
    characteristic.push({
      method: 'tolerance-weibull',
      coverage,
      confidence,
      value: canW ? weibullLowerToleranceLimit(fw.params.shape, fw.params.scale, n, coverage, confidence) : null,
      note: canW
        ? `approximate (large-sample) Weibull tolerance limit: Wald bound on the log-quantile of the extreme-value MLE (Lawless 2003; Meeker & Escobar 1998), ${lvl}${rejectionNote('weibull')}${n < 200 ? '; at this n its actual confidence is below the nominal level (simulated: about 0.65 at n = 20, 0.69 at n = 50, 0.73 at n = 200 for nominal 0.75), so it is not conservative' : ''}`
        : !allPositive && n > 0
          ? 'needs all values > 0'
          : `the large-sample approximation needs n ≥ ${MIN_N_WEIBULL_TOLERANCE} (n = ${n})`,
      factor: null,
      min_n: MIN_N_WEIBULL_TOLERANCE,
    });
    const minN = orderStatisticMinN(coverage, confidence);
    const r = n >= 1 ? orderStatisticRank(n, coverage, confidence) : null;
    characteristic.push({
      method: 'order-statistic',
      coverage,
      confidence,
      value: r === null ? null : sorted[r - 1],
      note:
        r === null
          ? `distribution-free bound needs n ≥ ${minN} for ${lvl} (n = ${n})`
          : `distribution-free bound (ISO 16269-6): order statistic x_(${r}) of ${n}, attained confidence ${fmt(orderStatisticConfidence(n, r, coverage), 4)}, ${lvl}`,
      factor: r,
      min_n: Number.isFinite(minN) ? minN : null,
    });
  }
  // A level outside (0, 1) (or any other non-computable input) gives no number, never NaN.
  for (const c of characteristic) {
    if (c.value !== null && !Number.isFinite(c.value)) {
      c.value = null;
      c.factor = null;
      c.min_n = c.min_n !== null && Number.isFinite(c.min_n) ? c.min_n : null;
      c.note = `not computable for coverage ${c.coverage}, confidence ${c.confidence} (levels must lie in (0, 1))`;
    }
  }
  if (n >= 1 && n < MIN_N_TOLERANCE) warnings.push(`n = ${n} < ${MIN_N_TOLERANCE}: no tolerance limits`);
  else if (n >= MIN_N_TOLERANCE && n < MIN_N_WEIBULL_TOLERANCE && fw) {
    warnings.push(`n = ${n} < ${MIN_N_WEIBULL_TOLERANCE}: no Weibull tolerance limit (large-sample method)`);
  }
  const head = levels[0];
  const headMinN = orderStatisticMinN(head.coverage, head.confidence);
  if (n >= 1 && n < headMinN) warnings.push(`n = ${n} < ${headMinN}: no distribution-free bound at the headline level`);

  const headlineMethod: CharacteristicMethod = best ? (`tolerance-${best.model}` as CharacteristicMethod) : 'tolerance-normal';
  let headline =
    characteristic.find((c) => c.method === headlineMethod && c.coverage === head.coverage && c.confidence === head.confidence) ?? null;
  if (headline && headline.value === null) {
    headline = characteristic.find((c) => c.method === 'tolerance-normal' && c.coverage === head.coverage && c.confidence === head.confidence) ?? null;
  }

  // Compliance.
  let compliance: Compliance | null = null;
  if (lower !== null || upper !== null) {
    let nBelow = 0;
    let nAbove = 0;
    for (let i = 0; i < n; i++) {
      if (lower !== null && sorted[i] < lower) nBelow++;
      if (upper !== null && sorted[i] > upper) nAbove++;
    }
    const cdf = best ? modelCdf(best) : null;
    let cpk: number | null = null;
    if (mean !== null && sd !== null && sd > 0) {
      const parts: number[] = [];
      if (lower !== null) parts.push((mean - lower) / (3 * sd));
      if (upper !== null) parts.push((upper - mean) / (3 * sd));
      cpk = Math.min(...parts);
    }
    compliance = {
      lower,
      upper,
      n_below: lower !== null ? nBelow : null,
      n_above: upper !== null ? nAbove : null,
      fraction_outside: n > 0 ? (nBelow + nAbove) / n : 0,
      tail_below: lower !== null && cdf ? cdf(lower) : null,
      tail_above: upper !== null && cdf ? 1 - cdf(upper) : null,
      cpk,
    };
    if (n === 0) warnings.push('compliance: no values to check');
  }

  return {
    n,
    n_missing: nMissing,
    mean,
    sd,
    cov,
    min: n >= 1 ? sorted[0] : null,
    max: n >= 1 ? sorted[n - 1] : null,
    median: pct(0.5),
    percentiles: { p05: pct(0.05), p50: pct(0.5), p95: pct(0.95) },
    percentile_method: 'linear (Hyndman-Fan type 7)',
    fits: fitList.map((f) => ({ model: f.model, params: f.params, ad: f.ad, p: f.p, p_method: f.p_method, loglik: f.loglik, aic: f.aic })),
    best_fit: best ? best.model : null,
    best_fit_rule: BEST_FIT_RULE,
    characteristic,
    headline,
    compliance,
    warnings,
  };
}

/** Cumulative distribution function of a fitted model, in the data's unit. */
export function modelCdf(fit: Pick<FitResult, 'model' | 'params'>): (x: number) => number {
  const p = fit.params;
  switch (fit.model) {
    case 'normal':
      return (x) => normalCdf((x - p.mu) / p.sigma);
    case 'lognormal':
      return (x) => (x > 0 ? normalCdf((Math.log(x) - p.mu) / p.sigma) : 0);
    case 'weibull':
      return (x) => (x > 0 ? -Math.expm1(-Math.pow(x / p.scale, p.shape)) : 0);
  }
}
