/**
 * The batch writer isolates what the database refuses: a batch in which one record breaks a
 * constraint of the schema (a negative diameter against `diameter_mm > 0`; an impossible date
 * against the date type) that the readers would have caught — written here straight to the
 * writer — stores every other record and a `not_stored` rejection at the refused record's line,
 * with the database's message. A rejection message with a NUL character is stored with it shown
 * as `\0` (PostgreSQL text cannot hold NUL).
 */
import { describe, expect, it } from 'vitest';
import { writeTestBatch, type BatchEntry, type TestBatch } from '@fractile/store';
import { testDatabases } from './support/databases.ts';

describe.each(testDatabases())('batch writer isolation on $name', (tdb) => {
  it('stores the rest of a batch and rejects the refused records at their lines', async () => {
    const store = await tdb.open();
    try {
      const run = Number((await store.db.insertInto('ingest_runs').values({ settings: '{}', code_version: 'test' }).returning('id').executeTakeFirstOrThrow()).id);
      await store.db.insertInto('source_files').values({ sha256: 'a'.repeat(64), name: 'm.csv', size_bytes: 1 }).execute();
      const records = Array.from({ length: 9 }, (_, i) => ({ lab: 'L', testId: `T${i}`, grade: 'G', supplier: 'S', heat: i % 2 ? 'H' : null, file: 'm.csv', line: i + 2 }));
      const attempts: number[][] = [];
      const batch: TestBatch = {
        run,
        manifestSha256: 'a'.repeat(64),
        records,
        async *entries(indexes) {
          attempts.push(indexes);
          for (const i of indexes) {
            if (i === 7) {
              yield { kind: 'rejection', rejection: { file: 'c/7.csv', line: 3, column: 2, code: 'not_a_number', message: 'force: not a number: "1\u00002"' } };
              continue;
            }
            const e: BatchEntry = {
              kind: 'test', index: i, content_sha256: String(i).padStart(64, '0'), version: 1, supersedes: null, curve: null,
              values: { tested_on: i === 5 ? '2024-13-45' : '2024-05-02', shape: 'round', diameter_mm: i === 2 ? -1 : 10, area_mm2: 78.5, gauge_length_mm: 50 },
              summary: { yield_mpa: 300, yield_definition: 'rp0.2', tensile_mpa: 450, uniform_elongation_pct: null, elongation_pct: null },
            };
            yield e;
          }
        },
      };
      const out = await writeTestBatch(store, batch);
      expect(out.filter((o) => o.kind === 'test').map((o) => (o as { index: number }).index).sort()).toEqual([0, 1, 3, 4, 6, 8]);
      const refused = out.flatMap((o) => (o.kind === 'rejection' && o.rejection.code === 'not_stored' ? [o.rejection] : []));
      expect(refused.map((r) => [r.file, r.line, r.column])).toEqual([['m.csv', 4, 0], ['m.csv', 7, 0]]);
      for (const r of refused) expect(r.message).toMatch(/the database refused test L\/T[25]: .* \(SQLSTATE 2[23][0-9A-Z]{3}\)/);
      expect(attempts.length).toBeGreaterThan(3); // split down to the single records
      const tests = await store.db.selectFrom('tests').select('test_id').orderBy('test_id').execute();
      expect(tests.map((t) => t.test_id)).toEqual(['T0', 'T1', 'T3', 'T4', 'T6', 'T8']);
      expect(await store.db.selectFrom('summary_records').select('test_row_id').execute()).toHaveLength(6);
      const rejections = await store.db.selectFrom('rejections').select(['file', 'line', 'code', 'message']).orderBy('line').execute();
      expect(rejections.map((r) => [r.file, r.line, r.code])).toEqual([['c/7.csv', 3, 'not_a_number'], ['m.csv', 4, 'not_stored'], ['m.csv', 7, 'not_stored']]);
      expect(rejections[0].message).toBe('force: not a number: "1\\02"');
    } finally {
      await store.close();
    }
  });
});
