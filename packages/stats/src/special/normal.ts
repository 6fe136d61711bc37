/**
 * Standard normal distribution: quantile z_p and cumulative probability Φ(x).
 *
 * Thin wrappers over the `@stdlib` ports (Cephes/Boost algorithms, double precision), so the rest
 * of the package has one place to get them from. Dimensionless in and out.
 * Degenerate input: p outside [0, 1] or NaN gives NaN; p = 0 → −∞, p = 1 → +∞.
 */
import stdNormalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import stdNormalCdf from '@stdlib/stats-base-dists-normal-cdf';

/** z such that Φ(z) = p. */
export function normalQuantile(p: number): number {
  return stdNormalQuantile(p, 0, 1);
}

/** Φ(x) = P(Z ≤ x) for the standard normal Z. */
export function normalCdf(x: number): number {
  return stdNormalCdf(x, 0, 1);
}

/** Standard normal density φ(x). */
export function normalPdf(x: number): number {
  return Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI);
}

/**
 * ln Φ(x), accurate in the far lower tail: direct for x > −35, else the asymptotic expansion
 * ln Φ(x) = −x²/2 − ln(−x) − ½ ln 2π + ln(1 − 1/x² + 3/x⁴ − 15/x⁶ + 105/x⁸) (Abramowitz & Stegun 26.2.12).
 */
export function normalLogCdf(x: number): number {
  if (x > -35) return Math.log(normalCdf(x));
  const r = 1 / (x * x);
  return -0.5 * x * x - Math.log(-x) - 0.5 * Math.log(2 * Math.PI) + Math.log1p(r * (-1 + r * (3 + r * (-15 + r * 105))));
}
