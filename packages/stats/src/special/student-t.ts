/**
 * Central Student t distribution with `df` degrees of freedom: quantile and cumulative probability.
 *
 * Wrappers over the `@stdlib` ports (incomplete beta based, double precision).
 * Degenerate input: df ≤ 0, NaN, or p outside [0, 1] gives NaN.
 */
import stdTQuantile from '@stdlib/stats-base-dists-t-quantile';
import stdTCdf from '@stdlib/stats-base-dists-t-cdf';

/** t_{df; p}: the value with P(T ≤ t) = p. */
export function studentTQuantile(p: number, df: number): number {
  return stdTQuantile(p, df);
}

/** P(T ≤ t) for T ~ t(df). */
export function studentTCdf(t: number, df: number): number {
  return stdTCdf(t, df);
}
