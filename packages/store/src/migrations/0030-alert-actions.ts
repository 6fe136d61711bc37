/**
 * What users say about drift alerts: every acknowledgement, closing and reopening, with who and a
 * note, appended and never changed (user input, like the raw test tables). An alert's state is
 * its latest action: none or 'reopen' → open, 'acknowledge' → acknowledged, 'close' → closed.
 */
import { sql, type Kysely } from 'kysely';

// biome-ignore lint/suspicious/noExplicitAny: a migration runs against the schema of its own time, not today's (kysely migration guide)
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create table alert_actions (
      id bigserial primary key,
      alert_id text not null,
      action text not null check (action in ('acknowledge', 'close', 'reopen')),
      actor text not null check (actor <> ''),
      note text,
      acted_at timestamptz not null default now()
    )`.execute(db);
  await sql`create index alert_actions_alert on alert_actions (alert_id, id)`.execute(db);
}

// biome-ignore lint/suspicious/noExplicitAny: a migration runs against the schema of its own time, not today's (kysely migration guide)
export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop table if exists alert_actions`.execute(db);
}
