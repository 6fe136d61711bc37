/**
 * Anderson–Darling goodness of fit with parameters estimated from the sample.
 *
 *   A² = −n − (1/n) Σ_{i=1..n} (2i − 1) [ln F(x_(i)) + ln(1 − F(x_(n+1−i)))]
 *
 * (Anderson & Darling 1954; Stephens 1974, J. Am. Stat. Assoc. 69:730–737). The caller passes the
 * log-cdf and log-survival of the fitted model at the ordered sample, which keeps the tails exact.
 *
 * p-values (upper tail, both parameters estimated — "case 3"):
 * - normal (and lognormal on ln x): modified statistic A*² = A²(1 + 0.75/n + 2.25/n²) and the
 *   piecewise exponential formulas of D'Agostino & Stephens (1986), *Goodness-of-Fit Techniques*,
 *   Table 4.9, which follow Stephens (1974). Intended for n ≥ 8; the caller warns below that.
 * - Weibull (smallest extreme value on ln x, MLE): only a table exists. A*² = A²(1 + 0.2/√n) and
 *   the critical values 0.474, 0.637, 0.757, 0.877, 1.038 at 25, 10, 5, 2.5, 1 % (Stephens 1977;
 *   D'Agostino & Stephens 1986, Table 4.17). ln p is interpolated linearly in A*² between the
 *   points; beyond them the p-value is reported as the table bound (0.25 or 0.01) and marked so.
 *
 * Dimensionless. Degenerate input: n < 1 → NaN.
 */

export function andersonDarlingStatistic(logCdf: ArrayLike<number>, logSf: ArrayLike<number>): number {
  const n = logCdf.length;
  if (n < 1) return NaN;
  let s = 0;
  for (let i = 0; i < n; i++) s += (2 * i + 1) * (logCdf[i] + logSf[n - 1 - i]);
  return -n - s / n;
}

/** Upper-tail p of A² for the normal model, parameters estimated (D'Agostino & Stephens 1986, Table 4.9). */
export function andersonDarlingPNormal(a2: number, n: number): number {
  const a = a2 * (1 + 0.75 / n + 2.25 / (n * n));
  let p: number;
  if (a >= 0.6) p = Math.exp(1.2937 - 5.709 * a + 0.0186 * a * a);
  else if (a >= 0.34) p = Math.exp(0.9177 - 4.279 * a - 1.38 * a * a);
  else if (a >= 0.2) p = 1 - Math.exp(-8.318 + 42.796 * a - 59.938 * a * a);
  else p = 1 - Math.exp(-13.436 + 101.14 * a - 223.73 * a * a);
  return Math.min(1, Math.max(0, p));
}

/** Critical values of A*² = A²(1 + 0.2/√n) for the extreme-value / Weibull case 3 (Stephens 1977). */
export const WEIBULL_AD_TABLE: readonly { alpha: number; critical: number }[] = [
  { alpha: 0.25, critical: 0.474 },
  { alpha: 0.1, critical: 0.637 },
  { alpha: 0.05, critical: 0.757 },
  { alpha: 0.025, critical: 0.877 },
  { alpha: 0.01, critical: 1.038 },
];

/** Upper-tail p of A² for the Weibull model by interpolation in the Stephens (1977) table. */
export function andersonDarlingPWeibull(a2: number, n: number): { p: number; method: 'table-interpolated' | 'table-bound' } {
  const a = a2 * (1 + 0.2 / Math.sqrt(n));
  const t = WEIBULL_AD_TABLE;
  if (a <= t[0].critical) return { p: t[0].alpha, method: 'table-bound' };
  const last = t[t.length - 1];
  if (a >= last.critical) return { p: last.alpha, method: 'table-bound' };
  for (let i = 1; i < t.length; i++) {
    if (a <= t[i].critical) {
      const lo = t[i - 1];
      const hi = t[i];
      const f = (a - lo.critical) / (hi.critical - lo.critical);
      return { p: Math.exp(Math.log(lo.alpha) + f * (Math.log(hi.alpha) - Math.log(lo.alpha))), method: 'table-interpolated' };
    }
  }
  return { p: last.alpha, method: 'table-bound' };
}
