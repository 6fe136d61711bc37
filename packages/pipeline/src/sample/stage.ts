/**
 * The sample stage: the models the samplers draw from, stored per run and reused for the same
 * settings on the same population — per group the distribution model of its properties
 * (distribution-model.ts, on top of the aggregate stage's fits and correlations) and the curve
 * model of its true stress–plastic strain curves (curve-models.ts). Both are seeded (the
 * bootstrap), so a stored model is the model the same settings would compute again. The draws
 * themselves (property-sets.ts, random-curves.ts) are cheap and not stored.
 */
import type { Store } from '@fractile/store';
import type { CurveModelOptions } from '@fractile/stats';
import { runAggregate, type AggregateOptions } from '../aggregate/stage.ts';
import type { GroupField } from '../aggregate/grouping.ts';
import type { PopulationOptions } from '../population.ts';
import { populationHash } from '../population-hash.ts';
import { currentGrid, loadPopulation, type PropertyFilter, type PropertyKey } from '../properties.ts';
import { runStage, STAGE_VERSIONS } from '../runs.ts';
import { groupCurveModels, type GroupCurveModel } from './curve-models.ts';
import { distributionModels, type GroupDistribution } from './distribution-model.ts';

export const DEFAULT_SAMPLE_PROPERTIES: PropertyKey[] = ['yield_mpa', 'rm_mpa', 'ag_pct', 'n_value'];
export const DEFAULT_BOOTSTRAP = 500;

export interface DistributionStageOptions extends Pick<AggregateOptions, 'catalog' | 'codeVersion'> {
  by: GroupField[];
  properties?: PropertyKey[];
  /** bootstrap replicates (0: none; default 500) */
  bootstrap?: number;
  /** seed of the bootstrap */
  seed?: number;
  filter?: PropertyFilter;
  population?: PopulationOptions;
}

export interface DistributionStageResult {
  run: number;
  reused: boolean;
  /** the aggregate run the marginals and correlations come from */
  stats_run: number;
  settings: Record<string, unknown>;
  models: GroupDistribution[];
}

export interface CurveModelStageOptions {
  by: GroupField[];
  model?: CurveModelOptions;
  filter?: PropertyFilter;
  population?: PopulationOptions;
  codeVersion: string;
}

export interface CurveModelStageResult {
  run: number;
  reused: boolean;
  settings: Record<string, unknown>;
  models: GroupCurveModel[];
}

const byGroup = (a: { group: Record<string, string> }, b: { group: Record<string, string> }) => JSON.stringify(a.group).localeCompare(JSON.stringify(b.group));

/** Finds the finished run of these settings and inputs, or computes, stores and records one. */
async function storedRun<T extends { group: Record<string, string> }>(
  store: Store,
  settings: Record<string, unknown>,
  inputHash: string,
  codeVersion: string,
  compute: () => T[],
): Promise<{ run: number; reused: boolean; items: T[] }> {
  const db = store.db;
  const r = await runStage(db, {
    stage: 'sample', settings, inputHash, codeVersion,
    reuse: async (id) => {
      const rows = await db.selectFrom('group_results').select(['body']).where('run_id', '=', id).where('stage', '=', 'sample').execute();
      return rows.map((r) => (typeof r.body === 'string' ? JSON.parse(r.body) : r.body) as T);
    },
    compute: async (run) => {
      const items = compute();
      await store.copyRows('group_results', ['run_id', 'stage', 'group_key', 'property', 'body'], items.map((m) => [run, 'sample', JSON.stringify(m.group), String(settings.kind), JSON.stringify(m)]));
      return { result: items, counts: { groups: items.length } };
    },
  });
  return { run: r.run, reused: r.reused, items: [...r.result].sort(byGroup) };
}

export async function runDistributions(store: Store, opts: DistributionStageOptions): Promise<DistributionStageResult> {
  const properties = opts.properties ?? DEFAULT_SAMPLE_PROPERTIES;
  const agg = await runAggregate(store, { by: opts.by, filter: opts.filter, population: opts.population, catalog: opts.catalog, codeVersion: opts.codeVersion });
  const pop = await loadPopulation(store.db, opts.filter, opts.population);
  const bootstrap = opts.bootstrap ?? DEFAULT_BOOTSTRAP;
  const seed = opts.seed ?? 1;
  const settings = { kind: 'distributions', algorithm_version: STAGE_VERSIONS.sample, by: opts.by, properties, bootstrap, seed, filter: opts.filter ?? {}, population: pop.options, stats_run: agg.run };
  const r = await storedRun(store, settings, populationHash(pop), opts.codeVersion, () => distributionModels(agg, pop.rows, { by: opts.by, properties, bootstrap, seed }));
  return { run: r.run, reused: r.reused, stats_run: agg.run, settings, models: r.items };
}

export async function runCurveModels(store: Store, opts: CurveModelStageOptions): Promise<CurveModelStageResult> {
  const pop = await loadPopulation(store.db, opts.filter, { ...opts.population, withGrid: true });
  const grids = await currentGrid(store.db);
  const settings = { kind: 'curve-model', algorithm_version: STAGE_VERSIONS.sample, by: opts.by, model: opts.model ?? {}, filter: opts.filter ?? {}, population: pop.options, grids };
  const r = await storedRun(store, settings, populationHash(pop), opts.codeVersion, () => groupCurveModels(pop.rows, grids, opts.by, opts.model));
  return { run: r.run, reused: r.reused, settings, models: r.items };
}

