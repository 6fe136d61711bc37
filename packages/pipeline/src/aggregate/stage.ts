/**
 * The aggregate stage: population statistics per group and property (summary, fits,
 * characteristic values with the headline design value, compliance, warnings, and the counts of
 * values left out by reason) and correlation matrices per group, from the population of the
 * current per-test results (population.ts: excluded tests and flagged values left out unless
 * asked for). Per-property settings (prior V, headline model) come from the grade catalog.
 * Results are stored per run; the same settings on the same inputs reuse the stored run.
 */
import type { Store } from '@fractile/store';
import { correlationMatrices, DEFAULT_LEVELS, summarizeProperty, type PropertySummary, type SummaryLevel, type SummaryOptions } from '@fractile/stats';
import { gradeSettings, type Catalog } from '../catalog.ts';
import { populationHash } from '../population-hash.ts';
import { leftOutCounts, type LeftOut, type Population, type PopulationOptions } from '../population.ts';
import { loadPopulation, NUMERIC_PROPERTIES, type PropertyFilter, type PropertyKey, type PropertyRow } from '../properties.ts';
import { exclusiveStage, runStage, STAGE_VERSIONS } from '../runs.ts';
import { groupRows, type GroupField } from './grouping.ts';
import { limitsFor } from './limits.ts';

/** A coverage/confidence pair of the characteristic values (the stats package's shape). */
export type Level = SummaryLevel;

export interface AggregateOptions {
  by: GroupField[];
  properties?: PropertyKey[];
  /** first level is the headline; default DEFAULT_LEVELS (stats/src/default-levels.ts) */
  levels?: readonly Level[];
  /** prior coefficient of variation for the EN 1990 "V known" fractile of every property, overriding the catalog */
  priorV?: number;
  filter?: PropertyFilter;
  /** which tests and values enter the statistics (default: excluded tests and flagged values left out) */
  population?: PopulationOptions;
  catalog: Catalog | null;
  codeVersion: string;
}

export type StatsRow = { group: Record<string, string>; property: PropertyKey; left_out: LeftOut } & PropertySummary;

export interface CorrelationResult {
  group: Record<string, string>;
  properties: string[];
  pearson: (number | null)[][];
  spearman: (number | null)[][];
  n: number[][];
}

export interface AggregateResult {
  run: number;
  reused: boolean;
  stats: StatsRow[];
  correlations: CorrelationResult[];
  timings: Record<string, number>;
  /** the exclusions in force when the statistics were computed */
  exclusions: Population['exclusions'];
}


/** The single grade of a group (from its key, or shared by all its rows), else null. */
function groupGrade(key: Record<string, string>, rows: PropertyRow[], idx: number[]): string | null {
  if (key.grade !== undefined) return key.grade;
  const g = new Set(idx.map((i) => rows[i].grade));
  return g.size === 1 ? [...g][0] : null;
}

/**
 * The summary options of one property of a group: the catalog's spec limits, prior V and
 * headline model of the group's grade (none for a group spanning several grades), the levels.
 * The design stage asks the same function, so its characteristic yield is the stats headline.
 */
export function propertySummaryOptions(property: PropertyKey, grade: string | null, opts: Pick<AggregateOptions, 'catalog' | 'levels' | 'priorV'>): SummaryOptions {
  const entry = grade === null ? null : gradeSettings(opts.catalog, grade);
  const { lower, upper } = limitsFor(property, entry ? entry.spec : null);
  const stat = entry?.properties?.[property];
  return { levels: opts.levels ?? DEFAULT_LEVELS, priorV: opts.priorV ?? stat?.prior_v ?? null, headlineModel: stat?.headline_model ?? null, lower, upper };
}

/** The grade of a group of rows, or null when they span several. */
export function gradeOfGroup(key: Record<string, string>, rows: PropertyRow[], idx: number[]): string | null {
  return groupGrade(key, rows, idx);
}

/** Pure part of the stage: statistics of an already loaded population (or of rows taken as they are). */
export function aggregateRows(
  input: PropertyRow[] | Pick<Population, 'rows' | 'excluded' | 'options'>,
  opts: Omit<AggregateOptions, 'codeVersion'>,
): { stats: StatsRow[]; correlations: CorrelationResult[]; timings: Record<string, number> } {
  const pop = Array.isArray(input) ? { rows: input, excluded: [], options: { includeFlagged: false, includeExcluded: false } } : input;
  const rows = pop.rows;
  const t0 = performance.now();
  const properties = opts.properties ?? [...NUMERIC_PROPERTIES];
  const groups = groupRows(rows, opts.by, properties);
  const excludedByGroup = new Map<string, PropertyRow[]>();
  for (const g of groupRows(pop.excluded, opts.by, [])) excludedByGroup.set(JSON.stringify(g.key), g.rows.map((i) => pop.excluded[i]));
  const t1 = performance.now();
  const stats: StatsRow[] = [];
  const correlations: CorrelationResult[] = [];
  for (const g of groups) {
    const grade = groupGrade(g.key, rows, g.rows);
    const members = g.rows.map((i) => rows[i]);
    const excluded = excludedByGroup.get(JSON.stringify(g.key)) ?? [];
    for (const p of properties) {
      const values = g.columns[p].filter((v) => Number.isFinite(v));
      const leftOut = leftOutCounts(members, excluded, p, pop.options);
      if (values.length === 0 && leftOut.n === 0) continue;
      const summary = summarizeProperty(values, propertySummaryOptions(p, grade, opts));
      if (grade === null && (p === 'yield_mpa' || p === 'rm_mpa' || p === 'yt_ratio' || p === 'a_pct')) {
        summary.warnings.push('group spans several grades: no specification limits applied');
      }
      if (leftOut.n > 0) summary.warnings.push(`${leftOut.n} value(s) left out: ${Object.entries(leftOut.by_reason).map(([k, v]) => `${k} ${v}`).join(', ')}`);
      stats.push({ group: g.key, property: p, left_out: leftOut, ...summary });
    }
  }
  stats.sort(statsOrder);
  const t2 = performance.now();
  for (const g of groups) {
    const cols: Record<string, number[]> = {};
    for (const p of properties) if (g.columns[p].some((v) => Number.isFinite(v))) cols[p] = g.columns[p];
    if (Object.keys(cols).length >= 2) correlations.push({ group: g.key, ...correlationMatrices(cols) });
  }
  const t3 = performance.now();
  return { stats, correlations, timings: { group_ms: t1 - t0, summarize_ms: t2 - t1, correlate_ms: t3 - t2 } };
}

/** Runs the stage alone on the database (see `exclusiveStage`). */
export function runAggregate(store: Store, opts: AggregateOptions): Promise<AggregateResult> {
  return exclusiveStage(store, 'aggregate', () => aggregateAlone(store, opts));
}

async function aggregateAlone(store: Store, opts: AggregateOptions): Promise<AggregateResult> {
  const db = store.db;
  const t0 = performance.now();
  const pop = await loadPopulation(db, opts.filter, opts.population);
  const rows = pop.rows;
  const tLoad = performance.now() - t0;
  const settings = {
    algorithm_version: STAGE_VERSIONS.aggregate, by: opts.by,
    properties: opts.properties ?? [...NUMERIC_PROPERTIES],
    levels: opts.levels ?? DEFAULT_LEVELS,
    priorV: opts.priorV ?? null,
    filter: opts.filter ?? {},
    population: pop.options,
    spec: opts.catalog ? Object.fromEntries(Object.entries(opts.catalog.grades).map(([g, e]) => [g, e.spec])) : null,
    property_settings: opts.catalog ? Object.fromEntries(Object.entries(opts.catalog.grades).map(([g, e]) => [g, e.properties ?? {}])) : null,
  };
  const r = await runStage<{ stats: StatsRow[]; correlations: CorrelationResult[]; timings?: Record<string, number> }>(db, {
    stage: 'aggregate', settings, inputHash: populationHash(pop), codeVersion: opts.codeVersion,
    reuse: (id) => loadAggregate(store, id),
    compute: async (run) => {
      const { stats, correlations, timings } = aggregateRows(pop, opts);
      const tw = performance.now();
      await store.copyRows('group_results', ['run_id', 'stage', 'group_key', 'property', 'body'], [
        ...stats.map((s) => [run, 'aggregate', JSON.stringify(s.group), s.property, JSON.stringify(s)]),
        ...correlations.map((c) => [run, 'aggregate', JSON.stringify(c.group), '', JSON.stringify(c)]),
      ]);
      const counts = { tests: rows.length, groups: correlations.length, rows: stats.length, excluded_tests: pop.excluded.length, values_left_out: stats.reduce((a, s) => a + s.left_out.n, 0) };
      return { result: { stats, correlations, timings: { ...timings, store_ms: performance.now() - tw } }, counts };
    },
  });
  const timings: Record<string, number> = r.reused ? { load_ms: tLoad, reused_ms: performance.now() - t0 - tLoad } : { load_ms: tLoad, ...r.result.timings };
  return { run: r.run, reused: r.reused, stats: r.result.stats, correlations: r.result.correlations, exclusions: pop.exclusions, timings };
}

/** One order for computed and stored rows: by group, then property in NUMERIC_PROPERTIES order. */
function statsOrder(a: StatsRow, b: StatsRow): number {
  return JSON.stringify(a.group).localeCompare(JSON.stringify(b.group)) || NUMERIC_PROPERTIES.indexOf(a.property) - NUMERIC_PROPERTIES.indexOf(b.property);
}

/** Stored results of an aggregate run. */
export async function loadAggregate(store: Store, run: number): Promise<{ stats: StatsRow[]; correlations: CorrelationResult[] }> {
  const rows = await store.db.selectFrom('group_results').select(['property', 'body']).where('run_id', '=', run).where('stage', '=', 'aggregate').execute();
  const parse = (b: unknown) => (typeof b === 'string' ? JSON.parse(b) : b);
  const stats = rows.filter((r) => r.property !== '').map((r) => parse(r.body) as StatsRow);
  const correlations = rows.filter((r) => r.property === '').map((r) => parse(r.body) as CorrelationResult);
  stats.sort(statsOrder);
  correlations.sort((a, b) => JSON.stringify(a.group).localeCompare(JSON.stringify(b.group)));
  return { stats, correlations };
}
