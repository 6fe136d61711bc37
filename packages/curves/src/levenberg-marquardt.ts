/**
 * Nonlinear least squares for small models (1–4 parameters) with box bounds, by
 * Levenberg–Marquardt, without allocating per point or per iteration.
 *
 * Method: each step solves (JᵀJ + λ·D)·δ = Jᵀr for the free parameters (Cholesky), where D is
 * the running maximum of diag(JᵀJ), which makes the steps independent of the parameters' scales
 * (Marquardt 1963; the diagonal scaling of MINPACK's lmder, Moré 1978). λ follows the gain ratio
 * ρ = actual / predicted reduction of the sum of squares: λ·max(1/3, 1 − (2ρ − 1)³) after an
 * accepted step, λ·ν with ν doubling after a rejected one (Nielsen 1999, as given in Madsen,
 * Nielsen & Tingleff, "Methods for non-linear least squares problems", 2004, §3.2; from memory).
 * Bounds by projection: a trial point is clamped into the box, and a parameter on a bound whose
 * gradient points out of the box is held there for that step (an active set), so a fit whose
 * optimum lies on a bound ends there instead of stalling beside it. JᵀJ and Jᵀr are accumulated
 * point by point, so no Jacobian matrix is stored.
 *
 * Stops when a step changes the sum of squares by at most FTOL relative and predicts no more
 * (MINPACK's ftol test), when the scaled step is below XTOL of the scaled parameters, when no
 * step can reduce the sum any further, or after MAX_EVALUATIONS evaluations of the model (the
 * best point is returned).
 *
 * Written here rather than taken from the registry: the package used before
 * (ml-levenberg-marquardt 5.1) allocates arrays per point and per iteration, stops on an absolute
 * error only and needed up to 40 × 5 restarted rounds; the four law fits took 4–5 ms per test,
 * about 90 % of the reduction. No registry package solves 2–4 parameter problems without
 * allocation. Checked against NIST's StRD nonlinear regression certified values and SciPy's
 * curve_fit (levenberg-marquardt.test.ts, test/curves-law-fits-scipy.test.ts).
 *
 * In: x, y (any units; residuals are y − f), the model writing ∂f/∂θ into `grad` and returning
 * f(θ, x) (it must not call leastSquares itself: the work arrays are shared), start θ0, bounds.
 * Out: θ and the sum of squared residuals (y units²), or null with fewer points than parameters
 * plus one, more than 4 parameters, or a start or result that is not finite.
 */

/** Writes ∂f/∂θ at x into `grad` and returns f(θ, x). */
export type ModelWithGradient = (theta: Float64Array, x: number, grad: Float64Array) => number;

export interface LeastSquaresResult { theta: number[]; sse: number; evaluations: number }

export const MAX_PARAMETERS = 4;
// a sum of squares within 1e-12 (relative) of its minimum leaves the parameters within about
// 1e-5 of their standard errors of the optimum (for up to ~100 points)
const FTOL = 1e-12;
const XTOL = 1e-10;
const MAX_EVALUATIONS = 400;
const LAMBDA_MAX = 1e30;

// work arrays, shared by all calls (a call never re-enters: the model does not fit)
const P = MAX_PARAMETERS;
const theta = new Float64Array(P), trial = new Float64Array(P), step = new Float64Array(P);
const grad = new Float64Array(P), diag = new Float64Array(P), rhs = new Float64Array(P);
const free = new Uint8Array(P);
let jtj = new Float64Array(P * P), jtr = new Float64Array(P);
let jtjTrial = new Float64Array(P * P), jtrTrial = new Float64Array(P);
const chol = new Float64Array(P * P);

/** Sum of squares at θ; JᵀJ (upper triangle) and Jᵀr into a and b. */
function accumulate(x: ArrayLike<number>, y: ArrayLike<number>, model: ModelWithGradient, th: Float64Array, np: number, a: Float64Array, b: Float64Array): number {
  a.fill(0);
  b.fill(0);
  let sse = 0;
  for (let i = 0; i < x.length; i++) {
    const r = y[i] - model(th, x[i], grad);
    sse += r * r;
    for (let j = 0; j < np; j++) {
      const gj = grad[j];
      b[j] += gj * r;
      for (let k = j; k < np; k++) a[j * P + k] += gj * grad[k];
    }
  }
  return sse;
}

/**
 * Solves (A + λ·diag(d))·δ = b over the free parameters (the others get δ = 0), by Cholesky on
 * the system scaled to unit diagonal. Returns false when it is not positive definite.
 */
function solveDamped(np: number, lambda: number): boolean {
  for (let j = 0; j < np; j++) {
    step[j] = 0;
    if (!free[j]) continue;
    const sj = 1 / Math.sqrt(diag[j]);
    for (let k = j; k < np; k++) {
      if (!free[k]) continue;
      const v = jtj[j * P + k] * sj / Math.sqrt(diag[k]);
      chol[j * P + k] = j === k ? v + lambda : v;
    }
    rhs[j] = jtr[j] * sj;
  }
  // in place: upper triangle becomes Rᵀ's rows (A = RᵀR)
  for (let j = 0; j < np; j++) {
    if (!free[j]) continue;
    let s = chol[j * P + j];
    for (let i = 0; i < j; i++) if (free[i]) s -= chol[i * P + j] * chol[i * P + j];
    if (!(s > 0)) return false;
    const rjj = Math.sqrt(s);
    chol[j * P + j] = rjj;
    for (let k = j + 1; k < np; k++) {
      if (!free[k]) continue;
      let t = chol[j * P + k];
      for (let i = 0; i < j; i++) if (free[i]) t -= chol[i * P + j] * chol[i * P + k];
      chol[j * P + k] = t / rjj;
    }
  }
  for (let j = 0; j < np; j++) {
    if (!free[j]) continue;
    let t = rhs[j];
    for (let i = 0; i < j; i++) if (free[i]) t -= chol[i * P + j] * rhs[i];
    rhs[j] = t / chol[j * P + j];
  }
  for (let j = np - 1; j >= 0; j--) {
    if (!free[j]) continue;
    let t = rhs[j];
    for (let k = j + 1; k < np; k++) if (free[k]) t -= chol[j * P + k] * rhs[k];
    rhs[j] = t / chol[j * P + j];
    step[j] = rhs[j] / Math.sqrt(diag[j]);
  }
  return true;
}

/** δᵀ(2b − Aδ): the reduction of the sum of squares the linear model predicts for the step δ. */
function predictedReduction(np: number, d: Float64Array): number {
  let s = 0;
  for (let j = 0; j < np; j++) {
    let ad = 0;
    for (let k = 0; k < np; k++) ad += (j <= k ? jtj[j * P + k] : jtj[k * P + j]) * d[k];
    s += d[j] * (2 * jtr[j] - ad);
  }
  return s;
}

export function leastSquares(
  x: ArrayLike<number>, y: ArrayLike<number>, model: ModelWithGradient,
  theta0: ArrayLike<number>, lower: ArrayLike<number>, upper: ArrayLike<number>,
): LeastSquaresResult | null {
  const np = theta0.length;
  if (np < 1 || np > P || x.length < np + 1 || y.length !== x.length) return null;
  for (let j = 0; j < np; j++) {
    if (!Number.isFinite(theta0[j])) return null;
    theta[j] = Math.min(upper[j], Math.max(lower[j], theta0[j]));
  }
  let sse = accumulate(x, y, model, theta, np, jtj, jtr);
  let evaluations = 1;
  if (!Number.isFinite(sse)) return null;
  for (let j = 0; j < np; j++) diag[j] = jtj[j * P + j] > 0 ? jtj[j * P + j] : 1;
  let lambda = 1e-3, nu = 2;
  while (evaluations < MAX_EVALUATIONS && sse > 0) {
    for (let j = 0; j < np; j++) {
      free[j] = (theta[j] <= lower[j] && jtr[j] < 0) || (theta[j] >= upper[j] && jtr[j] > 0) ? 0 : 1;
    }
    if (!solveDamped(np, lambda)) {
      lambda *= nu; nu *= 2;
      if (lambda > LAMBDA_MAX) break;
      continue;
    }
    let moved = false, stepNorm = 0, thetaNorm = 0;
    for (let j = 0; j < np; j++) {
      trial[j] = Math.min(upper[j], Math.max(lower[j], theta[j] + step[j]));
      step[j] = trial[j] - theta[j];
      if (step[j] !== 0) moved = true;
      const w = Math.sqrt(diag[j]);
      stepNorm += (w * step[j]) ** 2;
      thetaNorm += (w * theta[j]) ** 2;
    }
    if (!moved) break;
    const predicted = predictedReduction(np, step);
    const sseTrial = accumulate(x, y, model, trial, np, jtjTrial, jtrTrial);
    evaluations++;
    const actual = sse - sseTrial;
    const rho = predicted > 0 ? actual / predicted : -1;
    const tiny = Math.abs(actual) <= FTOL * sse && predicted <= FTOL * sse;
    if (Number.isFinite(sseTrial) && actual > 0 && rho > 0) {
      theta.set(trial);
      const a = jtj; jtj = jtjTrial; jtjTrial = a;
      const b = jtr; jtr = jtrTrial; jtrTrial = b;
      sse = sseTrial;
      for (let j = 0; j < np; j++) if (jtj[j * P + j] > diag[j]) diag[j] = jtj[j * P + j];
      lambda *= Math.max(1 / 3, 1 - (2 * rho - 1) ** 3);
      nu = 2;
      if (tiny || stepNorm <= XTOL * XTOL * thetaNorm) break;
    } else {
      if (tiny) break;
      lambda *= nu; nu *= 2;
      if (lambda > LAMBDA_MAX) break;
    }
  }
  const out = Array.from(theta.subarray(0, np));
  if (!out.every(Number.isFinite) || !Number.isFinite(sse)) return null;
  return { theta: out, sse, evaluations };
}
