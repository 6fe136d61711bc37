/**
 * One-sided lower statistical tolerance bound of a sample: the value below which at most a
 * proportion 1 − p of the population lies, with confidence γ (ISO 16269-6; NIST/SEMATECH
 * e-Handbook 7.2.6.3). Normal model: x̄ − k·s; lognormal model: exp(mean(ln x) − k·sd(ln x)),
 * with k the exact noncentral-t factor of `@fractile/stats`.
 *
 * Units: whatever the values carry (MPa, mm/mm). Degenerate input: fewer than two finite values,
 * or (lognormal) any value ≤ 0 among them, returns `null`; a sample with zero spread returns its
 * common value.
 */
import { normalToleranceFactor } from '@fractile/stats';
import { mean, sampleStandardDeviation } from 'simple-statistics';
import type { ToleranceModel } from './types.ts';

export interface ToleranceSpec {
  coverage: number;
  confidence: number;
  model: ToleranceModel;
}

export interface ToleranceBound {
  bound: number;
  n: number;
  k: number;
  /** Mean and standard deviation on the model's scale (logarithms for the lognormal model). */
  mean: number;
  sd: number;
}

export function lowerToleranceBound(values: readonly number[], spec: ToleranceSpec): ToleranceBound | null {
  const finite = values.filter((v) => Number.isFinite(v));
  if (finite.length < 2) return null;
  if (spec.model === 'lognormal' && finite.some((v) => v <= 0)) return null;
  const scaled = spec.model === 'lognormal' ? finite.map(Math.log) : finite;
  const n = scaled.length;
  const k = normalToleranceFactor(n, spec.coverage, spec.confidence);
  if (!Number.isFinite(k)) return null;
  const m = mean(scaled);
  const sd = sampleStandardDeviation(scaled);
  const bound = spec.model === 'lognormal' ? Math.exp(m - k * sd) : m - k * sd;
  return Number.isFinite(bound) ? { bound, n, k, mean: m, sd } : null;
}
