/**
 * Curve channels stored as bytea (channel-bytes.ts): each channel the little-endian IEEE 754
 * binary64 bytes of its points, 8 a point, written and read by binary COPY without formatting
 * or parsing numbers. Measured on PGlite 0.4.6 with 1,000 curves × 3 channels × 2,000 points,
 * fsync on: writing by COPY as float8[] text 7.2 s of CPU, as bytea by binary COPY 2.3 s (1.4 s
 * with STORAGE EXTERNAL, i.e. without pglz compression: 50 MB on disk against 25 MB); reading
 * back as float8[] text 2.8 s, bytea by plain SELECT 4.4 s (returned as hex text), bytea by
 * `COPY … TO` binary 0.5 s. The channels are therefore STORAGE EXTERNAL (stored out of line,
 * uncompressed).
 *
 * For queries by hand, `curve_channel(bytea) → float8[]` decodes a channel and the view
 * `curve_arrays` shows every channel as float8[] (`curve_channel_bytes(float8[]) → bytea` is the
 * inverse, used here to convert a database of the old schema). Both are exact: a value is
 * rebuilt from its sign, exponent and fraction bits with products of powers of two, which
 * float8 arithmetic performs without rounding (normal, subnormal, ±0, ±Infinity, NaN).
 *
 * `down` converts back to float8[].
 */
import type { Kysely } from 'kysely';
import { sql } from 'kysely';

export const CHANNEL_COLUMNS = ['time_s', 'force_n', 'extension_mm', 'crosshead_mm', 'stress_mpa', 'strain'] as const;

const byte = (k: number) => `get_byte(b, 8 * i + ${k})::int8`;

/** float8[] from the stored bytes (see above); an empty bytea gives an empty array. */
const DECODE = `
  create or replace function curve_channel(b bytea) returns float8[] language sql immutable strict parallel safe as $$
    select coalesce(array_agg(
      case
        when x.e = 2047 then case when x.m <> 0 then 'NaN'::float8 when x.s = 1 then '-Infinity'::float8 else 'Infinity'::float8 end
        when x.e = 0 then (1 - 2 * x.s)::float8 * (x.m::float8 * power(2::float8, -1074::float8))
        else (1 - 2 * x.s)::float8 * ((1::float8 + x.m::float8 * power(2::float8, -52::float8)) * power(2::float8, (x.e - 1023)::float8))
      end order by x.i), '{}'::float8[])
    from (
      select i,
             ${byte(7)} >> 7 as s,
             ((${byte(7)} & 127) << 4) | (${byte(6)} >> 4) as e,
             ((${byte(6)} & 15) << 48) | (${byte(5)} << 40) | (${byte(4)} << 32) | (${byte(3)} << 24) | (${byte(2)} << 16) | (${byte(1)} << 8) | ${byte(0)} as m
      from generate_series(0, length(b) / 8 - 1) as i
    ) x
  $$`;

/** The stored bytes of a float8[] (float8send is big-endian: its 8 bytes reversed). */
const ENCODE = `
  create or replace function curve_channel_bytes(a float8[]) returns bytea language sql immutable strict parallel safe as $$
    select coalesce(string_agg(
      substr(b, 8, 1) || substr(b, 7, 1) || substr(b, 6, 1) || substr(b, 5, 1) || substr(b, 4, 1) || substr(b, 3, 1) || substr(b, 2, 1) || substr(b, 1, 1),
      ''::bytea order by i), ''::bytea)
    from unnest(a) with ordinality as u(v, i), lateral (select float8send(u.v) as b) f
  $$`;

const VIEW = `
  create view curve_arrays as
    select test_row_id, n_points, ${CHANNEL_COLUMNS.map((c) => `curve_channel(${c}) as ${c}`).join(', ')}, source_sha256, source_path
    from curves`;

/** Drops the check constraints on curves whose definition mentions `needle`. */
async function dropChecks(db: Kysely<unknown>, needle: string): Promise<void> {
  const r = await sql<{ conname: string }>`
    select conname from pg_constraint
    where conrelid = 'curves'::regclass and contype = 'c' and pg_get_constraintdef(oid) like ${'%' + needle + '%'}`.execute(db);
  for (const { conname } of r.rows) await sql`alter table curves drop constraint ${sql.id(conname)}`.execute(db);
}

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql.raw(DECODE).execute(db);
  await sql.raw(ENCODE).execute(db);
  await dropChecks(db, 'cardinality(');
  await sql.raw(`alter table curves ${CHANNEL_COLUMNS.map((c) => `alter column ${c} type bytea using curve_channel_bytes(${c})`).join(', ')}`).execute(db);
  await sql.raw(`alter table curves ${CHANNEL_COLUMNS.map((c) => `alter column ${c} set storage external`).join(', ')}`).execute(db);
  for (const c of CHANNEL_COLUMNS) await sql.raw(`alter table curves add constraint curves_${c}_points check (octet_length(${c}) = 8 * n_points)`).execute(db);
  await sql.raw(VIEW).execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`drop view if exists curve_arrays`.execute(db);
  for (const c of CHANNEL_COLUMNS) await sql.raw(`alter table curves drop constraint if exists curves_${c}_points`).execute(db);
  await sql.raw(`alter table curves ${CHANNEL_COLUMNS.map((c) => `alter column ${c} type float8[] using curve_channel(${c})`).join(', ')}`).execute(db);
  for (const c of CHANNEL_COLUMNS) await sql.raw(`alter table curves add check (cardinality(${c}) = n_points)`).execute(db);
}
