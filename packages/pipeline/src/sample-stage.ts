/**
 * Correlated property sets for reliability analyses: per group, each property's best-fitting
 * marginal (from the aggregate stage) joined by the group's Spearman matrix through a Gaussian
 * copula (see @fractile/stats sampleCorrelated). Seeded, so the same call gives the same sets.
 */
import { sampleCorrelated, type CopulaRepair } from '@fractile/stats';
import type { AggregateResult } from './aggregate/stage.ts';
import type { PropertyKey } from './properties.ts';

export interface SampleSet {
  group: Record<string, string>;
  properties: PropertyKey[];
  marginals: { property: PropertyKey; model: string; params: Record<string, number> }[];
  spearman: (number | null)[][];
  /** how a rank-correlation matrix that was not positive definite was repaired; null when none was needed */
  copula_repair: CopulaRepair | null;
  seed: number;
  n: number;
  /** one row per sampled set, values in the properties' units */
  rows: Record<string, number>[];
  warnings: string[];
}

export function sampleGroups(agg: Pick<AggregateResult, 'stats' | 'correlations'>, properties: PropertyKey[], n: number, seed: number): SampleSet[] {
  const out: SampleSet[] = [];
  const key = (g: Record<string, string>) => JSON.stringify(g);
  for (const corr of agg.correlations) {
    const warnings: string[] = [];
    const props = properties.filter((p) => corr.properties.includes(p));
    const missing = properties.filter((p) => !props.includes(p));
    if (missing.length) warnings.push(`no values in this group for: ${missing.join(', ')}`);
    const marginals: SampleSet['marginals'] = [];
    for (const p of props) {
      const s = agg.stats.find((r) => key(r.group) === key(corr.group) && r.property === p);
      const fit = s?.fits.find((f) => f.model === s.best_fit);
      if (!s || !fit) {
        warnings.push(`${p}: no fitted model (too few values)`);
        continue;
      }
      marginals.push({ property: p, model: fit.model, params: fit.params });
    }
    const used = marginals.map((m) => m.property);
    const idx = used.map((p) => corr.properties.indexOf(p));
    const spearman = idx.map((i) => idx.map((j) => corr.spearman[i][j]));
    if (used.length === 0) {
      out.push({ group: corr.group, properties: [], marginals, spearman, copula_repair: null, seed, n: 0, rows: [], warnings });
      continue;
    }
    const r = sampleCorrelated(marginals.map((m) => ({ model: m.model as 'normal' | 'lognormal' | 'weibull', params: m.params })), spearman, n, seed);
    if ('code' in r) {
      warnings.push(`${r.code}: ${r.message}`);
      out.push({ group: corr.group, properties: used, marginals, spearman, copula_repair: null, seed, n: 0, rows: [], warnings });
      continue;
    }
    if (r.repair) warnings.push(`the rank-correlation matrix was not positive definite: replaced by the nearest correlation matrix (Higham 2002; largest change ${r.repair.max_change.toFixed(3)})`);
    const rows = Array.from({ length: n }, (_, k) => Object.fromEntries(used.map((p, i) => [p, r.columns[i][k]])));
    out.push({ group: corr.group, properties: used, marginals, spearman, copula_repair: r.repair, seed, n, rows, warnings });
  }
  return out;
}
