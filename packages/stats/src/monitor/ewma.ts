/**
 * EWMA chart on standardized values z (mean 0, SD 1 in control), Roberts (1959); limits and
 * average run lengths as in Lucas & Saccucci (1990), Technometrics 32:1–12, and Montgomery:
 *   w_i = λ·z_i + (1 − λ)·w_{i−1}, w_0 = 0,
 *   limits ±L·√(λ/(2−λ)·(1 − (1−λ)^{2i}))   ('exact', time-varying)
 *   or     ±L·√(λ/(2−λ))                     ('asymptotic', the limits of the ARL tables).
 * Units: z and w in standard deviations. Signals when w leaves the limits (strictly).
 */
import type { EwmaParams } from './types.ts';

/**
 * Default design λ = 0.10, L = 2.814: the Lucas & Saccucci (1990) design with in-control ARL 500
 * and ARL 10.3 for a 1σ shift (as tabulated by Montgomery). The often-quoted pair λ = 0.10,
 * L = 2.7 gives an in-control ARL of about 369 (and 9.7 for 1σ), by the Markov-chain method of
 * Lucas & Saccucci and by simulation; pass it explicitly to use that design.
 */
export const DEFAULT_EWMA: EwmaParams = { lambda: 0.1, L: 2.814 };

export type EwmaLimitKind = 'asymptotic' | 'exact';

/** Half-width of the limits at step i (1-based), in SD. */
export function ewmaHalfWidth(params: EwmaParams, i: number, kind: EwmaLimitKind): number {
  const { lambda, L } = params;
  const base = lambda / (2 - lambda);
  if (kind === 'asymptotic') return L * Math.sqrt(base);
  return L * Math.sqrt(base * (1 - Math.pow(1 - lambda, 2 * i)));
}

export interface EwmaChart {
  ewma: Float64Array;
  /** Half-width of the limits at each point (constant for 'asymptotic'). */
  halfWidth: Float64Array;
  outHigh: Uint8Array;
  outLow: Uint8Array;
}

export function ewmaChart(z: ArrayLike<number>, params: EwmaParams, kind: EwmaLimitKind = 'asymptotic'): EwmaChart {
  const n = z.length;
  const ewma = new Float64Array(n);
  const halfWidth = new Float64Array(n);
  const outHigh = new Uint8Array(n);
  const outLow = new Uint8Array(n);
  let w = 0;
  for (let i = 0; i < n; i++) {
    w = params.lambda * z[i] + (1 - params.lambda) * w;
    const hw = ewmaHalfWidth(params, i + 1, kind);
    ewma[i] = w;
    halfWidth[i] = hw;
    outHigh[i] = w > hw ? 1 : 0;
    outLow[i] = w < -hw ? 1 : 0;
  }
  return { ewma, halfWidth, outHigh, outLow };
}

/**
 * Run length of a fresh two-sided EWMA (zero start) fed by nextZ: the 1-based index of the first
 * signal, or maxRun if none by then. Same recursion and limits as ewmaChart.
 */
export function ewmaRunLength(nextZ: () => number, params: EwmaParams, kind: EwmaLimitKind = 'asymptotic', maxRun = 1_000_000): number {
  let w = 0;
  const hwInf = ewmaHalfWidth(params, Infinity, 'asymptotic');
  for (let i = 1; i <= maxRun; i++) {
    w = params.lambda * nextZ() + (1 - params.lambda) * w;
    const hw = kind === 'asymptotic' ? hwInf : ewmaHalfWidth(params, i, kind);
    if (w > hw || w < -hw) return i;
  }
  return maxRun;
}
