/**
 * Migration 0040 (curve channels float8[] → bytea) on a database made by the old schema: a
 * database migrated by every step but 0040, with curves written as float8[] — doubles whose bit patterns
 * are drawn at random, plus the edge cases of IEEE 754 binary64 (±0, the smallest subnormal, the
 * largest subnormal, the smallest normal, the largest finite value, ±Infinity, NaN) — is then
 * migrated to the latest schema. Every channel must come back bit for bit: as little-endian bytes
 * read by the store (channel-bytes.ts), and as float8[] through the SQL decoder `curve_arrays`.
 * The oracle is the values themselves (IEEE 754-2008, binary64 interchange format: a conversion
 * that is exact must return the same bits; Object.is distinguishes −0 and compares NaN).
 */
import { Migrator, sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import { channelFromBytes, MIGRATIONS, migrateToLatest, openStore, type Store } from '@fractile/store';
import { createServerDatabase } from './support/databases.ts';
import { mulberry32 } from './support/random.ts';

const SHA = (c: string) => c.repeat(64);

/** the schema before curves were bytea: every migration but 0040 */
const BEFORE = Object.fromEntries(Object.entries(MIGRATIONS).filter(([name]) => name !== '0040-curves-bytea'));

/** Doubles of random bit patterns (NaN patterns left out: a NaN's payload is not kept by float8 text), then the edge cases. */
function values(seed: number, n: number): Float64Array {
  const u = mulberry32(seed);
  const bits = new Uint32Array(2 * n);
  for (let i = 0; i < bits.length; i++) bits[i] = Math.floor(u() * 2 ** 32) >>> 0;
  const out = new Float64Array(bits.buffer);
  for (let i = 0; i < n; i++) if (Number.isNaN(out[i])) out[i] = i;
  const edges = [0, -0, 5e-324, -5e-324, 2.225073858507201e-308, 2.2250738585072014e-308, 1.7976931348623157e308, -1.7976931348623157e308, Infinity, -Infinity, NaN, 0.1 + 0.2, 1 / 3, 123456.789, -2.5e-7];
  out.set(edges.slice(0, n), 0);
  return out;
}

/** float8[] text that reads back as the same doubles (shortest round-trip form, exact). */
const literal = (a: Float64Array) => '{' + Array.from(a, (v) => (Object.is(v, -0) ? '-0' : Number.isNaN(v) ? 'NaN' : String(v))).join(',') + '}';

const same = (got: ArrayLike<number | string>, want: Float64Array) => got.length === want.length && Array.prototype.every.call(want, (v: number, i: number) => Object.is(Number(got[i]), v));

async function oldSchemaWithCurves(store: Store): Promise<Map<number, Float64Array[]>> {
  const migrator = new Migrator({ db: store.db, provider: { getMigrations: async () => BEFORE }, allowUnorderedMigrations: true, migrationTableName: 'kysely_migration' });
  const { error } = await migrator.migrateToLatest();
  if (error) throw error;
  const db = store.db;
  const run = await sql<{ id: number }>`insert into ingest_runs (settings, code_version) values ('{}', 'old') returning id`.execute(db);
  const grade = await sql<{ id: number }>`insert into grades (code) values ('G') returning id`.execute(db);
  const supplier = await sql<{ id: number }>`insert into suppliers (name) values ('S') returning id`.execute(db);
  await sql`insert into source_files (sha256, name, size_bytes) values (${SHA('a')}, 'm.csv', 1)`.execute(db);
  const written = new Map<number, Float64Array[]>();
  for (let k = 0; k < 3; k++) {
    const t = await sql<{ id: number }>`
      insert into tests (lab, test_id, version, is_current, grade_id, supplier_id, tested_on, shape, area_mm2, gauge_length_mm, content_sha256, manifest_sha256, manifest_line, run_id)
      values ('default', ${'T' + k}, 1, true, ${grade.rows[0].id}, ${supplier.rows[0].id}, '2024-01-01', 'area', 10, 50, ${SHA('b')}, ${SHA('a')}, ${k + 2}, ${run.rows[0].id}) returning id`.execute(db);
    const id = Number(t.rows[0].id);
    const n = [2000, 20, 1][k];
    const force = values(10 + k, n);
    const ext = values(20 + k, n);
    await sql`
      insert into curves (test_row_id, n_points, time_s, force_n, extension_mm, source_sha256, source_path)
      values (${id}, ${n}, null, ${literal(force)}::float8[], ${literal(ext)}::float8[], ${SHA('c')}, 'c.csv')`.execute(db);
    written.set(id, [force, ext]);
  }
  return written;
}

async function check(store: Store): Promise<void> {
  const written = await oldSchemaWithCurves(store);
  const applied = await migrateToLatest(store.db);
  expect(applied).toContain('0040-curves-bytea');
  const rows = await store.db.selectFrom('curves').select(['test_row_id', 'n_points', 'time_s', 'force_n', 'extension_mm']).orderBy('test_row_id').execute();
  expect(rows).toHaveLength(3);
  for (const r of rows) {
    const [force, ext] = written.get(Number(r.test_row_id))!;
    expect(r.time_s).toBeNull();
    expect(same(channelFromBytes(r.force_n!), force)).toBe(true);
    expect(same(channelFromBytes(r.extension_mm!), ext)).toBe(true);
  }
  // the decoder for queries by hand gives the same doubles
  const view = await sql<{ test_row_id: number; force_n: (number | string)[]; extension_mm: (number | string)[]; time_s: unknown }>`
    select test_row_id, force_n, extension_mm, time_s from curve_arrays order by test_row_id`.execute(store.db);
  for (const r of view.rows) {
    const [force, ext] = written.get(Number(r.test_row_id))!;
    expect(r.time_s).toBeNull();
    expect(same(r.force_n.map(Number), force)).toBe(true);
    expect(same(r.extension_mm.map(Number), ext)).toBe(true);
  }
  // the stored form is checked: 8 bytes a point
  await expect(sql`update curves set force_n = '\\x0001'::bytea where n_points = 20`.execute(store.db)).rejects.toThrow();
}

describe('migration 0040 converts curves stored by the old schema', () => {
  it('on the embedded engine', async () => {
    const store = await openStore('memory://', { migrate: false });
    try {
      await check(store);
    } finally {
      await store.close();
    }
  }, 300_000);

  it.skipIf(!process.env.TEST_DATABASE_URL)('on a server', async () => {
    const d = await createServerDatabase(process.env.TEST_DATABASE_URL!);
    const store = await openStore(d.url, { migrate: false });
    try {
      await check(store);
    } finally {
      await store.close();
      await d.drop();
    }
  }, 300_000);
});
