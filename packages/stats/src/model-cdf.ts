/**
 * Cumulative distribution function of a fitted model, in the data's unit: normal Φ((x − μ)/σ);
 * lognormal Φ((ln x − μ)/σ) for x > 0, else 0; Weibull 1 − exp(−(x/λ)^k) for x > 0, else 0.
 */
import type { FitResult } from './fit-types.ts';
import { normalCdf } from './special/normal.ts';

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
