/**
 * Results of the pipeline stages. Raw tables are never changed by these stages; every result is
 * keyed by what produced it (test version or group, settings hash, algorithm version), so results
 * of old and new settings stand side by side. No foreign keys to the raw tables, so the results can
 * be distributed by test on a sharded PostgreSQL alongside them.
 */
import { sql, type Kysely } from 'kysely';

// biome-ignore lint/suspicious/noExplicitAny: a migration runs against the schema of its own time, not today's (kysely migration guide)
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create table stage_settings (
      hash text primary key,
      stage text not null,
      body jsonb not null,
      created_at timestamptz not null default now()
    )`.execute(db);
  await sql`
    create table stage_runs (
      id bigserial primary key,
      stage text not null check (stage in ('reduce', 'aggregate', 'design', 'monitor', 'sample', 'report')),
      settings_hash text not null,
      input_hash text,
      code_version text not null,
      started_at timestamptz not null default now(),
      finished_at timestamptz,
      status text not null default 'running' check (status in ('running', 'done', 'failed')),
      counts jsonb not null default '{}'::jsonb
    )`.execute(db);
  await sql`create index stage_runs_lookup on stage_runs (stage, settings_hash, input_hash, status)`.execute(db);
  await sql`
    create table test_results (
      test_pk bigint not null,
      settings_hash text not null,
      algorithm_version text not null,
      run_id bigint not null,
      ok boolean not null,
      given boolean not null default false,
      failure_code text,
      failure_message text,
      modulus_gpa double precision,
      rp02_mpa double precision,
      rt05_mpa double precision,
      reh_mpa double precision,
      rel_mpa double precision,
      ype_pct double precision,
      rm_mpa double precision,
      ag_pct double precision,
      agt_pct double precision,
      a_pct double precision,
      yt_ratio double precision,
      n_value double precision,
      k_mpa double precision,
      yield_mpa double precision,
      yield_definition text check (yield_definition in ('rp0.2', 'rt0.5', 'reh', 'rel')),
      shape_class text check (shape_class in ('plateau', 'continuous', 'bilinear')),
      flags text[] not null default '{}',
      uniform_plastic_strain double precision,
      grid_stress_mpa double precision[],
      fits jsonb,
      details jsonb,
      created_at timestamptz not null default now(),
      primary key (test_pk, settings_hash, algorithm_version),
      check (ok or failure_code is not null)
    )`.execute(db);
  await sql`create index test_results_run on test_results (run_id)`.execute(db);
  await sql`
    create table group_results (
      run_id bigint not null,
      stage text not null check (stage in ('aggregate', 'design', 'monitor', 'sample')),
      group_key jsonb not null,
      property text not null default '',
      body jsonb not null,
      primary key (run_id, stage, group_key, property)
    )`.execute(db);
}

// biome-ignore lint/suspicious/noExplicitAny: a migration runs against the schema of its own time, not today's (kysely migration guide)
export async function down(db: Kysely<any>): Promise<void> {
  for (const t of ['group_results', 'test_results', 'stage_runs', 'stage_settings']) await sql`drop table if exists ${sql.table(t)}`.execute(db);
}
