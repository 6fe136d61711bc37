/**
 * Raw tables: what ingest writes and every later stage reads. Raw rows are never updated by a
 * later stage; ingest itself only flips `tests.is_current`/`superseded_at` on a replace.
 *
 * Sharding (distribution by test): `tests`, `curves` and `summary_records` are meant to be
 * distributed on the test row id (`tests.id` = `curves.test_row_id` = `summary_records.test_row_id`,
 * co-located), so the only foreign keys between big tables join on that column. `grades`,
 * `suppliers`, `heats`, `source_files` and `ingest_runs` are small reference tables; foreign keys
 * into them are allowed from distributed tables. `rejections` references nothing. The one
 * constraint a distributed database cannot enforce across shards is the partial unique index on
 * the identity (lab, test_id) of the current version; the ingest writer also checks it in SQL
 * before writing, so on a sharded cluster it stays correct with one writer per identity.
 *
 * The curves → tests foreign keys are DEFERRABLE INITIALLY DEFERRED so that a batch can stream
 * its curves by COPY before the (small) test rows are written in the same transaction.
 */
import type { Kysely } from 'kysely';
import { sql } from 'kysely';

const statements = [
  `create table source_files (
     id bigserial primary key,
     sha256 text not null unique check (sha256 ~ '^[0-9a-f]{64}$'),
     name text not null,
     size_bytes bigint not null check (size_bytes >= 0),
     received_at timestamptz not null default now()
   )`,
  `create table ingest_runs (
     id bigserial primary key,
     started_at timestamptz not null default now(),
     finished_at timestamptz,
     settings jsonb not null,
     code_version text not null,
     status text not null default 'running' check (status in ('running', 'completed', 'failed')),
     accepted integer not null default 0,
     duplicates integer not null default 0,
     replaced integer not null default 0,
     rejected integer not null default 0
   )`,
  `create table grades (
     id serial primary key,
     code text not null unique check (code <> '')
   )`,
  `create table suppliers (
     id serial primary key,
     name text not null unique check (name <> '')
   )`,
  `create table heats (
     id bigserial primary key,
     supplier_id integer not null references suppliers (id),
     code text not null check (code <> ''),
     unique (supplier_id, code)
   )`,
  `create table tests (
     id bigserial primary key,
     lab text not null check (lab <> ''),
     test_id text not null check (test_id <> ''),
     version integer not null check (version >= 1),
     is_current boolean not null,
     superseded_at timestamptz,
     grade_id integer not null references grades (id),
     supplier_id integer not null references suppliers (id),
     heat_id bigint references heats (id),
     tested_on date not null,
     shape text check (shape in ('round', 'flat', 'area')),
     diameter_mm float8 check (diameter_mm > 0 and diameter_mm < 'infinity'),
     thickness_mm float8 check (thickness_mm > 0 and thickness_mm < 'infinity'),
     width_mm float8 check (width_mm > 0 and width_mm < 'infinity'),
     area_mm2 float8 check (area_mm2 > 0 and area_mm2 < 'infinity'),
     gauge_length_mm float8 check (gauge_length_mm > 0 and gauge_length_mm < 'infinity'),
     orientation text,
     temperature_c float8 check (temperature_c > -273.15 and temperature_c < 'infinity'),
     content_sha256 text not null check (content_sha256 ~ '^[0-9a-f]{64}$'),
     manifest_sha256 text not null references source_files (sha256),
     manifest_line integer not null check (manifest_line >= 1),
     run_id bigint not null references ingest_runs (id),
     created_at timestamptz not null default now(),
     unique (lab, test_id, version),
     check (is_current = (superseded_at is null))
   )`,
  // one current version per identity; history rows are the non-current ones
  `create unique index tests_current_identity on tests (lab, test_id) where is_current`,
  // what the later stages filter and group by
  `create index tests_current_grade_supplier_date on tests (grade_id, supplier_id, tested_on) where is_current`,
  `create index tests_current_supplier_date on tests (supplier_id, tested_on) where is_current`,
  `create index tests_current_date on tests (tested_on) where is_current`,
  `create index tests_run on tests (run_id)`,
  `create table curves (
     test_row_id bigint primary key references tests (id) deferrable initially deferred,
     n_points integer not null check (n_points >= 1),
     time_s float8[] check (cardinality(time_s) = n_points),
     force_n float8[] check (cardinality(force_n) = n_points),
     extension_mm float8[] check (cardinality(extension_mm) = n_points),
     crosshead_mm float8[] check (cardinality(crosshead_mm) = n_points),
     stress_mpa float8[] check (cardinality(stress_mpa) = n_points),
     strain float8[] check (cardinality(strain) = n_points),
     source_sha256 text not null check (source_sha256 ~ '^[0-9a-f]{64}$'),
     source_path text not null,
     check ((force_n is not null and (extension_mm is not null or crosshead_mm is not null)) or (stress_mpa is not null and strain is not null))
   )`,
  `create index curves_source on curves (source_sha256)`,
  `create table summary_records (
     test_row_id bigint primary key references tests (id) deferrable initially deferred,
     yield_mpa float8 check (yield_mpa > 0 and yield_mpa < 'infinity'),
     yield_definition text check (yield_definition in ('rp0.2', 'rt0.5', 'reh', 'rel')),
     tensile_mpa float8 check (tensile_mpa > 0 and tensile_mpa < 'infinity'),
     uniform_elongation_pct float8 check (uniform_elongation_pct >= 0 and uniform_elongation_pct < 'infinity'),
     elongation_pct float8 check (elongation_pct >= 0 and elongation_pct < 'infinity'),
     check (yield_mpa is null or yield_definition is not null)
   )`,
  `create table rejections (
     id bigserial primary key,
     run_id bigint not null,
     file text not null,
     line integer not null check (line >= 0),
     col integer not null check (col >= 0),
     code text not null,
     message text not null,
     created_at timestamptz not null default now()
   )`,
  `create index rejections_run on rejections (run_id)`,
];

export async function up(db: Kysely<unknown>): Promise<void> {
  for (const s of statements) await sql.raw(s).execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  for (const t of ['rejections', 'summary_records', 'curves', 'tests', 'heats', 'suppliers', 'grades', 'ingest_runs', 'source_files']) {
    await sql.raw(`drop table if exists ${t}`).execute(db);
  }
}
