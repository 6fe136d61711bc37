/**
 * The store on both engines: migrations, COPY round trip (escaping; curve channels exactly, by
 * binary COPY, read back by SELECT and by binary COPY TO, and decoded in SQL by curve_channel),
 * transactions (COPY on the transaction's connection, rolled back with it), the schema's checks,
 * and the query helpers with keyset pagination.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { sql } from 'kysely';
import { channelBytes, channelFromBytes, CURVE_COLUMNS, CURVE_TYPES, iterateCurrentTests, listTests, migrateToLatest } from '@fractile/store';
import type { Store } from '@fractile/store';
import { testDatabases } from './support/databases.ts';

const SHA = (c: string) => c.repeat(64);

async function seedBasics(store: Store): Promise<{ run: number; grade: number; supplier: number }> {
  const run = await store.db.insertInto('ingest_runs').values({ settings: JSON.stringify({ t: 1 }), code_version: 'test' }).returning('id').executeTakeFirstOrThrow();
  const grade = await store.db.insertInto('grades').values({ code: 'G-1' }).returning('id').executeTakeFirstOrThrow();
  const supplier = await store.db.insertInto('suppliers').values({ name: 'Supplier A' }).returning('id').executeTakeFirstOrThrow();
  await store.db.insertInto('source_files').values({ sha256: SHA('a'), name: 'manifest.csv', size_bytes: 10 }).execute();
  return { run: run.id, grade: grade.id, supplier: supplier.id };
}

function testRow(ids: { run: number; grade: number; supplier: number }, testId: string, extra: Record<string, unknown> = {}) {
  return {
    lab: 'default', test_id: testId, version: 1, is_current: true, grade_id: ids.grade, supplier_id: ids.supplier,
    tested_on: '2024-03-05', shape: 'round' as const, diameter_mm: 10, area_mm2: (Math.PI * 100) / 4, gauge_length_mm: 50,
    content_sha256: SHA('b'), manifest_sha256: SHA('a'), manifest_line: 2, run_id: ids.run, ...extra,
  };
}

describe.each(testDatabases())('store on $name', (tdb) => {
  let store: Store;
  beforeEach(async () => {
    store = await tdb.open();
  });
  afterEach(async () => {
    await store.close();
  });

  it('applies the raw migration once; a second run applies nothing', async () => {
    expect(await migrateToLatest(store.db)).toEqual([]);
    const tables = await sql<{ table_name: string }>`select table_name from information_schema.tables where table_schema = 'public' order by 1`.execute(store.db);
    const names = tables.rows.map((r) => r.table_name);
    for (const t of ['source_files', 'ingest_runs', 'grades', 'suppliers', 'heats', 'tests', 'curves', 'summary_records', 'rejections']) expect(names).toContain(t);
  });

  it('COPY round-trips text with tab, newline, backslash and NULL, and curve channels exactly', async () => {
    const text = 'tab\there, line\nbreak, back\\slash, CR\r, "quoted", {braces}';
    const n = await store.copyRows('rejections', ['run_id', 'file', 'line', 'col', 'code', 'message'], [[7, text, 3, 4, 'x', text]]);
    expect(n).toBe(1);
    const r = await store.db.selectFrom('rejections').selectAll().executeTakeFirstOrThrow();
    expect(r.file).toBe(text);
    expect(r.message).toBe(text);

    const ids = await seedBasics(store);
    const t = await store.db.insertInto('tests').values(testRow(ids, 'T1')).returning('id').executeTakeFirstOrThrow();
    // values whose shortest decimal form is long; -0 and subnormals must survive exactly
    const values = new Float64Array([0.1 + 0.2, 1 / 3, -0, 5e-324, 2.2250738585072014e-308, 1.7976931348623157e308, 123456.789, -2.5e-7]);
    const bytes = channelBytes(values);
    await store.copyBinaryRows('curves', CURVE_COLUMNS, CURVE_TYPES, [[t.id, values.length, null, bytes, bytes, null, null, null, SHA('c'), 'c.csv/ü\t']]);
    const [stored] = await iterateCurrentTests(store.db, { batchSize: 10 }).next().then((x) => x.value ?? []);
    expect(stored.curve).not.toBeNull();
    for (let i = 0; i < values.length; i++) {
      expect(Object.is(stored.curve!.forceN![i], values[i])).toBe(true);
      expect(Object.is(stored.curve!.extensionMm![i], values[i])).toBe(true);
    }
    expect(stored.curve!.timeS).toBeNull();
    expect(stored.curve!.sourcePath).toBe('c.csv/ü\t');
    expect(stored.testedOn).toBe('2024-03-05');
    // read back by binary COPY TO: the same bytes, NULL as null, text as written
    const out = await store.copyOutBinary('select test_row_id, n_points, force_n, time_s, source_path from curves', ['int8', 'int4', 'bytea', 'bytea', 'text']);
    expect(out).toHaveLength(1);
    expect(out[0][0]).toBe(t.id);
    expect(out[0][1]).toBe(values.length);
    expect(Buffer.from(out[0][2] as Uint8Array).equals(Buffer.from(bytes))).toBe(true);
    expect(out[0][3]).toBeNull();
    expect(out[0][4]).toBe('c.csv/ü\t');
    expect(Array.from(channelFromBytes(out[0][2] as Uint8Array)).every((v, i) => Object.is(v, values[i]))).toBe(true);
    // decoded in SQL (migration 0040: curve_channel and the view curve_arrays), value for value
    const v = await sql<{ force_n: number[] | string[]; time_s: unknown }>`select force_n, time_s from curve_arrays`.execute(store.db);
    expect(v.rows[0].time_s).toBeNull();
    expect(v.rows[0].force_n.map(Number).every((x, i) => Object.is(x, values[i]))).toBe(true);
  });

  it('COPY inside a transaction is rolled back with it', async () => {
    await expect(
      store.transaction(async (trx) => {
        await store.copyRows('rejections', ['run_id', 'file', 'line', 'col', 'code', 'message'], [[1, 'f', 1, 1, 'c', 'm']]);
        const seen = await trx.selectFrom('rejections').select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow();
        expect(Number(seen.n)).toBe(1); // visible on the transaction's own connection
        throw new Error('abort');
      }),
    ).rejects.toThrow('abort');
    const after = await store.db.selectFrom('rejections').select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow();
    expect(Number(after.n)).toBe(0);
    const committed = await store.transaction(async () => store.copyRows('rejections', ['run_id', 'file', 'line', 'col', 'code', 'message'], (function* () {
      for (let i = 0; i < 1000; i++) yield [1, `f${i}`, i, 1, 'c', 'm'];
    })()));
    expect(committed).toBe(1000);
  });

  it('a failing COPY rejects and leaves nothing behind', async () => {
    await expect(store.copyRows('rejections', ['run_id', 'file', 'line', 'col', 'code', 'message'], [[1, 'f', -1, 1, 'c', 'm']])).rejects.toThrow();
    const after = await store.db.selectFrom('rejections').select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow();
    expect(Number(after.n)).toBe(0);
  });

  it('checks shapes, positive dimensions, yield definitions and one current version per identity', async () => {
    const ids = await seedBasics(store);
    await expect(store.db.insertInto('tests').values(testRow(ids, 'BAD', { shape: 'hexagon' as 'round' })).execute()).rejects.toThrow();
    await expect(store.db.insertInto('tests').values(testRow(ids, 'BAD', { diameter_mm: 0 })).execute()).rejects.toThrow();
    await expect(store.db.insertInto('tests').values(testRow(ids, 'BAD', { gauge_length_mm: -5 })).execute()).rejects.toThrow();
    await expect(store.db.insertInto('tests').values(testRow(ids, 'BAD', { tested_on: '2024-02-30' })).execute()).rejects.toThrow();
    const first = await store.db.insertInto('tests').values(testRow(ids, 'T1')).returning('id').executeTakeFirstOrThrow();
    await expect(store.db.insertInto('tests').values(testRow(ids, 'T1', { version: 2 })).execute()).rejects.toThrow();
    // history: the old version superseded, the new one current
    await store.db.updateTable('tests').set({ is_current: false, superseded_at: new Date() }).where('id', '=', first.id).execute();
    await store.db.insertInto('tests').values(testRow(ids, 'T1', { version: 2 })).execute();
    await expect(store.db.insertInto('summary_records').values({ test_row_id: first.id, yield_mpa: 300, yield_definition: 'rp0.3' as 'rp0.2' }).execute()).rejects.toThrow();
    await expect(store.db.insertInto('summary_records').values({ test_row_id: first.id, yield_mpa: 300, yield_definition: null }).execute()).rejects.toThrow();
    const current = await listTests(store.db);
    expect(current.map((t) => [t.test_id, t.version])).toEqual([['T1', 2]]);
    const all = await listTests(store.db, { includeHistory: true });
    expect(all.map((t) => [t.test_id, t.version, t.is_current])).toEqual([['T1', 1, false], ['T1', 2, true]]);
  });

  it('iterates current tests in keyset batches that cover every test once', async () => {
    const ids = await seedBasics(store);
    const rows = Array.from({ length: 23 }, (_, i) => testRow(ids, `T${String(i).padStart(2, '0')}`));
    await store.db.insertInto('tests').values(rows).execute();
    const seen: string[] = [];
    const sizes: number[] = [];
    for await (const batch of iterateCurrentTests(store.db, { batchSize: 5 })) {
      sizes.push(batch.length);
      seen.push(...batch.map((t) => t.testId));
    }
    expect(sizes).toEqual([5, 5, 5, 5, 3]);
    expect(seen.sort()).toEqual(rows.map((r) => r.test_id).sort());
    const listed = await listTests(store.db, { grade: 'G-1', testedFrom: '2024-01-01', testedTo: '2024-12-31' });
    expect(listed).toHaveLength(23);
    expect(listed[0]).toMatchObject({ grade: 'G-1', supplier: 'Supplier A', heat: null, shape: 'round', has_curve: false });
    expect(await listTests(store.db, { supplier: 'nobody' })).toEqual([]);
  });
});
