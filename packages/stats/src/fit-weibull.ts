/**
 * Two-parameter Weibull fit by maximum likelihood (location fixed at 0, as
 * scipy.stats.weibull_min.fit(x, floc=0)), with its Anderson–Darling statistic and table p-value.
 *
 * F(x) = 1 − exp(−(x/λ)^k); the estimates come from `weibull-mle.ts` (profile score equation,
 * Lawless 2003, §5.2).
 * A² is computed on ln x against the smallest-extreme-value law with u = ln λ̂, b = 1/k̂, as
 * scipy.stats.anderson(ln x, 'gumbel_l') does; its p-value comes from the Stephens (1977) table.
 *
 * Units: scale in the data's unit, shape dimensionless. Degenerate input: fewer than 3 finite
 * values, any value ≤ 0, or zero spread → null.
 */
import { andersonDarlingPWeibull, andersonDarlingStatistic } from './anderson-darling.ts';
import type { FitResult } from './fit-types.ts';
import { weibullMleFromLogs } from './weibull-mle.ts';

export function fitWeibull(x: ArrayLike<number>): FitResult | null {
  const logs: number[] = [];
  for (let i = 0; i < x.length; i++) {
    const v = x[i];
    if (!Number.isFinite(v)) continue;
    if (!(v > 0)) return null;
    logs.push(Math.log(v));
  }
  return fitWeibullSortedLogs(Float64Array.from(logs).sort());
}

/** Weibull fit from ln x already sorted ascending. */
export function fitWeibullSortedLogs(sortedLogs: ArrayLike<number>): FitResult | null {
  const n = sortedLogs.length;
  if (n < 3) return null;
  const mle = weibullMleFromLogs(sortedLogs);
  if (!mle) return null;
  const k = mle.shape;
  const scale = Math.exp(mle.logScale);

  // Log-likelihood: Σ [ln k − k ln λ + (k − 1) ln x − (x/λ)^k]; Σ (x/λ)^k = n at the MLE.
  let sumLog = 0;
  for (let i = 0; i < n; i++) sumLog += sortedLogs[i];
  const lnScale = Math.log(scale);
  const loglik = n * Math.log(k) - n * k * lnScale + (k - 1) * sumLog - n;

  // A² on the smallest-extreme-value scale: z = k (ln x − ln λ), F = 1 − exp(−e^z).
  const logCdf = new Float64Array(n);
  const logSf = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const ez = Math.exp(k * (sortedLogs[i] - lnScale));
    logCdf[i] = Math.log(-Math.expm1(-ez));
    logSf[i] = -ez;
  }
  const ad = andersonDarlingStatistic(logCdf, logSf);
  const pv = andersonDarlingPWeibull(ad, n);
  return {
    model: 'weibull',
    params: { shape: k, scale },
    ad,
    p: pv.p,
    p_method: pv.method,
    loglik,
    aic: 4 - 2 * loglik,
    n,
  };
}
