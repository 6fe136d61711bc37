/**
 * Poisson and binomial densities with real arguments, to near full relative precision:
 * π(x; λ) = e^{−λ} λ^x / Γ(x + 1) and b(x; n, p) = Γ(n + 1) / (Γ(x + 1) Γ(n − x + 1)) p^x (1 − p)^{n−x}.
 *
 * Written by hand from the saddle-point algorithm of Loader, C. (2000), "Fast and accurate
 * computation of binomial probabilities" (the `stirlerr` / `bd0` decomposition): the naive
 * exp(x ln λ − λ − lnΓ(x+1)) (and its binomial analogue) loses about λ·ε of relative precision once λ is large, which matters in
 * the noncentral t series. Real (non-integer) x is allowed because the noncentral t mixture needs
 * half-integer arguments. Dimensionless in and out; λ ≤ 0 or x < 0 → 0 (λ = 0, x = 0 → 1);
 * for the binomial, x outside [0, n] → 0.
 */
import gammaln from '@stdlib/math-base-special-gammaln';

const HALF_LN_2PI = 0.5 * Math.log(2 * Math.PI);

/** stirlerr(n) = ln Γ(n+1) − (n + ½) ln n + n − ½ ln 2π (Loader 2000). */
export function stirlingError(n: number): number {
  if (n <= 15) {
    return gammaln(n + 1) - (n + 0.5) * Math.log(n) + n - HALF_LN_2PI;
  }
  const S0 = 1 / 12;
  const S1 = 1 / 360;
  const S2 = 1 / 1260;
  const S3 = 1 / 1680;
  const S4 = 1 / 1188;
  const nn = n * n;
  if (n > 500) return (S0 - S1 / nn) / n;
  if (n > 80) return (S0 - (S1 - S2 / nn) / nn) / n;
  if (n > 35) return (S0 - (S1 - (S2 - S3 / nn) / nn) / nn) / n;
  return (S0 - (S1 - (S2 - (S3 - S4 / nn) / nn) / nn) / nn) / n;
}

/** bd0(x, m) = x ln(x/m) + m − x, evaluated without cancellation when x ≈ m (Loader 2000). */
export function deviancePart(x: number, m: number): number {
  if (Math.abs(x - m) < 0.1 * (x + m)) {
    let v = (x - m) / (x + m);
    let s = (x - m) * v;
    let ej = 2 * x * v;
    v *= v;
    for (let j = 1; j < 1000; j++) {
      ej *= v;
      const s1 = s + ej / (2 * j + 1);
      if (s1 === s) return s1;
      s = s1;
    }
    return s;
  }
  return x * Math.log(x / m) + m - x;
}

/** e^{−λ} λ^x / Γ(x + 1). */
export function poissonDensity(x: number, lambda: number): number {
  if (!(lambda >= 0) || !(x >= 0)) return 0;
  if (lambda === 0) return x === 0 ? 1 : 0;
  if (x === 0) return Math.exp(-lambda);
  return Math.exp(-stirlingError(x) - deviancePart(x, lambda)) / Math.sqrt(2 * Math.PI * x);
}

/**
 * Binomial density with real x and n (0 ≤ x ≤ n), p and q = 1 − p passed separately so that a q
 * computed without cancellation is used as given (Loader 2000, dbinom_raw).
 */
export function binomialDensity(x: number, n: number, p: number, q: number): number {
  if (!(x >= 0 && x <= n)) return 0;
  if (p === 0) return x === 0 ? 1 : 0;
  if (q === 0) return x === n ? 1 : 0;
  if (x === 0) return Math.exp(n * Math.log1p(-p));
  if (x === n) return Math.exp(n * Math.log(p));
  const lc =
    stirlingError(n) - stirlingError(x) - stirlingError(n - x) - deviancePart(x, n * p) - deviancePart(n - x, n * q);
  const lf = Math.log(2 * Math.PI) + Math.log(x) + Math.log1p(-x / n);
  return Math.exp(lc - 0.5 * lf);
}
