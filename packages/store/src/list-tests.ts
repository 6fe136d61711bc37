/**
 * What is stored: one row per test (current versions by default), with identity, grade,
 * supplier, heat, date, geometry and whether it has a curve. Read by `fractile tests` and by the
 * later stages to select groups.
 */
import type { Kysely } from 'kysely';
import type { Database, SpecimenShapeCode } from './schema.ts';

export interface TestFilter {
  lab?: string | readonly string[];
  grade?: string | readonly string[];
  supplier?: string | readonly string[];
  /** inclusive ISO dates */
  testedFrom?: string;
  testedTo?: string;
  /** also list superseded versions (history) */
  includeHistory?: boolean;
}

export interface TestListing {
  row_id: number;
  lab: string;
  test_id: string;
  version: number;
  is_current: boolean;
  grade: string;
  supplier: string;
  heat: string | null;
  tested_on: string;
  shape: SpecimenShapeCode | null;
  diameter_mm: number | null;
  thickness_mm: number | null;
  width_mm: number | null;
  area_mm2: number | null;
  gauge_length_mm: number | null;
  orientation: string | null;
  temperature_c: number | null;
  has_curve: boolean;
  has_summary: boolean;
}

export async function listTests(db: Kysely<Database>, filter: TestFilter = {}): Promise<TestListing[]> {
  let q = db
    .selectFrom('tests as t')
    .innerJoin('grades as g', 'g.id', 't.grade_id')
    .innerJoin('suppliers as s', 's.id', 't.supplier_id')
    .leftJoin('heats as h', 'h.id', 't.heat_id')
    .select((eb) => [
      't.id as row_id',
      't.lab',
      't.test_id',
      't.version',
      't.is_current',
      'g.code as grade',
      's.name as supplier',
      'h.code as heat',
      't.tested_on',
      't.shape',
      't.diameter_mm',
      't.thickness_mm',
      't.width_mm',
      't.area_mm2',
      't.gauge_length_mm',
      't.orientation',
      't.temperature_c',
      eb.exists(eb.selectFrom('curves as c').select('c.test_row_id').whereRef('c.test_row_id', '=', 't.id')).as('has_curve'),
      eb.exists(eb.selectFrom('summary_records as r').select('r.test_row_id').whereRef('r.test_row_id', '=', 't.id')).as('has_summary'),
    ]);
  if (!filter.includeHistory) q = q.where('t.is_current', '=', true);
  const oneOf = (v: string | readonly string[]) => (typeof v === 'string' ? [v] : [...v]);
  if (filter.lab !== undefined) q = q.where('t.lab', 'in', oneOf(filter.lab));
  if (filter.grade !== undefined) q = q.where('g.code', 'in', oneOf(filter.grade));
  if (filter.supplier !== undefined) q = q.where('s.name', 'in', oneOf(filter.supplier));
  if (filter.testedFrom !== undefined) q = q.where('t.tested_on', '>=', filter.testedFrom);
  if (filter.testedTo !== undefined) q = q.where('t.tested_on', '<=', filter.testedTo);
  const rows = await q.orderBy('t.lab').orderBy('t.test_id').orderBy('t.version').execute();
  return rows.map((r) => ({ ...r, has_curve: Boolean(r.has_curve), has_summary: Boolean(r.has_summary) }));
}
