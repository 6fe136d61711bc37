/**
 * Noncentral t distribution T' = (Z + δ) / √(χ²_ν / ν): cumulative probability and quantile.
 *
 * No well-kept JavaScript package provides it, so it is written here by hand from the published
 * algorithm of Benton, D. & Krishnamoorthy, K. (2003), "Computing discrete mixtures of continuous
 * distribution functions: noncentral chisquare, noncentral t and the distribution of the square of
 * the sample multiple correlation coefficient", Computational Statistics & Data Analysis 43,
 * 249–267 (an improvement of Lenth, R. V. (1989), Applied Statistics algorithm AS 243).
 *
 * For t ≥ 0, with x = t² / (ν + t²) and λ = δ²/2 (Guenther 1978; AS 243, eq. 1):
 *
 *   F(t; ν, δ) = Φ(−δ) + ½ Σ_{i≥0} [ P_i · I_x(i + ½, ν/2) + Q_i · I_x(i + 1, ν/2) ],
 *   P_i = e^{−λ} λ^i / i!,   Q_i = δ/√2 · e^{−λ} λ^i / Γ(i + 3/2),
 *
 * and F(t; ν, δ) = 1 − F(−t; ν, −δ) for t < 0. Following Benton & Krishnamoorthy the sum starts at
 * the Poisson mode k = ⌊λ⌋, where the two incomplete beta values are evaluated directly, and runs
 * forwards and backwards with the recurrence I_x(a+1, b) = I_x(a, b) − Γ(a+b)/(Γ(a+1)Γ(b)) x^a (1−x)^b,
 * so only two incomplete beta evaluations are needed whatever δ is. The weights and recurrence terms at
 * the mode come from accurate kernels (saddle-point Poisson and binomial densities, Loader 2000), not
 * from exp(lgamma(·)) differences, which would lose about λ·ε of relative precision for large δ.
 *
 * The complement 1 − F is summed as its own positive series, ½ Σ [P_i (1 − I_x(i+½, ν/2)) + Q_i (1 − I_x(i+1, ν/2))],
 * which keeps relative precision in the upper tail for δ ≥ 0 (used for t < 0 with δ ≤ 0 as well).
 *
 * Precision (checked against SciPy's scipy.stats.nct, which wraps Boost): about 1e-14 relative for
 * x ≥ 0 with δ ≥ 0 and for x < 0 with δ ≤ 0, where the series is all positive, down to values of
 * about 1e-100 (deeper, the incomplete beta values at the mode underflow); for x < 0 with δ > 0,
 * a far lower tail, about 1e-16 absolute. The incomplete beta underneath (@stdlib, a Boost port)
 * limits this to about 1e-12 relative in places (seen e.g. at I_x(12, 57.8) near x = 0.18).
 *
 * Units: dimensionless. Degenerate input: ν ≤ 0 or any NaN → NaN; δ = 0 reduces to the central t.
 */
import betainc from '@stdlib/math-base-special-betainc';
import { binomialDensity, poissonDensity } from './saddle-point-density.ts';
import { normalCdf, normalQuantile } from './normal.ts';
import { studentTCdf } from './student-t.ts';

const EPS = 1e-17;
const MAX_TERMS = 100_000;

/**
 * Regularized incomplete beta I_x(a, b) (or its complement), with y = 1 − x passed as computed
 * without cancellation. Where y < 10⁻³ the rounding of 1 − x inside the routine would cost more
 * than 10⁻¹³ of relative precision, so there the symmetry I_x(a, b) = 1 − I_y(b, a) is used and a
 * tiny y (large |t| against ν) keeps its precision; elsewhere x is passed as it is.
 */
function incompleteBeta(x: number, y: number, a: number, b: number, upper: boolean): number {
  return y >= 1e-3 ? betainc(x, a, b, true, upper) : betainc(y, b, a, true, !upper);
}

/**
 * Mixture sum for t ≥ 0. Returns ½ Σ [P_i·J(i+½) + Q_i·J(i+1)] where J is I_x(·, ν/2) when
 * `upper` is false and 1 − I_x(·, ν/2) when it is true.
 */
function mixtureSum(t: number, df: number, delta: number, upper: boolean): number {
  const t2 = t * t;
  const x = t2 / (df + t2);
  const oneMinusX = df / (df + t2);
  const b = df / 2;
  const lambda = (delta * delta) / 2;
  const k = Math.floor(lambda);

  // Weights at the mode, by the saddle-point Poisson density (Loader 2000): P_k = π(k; λ) and
  // Q_k = sign(δ)·π(k + ½; λ), since δ/√2 · e^{−λ} λ^k / Γ(k + 3/2) = sign(δ) e^{−λ} λ^{k+½} / Γ(k + 3/2).
  const pK = poissonDensity(k, lambda);
  const qK = Math.sign(delta) * poissonDensity(k + 0.5, lambda);

  // Incomplete beta at the mode and the recurrence terms g(a) = Γ(a+b)/(Γ(a+1)Γ(b)) x^a (1−x)^b,
  // written as b/(a+b) · binomial density(a; a + b, x) and evaluated by the saddle-point kernel.
  const aP = k + 0.5;
  const aQ = k + 1;
  const iP = incompleteBeta(x, oneMinusX, aP, b, upper);
  const iQ = incompleteBeta(x, oneMinusX, aQ, b, upper);
  const gP0 = (b / (aP + b)) * binomialDensity(aP, aP + b, x, oneMinusX);
  const gQ0 = (b / (aQ + b)) * binomialDensity(aQ, aQ + b, x, oneMinusX);
  // For the lower incomplete beta: I(a+1) = I(a) − g(a), I(a−1) = I(a) + g(a−1).
  // For the upper complement U = 1 − I: U(a+1) = U(a) + g(a), U(a−1) = U(a) − g(a−1).
  const sgn = upper ? 1 : -1;

  let sum = 0;

  // Backward from the mode − 1 down to 0 (finite; stops early once the terms are negligible).
  if (k > 0) {
    let p = pK;
    let q = qK;
    let jP = iP;
    let jQ = iQ;
    let gP = gP0;
    let gQ = gQ0;
    for (let i = k - 1; i >= 0; i--) {
      // g(a − 1) = g(a) · a / (x (a + b − 1)), stepping a from i + 3/2 to i + 1/2 (and i + 2 to i + 1).
      gP *= (i + 1.5) / (x * (i + 0.5 + b));
      gQ *= (i + 2) / (x * (i + 1 + b));
      // Where the mode's term underflowed (tiny x), take the term directly instead.
      if (!Number.isFinite(gP) || !Number.isFinite(gQ)) {
        gP = (b / (i + 0.5 + b)) * binomialDensity(i + 0.5, i + 0.5 + b, x, oneMinusX);
        gQ = (b / (i + 1 + b)) * binomialDensity(i + 1, i + 1 + b, x, oneMinusX);
      }
      jP -= sgn * gP;
      jQ -= sgn * gQ;
      p *= (i + 1) / lambda;
      q *= (i + 1.5) / lambda;
      const term = p * jP + q * jQ;
      sum += term;
      // Below the mode the weights fall faster than geometrically (ratio i/λ), so once a weight is
      // negligible against the sum, so is everything below it.
      if ((Math.abs(p) + Math.abs(q)) * (i / (lambda - i)) <= EPS * Math.abs(sum)) break;
    }
  }

  // Forward from the mode.
  {
    let p = pK;
    let q = qK;
    let jP = iP;
    let jQ = iQ;
    let gP = gP0;
    let gQ = gQ0;
    for (let i = k; i < k + MAX_TERMS; i++) {
      sum += p * jP + q * jQ;
      const aPi = i + 0.5;
      const aQi = i + 1;
      jP += sgn * gP;
      jQ += sgn * gQ;
      gP *= (x * (aPi + b)) / (aPi + 1);
      gQ *= (x * (aQi + b)) / (aQi + 1);
      p *= lambda / (i + 1);
      q *= lambda / (i + 1.5);
      // p, q, jP, jQ now belong to term i + 1. Above the mode the weights fall at least
      // geometrically (ratio λ/(i + 2)), and each J ≤ 1 is monotone (I falls, 1 − I rises), so the
      // remainder is at most (|p| + |q|) / (1 − λ/(i + 2)) · max J.
      if (i + 2 > lambda) {
        const tail = (Math.abs(p) + Math.abs(q)) / (1 - lambda / (i + 2));
        const jMax = upper ? 1 : Math.max(Math.abs(jP), Math.abs(jQ));
        if (tail * jMax <= EPS * Math.abs(sum) || tail < 1e-300) break;
      }
    }
  }
  return 0.5 * sum;
}

/**
 * P(T' ≤ x) for the noncentral t distribution with `df` degrees of freedom and noncentrality `delta`.
 */
export function noncentralTCdf(x: number, df: number, delta: number): number {
  if (Number.isNaN(x) || Number.isNaN(df) || Number.isNaN(delta) || !(df > 0)) return NaN;
  if (delta === 0) return studentTCdf(x, df);
  if (x === Infinity) return 1;
  if (x === -Infinity) return 0;
  if (x * x === 0) return normalCdf(-delta); // x = 0, or so small that x² underflows
  if (x > 0) {
    if (delta > 0) {
      const lower = normalCdf(-delta) + mixtureSum(x, df, delta, false);
      // Upper tail keeps relative precision through its own positive series.
      if (lower > 0.5) return 1 - mixtureSum(x, df, delta, true);
      return Math.min(1, Math.max(0, lower));
    }
    const lower = normalCdf(-delta) + mixtureSum(x, df, delta, false);
    return Math.min(1, Math.max(0, lower));
  }
  // x < 0: F(x; ν, δ) = 1 − F(−x; ν, −δ) = upper tail of (−x; ν, −δ).
  const d = -delta;
  if (d > 0) {
    return Math.min(1, Math.max(0, mixtureSum(-x, df, d, true)));
  }
  return Math.min(1, Math.max(0, 1 - (normalCdf(-d) + mixtureSum(-x, df, d, false))));
}

/**
 * P(T' > x), the survival function, summed as its own series so that it keeps relative precision
 * deep in the upper tail (where 1 − cdf would only resolve about 1e-16).
 */
export function noncentralTSf(x: number, df: number, delta: number): number {
  if (Number.isNaN(x) || Number.isNaN(df) || Number.isNaN(delta) || !(df > 0)) return NaN;
  if (x < 0) return noncentralTCdf(-x, df, -delta);
  if (x === Infinity) return 0;
  if (x * x === 0) return normalCdf(delta);
  if (delta === 0) return studentTCdf(-x, df);
  return Math.min(1, Math.max(0, mixtureSum(x, df, delta, true)));
}

/**
 * Starting value for the quantile: treat √(χ²_ν/ν) as normal with mean 1 and variance 1/(2ν),
 * which turns P(T' ≤ x) = p into a quadratic in x (the approximation behind Natrella's tolerance
 * factor formula, NIST/SEMATECH e-Handbook 7.2.6.3).
 */
function quantileGuess(p: number, df: number, delta: number): number {
  const z = normalQuantile(p);
  const a = 1 - (z * z) / (2 * df);
  const disc = delta * delta - a * (delta * delta - z * z);
  if (a > 0.05 && disc >= 0) return (delta + Math.sign(z) * Math.sqrt(disc)) / a;
  return delta + z;
}

/**
 * x with P(T' ≤ x) = p, found by bracketing from an approximate start and Brent's method
 * (Brent 1973, *Algorithms for Minimization without Derivatives*, ch. 4) to full double precision.
 * Degenerate input: p outside [0, 1], df ≤ 0 or NaN → NaN; p = 0 → −∞; p = 1 → +∞.
 */
export function noncentralTQuantile(p: number, df: number, delta: number): number {
  if (Number.isNaN(p) || Number.isNaN(df) || Number.isNaN(delta) || !(df > 0) || p < 0 || p > 1) return NaN;
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  const f = (x: number): number => noncentralTCdf(x, df, delta) - p;
  const x0 = quantileGuess(p, df, delta);
  let step = 0.02 * (Math.abs(x0) + 1);
  let lo = x0 - step;
  let hi = x0 + step;
  let flo = f(lo);
  let fhi = f(hi);
  let guard = 0;
  while (flo > 0 && guard++ < 200) {
    hi = lo;
    fhi = flo;
    step *= 2;
    lo -= step;
    flo = f(lo);
  }
  guard = 0;
  while (fhi < 0 && guard++ < 200) {
    lo = hi;
    flo = fhi;
    step *= 2;
    hi += step;
    fhi = f(hi);
  }
  if (flo > 0 || fhi < 0) return NaN;
  return brent(f, lo, hi, flo, fhi);
}

/** Brent's root finder on a bracket [a, b] with f(a)·f(b) ≤ 0. */
function brent(f: (x: number) => number, a0: number, b0: number, fa0: number, fb0: number): number {
  let a = a0;
  let b = b0;
  let fa = fa0;
  let fb = fb0;
  if (fa === 0) return a;
  if (fb === 0) return b;
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let iter = 0; iter < 200; iter++) {
    if ((fb > 0 && fc > 0) || (fb < 0 && fc < 0)) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol = 2 * Number.EPSILON * Math.abs(b) + 1e-300;
    const m = 0.5 * (c - b);
    if (Math.abs(m) <= tol || fb === 0) return b;
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let pp: number;
      let qq: number;
      if (a === c) {
        pp = 2 * m * s;
        qq = 1 - s;
      } else {
        const q0 = fa / fc;
        const r = fb / fc;
        pp = s * (2 * m * q0 * (q0 - r) - (b - a) * (r - 1));
        qq = (q0 - 1) * (r - 1) * (s - 1);
      }
      if (pp > 0) qq = -qq;
      else pp = -pp;
      if (2 * pp < Math.min(3 * m * qq - Math.abs(tol * qq), Math.abs(e * qq))) {
        e = d;
        d = pp / qq;
      } else {
        d = m;
        e = m;
      }
    } else {
      d = m;
      e = m;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
  }
  return b;
}
