/**
 * The headline (design) value of one property at the headline level, by a rule fixed before the
 * data is seen and stated with the result:
 *
 * - `lowest-model` (default): the lowest of the exact normal, lognormal and Weibull one-sided
 *   tolerance limits at coverage p and confidence γ (models that cannot be fitted, e.g. the
 *   lognormal and Weibull with a value ≤ 0, are left out). Whichever of the three families the
 *   population belongs to, its own exact limit lies below the p-content with confidence γ, and
 *   the lowest of the three lies below that limit, so the rule keeps at least confidence γ on each
 *   family (measured: test/stats-coverage.test.ts). Where Anderson–Darling rejects every model at
 *   5 % (model-rejection.ts), the distribution-free order-statistic bound (ISO 16269-6) is taken
 *   if n allows it; otherwise the lowest limit is kept, marked `no-model-fits`, with a warning.
 * - `catalog-model`: the grade catalog names the model for this property (normal, lognormal,
 *   weibull or order-statistic): that method's value at the headline level; a warning if
 *   Anderson–Darling rejects the named model.
 *
 * Model selection by AIC on the same data and then that model's nominal limit (the former rule)
 * is not conservative: the selection step costs confidence (issue measurements: 0.55 achieved for
 * a stated 0.75 on Weibull data at n = 20). Degenerate input: no method has a value → null.
 */
import type { CharacteristicMethod, CharacteristicValue, HeadlineModel, Sample, SummaryLevel } from './characteristic-types.ts';
import { isRejected } from './model-rejection.ts';

export type HeadlineBasis = 'lowest-model' | 'catalog-model' | 'distribution-free-fallback' | 'no-model-fits';

export interface HeadlineChoice {
  headline: CharacteristicValue | null;
  /** the rule, as fixed before the data (the same text for every group with the same settings) */
  rule: string;
  /** how the rule resolved on this data; null when there is no headline value */
  basis: HeadlineBasis | null;
  warnings: string[];
}

const MODEL_METHODS: CharacteristicMethod[] = ['tolerance-normal', 'tolerance-lognormal', 'tolerance-weibull'];

export function headlineRuleText(level: SummaryLevel, model: HeadlineModel | null): string {
  const lvl = `coverage ${level.coverage}, confidence ${level.confidence}`;
  if (model) return `catalog-model: the ${model === 'order-statistic' ? 'distribution-free order-statistic bound' : `exact ${model} tolerance limit`} named by the grade catalog for this property, at ${lvl}`;
  return `lowest-model: the lowest of the exact normal, lognormal and Weibull one-sided tolerance limits at ${lvl}; where Anderson–Darling rejects every model at 5 %, the distribution-free order-statistic bound if n allows, else the lowest limit marked "no model fits"`;
}

export function chooseHeadline(s: Sample, characteristic: readonly CharacteristicValue[], level: SummaryLevel, model: HeadlineModel | null = null): HeadlineChoice {
  const rule = headlineRuleText(level, model);
  const at = (m: CharacteristicMethod) => characteristic.find((c) => c.method === m && c.coverage === level.coverage && c.confidence === level.confidence);
  const warnings: string[] = [];
  if (model) {
    const c = at(model === 'order-statistic' ? 'order-statistic' : (`tolerance-${model}` as CharacteristicMethod));
    if (!c || c.value === null) return { headline: null, rule, basis: null, warnings: [`no headline: the catalog's ${model} method gives no value here (${c?.note ?? 'not computed'})`] };
    if (model !== 'order-statistic' && isRejected(s.fits.find((f) => f.model === model), s.n)) {
      warnings.push(`the catalog's headline model (${model}) is rejected by Anderson–Darling at 5 %: its value is doubtful`);
    }
    return { headline: c, rule, basis: 'catalog-model', warnings };
  }
  let lowest: CharacteristicValue | null = null;
  for (const m of MODEL_METHODS) {
    const c = at(m);
    if (c && c.value !== null && (lowest === null || c.value < lowest.value!)) lowest = c;
  }
  if (lowest === null) return { headline: null, rule, basis: null, warnings };
  const fitted = s.fits.filter((f) => MODEL_METHODS.includes(`tolerance-${f.model}` as CharacteristicMethod));
  const allRejected = fitted.length > 0 && fitted.every((f) => isRejected(f, s.n));
  if (!allRejected) return { headline: lowest, rule, basis: 'lowest-model', warnings };
  const os = at('order-statistic');
  if (os && os.value !== null) {
    warnings.push('Anderson–Darling rejects every model at 5 %: the headline is the distribution-free order-statistic bound');
    return { headline: os, rule, basis: 'distribution-free-fallback', warnings };
  }
  warnings.push(`no model fits: Anderson–Darling rejects every model at 5 % and n = ${s.n} is too small for the distribution-free bound (needs n ≥ ${os?.min_n ?? '—'}); the headline is the lowest model limit, not a sound design value`);
  return { headline: { ...lowest, note: `no model fits (Anderson–Darling rejects every model at 5 %): ${lowest.note}` }, rule, basis: 'no-model-fits', warnings };
}
