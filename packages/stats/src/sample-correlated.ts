/**
 * Correlated random property sets for reliability analyses, by the Gaussian copula
 * (Nelsen 2006, *An Introduction to Copulas*, §2.3; Iman & Conover 1982 for rank correlation).
 *
 1–2. The target Spearman matrix ρ_S is turned into the normal-copula correlation
 *    ρ = 2 sin(π ρ_S / 6), which gives exactly ρ_S as the Spearman correlation of the copula
 *    (Pearson 1907; Kruskal 1958); if that matrix is not positive definite (pairwise-complete
 *    estimates need not be), it is replaced by the nearest correlation matrix in the Frobenius
 *    norm (Higham 2002), which changes the consistent entries as little as possible; `repair`
 *    reports the distance and the largest change (copula-correlation.ts).
 * 3. Standard normal vectors z = L·ε (ε from the seeded Box–Muller generator of @stdlib, on the
 *    32-bit Mersenne Twister) are mapped through Φ and each marginal's quantile function
 *    (model-quantile.ts): normal μ + σz; lognormal exp(μ + σz); Weibull λ(−ln Φ(−z))^{1/k}.
 *
 * Units: each column in the unit of its marginal. Null entries of ρ_S (unknown correlation) are
 * taken as 0. Degenerate input: n < 0 or a matrix whose size differs from the marginals → error value.
 * The same seed gives the same sample.
 */
import type { FitResult } from './fit-types.ts';
import { gaussianCopulaCorrelation, type CopulaRepair } from './copula-correlation.ts';
import { modelQuantileOfScore } from './model-quantile.ts';
import { normalStream } from './seeded-generators.ts';

export type { CopulaRepair };

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
  const copula = gaussianCopulaCorrelation(spearman);
  if (!copula) return { code: 'bad-size', message: 'copula correlation could not be made positive definite' };
  const { factor: l, repair, matrix: used } = copula;
  const randn = normalStream(seed);
  const q = marginals.map(modelQuantileOfScore);
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
