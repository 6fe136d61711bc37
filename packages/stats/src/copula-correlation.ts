/**
 * The correlation matrix of a Gaussian copula with a given Spearman matrix ρ_S:
 * ρ = 2 sin(π ρ_S / 6), which gives exactly ρ_S as the copula's Spearman correlation (Pearson
 * 1907; Kruskal 1958). Where that matrix is not positive definite (pairwise-complete estimates
 * need not be), it is replaced by the nearest correlation matrix in the Frobenius norm (Higham
 * 2002; nearest-correlation.ts), and `repair` says by how much. Also returns the lower Cholesky
 * factor the sampler multiplies by (written here: a dozen lines, and it doubles as the test of
 * positive definiteness, pivot > 1e-12).
 *
 * Null entries of ρ_S (unknown correlation) are taken as 0. Dimensionless. Degenerate input: a
 * matrix that stays indefinite after the repair → null.
 */
import { nearestCorrelation } from './nearest-correlation.ts';

export interface CopulaRepair {
  method: 'nearest correlation matrix (Higham 2002)';
  /** Frobenius distance between the target copula correlation and the one used */
  frobenius_distance: number;
  /** largest change of one entry */
  max_change: number;
  iterations: number;
}

export interface GaussianCopula {
  /** the normal-copula correlation used (after any repair) */
  matrix: number[][];
  /** its lower Cholesky factor */
  factor: number[][];
  /** how it was made positive definite; null when it was already */
  repair: CopulaRepair | null;
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

export function gaussianCopulaCorrelation(spearman: readonly (readonly (number | null)[])[]): GaussianCopula | null {
  const m = spearman.length;
  const target = Array.from({ length: m }, (_, i) =>
    Array.from({ length: m }, (_, j) => (i === j ? 1 : 2 * Math.sin((Math.PI * (spearman[i][j] ?? 0)) / 6))),
  );
  const direct = cholesky(target);
  if (direct) return { matrix: target, factor: direct, repair: null };
  const near = nearestCorrelation(target);
  const factor = cholesky(near.matrix);
  if (!factor) return null;
  return {
    matrix: near.matrix,
    factor,
    repair: { method: 'nearest correlation matrix (Higham 2002)', frobenius_distance: near.frobeniusDistance, max_change: near.maxChange, iterations: near.iterations },
  };
}
