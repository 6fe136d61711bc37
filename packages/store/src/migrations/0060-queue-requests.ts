/**
 * Work handed to the job queue (queue package): one row per request (`fractile ingest --queue`,
 * `fractile reduce --queue`) with the number of parts it was cut into, and one row per part once
 * its work is committed. The queue's own tables live in their own schema and forget finished
 * jobs; these rows are what "done" means, what `--wait` counts and where a request's follow-up
 * (the group stages after the last reduce part) is claimed exactly once. Small reference tables
 * on a sharded cluster (see docs/scale-out.md).
 */
import type { Kysely } from 'kysely';
import { sql } from 'kysely';

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`create table queue_requests (
    id bigserial primary key,
    kind text not null check (kind in ('ingest', 'reduce')),
    created_at timestamptz not null default now(),
    parts integer not null check (parts >= 0),
    settings jsonb not null,
    then_stages boolean not null default false,
    followup_at timestamptz,
    cancelled_at timestamptz
  )`.execute(db);
  await sql`create table queue_parts (
    request_id bigint not null references queue_requests (id),
    part integer not null check (part >= -1),
    kind text not null check (kind in ('ingest', 'reduce', 'stages')),
    finished_at timestamptz not null default now(),
    counts jsonb not null,
    primary key (request_id, part)
  )`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`drop table if exists queue_parts`.execute(db);
  await sql`drop table if exists queue_requests`.execute(db);
}
