/**
 * Asymptotic covariance of the maximum-likelihood estimates of a two-parameter fit: the inverse of
 * the observed information J = −∂²ℓ/∂θ∂θᵀ at the MLE (Efron & Hinkley 1978; Lawless 2003,
 * *Statistical Models and Methods for Lifetime Data*, §B.2), in the parameters the fit reports:
 *
 * - normal (μ, σ), σ the MLE: J = diag(n/σ², 2n/σ²), so Var μ̂ = σ²/n, Var σ̂ = σ²/(2n), uncorrelated;
 * - lognormal (μ, σ) of ln x: the same on the logs;
 * - Weibull (k, λ), with z_i = (x_i/λ)^k, L_i = ln(x_i/λ) and Σ z_i = n at the MLE:
 *   J_kk = n/k² + Σ z_i L_i², J_kλ = −(k/λ) Σ z_i L_i, J_λλ = n k²/λ².
 *
 * In: the fit and the values it was fitted on (finite; for lognormal and Weibull > 0). Out: the
 * parameter names in order, the 2 × 2 covariance, standard errors and their correlation; units
 * those of the parameters (squared). Degenerate input: fewer than 3 values or a singular J → null.
 */
import type { FitResult } from './fit-types.ts';

export interface ParameterCovariance {
  method: 'observed information';
  parameters: [string, string];
  covariance: [[number, number], [number, number]];
  standard_errors: [number, number];
  correlation: number;
}

export function mleCovariance(fit: Pick<FitResult, 'model' | 'params'>, values: ArrayLike<number>): ParameterCovariance | null {
  const x: number[] = [];
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) x.push(values[i]);
  const n = x.length;
  if (n < 3) return null;
  let names: [string, string];
  let jaa: number;
  let jab: number;
  let jbb: number;
  if (fit.model === 'normal' || fit.model === 'lognormal') {
    const s = fit.params.sigma;
    names = ['mu', 'sigma'];
    jaa = n / (s * s);
    jab = 0;
    jbb = (2 * n) / (s * s);
  } else {
    const k = fit.params.shape;
    const lam = fit.params.scale;
    let sz = 0;
    let szl = 0;
    let szl2 = 0;
    for (const v of x) {
      if (!(v > 0)) return null;
      const l = Math.log(v / lam);
      const z = Math.exp(k * l);
      sz += z;
      szl += z * l;
      szl2 += z * l * l;
    }
    // the general second derivatives; with Σ z = n (the MLE) they reduce to the forms above
    names = ['shape', 'scale'];
    jaa = n / (k * k) + szl2;
    jab = (n - sz - k * szl) / lam;
    jbb = (k * ((k + 1) * sz - n)) / (lam * lam);
  }
  const det = jaa * jbb - jab * jab;
  if (!(det > 0) || !Number.isFinite(det)) return null;
  const caa = jbb / det;
  const cab = -jab / det || 0; // 0, not −0, where the parameters are uncorrelated
  const cbb = jaa / det;
  const se: [number, number] = [Math.sqrt(caa), Math.sqrt(cbb)];
  return { method: 'observed information', parameters: names, covariance: [[caa, cab], [cab, cbb]], standard_errors: se, correlation: cab / (se[0] * se[1]) };
}
