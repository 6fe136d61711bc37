/**
 * The distribution model of a group for probabilistic analyses: per property the best-fitting
 * marginal of the aggregate stage (family, parameters, the range of the data it was fitted on,
 * Anderson–Darling goodness of fit, the other fitted families), the rank (Spearman) and
 * normal-score correlation matrices, the Gaussian copula the sampler uses (normal correlation
 * ρ = 2 sin(π ρ_S/6) of the Spearman matrix, repaired to the nearest correlation matrix where it
 * is not positive definite — sample-correlated.ts), the number of tests, and the statistical
 * uncertainty of the parameters two ways: the asymptotic covariance of the MLEs from the observed
 * information (mle-covariance.ts) and a nonparametric bootstrap of the tests that also carries the
 * correlations (bootstrap-model.ts; its replicates kept, so a sampler or an analyst can draw from
 * them). The JSON of this model is documented in docs/distribution-export.md.
 *
 * Pure: the aggregate result and the population rows in, one model per group out. The values
 * used are those of the aggregate's population (the same rows, grouped the same way).
 */
import {
  bootstrapCovariance,
  bootstrapModel,
  bootstrapSpearmanSe,
  gaussianCopulaCorrelation,
  mleCovariance,
  normalScoreCorrelation,
  PARAMETER_NAMES,
  type BootstrapReplicate,
  type CopulaRepair,
  type ModelName,
  type ParameterCovariance,
} from '@fractile/stats';
import type { AggregateResult } from '../aggregate/stage.ts';
import { groupRows, type GroupField } from '../aggregate/grouping.ts';
import { testIdsSha256 } from '../design/provenance.ts';
import type { PropertyKey, PropertyRow } from '../properties.ts';
import { propertyUnit } from './property-unit.ts';

export interface FamilyFit {
  family: ModelName;
  parameters: Record<string, number>;
  anderson_darling: number;
  p_value: number | null;
  p_method: string;
  aic: number;
}

export interface MarginalModel extends FamilyFit {
  property: PropertyKey;
  unit: string;
  /** values the marginal was fitted on */
  n: number;
  data_range: { min: number; max: number };
  /** the other fitted families, for comparison */
  alternatives: FamilyFit[];
  uncertainty: {
    asymptotic: ParameterCovariance | null;
    bootstrap: { method: string; replicates: number; parameters: [string, string]; covariance: [[number, number], [number, number]]; standard_errors: [number, number]; correlation: number } | null;
  };
}

export interface GroupDistribution {
  group: Record<string, string>;
  n_tests: number;
  test_ids_sha256: string;
  properties: PropertyKey[];
  marginals: MarginalModel[];
  correlation: {
    spearman: (number | null)[][];
    normal_scores: (number | null)[][];
    /** complete pairs behind each coefficient */
    n_pairs: number[][];
    spearman_bootstrap_se: (number | null)[][] | null;
  };
  copula: {
    family: 'gaussian';
    correlation_from: string;
    correlation: number[][];
    repair: CopulaRepair | null;
  };
  bootstrap: { method: string; requested: number; seed: number; failed: number; replicates: BootstrapReplicate[] } | null;
  warnings: string[];
}

export interface DistributionOptions {
  by: GroupField[];
  properties: PropertyKey[];
  /** bootstrap replicates (0: no bootstrap) */
  bootstrap: number;
  seed: number;
}

export const COPULA_FROM = 'Spearman matrix, ρ = 2 sin(π ρ_S / 6) (Kruskal 1958), nearest correlation matrix where not positive definite (Higham 2002)';

const key = (g: Record<string, string>) => JSON.stringify(g);

function familyFit(f: { model: ModelName; params: Record<string, number>; ad: number; p: number | null; p_method: string; aic: number }): FamilyFit {
  return { family: f.model, parameters: { ...f.params }, anderson_darling: f.ad, p_value: f.p, p_method: f.p_method, aic: f.aic };
}

export function distributionModels(agg: Pick<AggregateResult, 'stats' | 'correlations'>, rows: PropertyRow[], opts: DistributionOptions): GroupDistribution[] {
  const out: GroupDistribution[] = [];
  for (const g of groupRows(rows, opts.by, opts.properties)) {
    const warnings: string[] = [];
    const marginals: MarginalModel[] = [];
    const columns: number[][] = [];
    for (const p of opts.properties) {
      const s = agg.stats.find((r) => key(r.group) === key(g.key) && r.property === p);
      const best = s?.fits.find((f) => f.model === s.best_fit);
      if (!s || !best || s.min === null || s.max === null) {
        warnings.push(`${p}: no fitted model (${s ? 'too few values' : 'no values in this group'})`);
        continue;
      }
      const values = g.columns[p].filter((v) => Number.isFinite(v));
      const asymptotic = mleCovariance(best, values);
      if (!asymptotic) warnings.push(`${p}: the observed information is singular; no asymptotic covariance`);
      marginals.push({
        property: p,
        unit: propertyUnit(p),
        ...familyFit(best),
        n: s.n,
        data_range: { min: s.min, max: s.max },
        alternatives: s.fits.filter((f) => f.model !== best.model).map(familyFit),
        uncertainty: { asymptotic, bootstrap: null },
      });
      columns.push(g.columns[p]);
    }
    const properties = marginals.map((m) => m.property);
    const corr = agg.correlations.find((c) => key(c.group) === key(g.key));
    const idx = properties.map((p) => corr?.properties.indexOf(p) ?? -1);
    const spearman = idx.map((i, a) => idx.map((j, b) => (a === b ? 1 : i >= 0 && j >= 0 ? corr!.spearman[i][j] : null)));
    const nPairs = idx.map((i) => idx.map((j) => (i >= 0 && j >= 0 ? corr!.n[i][j] : 0)));
    const found = gaussianCopulaCorrelation(spearman);
    if (!found) warnings.push('the copula correlation could not be made positive definite: the properties are sampled independently');
    const copula = found ?? { matrix: spearman.map((r, i) => r.map((_, j) => (i === j ? 1 : 0))), repair: null };
    if (copula.repair) warnings.push(`the rank-correlation matrix was not positive definite: the copula uses the nearest correlation matrix (Higham 2002; largest change ${copula.repair.max_change.toFixed(3)})`);
    let bootstrap: GroupDistribution['bootstrap'] = null;
    let seBoot: (number | null)[][] | null = null;
    if (opts.bootstrap > 0 && marginals.length > 0) {
      const b = bootstrapModel(columns, marginals.map((m) => m.family), opts.bootstrap, opts.seed);
      if ('code' in b) warnings.push(`bootstrap: ${b.message}`);
      else {
        bootstrap = { method: b.method, requested: b.requested, seed: b.seed, failed: b.failed, replicates: b.replicates };
        if (b.failed > 0) warnings.push(`bootstrap: ${b.failed} of ${b.requested} resamples could not be fitted and were dropped`);
        marginals.forEach((m, i) => {
          const names = PARAMETER_NAMES[m.family];
          const c = bootstrapCovariance(b, i, names);
          m.uncertainty.bootstrap = c ? { method: b.method, replicates: b.replicates.length, parameters: names, ...c } : null;
        });
        seBoot = bootstrapSpearmanSe(b, marginals.length);
      }
    }
    const ids = g.rows.map((i) => `${rows[i].lab}/${rows[i].test_id}`);
    out.push({
      group: g.key,
      n_tests: ids.length,
      test_ids_sha256: testIdsSha256(ids),
      properties,
      marginals,
      correlation: { spearman, normal_scores: normalScoreCorrelation(columns), n_pairs: nPairs, spearman_bootstrap_se: seBoot },
      copula: { family: 'gaussian', correlation_from: COPULA_FROM, correlation: copula.matrix, repair: copula.repair },
      bootstrap,
      warnings,
    });
  }
  return out;
}
