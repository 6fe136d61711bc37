/**
 * Upper-tail probabilities of the F, chi-square and normal distributions, computed from the
 * complementary incomplete beta and gamma functions of @stdlib, so tiny p-values keep their
 * relative precision (1 − CDF would round them to 0).
 *   F(d1, d2):  P(X > x) = I_{d2/(d2 + d1·x)}(d2/2, d1/2)
 *   χ²(k):      P(X > x) = Q(k/2, x/2)
 *   normal, two-sided: 2·Φ(−|z|)
 */
import betainc from '@stdlib/math-base-special-betainc';
import gammainc from '@stdlib/math-base-special-gammainc';
import normalCdf from '@stdlib/stats-base-dists-normal-cdf';

export function fUpperTail(x: number, d1: number, d2: number): number {
  if (!(x > 0)) return 1;
  if (x === Infinity) return 0;
  return betainc(d2 / (d2 + d1 * x), d2 / 2, d1 / 2, true, false);
}

export function chiSquareUpperTail(x: number, k: number): number {
  if (!(x > 0)) return 1;
  if (x === Infinity) return 0;
  return gammainc(x / 2, k / 2, true, true);
}

export function normalTwoSided(z: number): number {
  return 2 * normalCdf(-Math.abs(z), 0, 1);
}
