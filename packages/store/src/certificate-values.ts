/**
 * The certificate (summary) values stored beside a curve: for every current test that has both a
 * curve and summary values, the given yield with its definition, tensile strength and elongations
 * (MPa, percent). The cross-check compares them with what the curve gives.
 */
import type { Kysely } from 'kysely';
import type { YieldDefinition } from '@fractile/curves';
import type { Database } from './schema.ts';

export interface CertificateValues {
  test_row_id: number;
  yield_mpa: number | null;
  yield_definition: YieldDefinition | null;
  tensile_mpa: number | null;
  uniform_elongation_pct: number | null;
  elongation_pct: number | null;
}

export async function certificateValuesBesideCurves(db: Kysely<Database>): Promise<CertificateValues[]> {
  return db
    .selectFrom('summary_records as s')
    .innerJoin('tests as t', 't.id', 's.test_row_id')
    .innerJoin('curves as c', 'c.test_row_id', 't.id')
    .select(['s.test_row_id', 's.yield_mpa', 's.yield_definition', 's.tensile_mpa', 's.uniform_elongation_pct', 's.elongation_pct'])
    .where('t.is_current', '=', true)
    .orderBy('s.test_row_id')
    .execute();
}
