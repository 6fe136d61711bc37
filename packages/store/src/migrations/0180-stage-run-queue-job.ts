/**
 * A stage run started by a queued job records the job (`queue_job`): a job is held by one worker
 * at a time, so when it is handed out again any run still `running` under its name was left by a
 * worker that died, and is marked `abandoned` (queue package) — the queue's form of what
 * runs.ts does for a killed process.
 */
import type { Kysely } from 'kysely';
import { sql } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`alter table stage_runs add column queue_job text`.execute(db);
  await sql`create index stage_runs_queue_job on stage_runs (queue_job) where queue_job is not null`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`alter table stage_runs drop column queue_job`.execute(db);
}
