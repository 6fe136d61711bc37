/**
 * The drift alerts ever reported, one row per alert id (a hash of group, property, rule and the
 * date it would have rung), with the monitor run that first reported it: a rerun of drift tells
 * which alerts are new by which ids it adds here. Rows are only inserted.
 */
import { sql, type Kysely } from 'kysely';

// biome-ignore lint/suspicious/noExplicitAny: a migration runs against the schema of its own time, not today's (kysely migration guide)
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create table drift_alerts (
      alert_id text primary key,
      group_key jsonb not null,
      property text not null,
      rule text not null,
      detected_on date not null,
      first_run bigint not null,
      first_seen_at timestamptz not null default now()
    )`.execute(db);
}

// biome-ignore lint/suspicious/noExplicitAny: a migration runs against the schema of its own time, not today's (kysely migration guide)
export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop table if exists drift_alerts`.execute(db);
}
