/**
 * Population summary of one property in one group, composed of one method per file:
 * descriptive statistics and fits (describe-sample.ts), the best fit by AIC (best-fit.ts), the
 * characteristic values — EN 1990 V known / V unknown (en1990-v-known.ts, en1990-v-unknown.ts),
 * exact normal, lognormal and Weibull tolerance limits (characteristic-normal.ts,
 * characteristic-lognormal.ts, characteristic-weibull.ts) and the distribution-free bound
 * (characteristic-order-statistic.ts) at every level — the headline value by the stated rule
 * (headline-rule.ts) and compliance on individual tests (compliance.ts).
 *
 * One value per EN 1990 method (5 % fractile) and one per tolerance method and level; a level
 * outside (0, 1) gives null values with a note, never NaN. Input: values in the property's unit,
 * NaN/±∞ missing. Degenerate input: numbers that cannot be computed are null and `warnings` says
 * why; nothing throws. Cost: a sort, the fits, and table look-ups of the factors (a Weibull factor
 * for an untabulated level is simulated once per n and cached).
 */
import { bestFitByAic, BEST_FIT_RULE } from './best-fit.ts';
import { lognormalCharacteristic } from './characteristic-lognormal.ts';
import { normalCharacteristic } from './characteristic-normal.ts';
import { orderStatisticCharacteristic } from './characteristic-order-statistic.ts';
import { MIN_N_TOLERANCE, fmt, type CharacteristicMethod, type CharacteristicValue, type HeadlineModel, type SummaryLevel } from './characteristic-types.ts';
import { complianceOf, type Compliance } from './compliance.ts';
import { DEFAULT_LEVELS } from './default-levels.ts';
import { describeSample } from './describe-sample.ts';
import { DEFAULT_PRIOR_V_CHECK_LEVEL, en1990VKnown } from './en1990-v-known.ts';
import { en1990VUnknown } from './en1990-v-unknown.ts';
import type { FitResult, ModelName } from './fit-types.ts';
import { chooseHeadline, type HeadlineBasis } from './headline-rule.ts';
import { rejectionNote } from './model-rejection.ts';
import { orderStatisticMinN } from './order-statistic-bound.ts';
import { weibullCharacteristic } from './characteristic-weibull.ts';

export interface SummaryOptions {
  /** Tolerance levels; the first is the headline level. Default DEFAULT_LEVELS. */
  levels?: readonly SummaryLevel[];
  /** Prior coefficient of variation for `en1990-v-known`, from the grade catalog; absent or null: not offered. */
  priorV?: number | null;
  /** Level of the χ² check of the prior V against the sample (default 0.95). */
  priorVCheckLevel?: number;
  /** Headline model named by the grade catalog; absent or null: the `lowest-model` rule. */
  headlineModel?: HeadlineModel | null;
  /** Specified minimum (same unit as the values); null or absent for none. */
  lower?: number | null;
  /** Specified maximum; null or absent for none. */
  upper?: number | null;
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
  /** The design value: the characteristic value the headline rule chose at the first level. */
  headline: CharacteristicValue | null;
  /** The headline rule, fixed before the data (headline-rule.ts). */
  headline_rule: string;
  /** How the rule resolved on these data; null without a headline. */
  headline_basis: HeadlineBasis | null;
  compliance: Compliance | null;
  warnings: string[];
}


function toleranceValues(s: ReturnType<typeof describeSample>['sample'], level: SummaryLevel): CharacteristicValue[] {
  const fit = (m: ModelName) => s.fits.find((f) => f.model === m);
  return [
    normalCharacteristic(s, level, rejectionNote(fit('normal'), s.n)),
    lognormalCharacteristic(s, level, rejectionNote(fit('lognormal'), s.n)),
    weibullCharacteristic(s, level, rejectionNote(fit('weibull'), s.n)),
    orderStatisticCharacteristic(s, level),
  ];
}

/** A level outside (0, 1) (or any other non-computable input) gives no number, never NaN. */
function withoutNaN(c: CharacteristicValue): CharacteristicValue {
  if (c.value === null || Number.isFinite(c.value)) return c;
  return { ...c, value: null, factor: null, min_n: c.min_n !== null && Number.isFinite(c.min_n) ? c.min_n : null, note: `not computable for coverage ${c.coverage}, confidence ${c.confidence} (levels must lie in (0, 1))` };
}

export function summarizeProperty(values: ArrayLike<number>, opts: SummaryOptions = {}): PropertySummary {
  const levels = opts.levels && opts.levels.length > 0 ? opts.levels : DEFAULT_LEVELS;
  const d = describeSample(values);
  const s = d.sample;
  const warnings = d.warnings;
  const best = bestFitByAic(s.fits);
  if (best && best.p !== null && best.p < 0.05) {
    warnings.push(`best-fit model (${best.model}) is rejected by Anderson–Darling at 5 % (p = ${fmt(best.p, 2)})`);
  }
  const normalNote = rejectionNote(s.fits.find((f) => f.model === 'normal'), s.n);
  const known = en1990VKnown(s, opts.priorV ?? null, opts.priorVCheckLevel ?? DEFAULT_PRIOR_V_CHECK_LEVEL, normalNote);
  if (known.warning) warnings.push(known.warning);
  const characteristic = [known.value, en1990VUnknown(s, normalNote), ...levels.flatMap((l) => toleranceValues(s, l))].map(withoutNaN);

  if (s.n >= 1 && s.n < MIN_N_TOLERANCE) warnings.push(`n = ${s.n} < ${MIN_N_TOLERANCE}: no tolerance limits`);
  const head = levels[0];
  const headMinN = orderStatisticMinN(head.coverage, head.confidence);
  if (s.n >= 1 && s.n < headMinN) warnings.push(`n = ${s.n} < ${headMinN}: no distribution-free bound at the headline level`);
  const choice = chooseHeadline(s, characteristic, head, opts.headlineModel ?? null);
  warnings.push(...choice.warnings);

  const method = choice.headline?.method as CharacteristicMethod | undefined;
  const headModel = method?.startsWith('tolerance-') ? (method.slice('tolerance-'.length) as ModelName) : null;
  const tailFit = (headModel ? s.fits.find((f) => f.model === headModel) : undefined) ?? best;
  const compliance = complianceOf(s, opts.lower ?? null, opts.upper ?? null, tailFit ?? null);
  if (compliance && s.n === 0) warnings.push('compliance: no values to check');

  return {
    n: s.n,
    n_missing: d.n_missing,
    mean: s.mean,
    sd: s.sd,
    cov: s.cov,
    min: d.min,
    max: d.max,
    median: d.median,
    percentiles: d.percentiles,
    percentile_method: 'linear (Hyndman-Fan type 7)',
    fits: s.fits.map((f) => ({ model: f.model, params: f.params, ad: f.ad, p: f.p, p_method: f.p_method, loglik: f.loglik, aic: f.aic })),
    best_fit: best ? best.model : null,
    best_fit_rule: BEST_FIT_RULE,
    characteristic,
    headline: choice.headline,
    headline_rule: choice.rule,
    headline_basis: choice.basis,
    compliance,
    warnings,
  };
}
