/**
 * Nonlinear least squares through ml-levenberg-marquardt (Levenberg–Marquardt), with the
 * conditioning that package leaves to the caller: parameters are scaled by their start values
 * (so every one starts at 1) and residuals by a typical y, and the analytical Jacobian is passed.
 * The package stops on an absolute error only; here it runs in rounds of 5 iterations until the
 * sum of squares improves by less than 1e-8 relative (at most 40 rounds), which leaves the
 * parameters far closer to the optimum than their standard errors. The package allocates per
 * point and iteration, so callers on a hot path should pass a few hundred points at most.
 *
 * In: x, y, model f(θ, x), its gradient ∂f/∂θ, start θ0 (non-zero entries), bounds on θ.
 * Out: θ and the sum of squared residuals (y units), or null when the result is not finite.
 */
import { levenbergMarquardt } from 'ml-levenberg-marquardt';

const ROUNDS = 40;
const ITERATIONS_PER_ROUND = 5;
const REL_TOL = 1e-8;

export type Model = (theta: readonly number[], x: number) => number;
export type ModelGradient = (theta: readonly number[], x: number) => number[];

export interface LmResult { theta: number[]; sse: number }

export function leastSquares(
  x: ArrayLike<number>, y: ArrayLike<number>, model: Model, gradient: ModelGradient,
  theta0: readonly number[], minTheta: readonly number[], maxTheta: readonly number[],
): LmResult | null {
  const np = theta0.length;
  if (x.length < np + 1 || theta0.some((t) => !Number.isFinite(t) || t === 0)) return null;
  let yScale = 0;
  for (let i = 0; i < y.length; i++) yScale = Math.max(yScale, Math.abs(y[i]));
  if (!(yScale > 0)) return null;
  const scale = theta0.slice();
  const toTheta = (p: number[]): number[] => p.map((v, k) => v * scale[k]);
  const data = { x, y: Float64Array.from(y as ArrayLike<number>, (v) => v / yScale) };
  const fn = (p: number[]) => { const th = toTheta(p); return (xi: number) => model(th, xi) / yScale; };
  const jac = (p: number[]) => { const th = toTheta(p); return (xi: number) => gradient(th, xi).map((g, k) => (g * scale[k]) / yScale); };
  const lo = minTheta.map((v, k) => (scale[k] > 0 ? v / scale[k] : maxTheta[k] / scale[k]));
  const hi = maxTheta.map((v, k) => (scale[k] > 0 ? v / scale[k] : minTheta[k] / scale[k]));
  let p: number[] = new Array(np).fill(1);
  let err = Infinity;
  try {
    for (let round = 0; round < ROUNDS; round++) {
      const r = levenbergMarquardt(data, fn, {
        initialValues: p, jacobianFunction: jac, minValues: lo, maxValues: hi,
        maxIterations: ITERATIONS_PER_ROUND, errorTolerance: 0, damping: 1e-3,
      });
      const e = r.parameterError;
      if (!(e <= err)) break;
      const improved = err - e;
      p = r.parameterValues;
      err = e;
      if (improved <= REL_TOL * e || e === 0) break;
    }
  } catch {
    return null;
  }
  const theta = toTheta(p);
  if (!theta.every(Number.isFinite) || !Number.isFinite(err)) return null;
  return { theta, sse: err * yScale * yScale };
}
