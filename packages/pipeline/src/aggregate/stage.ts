/**
 * The aggregate stage: population statistics per group and property (summary, fits,
 * characteristic values, compliance, warnings) and correlation matrices per group, from the
 * current per-test results. Results are stored per run; the same settings on the same inputs
 * reuse the stored run instead of recomputing.
 */
import type { Store } from '@fractile/store';
import { correlationMatrices, summarizeProperty, type PropertySummary } from '@fractile/stats';
import { gradeSettings, type Catalog } from '../catalog.ts';
import { hashOf } from '../hash.ts';
import { loadProperties, NUMERIC_PROPERTIES, type PropertyFilter, type PropertyKey, type PropertyRow } from '../properties.ts';
import { exclusiveStage, findDoneRun, finishRun, saveSettings, STAGE_VERSIONS, startRun } from '../runs.ts';
import { groupRows, type GroupField } from './grouping.ts';
import { limitsFor } from './limits.ts';

export interface Level {
  coverage: number;
  confidence: number;
}

export interface AggregateOptions {
  by: GroupField[];
  properties?: PropertyKey[];
  /** first level is the headline; default 0.95/0.75, 0.99/0.95, 0.90/0.95 */
  levels?: Level[];
  /** prior coefficient of variation for the EN 1990 "V known" fractile */
  priorV?: number;
  filter?: PropertyFilter;
  catalog: Catalog | null;
  codeVersion: string;
}

export type StatsRow = { group: Record<string, string>; property: PropertyKey } & PropertySummary;

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
}

export const DEFAULT_LEVELS: Level[] = [
  { coverage: 0.95, confidence: 0.75 },
  { coverage: 0.99, confidence: 0.95 },
  { coverage: 0.9, confidence: 0.95 },
];

/** The single grade of a group (from its key, or shared by all its rows), else null. */
function groupGrade(key: Record<string, string>, rows: PropertyRow[], idx: number[]): string | null {
  if (key.grade !== undefined) return key.grade;
  const g = new Set(idx.map((i) => rows[i].grade));
  return g.size === 1 ? [...g][0] : null;
}

/** Pure part of the stage: statistics of already loaded rows. */
export function aggregateRows(rows: PropertyRow[], opts: Omit<AggregateOptions, 'codeVersion'>): { stats: StatsRow[]; correlations: CorrelationResult[]; timings: Record<string, number> } {
  const t0 = performance.now();
  const properties = opts.properties ?? [...NUMERIC_PROPERTIES];
  const groups = groupRows(rows, opts.by, properties);
  const t1 = performance.now();
  const stats: StatsRow[] = [];
  const correlations: CorrelationResult[] = [];
  for (const g of groups) {
    const grade = groupGrade(g.key, rows, g.rows);
    const spec = grade === null ? null : gradeSettings(opts.catalog, grade).spec;
    for (const p of properties) {
      const values = g.columns[p].filter((v) => Number.isFinite(v));
      if (values.length === 0) continue;
      const { lower, upper } = limitsFor(p, spec);
      const summary = summarizeProperty(values, { levels: opts.levels ?? DEFAULT_LEVELS, priorV: opts.priorV, lower, upper });
      if (grade === null && (p === 'yield_mpa' || p === 'rm_mpa' || p === 'yt_ratio' || p === 'a_pct')) {
        summary.warnings.push('group spans several grades: no specification limits applied');
      }
      stats.push({ group: g.key, property: p, ...summary });
    }
  }
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
  const rows = await loadProperties(db, opts.filter);
  const tLoad = performance.now() - t0;
  const settings = {
    algorithm_version: STAGE_VERSIONS.aggregate, by: opts.by,
    properties: opts.properties ?? [...NUMERIC_PROPERTIES],
    levels: opts.levels ?? DEFAULT_LEVELS,
    priorV: opts.priorV ?? null,
    filter: opts.filter ?? {},
    spec: opts.catalog ? Object.fromEntries(Object.entries(opts.catalog.grades).map(([g, e]) => [g, e.spec])) : null,
  };
  const settingsHash = await saveSettings(db, 'aggregate', settings);
  const inputHash = hashOf(rows.map((r) => `${r.test_pk}:${r.settings_hash}`));
  const done = await findDoneRun(db, 'aggregate', settingsHash, inputHash);
  if (done) {
    const stored = await loadAggregate(store, done.id);
    return { run: done.id, reused: true, ...stored, timings: { load_ms: tLoad, reused_ms: performance.now() - t0 - tLoad } };
  }
  const run = await startRun(db, 'aggregate', settingsHash, inputHash, opts.codeVersion);
  const { stats, correlations, timings } = aggregateRows(rows, opts);
  const tw = performance.now();
  const values = [
    ...stats.map((s) => [run, 'aggregate', JSON.stringify(s.group), s.property, JSON.stringify(s)]),
    ...correlations.map((c) => [run, 'aggregate', JSON.stringify(c.group), '', JSON.stringify(c)]),
  ];
  await store.copyRows('group_results', ['run_id', 'stage', 'group_key', 'property', 'body'], values);
  await finishRun(db, run, { tests: rows.length, groups: correlations.length, rows: stats.length });
  return { run, reused: false, stats, correlations, timings: { load_ms: tLoad, ...timings, store_ms: performance.now() - tw } };
}

/** Stored results of an aggregate run. */
export async function loadAggregate(store: Store, run: number): Promise<{ stats: StatsRow[]; correlations: CorrelationResult[] }> {
  const rows = await store.db.selectFrom('group_results').select(['property', 'body']).where('run_id', '=', run).where('stage', '=', 'aggregate').execute();
  const parse = (b: unknown) => (typeof b === 'string' ? JSON.parse(b) : b);
  const stats = rows.filter((r) => r.property !== '').map((r) => parse(r.body) as StatsRow);
  const correlations = rows.filter((r) => r.property === '').map((r) => parse(r.body) as CorrelationResult);
  const order = (g: Record<string, string>) => JSON.stringify(g);
  stats.sort((a, b) => order(a.group).localeCompare(order(b.group)) || NUMERIC_PROPERTIES.indexOf(a.property) - NUMERIC_PROPERTIES.indexOf(b.property));
  correlations.sort((a, b) => order(a.group).localeCompare(order(b.group)));
  return { stats, correlations };
}
