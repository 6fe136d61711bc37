/**
 * The ingest batch writer: a batch of tests (their curves, test rows, summary values, new
 * reference rows and rejections) in one transaction, so a crash leaves whole batches only. It
 * owns the COPY column lists of the raw tables.
 *
 * The caller describes the batch by its records' identities and locations and an `entries`
 * function that, given the stored current version of each identity, yields what to write for
 * each record: a test (with its curve's channels, streamed straight into binary COPY as
 * little-endian float8 bytes, channel-bytes.ts), a duplicate, or a rejection. Curves go first
 * (their foreign key to `tests` is deferred); test rows, which are small, are kept until the
 * curves are in.
 *
 * Isolation: when the database refuses a batch for its data (SQLSTATE class 22, data exception;
 * 23, integrity constraint; 54, program limit, such as an index entry too large), the batch is
 * rolled back and split in halves, each written on its own, down to single records; a single
 * record the database refuses is stored as a `not_stored` rejection with the database's message
 * at its manifest line, and the rest is stored. Other errors (the connection, the disk) end the
 * run. `entries` is therefore called once per attempt, with the indexes of that attempt.
 *
 * On a server, batches of concurrent writers are serialized by a transaction-level advisory lock,
 * so the stored versions a batch is judged against cannot change under it. Text written to the
 * rejection table has NUL characters shown as `\0` (PostgreSQL's text cannot hold them; the
 * readers reject such cells in data).
 */
import { sql, type Kysely } from 'kysely';
import { channelBytes } from './channel-bytes.ts';
import { lockKey } from './exclusive.ts';
import type { BinaryType, BinaryValue } from './copy-binary.ts';
import type { Store } from './open-store.ts';
import type { Insertable } from 'kysely';
import type { Database, SummaryRecordsTable, TestsTable } from './schema.ts';

export const TEST_COLUMNS = ['id', 'lab', 'test_id', 'version', 'is_current', 'grade_id', 'supplier_id', 'heat_id', 'tested_on', 'shape', 'diameter_mm', 'thickness_mm', 'width_mm', 'area_mm2', 'gauge_length_mm', 'orientation', 'temperature_c', 'content_sha256', 'manifest_sha256', 'manifest_line', 'run_id'];
export const CURVE_COLUMNS = ['test_row_id', 'n_points', 'time_s', 'force_n', 'extension_mm', 'crosshead_mm', 'stress_mpa', 'strain', 'source_sha256', 'source_path'];
/** the binary COPY types of CURVE_COLUMNS */
export const CURVE_TYPES: readonly BinaryType[] = ['int8', 'int4', 'bytea', 'bytea', 'bytea', 'bytea', 'bytea', 'bytea', 'text', 'text'];
export const SUMMARY_COLUMNS = ['test_row_id', 'yield_mpa', 'yield_definition', 'tensile_mpa', 'uniform_elongation_pct', 'elongation_pct'];
export const REJECTION_COLUMNS = ['run_id', 'file', 'line', 'col', 'code', 'message'];

/**
 * Transaction-level advisory locks (PostgreSQL documentation, "Advisory Locks") on the identities
 * a batch writes, taken first in its transaction and in ascending key order: two ingests writing
 * the same identity take turns (the second then finds the first's version stored and judges
 * against it), batches of different identities write side by side, and equal orders cannot
 * deadlock. The reference rows (grades, suppliers, heats, source files) are inserted in sorted
 * order for the same reason.
 */
async function lockIdentities(db: Kysely<Database>, records: BatchRecord[]): Promise<void> {
  const keys = [...new Set(records.map((r) => BigInt(lockKey(`test ${r.lab}/${r.testId}`))))].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  if (keys.length === 0) return;
  await sql`select count(pg_advisory_xact_lock(k)) from (select k from unnest(${sql.val(keys.map(String))}::int8[]) with ordinality as u(k, i) order by i offset 0) s`.execute(db);
}

export interface RejectionValues {
  file: string;
  line: number;
  column: number;
  code: string;
  message: string;
}

export interface StoredVersion {
  id: number;
  version: number;
  content_sha256: string;
}

/** A record of the batch: identity, reference labels and where it was read. */
export interface BatchRecord {
  lab: string;
  testId: string;
  grade: string;
  supplier: string;
  heat: string | null;
  file: string;
  line: number;
}

/** The test row's own values (identity, references and provenance are the writer's). */
export type TestValues = Pick<Insertable<TestsTable>, 'tested_on' | 'shape' | 'diameter_mm' | 'thickness_mm' | 'width_mm' | 'area_mm2' | 'gauge_length_mm' | 'orientation' | 'temperature_c'>;

/** A curve's channels in canonical units (s, N, mm, MPa, mm/mm); null where absent. */
export interface CurveValues {
  n_points: number;
  time_s: Float64Array | null;
  force_n: Float64Array | null;
  extension_mm: Float64Array | null;
  crosshead_mm: Float64Array | null;
  stress_mpa: Float64Array | null;
  strain: Float64Array | null;
  source_sha256: string;
  /** curve path relative to its manifest */
  source_path: string;
  /** path as given, recorded in source_files */
  source_name: string;
  size_bytes: number;
}

export type SummaryRowValues = Omit<SummaryRecordsTable, 'test_row_id'>;

export type BatchEntry =
  | { kind: 'test'; index: number; values: TestValues; content_sha256: string; version: number; supersedes: number | null; curve: CurveValues | null; summary: SummaryRowValues | null }
  | { kind: 'duplicate'; index: number }
  | { kind: 'rejection'; rejection: RejectionValues };

/** What a committed attempt wrote, per entry (without the curves). */
export type BatchOutcome = { kind: 'test'; index: number; replaced: boolean } | { kind: 'duplicate'; index: number } | { kind: 'rejection'; rejection: RejectionValues };

export interface TestBatch {
  run: number;
  manifestSha256: string;
  records: BatchRecord[];
  /** what to write for the records at `indexes` (in order), judged against their stored versions */
  entries(indexes: number[], stored: Map<string, StoredVersion>): AsyncIterable<BatchEntry>;
  /**
   * called in the attempt's transaction once its rows are written, with the test row id of each
   * test written (by entry index): to write rows that belong with them (their per-test results)
   * in the same transaction; a refusal splits the batch like any other
   */
  written?(tests: { index: number; rowId: number }[]): Promise<void>;
}

export const identityKey = (lab: string, testId: string) => `${lab}\u0000${testId}`;

// biome-ignore lint/suspicious/noControlCharactersInRegex: NUL is the character PostgreSQL refuses in text
const clean = (s: string) => s.replace(/\u0000/g, '\\0');

/** Rejection rows as COPY values, NUL shown as `\0`. */
export function rejectionRows(run: number, rejections: readonly RejectionValues[]): unknown[][] {
  return rejections.map((r) => [run, clean(r.file), r.line, r.column, r.code, clean(r.message)]);
}

/** Stored current versions of these identities. */
async function storedVersions(db: Kysely<Database>, records: BatchRecord[]): Promise<Map<string, StoredVersion>> {
  if (records.length === 0) return new Map();
  const r = await sql<{ id: number; lab: string; test_id: string; version: number; content_sha256: string }>`
    select t.id, t.lab, t.test_id, t.version, t.content_sha256
    from unnest(${sql.val(records.map((x) => x.lab))}::text[], ${sql.val(records.map((x) => x.testId))}::text[]) as k(lab, test_id)
    join tests t on t.lab = k.lab and t.test_id = k.test_id and t.is_current`.execute(db);
  return new Map(r.rows.map((x) => [identityKey(x.lab, x.test_id), { id: Number(x.id), version: x.version, content_sha256: x.content_sha256 }]));
}

/** Ids of grades, suppliers and heats for these records, inserting the new ones. */
async function referenceIds(db: Kysely<Database>, records: BatchRecord[]) {
  const grades = [...new Set(records.map((r) => r.grade))].sort();
  const suppliers = [...new Set(records.map((r) => r.supplier))].sort();
  await sql`insert into grades (code) select unnest(${sql.val(grades)}::text[]) on conflict (code) do nothing`.execute(db);
  await sql`insert into suppliers (name) select unnest(${sql.val(suppliers)}::text[]) on conflict (name) do nothing`.execute(db);
  const g = await sql<{ id: number; code: string }>`select id, code from grades where code = any(${sql.val(grades)}::text[])`.execute(db);
  const s = await sql<{ id: number; name: string }>`select id, name from suppliers where name = any(${sql.val(suppliers)}::text[])`.execute(db);
  const gradeId = new Map(g.rows.map((x) => [x.code, x.id]));
  const supplierId = new Map(s.rows.map((x) => [x.name, x.id]));
  const heatKey = (supplier: number, code: string) => `${supplier}\u0000${code}`;
  const heats = new Map<string, { supplier: number; code: string }>();
  for (const r of records) if (r.heat !== null) heats.set(heatKey(supplierId.get(r.supplier)!, r.heat), { supplier: supplierId.get(r.supplier)!, code: r.heat });
  const heatId = new Map<string, number>();
  if (heats.size) {
    const sorted = [...heats.values()].sort((a, b) => a.supplier - b.supplier || (a.code < b.code ? -1 : a.code > b.code ? 1 : 0));
    const sup = sorted.map((h) => h.supplier);
    const code = sorted.map((h) => h.code);
    await sql`insert into heats (supplier_id, code) select * from unnest(${sql.val(sup)}::int4[], ${sql.val(code)}::text[]) on conflict (supplier_id, code) do nothing`.execute(db);
    const h = await sql<{ id: number; supplier_id: number; code: string }>`
      select h.id, h.supplier_id, h.code from unnest(${sql.val(sup)}::int4[], ${sql.val(code)}::text[]) as k(supplier_id, code)
      join heats h on h.supplier_id = k.supplier_id and h.code = k.code`.execute(db);
    for (const x of h.rows) heatId.set(heatKey(x.supplier_id, x.code), Number(x.id));
  }
  return (r: BatchRecord) => {
    const sid = supplierId.get(r.supplier)!;
    return { grade: gradeId.get(r.grade)!, supplier: sid, heat: r.heat === null ? null : heatId.get(heatKey(sid, r.heat))! };
  };
}

/** SQLSTATE classes the database uses to refuse data (rather than to fail). */
function refusedData(e: unknown): e is Error & { code: string } {
  const code = (e as { code?: unknown })?.code;
  return typeof code === 'string' && /^(22|23|54)[0-9A-Z]{3}$/.test(code);
}

async function attempt(store: Store, batch: TestBatch, indexes: number[]): Promise<BatchOutcome[]> {
  return store.transaction(async (db) => {
    const records = indexes.map((i) => batch.records[i]);
    if (store.engine === 'postgres') await lockIdentities(db, records);
    const stored = await storedVersions(db, records);
    const ids = await sql<{ id: number }>`select nextval(pg_get_serial_sequence('tests', 'id')) as id from generate_series(1, ${indexes.length}::int4)`.execute(db);
    const rowId = new Map(indexes.map((i, k) => [i, Number(ids.rows[k].id)]));
    const outcomes: BatchOutcome[] = [];
    const tests: Extract<BatchEntry, { kind: 'test' }>[] = [];
    const files = new Map<string, { sha256: string; name: string; size_bytes: number }>();
    const bytes = (a: Float64Array | null) => (a === null ? null : channelBytes(a));
    async function* curveRows(): AsyncGenerator<BinaryValue[]> {
      for await (const e of batch.entries(indexes, stored)) {
        if (e.kind !== 'test') {
          outcomes.push(e);
          continue;
        }
        outcomes.push({ kind: 'test', index: e.index, replaced: e.supersedes !== null });
        const c = e.curve;
        tests.push({ ...e, curve: null });
        if (!c) continue;
        files.set(c.source_sha256, { sha256: c.source_sha256, name: c.source_name, size_bytes: c.size_bytes });
        yield [rowId.get(e.index)!, c.n_points, bytes(c.time_s), bytes(c.force_n), bytes(c.extension_mm), bytes(c.crosshead_mm), bytes(c.stress_mpa), bytes(c.strain), c.source_sha256, c.source_path];
      }
    }
    await store.copyBinaryRows('curves', CURVE_COLUMNS, CURVE_TYPES, curveRows());
    const superseded = tests.flatMap((t) => (t.supersedes === null ? [] : [t.supersedes]));
    if (superseded.length) await db.updateTable('tests').set({ is_current: false, superseded_at: new Date() }).where('id', 'in', superseded).execute();
    if (tests.length) {
      const ref = await referenceIds(db, tests.map((t) => batch.records[t.index]));
      await store.copyRows('tests', TEST_COLUMNS, tests.map((t) => {
        const r = batch.records[t.index];
        const v = t.values;
        const id = ref(r);
        return [rowId.get(t.index), r.lab, r.testId, t.version, true, id.grade, id.supplier, id.heat, v.tested_on, v.shape, v.diameter_mm, v.thickness_mm, v.width_mm, v.area_mm2, v.gauge_length_mm, v.orientation, v.temperature_c, t.content_sha256, batch.manifestSha256, r.line, batch.run];
      }));
      await store.copyRows('summary_records', SUMMARY_COLUMNS, tests.filter((t) => t.summary).map((t) => {
        const s = t.summary!;
        return [rowId.get(t.index), s.yield_mpa, s.yield_definition, s.tensile_mpa, s.uniform_elongation_pct, s.elongation_pct];
      }));
    }
    if (files.size) await db.insertInto('source_files').values([...files.values()].sort((a, b) => (a.sha256 < b.sha256 ? -1 : 1))).onConflict((oc) => oc.column('sha256').doNothing()).execute();
    const rejections = outcomes.flatMap((o) => (o.kind === 'rejection' ? [o.rejection] : []));
    if (rejections.length) await store.copyRows('rejections', REJECTION_COLUMNS, rejectionRows(batch.run, rejections));
    if (batch.written && tests.length) await batch.written(tests.map((t) => ({ index: t.index, rowId: rowId.get(t.index)! })));
    return outcomes;
  });
}

/** What a dry run would write: the entries judged against the stored versions, nothing written. */
async function judge(store: Store, batch: TestBatch, indexes: number[]): Promise<BatchOutcome[]> {
  const stored = await storedVersions(store.db, indexes.map((i) => batch.records[i]));
  const outcomes: BatchOutcome[] = [];
  for await (const e of batch.entries(indexes, stored)) outcomes.push(e.kind === 'test' ? { kind: 'test', index: e.index, replaced: e.supersedes !== null } : e);
  return outcomes;
}

/** Writes the batch (see above); returns what was committed, per entry. */
export async function writeTestBatch(store: Store, batch: TestBatch, opts: { dryRun?: boolean } = {}): Promise<BatchOutcome[]> {
  const all = batch.records.map((_, i) => i);
  if (opts.dryRun) return judge(store, batch, all);
  const write = async (indexes: number[]): Promise<BatchOutcome[]> => {
    try {
      return await attempt(store, batch, indexes);
    } catch (e) {
      if (!refusedData(e)) throw e;
      if (indexes.length > 1) {
        const half = Math.ceil(indexes.length / 2);
        return [...(await write(indexes.slice(0, half))), ...(await write(indexes.slice(half)))];
      }
      const r = batch.records[indexes[0]];
      const rejection = { file: r.file, line: r.line, column: 0, code: 'not_stored', message: `the database refused test ${r.lab}/${r.testId}: ${e.message} (SQLSTATE ${e.code})` };
      await store.copyRows('rejections', REJECTION_COLUMNS, rejectionRows(batch.run, [rejection]));
      return [{ kind: 'rejection', rejection }];
    }
  };
  return write(all);
}
