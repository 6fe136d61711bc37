/**
 * Correlated property sets for reliability analyses: per group, the distribution model
 * (distribution-model.ts: each property's best-fitting marginal, joined by the group's Spearman
 * matrix through a Gaussian copula — @fractile/stats sampleCorrelated). Optionally with the
 * statistical uncertainty of the model (sampleWithUncertainty): the sets are drawn in blocks, each
 * from its own draw of the parameters — from the asymptotic normal law of the MLEs, or from a
 * bootstrap replicate (which also varies the correlations). Seeded, so the same call gives the
 * same sets.
 */
import { sampleCorrelated, sampleWithUncertainty, type CopulaRepair, type ParameterUncertainty } from '@fractile/stats';
import type { PropertyKey } from '../properties.ts';
import type { GroupDistribution } from './distribution-model.ts';

export interface UncertaintyOptions {
  mode: ParameterUncertainty;
  /** model draws; the sets are split into this many blocks (default: one per set) */
  draws?: number;
}

export interface SampleSet {
  group: Record<string, string>;
  properties: PropertyKey[];
  marginals: { property: PropertyKey; model: string; params: Record<string, number> }[];
  spearman: (number | null)[][];
  /** how a rank-correlation matrix that was not positive definite was repaired; null when none was needed */
  copula_repair: CopulaRepair | null;
  seed: number;
  n: number;
  /** how the parameter uncertainty was drawn; null: the sets come from the fitted model alone */
  parameter_uncertainty: { mode: ParameterUncertainty; method: string; draws: number; parameters: Record<string, number>[][] } | null;
  /** one row per sampled set, values in the properties' units (with `parameter_draw`, 0-based, when drawn with uncertainty) */
  rows: Record<string, number>[];
  warnings: string[];
}

const METHOD: Record<ParameterUncertainty, string> = {
  asymptotic: 'marginal parameters from the large-sample normal law of the MLEs (observed information), drawn on the log scale of scale and shape; rank correlations held at their estimates',
  bootstrap: 'marginals and rank correlations of nonparametric bootstrap replicates of the tests (Efron & Tibshirani 1993)',
};

export function sampleGroups(models: readonly GroupDistribution[], n: number, seed: number, uncertainty: UncertaintyOptions | null = null): SampleSet[] {
  return models.map((g) => {
    const warnings = [...g.warnings];
    const used = g.properties;
    const marginals = g.marginals.map((m) => ({ property: m.property, model: m.family, params: m.parameters }));
    const base = { group: g.group, properties: used, marginals, spearman: g.correlation.spearman, seed };
    if (used.length === 0) return { ...base, copula_repair: null, n: 0, parameter_uncertainty: null, rows: [], warnings };
    const fits = g.marginals.map((m) => ({ model: m.family, params: m.parameters }));
    if (uncertainty) {
      const draws = uncertainty.draws ?? n;
      const r = sampleWithUncertainty(
        { marginals: fits, spearman: g.correlation.spearman, covariances: g.marginals.map((m) => m.uncertainty.asymptotic), replicates: g.bootstrap?.replicates },
        uncertainty.mode,
        n,
        draws,
        seed,
      );
      if ('code' in r) {
        warnings.push(`${r.code}: ${r.message}`);
        return { ...base, copula_repair: null, n: 0, parameter_uncertainty: null, rows: [], warnings };
      }
      if (r.repaired > 0) warnings.push(`${r.repaired} of ${draws} model draws had a rank-correlation matrix that was not positive definite: each was replaced by its nearest correlation matrix (Higham 2002)`);
      const rows = Array.from({ length: n }, (_, k) => ({ parameter_draw: r.draw[k], ...Object.fromEntries(used.map((p, i) => [p, r.columns[i][k]])) }));
      return { ...base, copula_repair: g.copula.repair, n, parameter_uncertainty: { mode: uncertainty.mode, method: METHOD[uncertainty.mode], draws, parameters: r.parameters }, rows, warnings };
    }
    const r = sampleCorrelated(fits, g.correlation.spearman, n, seed);
    if ('code' in r) {
      warnings.push(`${r.code}: ${r.message}`);
      return { ...base, copula_repair: null, n: 0, parameter_uncertainty: null, rows: [], warnings };
    }
    const rows = Array.from({ length: n }, (_, k) => Object.fromEntries(used.map((p, i) => [p, r.columns[i][k]])));
    return { ...base, copula_repair: r.repair, n, parameter_uncertainty: null, rows, warnings };
  });
}
