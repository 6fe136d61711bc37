/**
 * Sample-size planning on the stored population: the aggregate stage's headlines and fits (run or
 * reused) and the same population's values (plan-groups.ts). The Monte Carlo is seeded and cheap
 * enough to run on demand, so plans are not stored; `stats_run` names the statistics they start from.
 */
import type { Store } from '@fractile/store';
import { runAggregate, type AggregateOptions } from '../aggregate/stage.ts';
import type { PopulationOptions } from '../population.ts';
import { loadPopulation, type PropertyFilter } from '../properties.ts';
import { planGroups, type GroupPlan, type PlanOptionsByGroup } from './plan-groups.ts';

export interface RunPlanOptions extends PlanOptionsByGroup, Pick<AggregateOptions, 'catalog' | 'codeVersion'> {
  filter?: PropertyFilter;
  population?: PopulationOptions;
}

export async function runPlan(store: Store, opts: RunPlanOptions): Promise<{ stats_run: number; plans: GroupPlan[] }> {
  const agg = await runAggregate(store, { by: opts.by, filter: opts.filter, population: opts.population, catalog: opts.catalog, codeVersion: opts.codeVersion });
  const pop = await loadPopulation(store.db, opts.filter, opts.population);
  return { stats_run: agg.run, plans: planGroups(agg, pop.rows, opts) };
}
