/**
 * Sample-size planning per group and property (@fractile/stats planSampleSize): how the design
 * value — the stats headline, by its rule at its level — is expected to move when 10, 20, 50 …
 * more tests come in, the added tests drawn from the population as the best fit by AIC describes
 * it. The value is recomputed the way the headline was chosen: the lowest of the three exact model
 * limits (`lowest-model`, also where no model fits), the catalog's named method
 * (`catalog-model`), or the distribution-free bound (`distribution-free-fallback`). The rule's
 * switch to the distribution-free bound when Anderson–Darling rejects every model is not
 * re-decided per replicate.
 * Pure: the aggregate result and its population rows in, one plan per group and property out;
 * a property without a headline gets no plan and a note why.
 */
import { planSampleSize, type EstimatedMethod, type SampleSizePlan } from '@fractile/stats';
import type { AggregateResult } from '../aggregate/stage.ts';
import { groupRows, type GroupField } from '../aggregate/grouping.ts';
import type { PropertyKey, PropertyRow } from '../properties.ts';

export const DEFAULT_PLAN_ADDED = [10, 20, 50];
export const DEFAULT_PLAN_PROPERTIES: PropertyKey[] = ['yield_mpa', 'rm_mpa'];

export interface PlanOptionsByGroup {
  by: GroupField[];
  properties: PropertyKey[];
  added: number[];
  replicates?: number;
  seed?: number;
}

export interface GroupPlan {
  group: Record<string, string>;
  property: PropertyKey;
  /** the headline rule's resolution (lowest-model, catalog-model, …) */
  headline_basis: string | null;
  plan: SampleSizePlan | null;
  note: string | null;
}

/** The estimator that recomputes a headline of this basis and method. */
function headlineEstimator(basis: string | null, method: string): EstimatedMethod | null {
  if (basis === 'lowest-model' || basis === 'no-model-fits') return 'lowest-model';
  if (basis === 'distribution-free-fallback') return 'order-statistic';
  if (basis === 'catalog-model' && ['tolerance-normal', 'tolerance-lognormal', 'tolerance-weibull', 'order-statistic'].includes(method)) return method as EstimatedMethod;
  return null;
}
const key = (g: Record<string, string>) => JSON.stringify(g);

export function planGroups(agg: Pick<AggregateResult, 'stats'>, rows: PropertyRow[], opts: PlanOptionsByGroup): GroupPlan[] {
  const out: GroupPlan[] = [];
  for (const g of groupRows(rows, opts.by, opts.properties)) {
    for (const p of opts.properties) {
      const s = agg.stats.find((r) => key(r.group) === key(g.key) && r.property === p);
      if (!s) continue;
      const h = s.headline;
      const base = { group: g.key, property: p, headline_basis: s.headline_basis };
      if (!h || h.value === null || h.confidence === null) {
        out.push({ ...base, plan: null, note: 'no design value (headline) for this property' });
        continue;
      }
      const method = headlineEstimator(s.headline_basis, h.method);
      if (!method) {
        out.push({ ...base, plan: null, note: `the headline method ${h.method} is not planned` });
        continue;
      }
      const fit = s.fits.find((f) => f.model === s.best_fit);
      if (!fit) {
        out.push({ ...base, plan: null, note: 'no fitted model to draw added tests from' });
        continue;
      }
      const plan = planSampleSize(g.columns[p], method, { coverage: h.coverage, confidence: h.confidence }, fit, { added: opts.added, replicates: opts.replicates, seed: opts.seed });
      if ('code' in plan) out.push({ ...base, plan: null, note: plan.message });
      else {
        const rejected = fit.p !== null && fit.p < 0.05 ? `; the best fit (${fit.model}) is rejected by Anderson–Darling at 5 %, so the added tests are drawn from a doubtful model` : '';
        out.push({ ...base, plan, note: `added tests drawn from the best fit (${fit.model})${rejected}` });
      }
    }
  }
  return out;
}
