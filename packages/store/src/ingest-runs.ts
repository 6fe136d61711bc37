/**
 * Ingest run rows: started before the first batch, finished with the counts, marked failed when
 * the run ends in an error. Every ingest holds the database's ingest section shared
 * (`store.sections.shared('ingest', …)`) while it runs; a run left `running` by a process that
 * was killed is marked `abandoned` by the next ingest that finds the section free
 * (`store.sections.ifAlone`), so that no ingest still running can be marked.
 */
import type { Kysely } from 'kysely';
import type { Store } from './open-store.ts';
import type { Database } from './schema.ts';
import { REJECTION_COLUMNS, rejectionRows, type RejectionValues } from './test-batch.ts';

export interface IngestCounts {
  accepted: number;
  duplicates: number;
  replaced: number;
  rejected: number;
}

/** Marks runs still `running` as abandoned; returns their ids. Call only when no ingest runs (see above). */
export async function abandonRunningIngests(db: Kysely<Database>): Promise<number[]> {
  const rows = await db.updateTable('ingest_runs').set({ status: 'abandoned' }).where('status', '=', 'running').returning('id').execute();
  return rows.map((r) => Number(r.id));
}

export async function startIngestRun(db: Kysely<Database>, settings: object, codeVersion: string): Promise<number> {
  const row = await db.insertInto('ingest_runs').values({ settings: JSON.stringify(settings), code_version: codeVersion }).returning('id').executeTakeFirstOrThrow();
  return Number(row.id);
}

export async function finishIngestRun(db: Kysely<Database>, run: number, counts: IngestCounts): Promise<void> {
  await db.updateTable('ingest_runs').set({ status: 'completed', finished_at: new Date(), ...counts }).where('id', '=', run).execute();
}

export async function failIngestRun(db: Kysely<Database>, run: number): Promise<void> {
  await db.updateTable('ingest_runs').set({ status: 'failed', finished_at: new Date() }).where('id', '=', run).execute();
}

/** Stores rejections found outside any batch (column maps, unreadable manifests). */
export async function storeRejections(store: Store, run: number, rejections: readonly RejectionValues[]): Promise<void> {
  if (rejections.length) await store.copyRows('rejections', REJECTION_COLUMNS, rejectionRows(run, rejections));
}

/** Records input files (manifests, column maps) by content. */
export async function recordSourceFiles(db: Kysely<Database>, files: { sha256: string; name: string; size_bytes: number }[]): Promise<void> {
  if (files.length) await db.insertInto('source_files').values(files).onConflict((oc) => oc.column('sha256').doNothing()).execute();
}
