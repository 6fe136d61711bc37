/**
 * Nonparametric bootstrap of a joint property model (Efron & Tibshirani 1993, *An Introduction to
 * the Bootstrap*, ch. 6–7): B resamples of the tests (rows) with replacement, each refitted the
 * way the model was fitted — every marginal by maximum likelihood in the family chosen on the data
 * (fit-normal.ts, fit-weibull.ts; the family is held fixed), the Spearman matrix pairwise complete
 * (correlation.ts). Rows are resampled whole, so the replicates carry the joint uncertainty of the
 * marginals and of the correlations. Resampling indices come from the seeded Mersenne Twister
 * (seeded-generators.ts); the same seed gives the same replicates.
 *
 * `bootstrapCovariance` summarizes one marginal's replicates as the sample covariance (divisor
 * B − 1) of its two parameters; `bootstrapSpearmanSe` the standard deviation of each correlation.
 *
 * In: columns of equal length (one row per test, NaN = missing), the family of each, B, a seed.
 * Out: the replicates that could be fitted (a resample in which some marginal cannot be fitted,
 * e.g. all its values equal, is dropped and counted). Degenerate input: B < 2 → error value.
 */
import { sampleCovariance, sampleStandardDeviation, sampleVariance } from 'simple-statistics';
import { correlationMatrices } from './correlation.ts';
import type { ModelName } from './fit-types.ts';
import { mleParameters } from './mle-parameters.ts';
import { uniformStream } from './seeded-generators.ts';

export const BOOTSTRAP_METHOD = 'nonparametric bootstrap of the tests (Efron & Tibshirani 1993), families held fixed';

export interface BootstrapReplicate {
  /** one parameter set per marginal, in the order of the columns */
  parameters: Record<string, number>[];
  spearman: (number | null)[][];
}

export interface ModelBootstrap {
  method: typeof BOOTSTRAP_METHOD;
  requested: number;
  seed: number;
  replicates: BootstrapReplicate[];
  /** resamples dropped because a marginal could not be fitted */
  failed: number;
}

export const PARAMETER_NAMES: Record<ModelName, [string, string]> = {
  normal: ['mu', 'sigma'],
  lognormal: ['mu', 'sigma'],
  weibull: ['shape', 'scale'],
};

export function bootstrapModel(columns: readonly ArrayLike<number>[], families: readonly ModelName[], replicates: number, seed: number): ModelBootstrap | { code: 'bad-count'; message: string } {
  if (!(Number.isInteger(replicates) && replicates >= 2)) return { code: 'bad-count', message: `bootstrap replicates must be a whole number ≥ 2, got ${replicates}` };
  const rows = columns.reduce((a, c) => Math.min(a, c.length), Infinity);
  const n = Number.isFinite(rows) ? rows : 0;
  const u = uniformStream(seed);
  const out: BootstrapReplicate[] = [];
  let failed = 0;
  const resampled = columns.map(() => new Float64Array(n));
  for (let b = 0; b < replicates; b++) {
    for (let r = 0; r < n; r++) {
      const pick = Math.floor(u() * n);
      for (let c = 0; c < columns.length; c++) resampled[c][r] = columns[c][pick];
    }
    const fits = families.map((f, c) => mleParameters(f, resampled[c]));
    if (fits.some((f) => f === null)) {
      failed++;
      continue;
    }
    const cols: Record<string, Float64Array> = {};
    resampled.forEach((c, i) => (cols[`c${i}`] = c));
    out.push({ parameters: fits as Record<string, number>[], spearman: correlationMatrices(cols).spearman });
  }
  return { method: BOOTSTRAP_METHOD, requested: replicates, seed, replicates: out, failed };
}

/** Covariance (divisor B − 1, simple-statistics) of marginal `index`'s two parameters over the replicates; null with fewer than 2. */
export function bootstrapCovariance(boot: Pick<ModelBootstrap, 'replicates'>, index: number, names: [string, string]): { covariance: [[number, number], [number, number]]; standard_errors: [number, number]; correlation: number } | null {
  const a = boot.replicates.map((r) => r.parameters[index][names[0]]);
  const b = boot.replicates.map((r) => r.parameters[index][names[1]]);
  if (a.length < 2) return null;
  const cab = sampleCovariance(a, b);
  const cov: [[number, number], [number, number]] = [[sampleVariance(a), cab], [cab, sampleVariance(b)]];
  const se: [number, number] = [Math.sqrt(cov[0][0]), Math.sqrt(cov[1][1])];
  return { covariance: cov, standard_errors: se, correlation: cab / (se[0] * se[1]) };
}

/** Standard deviation (divisor B − 1) of each Spearman coefficient over the replicates (null where fewer than 2 are defined). */
export function bootstrapSpearmanSe(boot: Pick<ModelBootstrap, 'replicates'>, size: number): (number | null)[][] {
  return Array.from({ length: size }, (_, i) =>
    Array.from({ length: size }, (_, j) => {
      if (i === j) return 0;
      const v = boot.replicates.map((r) => r.spearman[i][j]).filter((x): x is number => x !== null);
      return v.length < 2 ? null : sampleStandardDeviation(v);
    }),
  );
}
