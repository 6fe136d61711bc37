/**
 * Random-curve model of a group of true stress–plastic strain curves: functional principal
 * components of the registered log-stress curves, with the uniform strain, joined by a Gaussian
 * copula.
 *
 * 1. Registration: each curve on its own normalized strain s = εp/εp,u (normalized-curve.ts), in
 *    ln σ, so that every curve runs from its start to its own uniform strain.
 * 2. Functional principal components (Ramsay & Silverman 2005, *Functional Data Analysis*, ch. 8;
 *    Karhunen–Loève): mean curve m(s) and the leading eigenfunctions φ_k of the sample covariance
 *    of the registered curves, from the singular value decomposition of the centred n × J data
 *    matrix (ml-matrix); the K kept are the fewest that explain `varianceFraction` of the
 *    variance, at most `maxComponents` and at most n − 3. Scores ξ_ik = Σ_j (y_ij − m_j) φ_kj.
 *    Each φ_k is signed so that its entries sum to ≥ 0 (a fixed choice, so the model is
 *    reproducible).
 * 3. Joint law of (εp,u, ξ_1 … ξ_K): the uniform strain by its best-fitting two-parameter model
 *    (normal, lognormal or Weibull by AIC, best-fit.ts), each score by a normal law (MLE), joined
 *    by the Gaussian copula of their Spearman matrix (sample-correlated.ts). The rank
 *    correlations carry the link between strength (the first component, mostly the level of the
 *    curve) and hardening (the next ones, its shape) and the uniform strain.
 *
 * A sampled curve is m + Σ ξ_k φ_k at s = εp/εp,u, valid from εp = 0 to its own εp,u
 * (sample-curves.ts).
 *
 * In: the plastic-strain grid (mm/mm); per test the true stress on it (MPa, null beyond uniform
 * strain) and the uniform plastic strain. Out: the model (log stress of MPa; strains mm/mm), with
 * the variance explained, the tests used and the tests left out with the reason. Degenerate
 * input: fewer than MIN_CURVES usable curves, or no variation among them → an error value.
 */
import { Matrix, SVD } from 'ml-matrix';
import { bestFitByAic } from './best-fit.ts';
import { correlationMatrices } from './correlation.ts';
import { fitLognormal, fitNormal } from './fit-normal.ts';
import type { FitResult } from './fit-types.ts';
import { fitWeibull } from './fit-weibull.ts';
import { normalizedLogCurve } from './normalized-curve.ts';

export const MIN_CURVES = 10;

export interface CurveModelOptions {
  /** points of the normalized strain s on [0, 1] (default 101) */
  points?: number;
  /** share of the variance of the registered curves the kept components explain (default 0.999) */
  varianceFraction?: number;
  /** largest number of components (default 10) */
  maxComponents?: number;
}

export interface CurveInput {
  id: string;
  stress_mpa: readonly (number | null)[];
  uniform_plastic_strain: number | null;
}

export interface CurveModel {
  method: string;
  /** number of tests the model was fitted on */
  n: number;
  points: number;
  /** mean ln σ (σ in MPa) at s_j = j/(points − 1) */
  mean_log_stress: number[];
  /** eigenfunctions φ_k at s_j, one row per component */
  components: number[][];
  /** variance of each component's scores (ln MPa)² */
  component_variance: number[];
  /** share of the variance explained by the kept components */
  variance_explained: number;
  /** the law of the scores: normal, one per component */
  score_marginals: Pick<FitResult, 'model' | 'params'>[];
  /** the law of the uniform plastic strain (best fit by AIC), with its goodness of fit */
  uniform_strain: Pick<FitResult, 'model' | 'params' | 'ad' | 'p' | 'p_method' | 'aic'> & { min: number; max: number };
  /** Spearman matrix of [uniform plastic strain, ξ_1 … ξ_K] */
  spearman: (number | null)[][];
  /** the tests used, in order */
  test_ids: string[];
  /** tests left out, with the reason */
  left_out: { id: string; reason: string }[];
  /** tests whose uniform strain lies more than one grid step past their last grid stress, and the largest such gap */
  extended: { count: number; largest_gap: number };
}

export interface CurveModelError {
  code: 'too-few-curves' | 'no-variation';
  message: string;
  left_out: { id: string; reason: string }[];
}

export const CURVE_MODEL_METHOD =
  'functional principal components of ln(true stress) on the normalized strain εp/εp,u (Ramsay & Silverman 2005), scores and uniform strain joined by a Gaussian copula of their rank correlations';

export function fitCurveModel(grid: readonly number[], tests: readonly CurveInput[], opts: CurveModelOptions = {}): CurveModel | CurveModelError {
  const points = opts.points ?? 101;
  const fraction = opts.varianceFraction ?? 0.999;
  const maxK = opts.maxComponents ?? 10;
  const leftOut: { id: string; reason: string }[] = [];
  const rows: Float64Array[] = [];
  const ends: number[] = [];
  const ids: string[] = [];
  const step = grid.length > 1 ? grid[1] - grid[0] : 0;
  let extended = 0;
  let largestGap = 0;
  for (const t of tests) {
    const u = t.uniform_plastic_strain;
    if (u === null || !Number.isFinite(u)) {
      leftOut.push({ id: t.id, reason: 'no uniform strain' });
      continue;
    }
    const c = normalizedLogCurve(grid, t.stress_mpa, u, points);
    if (!c) {
      leftOut.push({ id: t.id, reason: 'no usable curve on the grid (fewer than two stresses, a gap, or a stress ≤ 0)' });
      continue;
    }
    if (c.gap > step * (1 + 1e-9)) extended++;
    largestGap = Math.max(largestGap, c.gap);
    rows.push(c.logStress);
    ends.push(u);
    ids.push(t.id);
  }
  const n = rows.length;
  if (n < MIN_CURVES) return { code: 'too-few-curves', message: `${n} usable curve(s); a curve model needs at least ${MIN_CURVES}`, left_out: leftOut };

  const mean = new Float64Array(points);
  for (const r of rows) for (let j = 0; j < points; j++) mean[j] += r[j] / n;
  const centred = new Matrix(n, points);
  for (let i = 0; i < n; i++) for (let j = 0; j < points; j++) centred.set(i, j, rows[i][j] - mean[j]);
  const svd = new SVD(centred, { computeLeftSingularVectors: false, computeRightSingularVectors: true, autoTranspose: true });
  const d = svd.diagonal;
  const v = svd.rightSingularVectors;
  const total = d.reduce((a, x) => a + x * x, 0);
  if (!(total > 0)) return { code: 'no-variation', message: 'the curves do not vary', left_out: leftOut };
  let k = 0;
  let explained = 0;
  const kMax = Math.max(1, Math.min(maxK, n - 3, d.length));
  while (k < kMax && explained < fraction) {
    explained += (d[k] * d[k]) / total;
    k++;
  }

  const components: number[][] = [];
  const scores: number[][] = [];
  for (let c = 0; c < k; c++) {
    const phi = Array.from({ length: points }, (_, j) => v.get(j, c));
    if (phi.reduce((a, x) => a + x, 0) < 0) for (let j = 0; j < points; j++) phi[j] = -phi[j];
    components.push(phi);
    scores.push(rows.map((r) => r.reduce((a, y, j) => a + (y - mean[j]) * phi[j], 0)));
  }
  const scoreFits = scores.map((s) => fitNormal(s));
  if (scoreFits.some((f) => f === null)) return { code: 'no-variation', message: 'a component has no spread', left_out: leftOut };
  const endFit = bestFitByAic([fitNormal(ends), fitLognormal(ends), fitWeibull(ends)].filter((f): f is FitResult => f !== null));
  if (!endFit) return { code: 'no-variation', message: 'the uniform strains do not vary', left_out: leftOut };
  const cols: Record<string, number[]> = { uniform_plastic_strain: ends };
  scores.forEach((s, c) => (cols[`score_${c + 1}`] = s));
  const spearman = correlationMatrices(cols).spearman;

  return {
    method: CURVE_MODEL_METHOD,
    n,
    points,
    mean_log_stress: Array.from(mean),
    components,
    component_variance: scores.map((_, c) => (d[c] * d[c]) / (n - 1)),
    variance_explained: explained,
    score_marginals: scoreFits.map((f) => ({ model: f!.model, params: f!.params })),
    uniform_strain: { model: endFit.model, params: endFit.params, ad: endFit.ad, p: endFit.p, p_method: endFit.p_method, aic: endFit.aic, min: Math.min(...ends), max: Math.max(...ends) },
    spearman,
    test_ids: ids,
    left_out: leftOut,
    extended: { count: extended, largest_gap: largestGap },
  };
}
