/**
 * Probability density of a fitted distribution, in the parameterisation of the stats stage:
 * normal `{ mu, sigma }` (or `{ mean, sd }`), lognormal `{ mu, sigma }` of ln x, weibull
 * `{ shape, scale }`.
 * The densities come from @stdlib. Returns null for an unknown model or parameters that are
 * missing, not finite or not positive where they must be.
 */
import normalPdf from '@stdlib/stats-base-dists-normal-pdf';
import lognormalPdf from '@stdlib/stats-base-dists-lognormal-pdf';
import weibullPdf from '@stdlib/stats-base-dists-weibull-pdf';
import type { DistributionFit } from './types.ts';

export type Density = (x: number) => number;

function param(fit: DistributionFit, name: string, positive: boolean): number | null {
  const value = fit.params[name];
  if (typeof value !== 'number' || !Number.isFinite(value)) return null;
  if (positive && !(value > 0)) return null;
  return value;
}

export function fitDensity(fit: DistributionFit): Density | null {
  switch (fit.model) {
    case 'normal': {
      const mean = param(fit, 'mu', false) ?? param(fit, 'mean', false);
      const sd = param(fit, 'sigma', true) ?? param(fit, 'sd', true);
      return mean === null || sd === null ? null : (x) => normalPdf(x, mean, sd);
    }
    case 'lognormal': {
      const mu = param(fit, 'mu', false);
      const sigma = param(fit, 'sigma', true);
      return mu === null || sigma === null ? null : (x) => (x > 0 ? lognormalPdf(x, mu, sigma) : 0);
    }
    case 'weibull': {
      const shape = param(fit, 'shape', true);
      const scale = param(fit, 'scale', true);
      return shape === null || scale === null ? null : (x) => (x >= 0 ? weibullPdf(x, shape, scale) : 0);
    }
    default:
      return null;
  }
}
