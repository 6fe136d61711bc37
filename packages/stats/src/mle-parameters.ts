/**
 * Maximum-likelihood parameters of a two-parameter family, without goodness of fit: for the
 * resamples of a bootstrap (bootstrap-model.ts), which refit thousands of times. The same
 * estimates as the full fits (fit-normal.ts, fit-weibull.ts): normal μ̂ = mean, σ̂ = √(Σ(x − μ̂)²/n);
 * lognormal the same on ln x; Weibull by the profile score equation (weibull-mle.ts).
 *
 * In: values (NaN = missing, skipped). Out: the parameters as the fits name them. Degenerate
 * input: fewer than 3 finite values, no spread, or (lognormal, Weibull) a value ≤ 0 → null.
 */
import type { ModelName } from './fit-types.ts';
import { weibullMleFromLogs } from './weibull-mle.ts';

export function mleParameters(family: ModelName, values: ArrayLike<number>): Record<string, number> | null {
  const x: number[] = [];
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!Number.isFinite(v)) continue;
    if (family !== 'normal' && !(v > 0)) return null;
    x.push(family === 'normal' ? v : Math.log(v));
  }
  const n = x.length;
  if (n < 3) return null;
  if (family === 'weibull') {
    const m = weibullMleFromLogs(x);
    return m ? { shape: m.shape, scale: Math.exp(m.logScale) } : null;
  }
  let s = 0;
  for (const v of x) s += v;
  const mu = s / n;
  let ss = 0;
  for (const v of x) ss += (v - mu) ** 2;
  return ss > 0 ? { mu, sigma: Math.sqrt(ss / n) } : null;
}
