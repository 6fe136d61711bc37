/**
 * The best-fitting model by the lowest AIC. All three models have two parameters, so this is the
 * highest log-likelihood on the scale of the data (Akaike 1974). Ties go to normal, then
 * lognormal, then Weibull. Used to describe the data (the sampler's marginals, the histogram's
 * curve); the design value follows the headline rule instead (headline-rule.ts). Null without fits.
 */
import type { FitResult, ModelName } from './fit-types.ts';

export const BEST_FIT_RULE =
  'lowest AIC (equal parameter counts, so highest log-likelihood); ties: normal, lognormal, weibull';

const MODEL_ORDER: ModelName[] = ['normal', 'lognormal', 'weibull'];

export function bestFitByAic(fits: readonly FitResult[]): FitResult | null {
  let best: FitResult | null = null;
  for (const m of MODEL_ORDER) {
    const f = fits.find((x) => x.model === m);
    if (f && (best === null || f.aic < best.aic)) best = f;
  }
  return best;
}
