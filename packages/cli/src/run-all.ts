/**
 * Every stage in order — reduce, aggregate, design curves, drift, the distribution models, sample-size
 * planning, report and exports — each
 * incremental, so a second run on unchanged data reuses what is stored. Prints the time of each
 * stage on stderr.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import type { Store } from '@fractile/store';
import {
  contractView,
  currentReduceHashes,
  DEFAULT_PLAN_ADDED,
  DEFAULT_PLAN_PROPERTIES,
  DESIGN_CAUTION,
  distributionExport,
  driftContract,
  hashOf,
  loadProperties,
  PROPERTY_ROW_KEYS,
  runAggregate,
  runCurves,
  runDistributions,
  runDrift,
  runPlan,
  runReduce,
  type Catalog,
  type GroupField,
} from '@fractile/pipeline';
import { csvComment } from '@fractile/pipeline/csv-cell';
import { renderReport } from '@fractile/report';
import { log, toCsv } from './context.ts';
import { writeCurveFiles } from './curve-files.ts';
import { progressBar } from './progress.ts';
import { assembleReport } from './report-data.ts';
import { CODE_VERSION } from './version.ts';

export interface RunAllOptions {
  catalog: Catalog | null;
  catalogSource: string | null;
  /** grouping of statistics, curves and the report */
  by: GroupField[];
  /** grouping of the drift series */
  driftBy: GroupField[];
  outDir: string;
  workers?: number;
  generatedAt: string;
  /** leave the reduce stage out (the report of what is already reduced) */
  skipReduce?: boolean;
}

export interface RunAllResult {
  report: string;
  exports: string[];
  timings: Record<string, number>;
  alerts: number;
}

async function timed<T>(timings: Record<string, number>, name: string, fn: () => Promise<T>): Promise<T> {
  const t0 = performance.now();
  const out = await fn();
  timings[name] = (performance.now() - t0) / 1000;
  log(`  ${name.padEnd(10)} ${timings[name].toFixed(2)} s`);
  return out;
}

/** Wraps exported JSON rows with the caution and their provenance. */
function withCaution(kind: string, rows: unknown, provenance: Record<string, unknown>): string {
  return JSON.stringify({ caution: DESIGN_CAUTION, kind, provenance, rows }, null, 2) + '\n';
}

const csvWithCaution = (provenance: Record<string, unknown>, text: string) =>
  `# ${DESIGN_CAUTION}\n` + Object.entries(provenance).map(([k, v]) => csvComment(k, v) + '\n').join('') + text;

export async function runAll(store: Store, o: RunAllOptions): Promise<RunAllResult> {
  const timings: Record<string, number> = {};
  const out = resolve(o.outDir);
  mkdirSync(out, { recursive: true });
  if (!o.skipReduce) {
    const bar = progressBar('reduce');
    const reduced = await timed(timings, 'reduce', () => runReduce(store, { catalog: o.catalog, codeVersion: CODE_VERSION, workers: o.workers, onProgress: (d, t) => bar.update(d, t) }));
    bar.stop();
    log(`  reduce: ${reduced.reduced} reduced, ${reduced.given} summary-only, ${reduced.failed} failed, ${reduced.unchanged} unchanged (read ${reduced.timings.read.toFixed(1)} s, compute ${reduced.timings.compute.toFixed(1)} s, write ${reduced.timings.write.toFixed(1)} s)`);
  }
  const aggregate = await timed(timings, 'stats', () => runAggregate(store, { by: o.by, catalog: o.catalog, codeVersion: CODE_VERSION }));
  const curves = await timed(timings, 'curves', () => runCurves(store, { by: o.by, catalog: o.catalog, codeVersion: CODE_VERSION, generatedAt: o.generatedAt }));
  const drift = await timed(timings, 'drift', () => runDrift(store, { by: o.driftBy, catalog: o.catalog, codeVersion: CODE_VERSION }));
  const distributions = await timed(timings, 'sample', () => runDistributions(store, { by: o.by, catalog: o.catalog, codeVersion: CODE_VERSION }));
  const planning = await timed(timings, 'planning', () => runPlan(store, { by: o.by, properties: DEFAULT_PLAN_PROPERTIES, added: DEFAULT_PLAN_ADDED, catalog: o.catalog, codeVersion: CODE_VERSION }));
  const hashes = await currentReduceHashes(store.db);
  const reduceHash = hashes ? hashOf(hashes) : null;

  const exports: string[] = [];
  await timed(timings, 'exports', async () => {
    const provenance = { code_version: CODE_VERSION, generated_at: o.generatedAt, database: store.engine, reduce_settings_hash: reduceHash, grouping: o.by };
    const put = (name: string, text: string) => {
      const p = join(out, name);
      writeFileSync(p, text);
      exports.push(p);
    };
    const props = (await loadProperties(store.db, { includeFailed: true }, { asReduced: true })).map(contractView);
    put('properties.json', withCaution('properties', props, provenance));
    put('properties.csv', csvWithCaution(provenance, toCsv(props.map((r) => ({ ...r, flags: (r.flags as string[]).join(' '), failure: r.failure ? JSON.stringify(r.failure) : null })), [...PROPERTY_ROW_KEYS, 'given', 'failure'])));
    put('stats.json', withCaution('stats', aggregate.stats, { ...provenance, stats_run: aggregate.run }));
    put('correlations.json', withCaution('correlations', aggregate.correlations, { ...provenance, stats_run: aggregate.run }));
    put('drift.json', withCaution('drift', driftContract(drift), { ...provenance, drift_run: drift.run, drift_grouping: o.driftBy }));
    put('distributions.json', JSON.stringify(distributionExport(distributions, CODE_VERSION, o.generatedAt), null, 2) + '\n');
    put('planning.json', withCaution('planning', planning.plans, { ...provenance, stats_run: planning.stats_run }));
    exports.push(...writeCurveFiles(join(out, 'curves'), curves.curves));
  });
  const report = join(out, 'report.html');
  await timed(timings, 'report', async () => {
    const data = await assembleReport(store, { by: o.by, aggregate, curves, drift, catalog: o.catalog, catalogSource: o.catalogSource, reduceHash, generatedAt: o.generatedAt, planning: planning.plans });
    writeFileSync(report, await renderReport(data));
  });
  return { report, exports, timings, alerts: drift.alerts.length };
}
