/**
 * Distribution-free one-sided lower tolerance bound from order statistics (ISO 16269-6,
 * distribution-free intervals; Wilks 1941).
 *
 * For any continuous population, the r-th smallest of n observations lies below the p-quantile of
 * the complementary tail, i.e. at least a proportion p of the population lies above x_(r), with
 * confidence P(Bin(n, 1 − p) ≥ r). For r = 1 (the sample minimum) this is 1 − p^n.
 *
 * Dimensionless (coverage, confidence); the bound is in the unit of the data.
 */
import betainc from '@stdlib/math-base-special-betainc';

/**
 * Smallest n for which the sample minimum is a lower bound on the `coverage` content with
 * `confidence`: the smallest n with 1 − p^n ≥ γ, i.e. ⌈ln(1 − γ) / ln p⌉ checked in exact steps.
 * Degenerate input: p or γ outside (0, 1) → NaN.
 */
export function orderStatisticMinN(coverage: number, confidence: number): number {
  if (!(coverage > 0 && coverage < 1 && confidence > 0 && confidence < 1)) return NaN;
  let n = Math.max(1, Math.ceil(Math.log1p(-confidence) / Math.log(coverage)) - 2);
  // Guard against rounding in the logarithms: step to the exact smallest n.
  while (n > 1 && 1 - Math.pow(coverage, n - 1) >= confidence) n--;
  while (1 - Math.pow(coverage, n) < confidence) n++;
  return n;
}

/**
 * Confidence that at least a proportion `coverage` lies above the r-th smallest of n observations:
 * P(Bin(n, 1 − p) ≥ r) = I_{1−p}(r, n − r + 1).
 */
export function orderStatisticConfidence(n: number, r: number, coverage: number): number {
  if (!(Number.isInteger(n) && Number.isInteger(r) && r >= 1 && r <= n)) return NaN;
  return betainc(1 - coverage, r, n - r + 1, true, false);
}

/**
 * The largest rank r (1-based) whose order statistic is still a lower bound with the requested
 * confidence, or null when even the minimum does not reach it (n too small).
 */
export function orderStatisticRank(n: number, coverage: number, confidence: number): number | null {
  if (!(Number.isInteger(n) && n >= 1)) return null;
  if (!(orderStatisticConfidence(n, 1, coverage) >= confidence)) return null;
  // Confidence decreases with r; find the largest r with confidence ≥ γ by bisection.
  let lo = 1;
  let hi = n;
  while (lo < hi) {
    const mid = Math.ceil((lo + hi) / 2);
    if (orderStatisticConfidence(n, mid, coverage) >= confidence) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}
