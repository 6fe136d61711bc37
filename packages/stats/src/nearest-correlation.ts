/**
 * Nearest correlation matrix in the Frobenius norm (Higham, N. J. 2002, "Computing the nearest
 * correlation matrix — a problem from finance", IMA J. Numer. Anal. 22:329–343, Algorithm 3.3):
 * alternating projections with Dykstra's correction between the positive semidefinite matrices
 * (eigenvalues clipped; here at `minEigenvalue` so the result has a Cholesky factor) and the
 * matrices with unit diagonal,
 *   R = Y − ΔS;  X = P_S(R);  ΔS = X − R;  Y = P_U(X),
 * until X and Y agree to `tolerance`. The symmetric eigendecomposition is ml-matrix's. The last X
 * is scaled to unit diagonal, D^{-1/2} X D^{-1/2}, which keeps it positive definite.
 *
 * Input: a symmetric matrix with unit diagonal (e.g. a pairwise-complete estimate that is not
 * positive definite). Output: the repaired matrix, its Frobenius distance from the input, the
 * largest entry change and the iterations. A matrix that is already positive definite (smallest
 * eigenvalue ≥ minEigenvalue) is returned unchanged with 0 iterations. Dimensionless.
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';

export interface NearestCorrelation {
  matrix: number[][];
  frobeniusDistance: number;
  maxChange: number;
  iterations: number;
  converged: boolean;
}

export interface NearestCorrelationOptions {
  minEigenvalue?: number;
  tolerance?: number;
  maxIterations?: number;
}

function projectPsd(r: Matrix, floor: number): Matrix {
  const e = new EigenvalueDecomposition(r, { assumeSymmetric: true });
  const v = e.eigenvectorMatrix;
  const d = e.realEigenvalues.map((x) => Math.max(x, floor));
  const scaled = v.clone();
  for (let j = 0; j < d.length; j++) for (let i = 0; i < v.rows; i++) scaled.set(i, j, v.get(i, j) * d[j]);
  const x = scaled.mmul(v.transpose());
  // symmetrize against rounding (ml-matrix's instance add/sub/mul work in place; the static ones copy)
  return Matrix.add(x, x.transpose()).mul(0.5);
}

function smallestEigenvalue(a: Matrix): number {
  return Math.min(...new EigenvalueDecomposition(a, { assumeSymmetric: true }).realEigenvalues);
}

export function nearestCorrelation(a: number[][], opts: NearestCorrelationOptions = {}): NearestCorrelation {
  const floor = opts.minEigenvalue ?? 1e-8;
  const tol = opts.tolerance ?? 1e-12;
  const maxIter = opts.maxIterations ?? 10_000;
  const m = a.length;
  const A = new Matrix(a);
  if (m === 0 || smallestEigenvalue(A) >= floor) return { matrix: a.map((r) => [...r]), frobeniusDistance: 0, maxChange: 0, iterations: 0, converged: true };
  let y = A.clone();
  let ds = Matrix.zeros(m, m);
  let x = A.clone();
  let iterations = 0;
  let converged = false;
  for (; iterations < maxIter; ) {
    iterations++;
    const r = Matrix.sub(y, ds);
    x = projectPsd(r, floor);
    ds = Matrix.sub(x, r);
    const yNext = x.clone();
    for (let i = 0; i < m; i++) yNext.set(i, i, 1);
    const change = Matrix.sub(yNext, y).norm('frobenius') / Math.max(1, y.norm('frobenius'));
    y = yNext;
    if (change < tol && Matrix.sub(x, y).norm('frobenius') < Math.sqrt(tol)) {
      converged = true;
      break;
    }
  }
  const out: number[][] = Array.from({ length: m }, (_, i) => Array.from({ length: m }, (_, j) => (i === j ? 1 : x.get(i, j) / Math.sqrt(x.get(i, i) * x.get(j, j)))));
  let dist = 0;
  let maxChange = 0;
  for (let i = 0; i < m; i++)
    for (let j = 0; j < m; j++) {
      const d = out[i][j] - a[i][j];
      dist += d * d;
      maxChange = Math.max(maxChange, Math.abs(d));
    }
  return { matrix: out, frobeniusDistance: Math.sqrt(dist), maxChange, iterations, converged };
}
