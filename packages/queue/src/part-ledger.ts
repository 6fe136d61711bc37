/**
 * The ledger of queued work (store migration 0060): a part is marked done after its work is
 * committed (a job that dies in between does its part again, finds it committed — the work is
 * idempotent by its keys — and marks it then), and the follow-up of a reduce request is enqueued
 * exactly once, in the transaction that claims it: each part commits its row before it looks, so
 * the last part to commit sees every row, and the `followup_at is null` claim lets only one win.
 */
import { sql } from 'kysely';
import type { Store } from '@fractile/store';
import { jobKey, MAX_ATTEMPTS, type JobKind, type StagesJob } from './job-kinds.ts';
import { QUEUE_SCHEMA } from './queue-schema.ts';

export async function markPartDone(store: Store, request: number, part: number, kind: JobKind, counts: Record<string, number>): Promise<void> {
  await store.db
    .insertInto('queue_parts')
    .values({ request_id: request, part, kind, counts: JSON.stringify(counts) })
    .onConflict((oc) => oc.columns(['request_id', 'part']).doNothing())
    .execute();
}

/** After a reduce part: enqueues the request's group stages if it asked for them and every part is done. */
export async function enqueueFollowUp(store: Store, request: number): Promise<boolean> {
  return store.transaction(async (trx) => {
    const claimed = await sql<{ settings: { stages?: Omit<StagesJob, 'request'> } }>`
      update queue_requests r set followup_at = now()
      where r.id = ${request} and r.then_stages and r.followup_at is null and r.cancelled_at is null
        and (select count(*) from queue_parts p where p.request_id = r.id and p.part >= 0) = r.parts
      returning r.settings`.execute(trx);
    if (!claimed.rows.length) return false;
    const stages = claimed.rows[0].settings.stages ?? { catalog: null, by: 'grade', driftBy: 'supplier,grade' };
    const payload: StagesJob = { request, ...stages };
    await sql`select ${sql.id(QUEUE_SCHEMA)}.add_job('stages', ${JSON.stringify(payload)}::json, job_key := ${jobKey(request, 'stages')}, max_attempts := ${MAX_ATTEMPTS})`.execute(trx);
    return true;
  });
}
