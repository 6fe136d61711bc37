/**
 * What the database holds, for reports: counts of current tests, of those with a curve and of
 * summary-only ones; and every rejection recorded at ingest, in the order recorded.
 */
import { sql, type Kysely } from 'kysely';
import type { Database } from './schema.ts';

export interface TestInventory {
  tests: number;
  curves: number;
  summary_only: number;
}

export async function testInventory(db: Kysely<Database>): Promise<TestInventory> {
  const r = await sql<{ tests: string; curves: string; summary_only: string }>`
    select count(*) as tests, count(c.test_row_id) as curves, count(*) filter (where c.test_row_id is null) as summary_only
    from tests t left join curves c on c.test_row_id = t.id where t.is_current`.execute(db);
  const c = r.rows[0];
  return { tests: Number(c.tests), curves: Number(c.curves), summary_only: Number(c.summary_only) };
}

export interface RecordedRejection {
  file: string;
  line: number | null;
  column: number | null;
  code: string;
  message: string;
}

export async function listRejections(db: Kysely<Database>): Promise<RecordedRejection[]> {
  const rows = await db.selectFrom('rejections').select(['file', 'line', 'col', 'code', 'message']).orderBy('id').execute();
  return rows.map((r) => ({ file: r.file, line: r.line, column: r.col, code: r.code, message: r.message }));
}
