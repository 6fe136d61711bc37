/**
 * What a worker does with each job: the existing stage functions, given the job's subset.
 *   - ingest: `ingestManifests` on the part's lines; its batches are transactions, so a killed
 *     attempt leaves whole batches, which the retry finds stored (duplicates) before it completes
 *     the rest. The ingest run of the dead attempt is marked `abandoned` by the next ingest
 *     (store ingest-runs.ts).
 *   - reduce: `runReduceBatch` on the job's ids (one COPY of results per batch of 256 tests);
 *     first, runs still `running` under this job's key are marked `abandoned` — a job is held by
 *     one worker at a time, so such a run belongs to an attempt that died.
 *   - stages: aggregate, design curves and drift as `fractile run` runs them (each stage takes
 *     its turn on the database and reuses a finished run with the same settings and inputs).
 * Each handler marks its part done in the ledger (part-ledger.ts) when its work is committed.
 */
import type { JobHelpers } from 'graphile-worker';
import { ingestManifests, scanFile } from '@fractile/ingest';
import { parseGroupBy, runAggregate, runCurves, runDrift, runReduceBatch } from '@fractile/pipeline';
import type { Store } from '@fractile/store';
import { jobKey, type IngestJob, type ReduceJob, type StagesJob } from './job-kinds.ts';
import { enqueueFollowUp, markPartDone } from './part-ledger.ts';

export interface HandlerContext {
  store: Store;
  codeVersion: string;
  /** worker threads a job may use (reduce computation, curve reading; 0: the job's own thread) */
  threads: number;
}

export async function handleIngest(ctx: HandlerContext, job: IngestJob, helpers?: JobHelpers): Promise<void> {
  const scan = await scanFile(job.manifest);
  if (scan.sha256 !== job.sha256) throw new Error(`${job.manifest}: the file changed since it was enqueued (SHA-256 ${scan.sha256.slice(0, 12)}…, enqueued ${job.sha256.slice(0, 12)}…); enqueue it again`);
  const s = await ingestManifests(ctx.store, [{ path: job.manifest, map: job.map }], {
    lines: { from: job.from, to: job.to },
    replace: job.replace,
    batchSize: job.batchSize,
    workers: ctx.threads,
    codeVersion: ctx.codeVersion,
  });
  helpers?.logger.info(`ingest ${jobKey(job.request, job.part)}: run ${s.run}: ${s.accepted} accepted, ${s.duplicates} duplicate, ${s.rejected.length} rejected`);
  await markPartDone(ctx.store, job.request, job.part, 'ingest', { run: s.run, accepted: s.accepted, duplicates: s.duplicates, replaced: s.replaced, rejected: s.rejected.length });
}

export async function handleReduce(ctx: HandlerContext, job: ReduceJob, helpers?: JobHelpers): Promise<void> {
  const key = jobKey(job.request, job.part);
  await ctx.store.db.updateTable('stage_runs').set({ status: 'abandoned' }).where('queue_job', '=', key).where('status', '=', 'running').execute();
  const s = await runReduceBatch(ctx.store, { catalog: job.catalog, overrides: job.overrides, testIds: job.ids, queueJob: key, workers: ctx.threads, codeVersion: ctx.codeVersion });
  helpers?.logger.info(`reduce ${key}: run ${s.run}: ${s.reduced} reduced, ${s.given} summary-only, ${s.failed} failed, ${s.unchanged} unchanged`);
  await markPartDone(ctx.store, job.request, job.part, 'reduce', { run: s.run, reduced: s.reduced, given: s.given, failed: s.failed, unchanged: s.unchanged });
  await enqueueFollowUp(ctx.store, job.request);
}

export async function handleStages(ctx: HandlerContext, job: StagesJob): Promise<void> {
  const by = parseGroupBy(job.by);
  const aggregate = await runAggregate(ctx.store, { by, catalog: job.catalog, codeVersion: ctx.codeVersion });
  const curves = await runCurves(ctx.store, { by, catalog: job.catalog, codeVersion: ctx.codeVersion, generatedAt: new Date().toISOString() });
  const drift = await runDrift(ctx.store, { by: parseGroupBy(job.driftBy), catalog: job.catalog, codeVersion: ctx.codeVersion });
  await markPartDone(ctx.store, job.request, -1, 'stages', { stats_run: aggregate.run, curves_run: curves.run, drift_run: drift.run, alerts: drift.alerts.length });
}
