/**
 * Simultaneous lower tolerance band over a grid: L_i = m_i − c·s_i at every grid point i, with
 * one critical value c chosen so that, with confidence γ, the whole band lies below the
 * population's lower p-fractile curve q_i = μ_i − z_p·σ_i at once (normal model at each point;
 * on logarithms for the lognormal model).
 *
 * Method: a max-type studentized statistic over the grid (the construction of simultaneous
 * tolerance bands for functional data, Rathnayake & Choudhary 2016, Biometrics 72:503–512 —
 * from memory). With z_j(i) = (x_j(i) − μ_i)/σ_i the standardized curves,
 *
 *   L_i ≤ q_i for all i  ⟺  max_i T_i ≤ c,   T_i = (z̄_i + z_p) / s_z,i,
 *
 * which depends only on the correlation of the z across the grid and on which tests reach each
 * point. c is the γ-quantile of max_i T_i, by Monte Carlo: the standardized curves are simulated as
 * a Gaussian process with the sample correlation (plug-in; a parametric bootstrap of the pivot),
 * each simulated test observed at the same points as the real one. At a single point this is exactly
 * the ISO 16269-6 pivot, whose γ-quantile is the noncentral-t factor k(n); c is never taken below
 * the largest k(n_i), which it must exceed in exact arithmetic.
 *
 * The correlation model: pairwise correlations of the standardized residuals (over the tests two
 * points share), eigen-decomposed (ml-matrix); the leading components that carry 99 % of the
 * trace (at most `MAX_COMPONENTS`) are kept, and what they leave of each point's unit variance is
 * simulated as independent noise — rougher than the data, which errs toward a larger c. Negative
 * eigenvalues (pairwise estimates need not be positive semi-definite) are dropped.
 *
 * The simulation draws each replicate's sufficient statistics directly
 * (`studentized-max-simulation.ts`): its cost grows with the grid, the components and the number of
 * distinct patterns of observed points, not with the number of tests; plus one
 * eigen-decomposition of the grid-sized matrix. Seeded: the same input gives the same c.
 *
 * In: per test, values at each grid point (`null` where absent), coverage p, confidence γ, model,
 * simulations, seed. Out: the band per point (NaN where a point has fewer than two values),
 * c, the largest pointwise k, the components used. Points with zero spread get their common value
 * and do not enter the maximum. Fewer than two points with spread: c is the pointwise k there.
 */
import { normalQuantile, normalToleranceFactor } from '@fractile/stats';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { simulateStudentizedMaxima, type TestBlock } from './studentized-max-simulation.ts';
import type { ToleranceModel } from './types.ts';

export interface SimultaneousBandSpec {
  coverage: number;
  confidence: number;
  model: ToleranceModel;
  simulations: number;
  seed: number;
}

export interface SimultaneousBand {
  bound: number[];
  criticalValue: number;
  maxPointwiseFactor: number;
  components: number;
}

const MAX_COMPONENTS = 20;
const TRACE_SHARE = 0.99;

export function simultaneousLowerBand(values: readonly (readonly (number | null)[])[], points: number, spec: SimultaneousBandSpec): SimultaneousBand | null {
  const log = spec.model === 'lognormal';
  const tests = values.length;
  // x[j][i] on the model's scale, NaN where absent
  const x = values.map((row) => Float64Array.from({ length: points }, (_, i) => {
    const v = row[i];
    if (v === null || v === undefined || !Number.isFinite(v)) return NaN;
    if (log) return v > 0 ? Math.log(v) : NaN;
    return v;
  }));
  const mean = new Float64Array(points), sd = new Float64Array(points), count = new Int32Array(points);
  for (let i = 0; i < points; i++) {
    let s = 0, c = 0;
    for (let j = 0; j < tests; j++) if (!Number.isNaN(x[j][i])) { s += x[j][i]; c++; }
    count[i] = c;
    mean[i] = c > 0 ? s / c : NaN;
    let q = 0;
    for (let j = 0; j < tests; j++) if (!Number.isNaN(x[j][i])) q += (x[j][i] - mean[i]) ** 2;
    sd[i] = c > 1 ? Math.sqrt(q / (c - 1)) : NaN;
  }
  // the points that enter the maximum
  const live: number[] = [];
  let maxK = 0;
  for (let i = 0; i < points; i++) {
    if (count[i] < 2) continue;
    const k = normalToleranceFactor(count[i], spec.coverage, spec.confidence);
    if (!Number.isFinite(k)) return null;
    maxK = Math.max(maxK, k);
    if (sd[i] > 0) live.push(i);
  }
  const g = live.length;
  if (g === 0 && maxK === 0) return null;

  // standardized residuals and their pairwise correlation over shared tests
  const z = x.map((row) => Float64Array.from(live, (i) => (row[i] - mean[i]) / sd[i]));
  const corr = new Matrix(g, g);
  for (let a = 0; a < g; a++) {
    corr.set(a, a, 1);
    for (let b = a + 1; b < g; b++) {
      let sab = 0, saa = 0, sbb = 0;
      for (let j = 0; j < tests; j++) {
        const za = z[j][a], zb = z[j][b];
        if (Number.isNaN(za) || Number.isNaN(zb)) continue;
        sab += za * zb; saa += za * za; sbb += zb * zb;
      }
      const r = saa > 0 && sbb > 0 ? sab / Math.sqrt(saa * sbb) : 0;
      corr.set(a, b, r);
      corr.set(b, a, r);
    }
  }
  const { loadings, components } = factorLoadings(corr);

  let c = maxK;
  if (g >= 2) {
    // tests with the same observed points form one block
    const blocks = new Map<string, TestBlock>();
    for (const row of z) {
      const pts: number[] = [];
      for (let a = 0; a < g; a++) if (!Number.isNaN(row[a])) pts.push(a);
      if (pts.length === 0) continue;
      const key = pts.join(',');
      const b = blocks.get(key);
      if (b) b.size++;
      else blocks.set(key, { size: 1, points: pts });
    }
    const maxima = simulateStudentizedMaxima(loadings, components, [...blocks.values()], normalQuantile(spec.coverage), spec.simulations, spec.seed);
    // the γ-quantile: the smallest simulated maximum with at least γ of them at or below it
    const at = Math.min(spec.simulations - 1, Math.max(0, Math.ceil(spec.confidence * spec.simulations) - 1));
    c = Math.max(maxK, maxima[at]);
  }
  const bound = Array.from({ length: points }, (_, i) => {
    if (count[i] < 2) return NaN;
    const b = mean[i] - c * (sd[i] > 0 ? sd[i] : 0);
    return log ? Math.exp(b) : b;
  });
  return { bound, criticalValue: c, maxPointwiseFactor: maxK, components };
}

/**
 * Loadings (row-major, points × components) of the leading eigen-components of a correlation
 * matrix: λ_k^{1/2}·v_k for the components that carry `TRACE_SHARE` of the trace of the
 * non-negative part, at most `MAX_COMPONENTS`; rows scaled down where they exceed unit length.
 */
function factorLoadings(corr: Matrix): { loadings: Float64Array; components: number } {
  const g = corr.rows;
  const evd = new EigenvalueDecomposition(corr, { assumeSymmetric: true });
  const values = evd.realEigenvalues;
  const vectors = evd.eigenvectorMatrix;
  const order = values.map((_, k) => k).sort((p, q) => values[q] - values[p]);
  const total = values.reduce((s, v) => s + Math.max(0, v), 0);
  let components = 0, acc = 0;
  while (components < Math.min(MAX_COMPONENTS, g) && values[order[components]] > 0 && acc < TRACE_SHARE * total) {
    acc += values[order[components]];
    components++;
  }
  const loadings = new Float64Array(g * Math.max(1, components));
  for (let a = 0; a < g; a++) {
    let norm = 0;
    for (let k = 0; k < components; k++) {
      const l = Math.sqrt(values[order[k]]) * vectors.get(a, order[k]);
      loadings[a * components + k] = l;
      norm += l * l;
    }
    if (norm > 1) for (let k = 0; k < components; k++) loadings[a * components + k] /= Math.sqrt(norm);
  }
  return { loadings, components };
}
