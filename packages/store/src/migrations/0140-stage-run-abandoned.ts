/**
 * A stage run can be `abandoned`: left `running` by a process that was killed, and found so when
 * the next run of the same stage starts (pipeline runs.ts).
 */
import type { Kysely } from 'kysely';
import { sql } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`alter table stage_runs drop constraint stage_runs_status_check`.execute(db);
  await sql`alter table stage_runs add constraint stage_runs_status_check check (status in ('running', 'done', 'failed', 'abandoned'))`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`update stage_runs set status = 'failed' where status = 'abandoned'`.execute(db);
  await sql`alter table stage_runs drop constraint stage_runs_status_check`.execute(db);
  await sql`alter table stage_runs add constraint stage_runs_status_check check (status in ('running', 'done', 'failed'))`.execute(db);
}
