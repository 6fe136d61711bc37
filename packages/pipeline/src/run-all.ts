/**
 * Every stage in order — reduce, aggregate (per group, and per group and supplier for the
 * report's breakdown), design curves, drift, the distribution models, sample-size planning, the
 * curve-versus-certificate cross-check — then the
 * exports and the report, each stage incremental, so a second run on unchanged data reuses what
 * is stored. Prints nothing: the caller is told each stage's time through `onStage` and the
 * reduction's progress through `onProgress`.
 */
import { writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { renderReport } from '@fractile/report';
import type { Store } from '@fractile/store';
import { runAggregate, type AggregateResult } from './aggregate/stage.ts';
import type { GroupField } from './aggregate/grouping.ts';
import type { Catalog } from './catalog.ts';
import { runCrossCheck } from './crosscheck/crosscheck-stage.ts';
import { runCurves } from './design/stage.ts';
import type { StressUnit } from './design/fe-table.ts';
import { writeExports } from './exports/write-exports.ts';
import { hashOf } from './hash.ts';
import { runDrift } from './monitor/stage.ts';
import { currentReduceHashes } from './properties.ts';
import { runReduce, type ReduceStageSummary } from './reduce/stage.ts';
import { DEFAULT_PLAN_ADDED, DEFAULT_PLAN_PROPERTIES } from './planning/plan-groups.ts';
import { runPlan } from './planning/run-plan.ts';
import { runDistributions } from './sample/stage.ts';
import { assembleReport } from './report/assemble-report.ts';

export interface RunAllOptions {
  catalog: Catalog | null;
  catalogSource: string | null;
  /** grouping of statistics, curves and the report */
  by: GroupField[];
  /** grouping of the drift series */
  driftBy: GroupField[];
  outDir: string;
  workers?: number;
  codeVersion: string;
  generatedAt: string;
  /** leave the reduce stage out (the report of what is already reduced) */
  skipReduce?: boolean;
  /** CSV exports with the comment block (default) or plain with sidecars */
  comments?: boolean;
  /** stress unit of the FE tables (default MPa) */
  feUnit?: StressUnit;
  /** provenance of every export beyond code version, time, database and grouping */
  provenance?: Record<string, unknown>;
  onStage?: (stage: string, seconds: number) => void;
  onReduce?: (summary: ReduceStageSummary) => void;
  onProgress?: (done: number, total: number) => void;
}

export interface RunAllResult {
  report: string;
  exports: string[];
  timings: Record<string, number>;
  alerts: number;
  /** tests whose curve and certificate were compared */
  crosschecked: number;
}

export async function runAll(store: Store, o: RunAllOptions): Promise<RunAllResult> {
  const timings: Record<string, number> = {};
  const timed = async <T>(name: string, fn: () => Promise<T>): Promise<T> => {
    const t0 = performance.now();
    const out = await fn();
    timings[name] = (performance.now() - t0) / 1000;
    o.onStage?.(name, timings[name]);
    return out;
  };
  const out = resolve(o.outDir);
  const codeVersion = o.codeVersion;
  if (!o.skipReduce) {
    const reduced = await timed('reduce', () => runReduce(store, { catalog: o.catalog, codeVersion, workers: o.workers, onProgress: o.onProgress }));
    o.onReduce?.(reduced);
  }
  const aggregate = await timed('stats', () => runAggregate(store, { by: o.by, catalog: o.catalog, codeVersion }));
  const finer: GroupField[] = o.by.includes('supplier') ? [] : [...o.by, 'supplier'];
  const breakdown: AggregateResult | null = finer.length ? await timed('stats by supplier', () => runAggregate(store, { by: finer, catalog: o.catalog, codeVersion })) : null;
  const curves = await timed('curves', () => runCurves(store, { by: o.by, catalog: o.catalog, codeVersion, generatedAt: o.generatedAt }));
  const drift = await timed('drift', () => runDrift(store, { by: o.driftBy, catalog: o.catalog, codeVersion }));
  const distributions = await timed('sample', () => runDistributions(store, { by: o.by, catalog: o.catalog, codeVersion }));
  const planning = await timed('planning', () =>
    runPlan(store, { by: o.by, properties: DEFAULT_PLAN_PROPERTIES, added: DEFAULT_PLAN_ADDED, catalog: o.catalog, codeVersion }),
  );
  const crosscheck = await timed('crosscheck', () => runCrossCheck(store));
  const hashes = await currentReduceHashes(store.db);
  const reduceHash = hashes ? hashOf(hashes) : null;

  const provenance = {
    code_version: codeVersion,
    generated_at: o.generatedAt,
    database: store.engine,
    reduce_settings_hash: reduceHash,
    grouping: o.by,
    ...o.provenance,
  };
  const written = await timed('exports', () => writeExports(store, out, { aggregate, curves, drift, distributions, planning, crosscheck, provenance, codeVersion, generatedAt: o.generatedAt, driftBy: o.driftBy, comments: o.comments, feUnit: o.feUnit }));
  const report = join(out, 'report.html');
  await timed('report', async () => {
    const data = await assembleReport(store, {
      by: o.by, aggregate, breakdown, curves, drift, crosscheck, catalog: o.catalog, catalogSource: o.catalogSource, reduceHash, codeVersion, generatedAt: o.generatedAt, lists: written.lists, planning: planning.plans,
    });
    writeFileSync(report, await renderReport(data));
  });
  return { report, exports: written.files, timings, alerts: drift.alerts.length, crosschecked: crosscheck.tests };
}
