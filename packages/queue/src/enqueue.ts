/**
 * Enqueuing: a request row and its jobs written in one transaction (a request is whole or
 * absent). Jobs go in through graphile-worker's `add_job` SQL function, one statement for all of
 * them (`unnest` of payloads and keys), so 4,000 parts are one round trip.
 */
import { sql } from 'kysely';
import type { Store } from '@fractile/store';
import { jobKey, MAX_ATTEMPTS, type JobKind } from './job-kinds.ts';
import { prepareQueue, QUEUE_SCHEMA } from './queue-schema.ts';

export interface EnqueuedRequest {
  request: number;
  parts: number;
}

/** Writes a request of `kind` with one job per payload (their `request`/`part` filled in). */
export async function enqueueRequest<P extends object>(
  store: Store,
  kind: Extract<JobKind, 'ingest' | 'reduce'>,
  settings: object,
  payloads: P[],
  thenStages = false,
): Promise<EnqueuedRequest> {
  if (store.engine !== 'postgres') throw new Error('the job queue needs a PostgreSQL server');
  await prepareQueue(store.target);
  return store.transaction(async (trx) => {
    const row = await trx
      .insertInto('queue_requests')
      .values({ kind, parts: payloads.length, settings: JSON.stringify(settings), then_stages: thenStages, followup_at: null, cancelled_at: null })
      .returning('id')
      .executeTakeFirstOrThrow();
    const request = Number(row.id);
    const bodies = payloads.map((p, part) => JSON.stringify({ ...p, request, part }));
    const keys = payloads.map((_, part) => jobKey(request, part));
    if (bodies.length) {
      await sql`select ${sql.id(QUEUE_SCHEMA)}.add_job(${kind}, u.p, job_key := u.k, max_attempts := ${MAX_ATTEMPTS})
                from unnest(${sql.val(bodies)}::json[], ${sql.val(keys)}::text[]) as u(p, k)`.execute(trx);
    }
    return { request, parts: payloads.length };
  });
}
