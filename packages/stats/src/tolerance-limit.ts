/**
 * One-sided lower tolerance limits: a value L such that, with confidence γ, at least a proportion
 * p (the coverage) of the population lies above L. All three are exact for their model.
 *
 * - normal: L = x̄ − k·s, k the exact noncentral-t factor (ISO 16269-6; tolerance-factor.ts).
 * - lognormal: the same on ln x, L = exp(mean(ln x) − k·sd(ln x)).
 * - Weibull: L = exp(û − t·b̂) = λ̂·exp(−t/k̂) with the MLEs û = ln λ̂, b̂ = 1/k̂ and t the pivotal
 *   factor of Thoman, Bain & Antle (weibull-tolerance-factor.ts): exact up to the Monte Carlo error
 *   of the simulated factor.
 *
 * Units: as the data. Degenerate input: n too small, zero spread or levels outside (0, 1) → NaN.
 */
import { normalToleranceFactor } from './tolerance-factor.ts';
import { weibullToleranceFactor } from './weibull-tolerance-factor.ts';

export function normalLowerToleranceLimit(mean: number, sd: number, n: number, coverage: number, confidence: number): number {
  return mean - normalToleranceFactor(n, coverage, confidence) * sd;
}

/** meanLog, sdLog: sample mean and standard deviation (n − 1) of ln x. */
export function lognormalLowerToleranceLimit(meanLog: number, sdLog: number, n: number, coverage: number, confidence: number): number {
  return Math.exp(meanLog - normalToleranceFactor(n, coverage, confidence) * sdLog);
}

/** shape k̂ and scale λ̂ are the Weibull MLEs from n complete observations. */
export function weibullLowerToleranceLimit(shape: number, scale: number, n: number, coverage: number, confidence: number): number {
  if (!(shape > 0 && scale > 0)) return NaN;
  const f = weibullToleranceFactor(n, coverage, confidence);
  return f ? scale * Math.exp(-f.t / shape) : NaN;
}
