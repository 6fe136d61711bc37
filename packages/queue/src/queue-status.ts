/**
 * What the queue holds, per job kind: `pending` (waiting to be claimed, retries included),
 * `running` (held by a worker), `retrying` (of the pending, those that failed before and wait for
 * their next attempt), `failed` (out of attempts: kept until retried or cancelled, with the last
 * error) and `done` (parts in the ledger; the queue itself forgets finished jobs). Retry puts
 * failed jobs back with their attempts reset; cancel marks a request cancelled and removes its
 * jobs that no worker holds (a running one finishes; its follow-up is not enqueued).
 */
import { sql } from 'kysely';
import type { Store } from '@fractile/store';
import { JOB_KINDS, type JobKind } from './job-kinds.ts';
import { prepareQueue, QUEUE_SCHEMA } from './queue-schema.ts';

export interface KindStatus {
  kind: JobKind;
  pending: number;
  running: number;
  retrying: number;
  failed: number;
  done: number;
}

export interface FailedJob {
  id: number;
  kind: JobKind;
  key: string | null;
  attempts: number;
  last_error: string | null;
}

export interface RequestProgress {
  request: number;
  kind: 'ingest' | 'reduce';
  parts: number;
  done: number;
  /** jobs of the request still in the queue, by state */
  pending: number;
  running: number;
  failed: number;
  then_stages: boolean;
  /** null while not asked for or not finished */
  stages_done: boolean | null;
  cancelled: boolean;
}

const q = sql.id(QUEUE_SCHEMA);

async function ready(store: Store): Promise<void> {
  if (store.engine !== 'postgres') throw new Error('the job queue needs a PostgreSQL server');
  await prepareQueue(store.target);
}

export async function queueStatus(store: Store): Promise<KindStatus[]> {
  await ready(store);
  const jobs = await sql<{ kind: string; pending: number; running: number; retrying: number; failed: number }>`
    select task_identifier as kind,
           count(*) filter (where locked_at is null and attempts < max_attempts)::int as pending,
           count(*) filter (where locked_at is not null)::int as running,
           count(*) filter (where locked_at is null and attempts > 0 and attempts < max_attempts)::int as retrying,
           count(*) filter (where locked_at is null and attempts >= max_attempts)::int as failed
    from ${q}.jobs group by task_identifier`.execute(store.db);
  const done = await store.db.selectFrom('queue_parts').select(['kind', (eb) => eb.fn.countAll<string>().as('n')]).groupBy('kind').execute();
  return JOB_KINDS.map((kind) => {
    const j = jobs.rows.find((r) => r.kind === kind);
    return { kind, pending: j?.pending ?? 0, running: j?.running ?? 0, retrying: j?.retrying ?? 0, failed: j?.failed ?? 0, done: Number(done.find((d) => d.kind === kind)?.n ?? 0) };
  });
}

export async function failedJobs(store: Store, kind?: JobKind): Promise<FailedJob[]> {
  await ready(store);
  const r = await sql<FailedJob>`
    select id::int8 as id, task_identifier as kind, key, attempts, last_error from ${q}.jobs
    where locked_at is null and attempts >= max_attempts ${kind ? sql`and task_identifier = ${kind}` : sql``}
    order by id`.execute(store.db);
  return r.rows.map((j) => ({ ...j, id: Number(j.id) }));
}

/** Puts failed jobs (all, or of one kind) back in the queue; returns how many. */
export async function retryFailed(store: Store, kind?: JobKind): Promise<number> {
  const ids = (await failedJobs(store, kind)).map((j) => String(j.id));
  if (!ids.length) return 0;
  const r = await sql`select id from ${q}.reschedule_jobs(${sql.val(ids)}::bigint[], run_at := now(), attempts := 0)`.execute(store.db);
  return r.rows.length;
}

/** Cancels a request: no new job of it starts; returns the jobs removed (a running one finishes). */
export async function cancelRequest(store: Store, request: number): Promise<{ found: boolean; removed: number }> {
  await ready(store);
  return store.transaction(async (trx) => {
    const row = await trx.updateTable('queue_requests').set({ cancelled_at: new Date() }).where('id', '=', request).where('cancelled_at', 'is', null).returning('id').executeTakeFirst();
    const exists = row ?? (await trx.selectFrom('queue_requests').select('id').where('id', '=', request).executeTakeFirst());
    const ids = await sql<{ id: string }>`select id::text as id from ${q}.jobs where locked_at is null and key like ${`r${request}:%`}`.execute(trx);
    const removed = ids.rows.length ? (await sql`select id from ${q}.complete_jobs(${sql.val(ids.rows.map((r) => r.id))}::bigint[])`.execute(trx)).rows.length : 0;
    return { found: Boolean(exists), removed };
  });
}

export async function requestProgress(store: Store, request: number): Promise<RequestProgress | null> {
  const req = await store.db.selectFrom('queue_requests').selectAll().where('id', '=', request).executeTakeFirst();
  if (!req) return null;
  const parts = await store.db.selectFrom('queue_parts').select(['part']).where('request_id', '=', request).execute();
  const jobs = await sql<{ pending: number; running: number; failed: number }>`
    select count(*) filter (where locked_at is null and attempts < max_attempts)::int as pending,
           count(*) filter (where locked_at is not null)::int as running,
           count(*) filter (where locked_at is null and attempts >= max_attempts)::int as failed
    from ${q}.jobs where key like ${`r${request}:%`}`.execute(store.db);
  const j = jobs.rows[0];
  return {
    request,
    kind: req.kind,
    parts: req.parts,
    done: parts.filter((p) => p.part >= 0).length,
    pending: j.pending,
    running: j.running,
    failed: j.failed,
    then_stages: req.then_stages,
    stages_done: req.then_stages ? parts.some((p) => p.part === -1) : null,
    cancelled: req.cancelled_at !== null,
  };
}

/** True when nothing of the request is left to run (done, failed or cancelled). */
export function settled(p: RequestProgress): boolean {
  const workDone = p.done === p.parts && (!p.then_stages || p.stages_done === true);
  return workDone || ((p.failed > 0 || p.cancelled) && p.pending === 0 && p.running === 0);
}

/** Polls a request until it is settled, calling `onProgress` on each change; returns the last state. */
export async function watchRequest(store: Store, request: number, onProgress: (p: RequestProgress) => void, pollMs = 1000): Promise<RequestProgress> {
  let last = '';
  for (;;) {
    const p = await requestProgress(store, request);
    if (!p) throw new Error(`no queued request ${request}`);
    const text = JSON.stringify(p);
    if (text !== last) onProgress(p), (last = text);
    if (settled(p)) return p;
    await new Promise((r) => setTimeout(r, pollMs));
  }
}
