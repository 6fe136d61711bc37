/**
 * Random true stress–plastic strain curves from a curve model (curve-model.ts): per sample, the
 * uniform plastic strain εp,u and the component scores ξ_k drawn jointly by the Gaussian copula
 * (sample-correlated.ts, seeded), the registered curve y(s) = m(s) + Σ ξ_k φ_k(s) (linear between
 * the model's points), and σ(εp) = exp(y(εp/εp,u)) at every grid point εp ≤ εp,u and at εp,u
 * itself (grid points strictly below it). So each curve is valid from the start of the grid to its
 * own uniform strain.
 * With `monotone` (default) each curve is made non-decreasing by isotonic regression
 * (isotonic.ts, equal weights), as hardening input to nonlinear analysis is (common practice).
 *
 * Units: plastic strain mm/mm, true stress MPa. Degenerate input: n not a whole number ≥ 0 → an
 * error value. The same seed gives the same curves.
 */
import type { CurveModel } from './curve-model.ts';
import { isotonicNonDecreasing } from './isotonic.ts';
import { sampleCorrelated, type CopulaRepair, type SampleError } from './sample-correlated.ts';

export interface SampledCurves {
  /** uniform plastic strain of each curve (mm/mm) */
  uniform_plastic_strain: Float64Array;
  /** true stress (MPa) at the grid points up to each curve's uniform strain */
  stress_mpa: Float64Array[];
  /** true stress (MPa) at each curve's uniform strain (its last point) */
  uniform_stress_mpa: Float64Array;
  repair: CopulaRepair | null;
  /** curves whose drawn uniform strain lies at or before the first grid point (only the far lower tail of a normal law can do this): they have their end point alone */
  degenerate: number;
}

export interface SampleCurvesOptions {
  monotone?: boolean;
}

export function sampleCurves(model: CurveModel, grid: readonly number[], n: number, seed: number, opts: SampleCurvesOptions = {}): SampledCurves | SampleError {
  const monotone = opts.monotone ?? true;
  const k = model.components.length;
  const drawn = sampleCorrelated([model.uniform_strain, ...model.score_marginals], model.spearman, n, seed);
  if ('code' in drawn) return drawn;
  const J = model.points;
  const ends = drawn.columns[0];
  const y = new Float64Array(J);
  const out: Float64Array[] = [];
  const endStress = new Float64Array(n);
  let degenerate = 0;
  for (let r = 0; r < n; r++) {
    for (let j = 0; j < J; j++) {
      let v = model.mean_log_stress[j];
      for (let c = 0; c < k; c++) v += drawn.columns[c + 1][r] * model.components[c][j];
      y[j] = v;
    }
    const u = ends[r];
    let m = 0;
    while (m < grid.length && grid[m] < u) m++;
    if (m === 0) degenerate++;
    const curve = new Float64Array(m + 1);
    for (let i = 0; i <= m; i++) {
      const s = i < m ? grid[i] / u : 1;
      const pos = Math.min(Math.max(s, 0), 1) * (J - 1);
      const lo = Math.min(Math.floor(pos), J - 2);
      curve[i] = Math.exp(y[lo] + (pos - lo) * (y[lo + 1] - y[lo]));
    }
    const final = monotone ? isotonicNonDecreasing(curve) : curve;
    out.push(final.subarray(0, m));
    endStress[r] = final[m];
  }
  return { uniform_plastic_strain: ends, stress_mpa: out, uniform_stress_mpa: endStress, repair: drawn.repair, degenerate };
}
