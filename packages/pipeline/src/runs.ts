/**
 * Stage run rows: every stage that does work records what ran, when, with which settings (by
 * hash, the body kept once in stage_settings), on which inputs, with which code version, and how
 * many items it handled.
 */
import { sql, type Kysely } from 'kysely';
import type { Database, StageName, Store } from '@fractile/store';
import { hashOf } from './hash.ts';

/**
 * Version of the per-test reduction (part of every per-test result's key); bump when a change
 * alters per-test results for the same input.
 */
export const ALGORITHM_VERSION = '5';

/** Algorithm version of each stage, recorded in its settings; bump one when its results change. */
export const STAGE_VERSIONS = { reduce: ALGORITHM_VERSION, aggregate: '4', design: '4', monitor: '5', sample: '1' } as const;

/**
 * Runs a stage alone on the database: two runs of the same stage (two processes on a server, two
 * calls in one process) never write results at once — the second waits for the first (store
 * `exclusive`), then finds its results done and reuses them, or computes what is left. Inside,
 * no other run of the stage can be going on, so runs still `running` were left by a killed
 * process (or one that failed) and are marked `abandoned` first.
 */
export function exclusiveStage<T>(store: Store, stage: StageName, fn: () => Promise<T>): Promise<T> {
  return store.exclusive(`stage ${stage}`, async () => {
    await store.db.updateTable('stage_runs').set({ status: 'abandoned' }).where('stage', '=', stage).where('status', '=', 'running').execute();
    return fn();
  });
}

/** Stores a settings body under its hash (once) and returns the hash. */
export async function saveSettings(db: Kysely<Database>, stage: StageName, body: object): Promise<string> {
  const hash = hashOf(body);
  await db
    .insertInto('stage_settings')
    .values({ hash, stage, body: JSON.stringify(body) })
    .onConflict((oc) => oc.column('hash').doNothing())
    .execute();
  return hash;
}

/** Records a run as `running`; `queueJob` names the queued job that started it (null in-process). */
export async function startRun(db: Kysely<Database>, stage: StageName, settingsHash: string, inputHash: string | null, codeVersion: string, queueJob: string | null = null): Promise<number> {
  const row = await db
    .insertInto('stage_runs')
    .values({ stage, settings_hash: settingsHash, input_hash: inputHash, code_version: codeVersion, counts: JSON.stringify({}), queue_job: queueJob })
    .returning('id')
    .executeTakeFirstOrThrow();
  return Number(row.id);
}

export async function finishRun(db: Kysely<Database>, runId: number, counts: Record<string, number>, status: 'done' | 'failed' = 'done'): Promise<void> {
  await db
    .updateTable('stage_runs')
    .set({ status, finished_at: sql<Date>`now()`, counts: JSON.stringify(counts) })
    .where('id', '=', runId)
    .execute();
}

/** The newest finished run of a stage with these settings and inputs, if any. */
export async function findDoneRun(db: Kysely<Database>, stage: StageName, settingsHash: string, inputHash: string | null): Promise<{ id: number; finished_at: Date | null } | null> {
  let q = db.selectFrom('stage_runs').select(['id', 'finished_at']).where('stage', '=', stage).where('settings_hash', '=', settingsHash).where('status', '=', 'done');
  q = inputHash === null ? q.where('input_hash', 'is', null) : q.where('input_hash', '=', inputHash);
  const row = await q.orderBy('id', 'desc').limit(1).executeTakeFirst();
  return row ? { id: Number(row.id), finished_at: row.finished_at } : null;
}

/** The newest finished run of a stage, whatever its settings. */
export async function latestRun(db: Kysely<Database>, stage: StageName): Promise<{ id: number; settings_hash: string; code_version: string; finished_at: Date | null; counts: Record<string, number> } | null> {
  const row = await db
    .selectFrom('stage_runs')
    .select(['id', 'settings_hash', 'code_version', 'finished_at', 'counts'])
    .where('stage', '=', stage)
    .where('status', '=', 'done')
    .orderBy('id', 'desc')
    .limit(1)
    .executeTakeFirst();
  return row ? { id: Number(row.id), settings_hash: row.settings_hash, code_version: row.code_version, finished_at: row.finished_at, counts: row.counts } : null;
}

/** What one stage run needs: its settings and inputs, how to read a finished run back, how to compute one. */
export interface StageWork<R> {
  stage: StageName;
  settings: object;
  /** Hash of the inputs (null where the settings alone key the run). */
  inputHash: string | null;
  codeVersion: string;
  /** The results of a finished run with these settings and inputs; null when they cannot be read back. */
  reuse(runId: number): Promise<R | null>;
  /** Computes and stores the results under `runId`; the counts go to the run row. */
  compute(runId: number, settingsHash: string): Promise<{ result: R; counts: Record<string, number> }>;
}

/**
 * The life of a stage run, one place for every stage: store the settings, reuse a finished run of
 * the same settings and inputs, else start a run row, compute, and mark it `done` with its counts
 * — or `failed` when the computation throws (the error is rethrown).
 */
export async function runStage<R>(db: Kysely<Database>, work: StageWork<R>): Promise<{ run: number; reused: boolean; settingsHash: string; result: R }> {
  const settingsHash = await saveSettings(db, work.stage, work.settings);
  const done = await findDoneRun(db, work.stage, settingsHash, work.inputHash);
  if (done) {
    const result = await work.reuse(done.id);
    if (result !== null) return { run: done.id, reused: true, settingsHash, result };
  }
  const run = await startRun(db, work.stage, settingsHash, work.inputHash, work.codeVersion);
  try {
    const { result, counts } = await work.compute(run, settingsHash);
    await finishRun(db, run, counts);
    return { run, reused: false, settingsHash, result };
  } catch (e) {
    await finishRun(db, run, {}, 'failed');
    throw e;
  }
}
