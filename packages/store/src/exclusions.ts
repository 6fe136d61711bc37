/**
 * Exclusions of tests from the statistics, with their reasons (table `exclusions`, append-only):
 * resolving the test references a user types (`lab/test_id` or a `test_id` unique over labs),
 * recording decisions, and reading the current state and the history.
 */
import { sql, type Insertable, type Kysely } from 'kysely';
import type { Database, ExclusionsTable } from './schema.ts';

export interface TestRef {
  /** as the user gave it */
  ref: string;
  lab: string;
  test_id: string;
  row_id: number;
}

export interface RefError {
  ref: string;
  message: string;
}

/** A decision to record: test identity, version, action, reason and who (the time is the database's). */
export type ExclusionDecision = Required<Omit<Insertable<ExclusionsTable>, 'id' | 'decided_at'>>;

export interface ExclusionRecord extends ExclusionDecision {
  id: number;
  decided_at: string;
}

/**
 * Resolves references to current tests: `lab/test_id` (split at the first '/'), else a bare
 * test_id that must name exactly one current test over all labs. Unknown or ambiguous references
 * come back as errors naming the reference.
 */
export async function resolveTestRefs(db: Kysely<Database>, refs: readonly string[]): Promise<{ resolved: TestRef[]; errors: RefError[] }> {
  const resolved: TestRef[] = [];
  const errors: RefError[] = [];
  for (const ref of refs) {
    const cut = ref.indexOf('/');
    const candidates: { lab?: string; test_id: string }[] = cut > 0 ? [{ lab: ref.slice(0, cut), test_id: ref.slice(cut + 1) }, { test_id: ref }] : [{ test_id: ref }];
    let found: { lab: string; test_id: string; id: number }[] = [];
    for (const c of candidates) {
      let q = db.selectFrom('tests').select(['lab', 'test_id', 'id']).where('is_current', '=', true).where('test_id', '=', c.test_id);
      if (c.lab !== undefined) q = q.where('lab', '=', c.lab);
      found = await q.orderBy('lab').execute();
      if (found.length > 0) break;
    }
    if (found.length === 0) errors.push({ ref, message: `unknown test "${ref}" (give lab/test_id or a test_id of a stored test)` });
    else if (found.length > 1) errors.push({ ref, message: `test id "${ref}" is ambiguous: it exists in labs ${found.map((f) => f.lab).join(', ')}; give lab/test_id` });
    else resolved.push({ ref, lab: found[0].lab, test_id: found[0].test_id, row_id: Number(found[0].id) });
  }
  return { resolved, errors };
}

/** Appends decisions in one transaction; returns their ids. */
export async function recordExclusions(db: Kysely<Database>, decisions: readonly ExclusionDecision[]): Promise<number[]> {
  if (decisions.length === 0) return [];
  const rows = await db.insertInto('exclusions').values(decisions.map((d) => ({ ...d }))).returning('id').execute();
  return rows.map((r) => Number(r.id));
}

const toRecord = (r: { id: number; lab: string; test_id: string; test_row_id: number | null; action: 'exclude' | 'include'; reason: string; decided_by: string; decided_at: Date | string }): ExclusionRecord => ({
  id: Number(r.id),
  lab: r.lab,
  test_id: r.test_id,
  test_row_id: r.test_row_id === null ? null : Number(r.test_row_id),
  action: r.action,
  reason: r.reason,
  decided_by: r.decided_by,
  decided_at: r.decided_at instanceof Date ? r.decided_at.toISOString() : new Date(r.decided_at).toISOString(),
});

/** The tests excluded now (their latest decision is `exclude`), by lab and test id. */
export async function activeExclusions(db: Kysely<Database>): Promise<ExclusionRecord[]> {
  const r = await sql<Parameters<typeof toRecord>[0]>`
    select * from (
      select distinct on (lab, test_id) id, lab, test_id, test_row_id, action, reason, decided_by, decided_at
      from exclusions order by lab, test_id, id desc
    ) latest where action = 'exclude' order by lab, test_id`.execute(db);
  return r.rows.map(toRecord);
}

/** Every decision, oldest first. */
export async function exclusionHistory(db: Kysely<Database>): Promise<ExclusionRecord[]> {
  const rows = await db.selectFrom('exclusions').selectAll().orderBy('id').execute();
  return rows.map(toRecord);
}
