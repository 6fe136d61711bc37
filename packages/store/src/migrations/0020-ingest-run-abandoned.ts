/**
 * An ingest run can be `abandoned`: left `running` by a process that was killed, and found so
 * when the next ingest starts (see ingest-runs.ts).
 */
import type { Kysely } from 'kysely';
import { sql } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`alter table ingest_runs drop constraint ingest_runs_status_check`.execute(db);
  await sql`alter table ingest_runs add constraint ingest_runs_status_check check (status in ('running', 'completed', 'failed', 'abandoned'))`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`update ingest_runs set status = 'failed' where status = 'abandoned'`.execute(db);
  await sql`alter table ingest_runs drop constraint ingest_runs_status_check`.execute(db);
  await sql`alter table ingest_runs add constraint ingest_runs_status_check check (status in ('running', 'completed', 'failed'))`.execute(db);
}
