/**
 * Ingest: manifests (+ optional column maps for their curve files) into the raw tables.
 *
 * Streaming and batched: manifest rows are read as a stream; a batch (up to `batchSize` tests)
 * holds only row metadata, while curves are parsed one file at a time and streamed straight into
 * COPY, so memory does not grow with the batch size. While a batch is written, the manifest is
 * read on and the next batch's first curves are read (batch writes stay one after the other;
 * measured on 2,000 tests × 2,000 points with batches of 200: 5.9 → 4.9 s). Each batch is one transaction (curves, test
 * rows, summary values, rejections): a crash leaves no half-test, and a re-run skips what was
 * committed (same content hash → duplicate) and completes the rest.
 *
 * Same identity (lab, test_id) with different content → `conflict` rejection, the stored test is
 * untouched; with `replace`, the stored version is kept as history and the new one becomes
 * current. A second row with the same identity in the same input is judged against the first
 * (a batch is cut before it).
 */
import { readFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import type { Kysely } from 'kysely';
import { sql } from 'kysely';
import type { Database, Store } from '@fractile/store';
import type { ColumnMap } from './column-map.ts';
import { parseColumnMapText } from './column-map.ts';
import { contentHash } from './content-hash.ts';
import { availableParallelism } from 'node:os';
import { Piscina } from 'piscina';
import { runCurveTask } from './curve-task.ts';
import type { CurveTask, CurveTaskResult } from './curve-task.ts';
import type { ManifestRecord } from './manifest-reader.ts';
import { NotUtf8Error, readManifest, scanFile } from './manifest-reader.ts';
import type { Rejection } from './rejection.ts';
import { reject } from './rejection.ts';

const INGEST_VERSION = (JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string }).version;

export interface ManifestInput {
  path: string;
  /** column map for this manifest's curve files */
  map?: string | null;
}

export interface IngestOptions {
  /** validate and classify, write nothing */
  dryRun?: boolean;
  /** a changed test replaces the stored one (kept as history) instead of being rejected */
  replace?: boolean;
  onProgress?: (done: number, total: number) => void;
  /** tests per transaction (default 200) */
  batchSize?: number;
  /** recorded in the run row (default: this package's version) */
  codeVersion?: string;
  /**
   * worker threads that read curve files (default: one less than the cores, at most 8, and none
   * below 4 cores, where the database and the main thread need them; 0 reads in-process). Used
   * only for inputs of at least 64 rows.
   */
  workers?: number;
}

export interface IngestSummary {
  /** run id (0 for a dry run) */
  run: number;
  /** tests written (new ones and replacements) */
  accepted: number;
  /** tests already stored with the same content, skipped */
  duplicates: number;
  /** of the accepted, how many replaced a stored version */
  replaced: number;
  rejected: Rejection[];
  dry_run: boolean;
}

interface Existing {
  id: number;
  version: number;
  content_sha256: string;
}

interface Accepted {
  rec: ManifestRecord;
  id: number;
  version: number;
  hash: string;
  curve: { sha256: string; sizeBytes: number } | null;
}

const identity = (lab: string, testId: string) => `${lab}\u0000${testId}`;

const TEST_COLUMNS = ['id', 'lab', 'test_id', 'version', 'is_current', 'grade_id', 'supplier_id', 'heat_id', 'tested_on', 'shape', 'diameter_mm', 'thickness_mm', 'width_mm', 'area_mm2', 'gauge_length_mm', 'orientation', 'temperature_c', 'content_sha256', 'manifest_sha256', 'manifest_line', 'run_id'];
const CURVE_COLUMNS = ['test_row_id', 'n_points', 'time_s', 'force_n', 'extension_mm', 'crosshead_mm', 'stress_mpa', 'strain', 'source_sha256', 'source_path'];
const SUMMARY_COLUMNS = ['test_row_id', 'yield_mpa', 'yield_definition', 'tensile_mpa', 'uniform_elongation_pct', 'elongation_pct'];
const REJECTION_COLUMNS = ['run_id', 'file', 'line', 'col', 'code', 'message'];

async function lookupIds(trx: Kysely<Database>, batch: ManifestRecord[]) {
  const grades = [...new Set(batch.map((r) => r.grade))];
  const suppliers = [...new Set(batch.map((r) => r.supplier))];
  await trx.insertInto('grades').values(grades.map((code) => ({ code }))).onConflict((oc) => oc.column('code').doNothing()).execute();
  await trx.insertInto('suppliers').values(suppliers.map((name) => ({ name }))).onConflict((oc) => oc.column('name').doNothing()).execute();
  const gradeId = new Map((await trx.selectFrom('grades').select(['id', 'code']).where('code', 'in', grades).execute()).map((g) => [g.code, g.id]));
  const supplierId = new Map((await trx.selectFrom('suppliers').select(['id', 'name']).where('name', 'in', suppliers).execute()).map((s) => [s.name, s.id]));
  const heatKeys = new Map<string, { supplier_id: number; code: string }>();
  for (const r of batch) if (r.heat !== null) heatKeys.set(`${supplierId.get(r.supplier)}\u0000${r.heat}`, { supplier_id: supplierId.get(r.supplier)!, code: r.heat });
  const heatId = new Map<string, number>();
  if (heatKeys.size) {
    const values = [...heatKeys.values()];
    await trx.insertInto('heats').values(values).onConflict((oc) => oc.columns(['supplier_id', 'code']).doNothing()).execute();
    const rows = await trx
      .selectFrom('heats')
      .select(['id', 'supplier_id', 'code'])
      .where((eb) => eb(eb.refTuple('supplier_id', 'code'), 'in', values.map((v) => eb.tuple(v.supplier_id, v.code))))
      .execute();
    for (const h of rows) heatId.set(`${h.supplier_id}\u0000${h.code}`, h.id);
  }
  return {
    grade: (r: ManifestRecord) => gradeId.get(r.grade)!,
    supplier: (r: ManifestRecord) => supplierId.get(r.supplier)!,
    heat: (r: ManifestRecord) => (r.heat === null ? null : heatId.get(`${supplierId.get(r.supplier)}\u0000${r.heat}`)!),
  };
}

async function currentVersions(db: Kysely<Database>, batch: ManifestRecord[]): Promise<Map<string, Existing>> {
  const rows = await db
    .selectFrom('tests')
    .select(['id', 'lab', 'test_id', 'version', 'content_sha256'])
    .where('is_current', '=', true)
    .where((eb) => eb(eb.refTuple('lab', 'test_id'), 'in', batch.map((r) => eb.tuple(r.lab, r.testId))))
    .execute();
  return new Map(rows.map((r) => [identity(r.lab, r.test_id), r]));
}

class Counts {
  accepted = 0;
  duplicates = 0;
  replaced = 0;
  rejected: Rejection[] = [];
  add(o: Counts): void {
    this.accepted += o.accepted;
    this.duplicates += o.duplicates;
    this.replaced += o.replaced;
    this.rejected.push(...o.rejected);
  }
}

/** Ingests the manifests; returns what was accepted, skipped and rejected. */
export async function ingestManifests(store: Store, manifests: ManifestInput[], opts: IngestOptions = {}): Promise<IngestSummary> {
  const dryRun = opts.dryRun ?? false;
  const replace = opts.replace ?? false;
  const batchSize = Math.max(1, Math.floor(opts.batchSize ?? 200));
  const total = new Counts();

  // column maps: read and validated once each
  const maps = new Map<string, { map: ColumnMap; sha256: string; size: number } | null>();
  for (const m of manifests) {
    if (!m.map || maps.has(m.map)) continue;
    let text: Buffer;
    try {
      text = readFileSync(m.map);
    } catch (e) {
      total.rejected.push(reject(m.map, 0, 0, 'bad_column_map', `cannot read the column map (${(e as { code?: string }).code ?? 'error'})`));
      maps.set(m.map, null);
      continue;
    }
    const parsed = parseColumnMapText(text.toString('utf8'));
    if (!parsed.ok) {
      total.rejected.push(reject(m.map, 0, 0, 'bad_column_map', parsed.message));
      maps.set(m.map, null);
    } else maps.set(m.map, { map: parsed.map, sha256: createHash('sha256').update(text).digest('hex'), size: text.length });
  }

  // first pass: hash, line count and UTF-8 check of each manifest (streaming)
  const scans: ({ sha256: string; sizeBytes: number; lines: number } | null)[] = [];
  for (const m of manifests) {
    if (m.map && maps.get(m.map) === null) {
      total.rejected.push(reject(m.path, 0, 0, 'bad_column_map', `not read: its column map ${m.map} is invalid`));
      scans.push(null);
      continue;
    }
    try {
      scans.push(await scanFile(m.path));
    } catch (e) {
      if (e instanceof NotUtf8Error) total.rejected.push(reject(m.path, e.line, 0, 'not_utf8', e.message));
      else total.rejected.push(reject(m.path, 0, 0, 'unreadable_file', `cannot read the manifest (${(e as { code?: string }).code ?? (e as Error).message})`));
      scans.push(null);
    }
  }
  const totalRows = scans.reduce((s, x) => s + (x ? Math.max(0, x.lines - 1) : 0), 0);
  let done = 0;
  const progress = () => opts.onProgress?.(Math.min(done, totalRows), totalRows);

  const cores = availableParallelism();
  const workers = Math.max(0, Math.floor(opts.workers ?? (cores >= 4 ? Math.min(8, cores - 1) : 0)));
  const pool =
    workers > 0 && totalRows >= 64
      ? new Piscina({ filename: new URL('./curve-worker.mjs', import.meta.url).href, minThreads: workers, maxThreads: workers, resourceLimits: { maxOldGenerationSizeMb: 96 } })
      : null;
  const lookahead = pool ? 2 * workers : 2;

  let run = 0;
  try {
    return await ingestAll();
  } catch (e) {
    if (run) await store.db.updateTable('ingest_runs').set({ status: 'failed', finished_at: new Date() }).where('id', '=', run).execute().catch(() => {});
    throw e;
  } finally {
    await pool?.destroy();
  }

  async function ingestAll(): Promise<IngestSummary> {
    if (!dryRun) {
      const settings = {
        manifests: manifests.map((m, i) => ({ path: m.path, sha256: scans[i]?.sha256 ?? null, map: m.map ?? null, map_sha256: m.map ? (maps.get(m.map)?.sha256 ?? null) : null })),
        replace,
        batch_size: batchSize,
      };
      const row = await store.db.insertInto('ingest_runs').values({ settings: JSON.stringify(settings), code_version: opts.codeVersion ?? INGEST_VERSION }).returning('id').executeTakeFirstOrThrow();
      run = row.id;
      if (total.rejected.length) await store.copyRows('rejections', REJECTION_COLUMNS, total.rejected.map((r) => [run, r.file, r.line, r.column, r.code, r.message]));
    }

    const readCurve = (rec: ManifestRecord, mapInfo: { map: ColumnMap } | null): Promise<CurveTaskResult> => {
      const task: CurveTask = { absPath: rec.curve!.absPath, displayPath: rec.curve!.displayPath, map: mapInfo?.map ?? null };
      const p = pool ? (pool.run(task) as Promise<CurveTaskResult>) : runCurveTask(task);
      p.catch(() => {});
      return p;
    };
    // curves of the next batch read while the current one is written (at most `lookahead`)
    const prefetched = new Map<ManifestRecord, Promise<CurveTaskResult>>();

    const writeBatch = async (manifestPath: string, batch: ManifestRecord[], rowRejections: Rejection[], manifestSha: string, mapInfo: { map: ColumnMap; sha256: string } | null): Promise<void> => {
      const c = new Counts();
      c.rejected.push(...rowRejections);
      const work = async (db: Kysely<Database>) => {
        if (!dryRun && store.engine === 'postgres') await db.selectNoFrom((eb) => eb.fn('pg_advisory_xact_lock', [eb.val(0x6672_6163)]).as('l')).execute();
        const existing = batch.length ? await currentVersions(db, batch) : new Map<string, Existing>();
        const ids = !dryRun && batch.length ? await lookupIds(db, batch) : null;
        let rowIds: number[] = [];
        if (!dryRun && batch.length) {
          const r = await sql<{ id: number }>`select nextval(pg_get_serial_sequence('tests', 'id')) as id from generate_series(1, ${batch.length}::int4)`.execute(db);
          rowIds = r.rows.map((x) => Number(x.id));
        }
        const accepted: Accepted[] = [];
        const superseded: number[] = [];
        // curve files are read `lookahead` ahead of the one being written (in worker threads when
        // there are any), so reading and parsing overlap COPY; memory: that many curves at most
        const reads = new Map<number, Promise<CurveTaskResult>>();
        const startRead = (i: number) => {
          const rec = batch[i];
          if (rec?.curve && !reads.has(i)) {
            const early = prefetched.get(rec);
            prefetched.delete(rec);
            reads.set(i, early ?? readCurve(rec, mapInfo));
          }
        };
        async function* curveRows(): AsyncGenerator<unknown[]> {
          for (let i = 0; i < batch.length; i++) {
            const rec = batch[i];
            for (let k = i; k <= i + lookahead && k < batch.length; k++) startRead(k);
            let curveSha: string | null = null;
            let curveSize = 0;
            let row: unknown[] | null = null;
            if (rec.curve) {
              const res = await reads.get(i)!;
              reads.delete(i);
              if (!res.ok) {
                c.rejected.push(res.rejection);
                continue;
              }
              const ch = res.literals;
              const needsGeometry = !(ch.stress && ch.strain);
              if (needsGeometry && rec.geometryIssue) {
                c.rejected.push(rec.geometryIssue);
                continue;
              }
              if (needsGeometry && rec.gaugeIssue) {
                c.rejected.push(rec.gaugeIssue);
                continue;
              }
              curveSha = res.sha256;
              curveSize = res.sizeBytes;
              row = [rowIds[i] ?? 0, res.nPoints, ch.time, ch.force, ch.extension, ch.crosshead, ch.stress, ch.strain, res.sha256, rec.curve.relPath];
            }
            const hash = contentHash(rec, curveSha, mapInfo?.sha256 ?? null);
            const old = existing.get(identity(rec.lab, rec.testId));
            let version = 1;
            if (old) {
              if (old.content_sha256 === hash) {
                c.duplicates++;
                continue;
              }
              if (!replace) {
                c.rejected.push(reject(manifestPath, rec.line, 0, 'conflict', `test ${rec.lab}/${rec.testId} is stored with different content (version ${old.version}); use --replace to store this as a new version`));
                continue;
              }
              superseded.push(old.id);
              version = old.version + 1;
              c.replaced++;
            }
            c.accepted++;
            accepted.push({ rec, id: rowIds[i] ?? 0, version, hash, curve: curveSha ? { sha256: curveSha, sizeBytes: curveSize } : null });
            if (row) yield row;
          }
        }
        if (dryRun) {
          for await (const _ of curveRows()) void _;
          return;
        }
        await store.copyRows('curves', CURVE_COLUMNS, curveRows());
        if (superseded.length) await db.updateTable('tests').set({ is_current: false, superseded_at: new Date() }).where('id', 'in', superseded).execute();
        await store.copyRows('tests', TEST_COLUMNS, accepted.map((a) => {
          const r = a.rec;
          return [a.id, r.lab, r.testId, a.version, true, ids!.grade(r), ids!.supplier(r), ids!.heat(r), r.testedOn, r.shape, r.diameterMm, r.thicknessMm, r.widthMm, r.areaMm2, r.gaugeLengthMm, r.orientation, r.temperatureC, a.hash, manifestSha, r.line, run];
        }));
        await store.copyRows('summary_records', SUMMARY_COLUMNS, accepted.filter((a) => a.rec.summary).map((a) => {
          const s = a.rec.summary!;
          return [a.id, s.yieldMpa, s.yieldDefinition, s.tensileMpa, s.uniformElongationPct, s.elongationPct];
        }));
        const files = new Map<string, { sha256: string; name: string; size_bytes: number }>();
        for (const a of accepted) if (a.curve && a.rec.curve) files.set(a.curve.sha256, { sha256: a.curve.sha256, name: a.rec.curve.displayPath, size_bytes: a.curve.sizeBytes });
        if (files.size) await db.insertInto('source_files').values([...files.values()]).onConflict((oc) => oc.column('sha256').doNothing()).execute();
        if (c.rejected.length) await store.copyRows('rejections', REJECTION_COLUMNS, c.rejected.map((r) => [run, r.file, r.line, r.column, r.code, r.message]));
      };
      if (dryRun) await work(store.db);
      else await store.transaction(work);
      total.add(c);
      done += batch.length + rowRejections.length;
      progress();
    };

    for (let mi = 0; mi < manifests.length; mi++) {
      const m = manifests[mi];
      const scan = scans[mi];
      if (!scan) continue;
      const mapInfo = m.map ? maps.get(m.map)! : null;
      if (!dryRun) {
        const sources = [{ sha256: scan.sha256, name: m.path, size_bytes: scan.sizeBytes }];
        if (m.map && mapInfo) sources.push({ sha256: mapInfo.sha256, name: m.map, size_bytes: mapInfo.size });
        await store.db.insertInto('source_files').values(sources).onConflict((oc) => oc.column('sha256').doNothing()).execute();
      }
      let batch: ManifestRecord[] = [];
      let pendingRejections: Rejection[] = [];
      let inBatch = new Set<string>();
      // the batch being written: the manifest is read on (and the next batch's first curves) meanwhile;
      // writes stay one after the other
      let writing: Promise<void> | null = null;
      const flush = async () => {
        if (writing) await writing;
        writing = null;
        if (batch.length === 0 && pendingRejections.length === 0) return;
        const w = writeBatch(m.path, batch, pendingRejections, scan.sha256, mapInfo);
        w.catch(() => {});
        writing = w;
        batch = [];
        pendingRejections = [];
        inBatch = new Set();
      };
      try {
        for await (const item of readManifest(m.path)) {
          if (item.kind === 'rejection') {
            pendingRejections.push(item.rejection);
            continue;
          }
          const key = identity(item.record.lab, item.record.testId);
          if (inBatch.has(key)) await flush();
          batch.push(item.record);
          inBatch.add(key);
          if (writing && item.record.curve && prefetched.size < lookahead) prefetched.set(item.record, readCurve(item.record, mapInfo));
          if (batch.length >= batchSize) await flush();
        }
        await flush();
      } finally {
        // never leave a write running behind an error (the run is then marked failed)
        if (writing) await writing;
      }
    }

    if (!dryRun) {
      await store.db
        .updateTable('ingest_runs')
        .set({ status: 'completed', finished_at: new Date(), accepted: total.accepted, duplicates: total.duplicates, replaced: total.replaced, rejected: total.rejected.length })
        .where('id', '=', run)
        .execute();
    }
    progress();
    return { run, accepted: total.accepted, duplicates: total.duplicates, replaced: total.replaced, rejected: total.rejected, dry_run: dryRun };
  }
}
