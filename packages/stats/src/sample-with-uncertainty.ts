/**
 * Correlated property sets with the statistical uncertainty of the model (two-level Monte Carlo:
 * an outer draw of the model, an inner draw of sets from it; Vose 2008, *Risk Analysis*, ch. 4 on
 * separating uncertainty from variability). The n sets are split into `draws` blocks of equal
 * size (the last blocks one smaller where n does not divide); block d is drawn by the Gaussian
 * copula (sample-correlated.ts) from its own model:
 *
 * - `asymptotic`: each marginal's parameters from the large-sample normal law of its MLEs
 *   (draw-parameters.ts), the copula's rank correlations held at their estimates;
 * - `bootstrap`: the marginals and the rank correlations of bootstrap replicate d mod B
 *   (bootstrap-model.ts), so the correlations vary too.
 *
 * With draws = n every set has its own model (the sets then follow the predictive law that
 * includes the estimation uncertainty); with fewer, an analysis can run its inner loop per block.
 * Seeded: parameters from sub-stream 0 of the seed, block d's sets from sub-stream d + 1
 * (seeded-generators.ts). Units: those of the marginals. Degenerate input: draws not in 1 … n, a
 * bootstrap without replicates, or a failing copula → error value.
 */
import type { BootstrapReplicate } from './bootstrap-model.ts';
import { drawParameters } from './draw-parameters.ts';
import type { FitResult } from './fit-types.ts';
import type { ParameterCovariance } from './mle-covariance.ts';
import { sampleCorrelated, type SampleError } from './sample-correlated.ts';
import { streamSeed } from './seeded-generators.ts';

export type ParameterUncertainty = 'asymptotic' | 'bootstrap';

export interface UncertainModel {
  marginals: Pick<FitResult, 'model' | 'params'>[];
  spearman: (number | null)[][];
  /** per marginal, for `asymptotic`; null holds that marginal at its estimate */
  covariances?: (Pick<ParameterCovariance, 'parameters' | 'covariance'> | null)[];
  /** for `bootstrap` */
  replicates?: readonly BootstrapReplicate[];
}

export interface UncertainSample {
  columns: Float64Array[];
  /** the model draw (block) of each set, 0-based */
  draw: Int32Array;
  /** the parameters of each model draw, one record per marginal */
  parameters: Record<string, number>[][];
  /** model draws whose rank-correlation matrix needed the nearest-correlation repair */
  repaired: number;
}

export function sampleWithUncertainty(model: UncertainModel, mode: ParameterUncertainty, n: number, draws: number, seed: number): UncertainSample | SampleError {
  if (!(Number.isInteger(n) && n >= 1 && Number.isInteger(draws) && draws >= 1 && draws <= n)) {
    return { code: 'bad-count', message: `parameter draws must be a whole number from 1 to the number of sets (${n}), got ${draws}` };
  }
  const m = model.marginals.length;
  let params: Record<string, number>[][];
  let spearmans: (number | null)[][][];
  if (mode === 'asymptotic') {
    const perMarginal = model.marginals.map((f, i) => drawParameters(f, model.covariances?.[i] ?? null, draws, streamSeed(streamSeed(seed, 0), i)));
    params = Array.from({ length: draws }, (_, d) => perMarginal.map((p) => p[d]));
    spearmans = Array.from({ length: draws }, () => model.spearman);
  } else {
    const reps = model.replicates ?? [];
    if (reps.length === 0) return { code: 'bad-count', message: 'no bootstrap replicates to draw from' };
    params = Array.from({ length: draws }, (_, d) => reps[d % reps.length].parameters);
    spearmans = Array.from({ length: draws }, (_, d) => reps[d % reps.length].spearman);
  }
  const columns = Array.from({ length: m }, () => new Float64Array(n));
  const drawOf = new Int32Array(n);
  let repaired = 0;
  for (let d = 0; d < draws; d++) {
    const from = Math.floor((d * n) / draws);
    const to = Math.floor(((d + 1) * n) / draws);
    const block = sampleCorrelated(model.marginals.map((f, i) => ({ model: f.model, params: params[d][i] })), spearmans[d], to - from, streamSeed(seed, d + 1));
    if ('code' in block) return block;
    if (block.repair) repaired++;
    for (let i = 0; i < m; i++) columns[i].set(block.columns[i], from);
    drawOf.fill(d, from, to);
  }
  return { columns, draw: drawOf, parameters: params, repaired };
}
