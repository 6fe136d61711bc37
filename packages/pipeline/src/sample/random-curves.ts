/**
 * Random whole true stress–plastic strain curves per group, drawn from the group's curve model
 * (curve-models.ts; @fractile/stats sampleCurves): each curve on the common grid from εp = 0 to
 * its own uniform plastic strain, which is its last point; non-decreasing unless `monotone` is
 * off. Seeded: the same seed gives the same curves (the group's position does not change them:
 * every group draws from the same seed).
 */
import { sampleCurves } from '@fractile/stats';
import type { GroupCurveModel } from './curve-models.ts';

export interface RandomCurve {
  /** 1-based */
  sample: number;
  uniform_plastic_strain: number;
  /** true plastic strain (mm/mm): the grid points up to the uniform strain, then the uniform strain */
  plastic_strain: number[];
  /** true stress (MPa) at each plastic strain */
  true_stress_mpa: number[];
}

export interface RandomCurveSet {
  group: Record<string, string>;
  seed: number;
  n: number;
  monotone: boolean;
  curves: RandomCurve[];
  warnings: string[];
}

export function randomCurves(models: readonly GroupCurveModel[], n: number, seed: number, monotone = true): RandomCurveSet[] {
  return models.map((g) => {
    const warnings = [...g.warnings];
    if (!g.model) return { group: g.group, seed, n: 0, monotone, curves: [], warnings };
    const s = sampleCurves(g.model, g.grid, n, seed, { monotone });
    if ('code' in s) {
      warnings.push(`${s.code}: ${s.message}`);
      return { group: g.group, seed, n: 0, monotone, curves: [], warnings };
    }
    if (s.degenerate > 0) warnings.push(`${s.degenerate} curve(s) drew a uniform strain at or before the start of the grid and consist of their end point alone`);
    if (s.repair) warnings.push(`the rank-correlation matrix of the curve model was not positive definite: replaced by the nearest correlation matrix (largest change ${s.repair.max_change.toFixed(3)})`);
    const curves = Array.from({ length: n }, (_, r) => {
      const u = s.uniform_plastic_strain[r];
      const stress = s.stress_mpa[r];
      return {
        sample: r + 1,
        uniform_plastic_strain: u,
        plastic_strain: [...g.grid.slice(0, stress.length), u],
        true_stress_mpa: [...stress, s.uniform_stress_mpa[r]],
      };
    });
    return { group: g.group, seed, n, monotone, curves, warnings };
  });
}
