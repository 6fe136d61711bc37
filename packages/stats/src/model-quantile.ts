/**
 * Quantile function of a fitted model, indexed by the standard normal score z of the probability
 * u = Φ(z) (so a Gaussian copula maps straight onto it): normal μ + σz; lognormal exp(μ + σz);
 * Weibull λ(−ln(1 − u))^{1/k}, with 1 − u = Φ(−z) taken in logs so the upper tail keeps its
 * digits. Units: the data's. Parameters as in fit-types.ts.
 */
import type { FitResult } from './fit-types.ts';
import { normalLogCdf } from './special/normal.ts';

export function modelQuantileOfScore(fit: Pick<FitResult, 'model' | 'params'>): (z: number) => number {
  const p = fit.params;
  switch (fit.model) {
    case 'normal':
      return (z) => p.mu + p.sigma * z;
    case 'lognormal':
      return (z) => Math.exp(p.mu + p.sigma * z);
    case 'weibull':
      return (z) => p.scale * Math.pow(-normalLogCdf(-z), 1 / p.shape);
  }
}
