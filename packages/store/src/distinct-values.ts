/**
 * The distinct values of an identity column over the current tests (grades, suppliers, labs,
 * orientations), sorted: what a filter such as `--grade` may name, so that a typo can be told
 * apart from an empty result.
 */
import type { Kysely } from 'kysely';
import type { Database } from './schema.ts';

export type DistinctColumn = 'grade' | 'supplier' | 'lab' | 'orientation';

export async function distinctTestValues(db: Kysely<Database>, column: DistinctColumn): Promise<string[]> {
  const current = db.selectFrom('tests as t').where('t.is_current', '=', true);
  const rows =
    column === 'grade'
      ? await current.innerJoin('grades as g', 'g.id', 't.grade_id').select('g.code as v').distinct().orderBy('v').execute()
      : column === 'supplier'
        ? await current.innerJoin('suppliers as s', 's.id', 't.supplier_id').select('s.name as v').distinct().orderBy('v').execute()
        : column === 'lab'
          ? await current.select('t.lab as v').distinct().orderBy('v').execute()
          : await current.select('t.orientation as v').where('t.orientation', 'is not', null).distinct().orderBy('v').execute();
  return rows.map((r) => String(r.v));
}
