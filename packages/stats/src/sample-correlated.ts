/**
 * Correlated random property sets for reliability analyses, by the Gaussian copula
 * (Nelsen 2006, *An Introduction to Copulas*, §2.3; Iman & Conover 1982 for rank correlation).
 *
 * 1. The target Spearman matrix ρ_S is turned into the normal-copula correlation
 *    ρ = 2 sin(π ρ_S / 6), which gives exactly ρ_S as the Spearman correlation of the copula
 *    (Pearson 1907; Kruskal 1958).
 * 2. If that matrix is not positive definite (pairwise-complete estimates need not be), it is
 *    replaced by the nearest correlation matrix in the Frobenius norm (Higham 2002, alternating
 *    projections; nearest-correlation.ts), which changes the consistent entries as little as
 *    possible; `repair` reports the distance and the largest change.
 * 3. Standard normal vectors z = L·ε (ε from the seeded Box–Muller generator of @stdlib, on the
 *    32-bit Mersenne Twister) are mapped through Φ and each marginal's quantile function:
 *    normal μ + σz; lognormal exp(μ + σz); Weibull λ(−ln Φ(−z))^{1/k}.
 *
 * Units: each column in the unit of its marginal. Null entries of ρ_S (unknown correlation) are
 * taken as 0. Degenerate input: n < 0 or a matrix whose size differs from the marginals → error value.
 * The same seed gives the same sample.
 */
import boxMuller from '@stdlib/random-base-box-muller';
import type { FitResult } from './fit-types.ts';
import { nearestCorrelation } from './nearest-correlation.ts';
import { normalLogCdf } from './special/normal.ts';

export interface CopulaRepair {
  method: 'nearest correlation matrix (Higham 2002)';
  /** Frobenius distance between the target copula correlation and the one used */
  frobenius_distance: number;
  /** largest change of one entry */
  max_change: number;
  iterations: number;
}

export interface CorrelatedSample {
  /** One column per marginal, in the order given. */
  columns: Float64Array[];
  /** How the copula correlation was made positive definite; null when it was already. */
  repair: CopulaRepair | null;
  /** The normal-copula correlation used (after any repair). */
  copulaCorrelation: number[][];
}

export interface SampleError {
  code: 'bad-size' | 'bad-count';
  message: string;
}

/** Lower Cholesky factor of a symmetric matrix, or null if it is not positive definite. */
function cholesky(a: number[][]): number[][] | null {
  const m = a.length;
  const l = Array.from({ length: m }, () => new Array<number>(m).fill(0));
  for (let i = 0; i < m; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i][j];
      for (let k = 0; k < j; k++) s -= l[i][k] * l[j][k];
      if (i === j) {
        if (!(s > 1e-12)) return null;
        l[i][i] = Math.sqrt(s);
      } else l[i][j] = s / l[j][j];
    }
  }
  return l;
}

function quantileOf(fit: Pick<FitResult, 'model' | 'params'>): (z: number) => number {
  const p = fit.params;
  switch (fit.model) {
    case 'normal':
      return (z) => p.mu + p.sigma * z;
    case 'lognormal':
      return (z) => Math.exp(p.mu + p.sigma * z);
    case 'weibull':
      // u = Φ(z); x = λ(−ln(1 − u))^{1/k}, with 1 − u = Φ(−z) taken in logs for the upper tail.
      return (z) => p.scale * Math.pow(-normalLogCdf(-z), 1 / p.shape);
  }
}

export function sampleCorrelated(
  marginals: Pick<FitResult, 'model' | 'params'>[],
  spearman: (number | null)[][],
  n: number,
  seed: number,
): CorrelatedSample | SampleError {
  const m = marginals.length;
  if (!(Number.isInteger(n) && n >= 0)) return { code: 'bad-count', message: `sample size must be a non-negative integer, got ${n}` };
  if (spearman.length !== m || spearman.some((row) => row.length !== m)) {
    return { code: 'bad-size', message: `Spearman matrix must be ${m}×${m} to match the marginals` };
  }
  const target = Array.from({ length: m }, (_, i) =>
    Array.from({ length: m }, (_, j) => (i === j ? 1 : 2 * Math.sin((Math.PI * (spearman[i][j] ?? 0)) / 6))),
  );
  let used = target;
  let repair: CopulaRepair | null = null;
  let l = cholesky(used);
  if (!l) {
    const near = nearestCorrelation(target);
    used = near.matrix;
    repair = { method: 'nearest correlation matrix (Higham 2002)', frobenius_distance: near.frobeniusDistance, max_change: near.maxChange, iterations: near.iterations };
    l = cholesky(used);
  }
  if (!l) return { code: 'bad-size', message: 'copula correlation could not be made positive definite' };
  const s = ((Math.floor(Math.abs(seed)) % 4294967295) + 4294967295) % 4294967295 || 1;
  const randn = boxMuller.factory({ seed: s });
  const q = marginals.map(quantileOf);
  const columns = marginals.map(() => new Float64Array(n));
  const eps = new Float64Array(m);
  for (let r = 0; r < n; r++) {
    for (let i = 0; i < m; i++) eps[i] = randn();
    for (let i = 0; i < m; i++) {
      let z = 0;
      for (let k = 0; k <= i; k++) z += l[i][k] * eps[k];
      columns[i][r] = q[i](z);
    }
  }
  return { columns, repair, copulaCorrelation: used };
}
