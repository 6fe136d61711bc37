/**
 * Exclusions: an engineer's decision to leave a test out of the statistics (a bad specimen, a
 * machine fault), with the reason, who and when. Append-only: an exclusion and its undo (an
 * `include`) are both rows, so the history stays; the state of a test is its latest row. Raw
 * test rows are never touched. Keyed by the test's identity (lab, test_id), so a decision holds
 * for every version of the test; `test_row_id` records the version current when it was made.
 */
import type { Kysely } from 'kysely';
import { sql } from 'kysely';

// biome-ignore lint/suspicious/noExplicitAny: a migration runs against the schema of its own time, not today's (kysely migration guide)
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create table exclusions (
      id bigserial primary key,
      lab text not null,
      test_id text not null,
      test_row_id bigint,
      action text not null check (action in ('exclude', 'include')),
      reason text not null,
      decided_by text not null,
      decided_at timestamptz not null default now(),
      check (action = 'include' or length(trim(reason)) > 0)
    )`.execute(db);
  await sql`create index exclusions_identity on exclusions (lab, test_id, id)`.execute(db);
}

// biome-ignore lint/suspicious/noExplicitAny: a migration runs against the schema of its own time, not today's (kysely migration guide)
export async function down(db: Kysely<any>): Promise<void> {
  await sql`drop table if exists exclusions`.execute(db);
}
