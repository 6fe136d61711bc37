/**
 * One-sided lower tolerance limits: a value L such that, with confidence γ, at least a proportion
 * p (the coverage) of the population lies above L.
 *
 * - normal: L = x̄ − k·s, k the exact noncentral-t factor (ISO 16269-6; tolerance-factor.ts).
 * - lognormal: the same on ln x, L = exp(mean(ln x) − k·sd(ln x)) — exact for the lognormal model.
 * - Weibull: no exact closed form. Large-sample (Wald) bound on the log-quantile of the
 *   smallest-extreme-value MLE, using the Fisher information of complete samples (Lawless 2003,
 *   *Statistical Models and Methods for Lifetime Data*, §5.2; Meeker & Escobar 1998, *Statistical
 *   Methods for Reliability Data*, §8.4): with u = ln λ̂, b = 1/k̂, w = ln(−ln p),
 *     y = u + w·b,   Var(y) ≈ (b²/n)·(V_uu + 2w·V_ub + w²·V_bb),
 *   where (V_uu, V_ub, V_bb) = (1.1087, −0.2570, 0.6079) is the inverse of the per-observation
 *   information [[1, 1 − γ_E], [1 − γ_E, π²/6 + (1 − γ_E)²]] (γ_E = Euler's constant, exact below);
 *   L = exp(y − z_γ·√Var(y)). Approximate; it errs on the liberal side for small n. Simulated
 *   attained confidence (shape 12, 2000 samples each; test/stats-summary.test.ts checks n = 30, 200):
 *   nominal 0.75 at p = 0.95 → 0.65 (n = 20), 0.69 (n = 50), 0.73 (n = 200);
 *   nominal 0.95 at p = 0.99 → 0.88, 0.91, 0.935. Hence the summary gives it only from n = 20.
 *
 * Units: as the data. Degenerate input: n < 2 or zero spread → NaN.
 */
import { normalToleranceFactor } from './tolerance-factor.ts';
import { normalQuantile } from './special/normal.ts';

const EULER_GAMMA = 0.5772156649015329;
const I_UB = 1 - EULER_GAMMA;
const I_BB = (Math.PI * Math.PI) / 6 + I_UB * I_UB;
const DET = I_BB - I_UB * I_UB; // = π²/6
/** Inverse Fisher information (times n / b²) of the smallest-extreme-value MLE (u, b). */
export const SEV_INVERSE_INFORMATION = { uu: I_BB / DET, ub: -I_UB / DET, bb: 1 / DET } as const;

export function normalLowerToleranceLimit(mean: number, sd: number, n: number, coverage: number, confidence: number): number {
  return mean - normalToleranceFactor(n, coverage, confidence) * sd;
}

/** meanLog, sdLog: sample mean and standard deviation (n − 1) of ln x. */
export function lognormalLowerToleranceLimit(meanLog: number, sdLog: number, n: number, coverage: number, confidence: number): number {
  return Math.exp(meanLog - normalToleranceFactor(n, coverage, confidence) * sdLog);
}

/** shape k̂ and scale λ̂ are the Weibull MLEs from n complete observations. */
export function weibullLowerToleranceLimit(shape: number, scale: number, n: number, coverage: number, confidence: number): number {
  if (!(n >= 2 && shape > 0 && scale > 0 && coverage > 0 && coverage < 1 && confidence > 0 && confidence < 1)) return NaN;
  const u = Math.log(scale);
  const b = 1 / shape;
  const w = Math.log(-Math.log(coverage));
  const y = u + w * b;
  const v = SEV_INVERSE_INFORMATION;
  const varY = ((b * b) / n) * (v.uu + 2 * w * v.ub + w * w * v.bb);
  return Math.exp(y - normalQuantile(confidence) * Math.sqrt(varY));
}
