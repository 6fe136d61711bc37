/**
 * Ingest: manifests (+ optional column maps for their curve files) into the raw tables.
 *
 * The inputs are scanned first (scan-inputs.ts); then each manifest is streamed in batches
 * (manifest-batches.ts) to the store's batch writer, one transaction per batch (store
 * test-batch.ts: a crash leaves whole batches only, and a batch the database refuses a record of
 * is split until that record alone is rejected). While a batch is written, the manifest is read
 * on and the next batch's first curves are read (curve-pool.ts; batch writes stay one after the
 * other; measured on 2,000 tests × 2,000 points with batches of 200: 5.9 → 4.9 s). Each record is
 * judged against the stored version of its identity (classify.ts): new, duplicate, conflict, or a
 * replacement with `replace`. A re-run skips what was committed and completes the rest.
 *
 * With a `reducer`, every test is reduced as it is stored (batch-entries.ts, curve-task.ts): the
 * worker that parsed a curve reduces it while its channels are in memory, and the per-test row is
 * written in the batch's transaction.
 *
 * Ingests run side by side: each holds the database's `ingest` section shared for its run
 * (store `sections`), and each batch locks the identities it writes (test-batch.ts), so two
 * ingests of the same test take turns on it and ingests of different tests do not wait. Runs a
 * killed process left `running` are marked `abandoned` by the next ingest that finds no other
 * one running.
 */
import { readFileSync } from 'node:fs';
import type { Store } from '@fractile/store';
import { abandonRunningIngests, failIngestRun, finishIngestRun, recordSourceFiles, startIngestRun, storeRejections, writeTestBatch } from '@fractile/store';
import { curveReduceInput, testBatch, type IngestReducer } from './batch-entries.ts';
import { curvePool } from './curve-pool.ts';
import { manifestBatches } from './manifest-batches.ts';
import type { Rejection } from './rejection.ts';
import { scanInputs, type ManifestInput, type ScannedManifest } from './scan-inputs.ts';

export type { ManifestInput, IngestReducer };

const INGEST_VERSION = (JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string }).version;

export interface IngestOptions {
  /** validate and classify, write nothing */
  dryRun?: boolean;
  /** a changed test replaces the stored one (kept as history) instead of being rejected */
  replace?: boolean;
  onProgress?: (done: number, total: number) => void;
  /** tests per transaction (default 200) */
  batchSize?: number;
  /** recorded in the run row (default: this package's version) */
  codeVersion?: string;
  /** worker threads that read curve files (see curve-pool.ts; 0 reads in-process) */
  workers?: number;
  /**
   * only the records and rejections whose manifest line is in [from, to) (a queued part, queue
   * package); whole-file findings (line 0) belong to the part with from = 0
   */
  lines?: { from: number; to: number };
  /**
   * reduce each test as it is stored, in the worker that read its curve, and write its per-test
   * result in the batch's transaction (ignored by a dry run)
   */
  reducer?: IngestReducer | null;
}

export interface IngestSummary {
  /** run id (0 for a dry run) */
  run: number;
  /** tests written (new ones and replacements) */
  accepted: number;
  /** tests already stored with the same content, skipped */
  duplicates: number;
  /** of the accepted, how many replaced a stored version */
  replaced: number;
  rejected: Rejection[];
  dry_run: boolean;
}

/** Ingests the manifests; returns what was accepted, skipped and rejected. */
export async function ingestManifests(store: Store, manifests: ManifestInput[], opts: IngestOptions = {}): Promise<IngestSummary> {
  const dryRun = opts.dryRun ?? false;
  const batchSize = Math.max(1, Math.floor(opts.batchSize ?? 200));
  const inputs = await scanInputs(manifests);
  const lines = opts.lines;
  const keep = lines ? (line: number) => line >= lines.from && line < lines.to : undefined;
  if (keep) inputs.rejected = inputs.rejected.filter((r) => keep(r.line));
  const reducer = dryRun ? null : (opts.reducer ?? null);
  const pool = curvePool(inputs.rows, opts.workers, curveReduceInput(reducer));
  const sum: IngestSummary = { run: 0, accepted: 0, duplicates: 0, replaced: 0, rejected: [...inputs.rejected], dry_run: dryRun };
  let done = 0;
  const progress = () => opts.onProgress?.(Math.min(done, inputs.rows), inputs.rows);

  const ingestManifest = async (m: ScannedManifest) => {
    const map = m.map?.map ?? null;
    if (!dryRun) await recordSourceFiles(store.db, [{ sha256: m.scan.sha256, name: m.input.path, size_bytes: m.scan.sizeBytes }, ...(m.map ? [{ sha256: m.map.sha256, name: m.input.map!, size_bytes: m.map.size }] : [])]);
    let writing: Promise<void> | null = null;
    try {
      for await (const b of manifestBatches(m.input.path, batchSize, (rec) => writing && pool.ahead(rec, map), keep)) {
        if (writing) await writing;
        const src = { run: sum.run, manifestPath: m.input.path, manifestSha256: m.scan.sha256, map: m.map, records: b.records, pool, replace: opts.replace ?? false, store, reducer };
        writing = (async () => {
          const outcomes = await writeTestBatch(store, testBatch(src), { dryRun });
          sum.rejected.push(...b.rejections);
          for (const o of outcomes) {
            if (o.kind === 'test') sum.accepted++, (sum.replaced += o.replaced ? 1 : 0);
            else if (o.kind === 'duplicate') sum.duplicates++;
            else sum.rejected.push(o.rejection as Rejection);
          }
          if (!dryRun) await storeRejections(store, sum.run, b.rejections);
          done += b.records.length + b.rejections.length;
          progress();
        })();
        writing.catch(() => {});
      }
    } finally {
      // never leave a write running behind an error (the run is then marked failed)
      if (writing) await writing;
    }
  };
  const ingestAll = async () => {
    for (const m of inputs.manifests) await ingestManifest(m);
    progress();
    return sum;
  };

  try {
    if (dryRun) return await ingestAll();
    // ingests run side by side (their batches lock the identities they write); a run left
    // `running` is marked abandoned only by an ingest that finds no other one running
    await store.sections.ifAlone('ingest', async () => {
      await abandonRunningIngests(store.db);
    });
    return await store.sections.shared('ingest', async () => {
      const settings = { manifests: inputs.settings, replace: opts.replace ?? false, batch_size: batchSize, ...(lines ? { lines } : {}) };
      sum.run = await startIngestRun(store.db, settings, opts.codeVersion ?? INGEST_VERSION);
      try {
        await storeRejections(store, sum.run, inputs.rejected);
        await ingestAll();
        await finishIngestRun(store.db, sum.run, { accepted: sum.accepted, duplicates: sum.duplicates, replaced: sum.replaced, rejected: sum.rejected.length });
        return sum;
      } catch (e) {
        await failIngestRun(store.db, sum.run).catch(() => {});
        throw e;
      }
    });
  } finally {
    await pool.destroy();
  }
}
