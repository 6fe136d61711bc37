/**
 * A batch of manifest records as the store's batch writer takes it (store test-batch.ts): the
 * records' identities and locations, and the entries to write for any subset of them — each
 * record's curve read (curve-pool.ts) and checked against its geometry, its content hash
 * (content-hash.ts) judged against the stored version (classify.ts): a test to write, a
 * duplicate, or a rejection. When the ingest reduces (`reducer`), each test written gets its
 * per-test result row in the same transaction: the curve's from the worker that read it, a
 * summary-only record's computed here (the same pure reduction, `@fractile/pipeline/reduce-one`).
 */
import { reduceOne, type ReduceRow } from '@fractile/pipeline/reduce-one';
import type { ReduceSettings } from '@fractile/curves';
import type { BatchEntry, BatchRecord, Store, StoredVersion, TestBatch } from '@fractile/store';
import { identityKey } from '@fractile/store';
import { classify } from './classify.ts';
import type { ColumnMap } from './column-map.ts';
import { contentHash } from './content-hash.ts';
import type { CurvePool } from './curve-pool.ts';
import type { ManifestRecord } from './manifest-reader.ts';
import { reject } from './rejection.ts';

/** Reduction at ingest (given by the caller: the pipeline's reduce settings and its result writer). */
export interface IngestReducer {
  /** the settings (and their hash) a grade's tests are reduced with */
  settingsFor(grade: string): { hash: string; settings: ReduceSettings };
  /** writes per-test rows (test_pk set) in the batch's transaction */
  write(store: Store, rows: ReduceRow[]): Promise<void>;
}

export interface BatchSource {
  run: number;
  manifestPath: string;
  manifestSha256: string;
  map: { map: ColumnMap; sha256: string } | null;
  records: ManifestRecord[];
  pool: CurvePool;
  replace: boolean;
  store: Store;
  reducer: IngestReducer | null;
}

/** records whose curves may be read ahead of the one being written (the pool bounds how many) */
const AHEAD = 64;

const batchRecord = (r: ManifestRecord, file: string): BatchRecord => ({ lab: r.lab, testId: r.testId, grade: r.grade, supplier: r.supplier, heat: r.heat, file, line: r.line });

/** The per-test row of a record without a curve (summary values, or nothing: a `no_data` failure). */
function summaryRow(reducer: IngestReducer, rec: ManifestRecord): ReduceRow {
  const { hash, settings } = reducer.settingsFor(rec.grade);
  const s = rec.summary;
  const summary = s ? { yieldMpa: s.yieldMpa, yieldDefinition: s.yieldDefinition, tensileMpa: s.tensileMpa, uniformElongationPct: s.uniformElongationPct, elongationPct: s.elongationPct } : null;
  return reduceOne({ testPk: 0, settingsHash: hash, settings, curve: null, summary });
}

async function entry(src: BatchSource, index: number, stored: Map<string, StoredVersion>, next: ManifestRecord[], rows: Map<number, ReduceRow>): Promise<BatchEntry> {
  const rec = src.records[index];
  const map = src.map?.map ?? null;
  for (const r of next) src.pool.ahead(r, map);
  let curve: Extract<BatchEntry, { kind: 'test' }>['curve'] = null;
  if (rec.curve) {
    const res = await src.pool.take(rec, map);
    if (!res.ok) return { kind: 'rejection', rejection: res.rejection };
    const ch = res.channels;
    const needsGeometry = !(ch.stress && ch.strain);
    const issue = needsGeometry ? (rec.geometryIssue ?? rec.gaugeIssue) : null;
    if (issue) return { kind: 'rejection', rejection: issue };
    curve = {
      n_points: ch.nPoints, time_s: ch.time, force_n: ch.force, extension_mm: ch.extension, crosshead_mm: ch.crosshead, stress_mpa: ch.stress, strain: ch.strain,
      source_sha256: res.sha256, source_path: rec.curve.relPath, source_name: rec.curve.displayPath, size_bytes: res.sizeBytes,
    };
    if (res.reduced) rows.set(index, res.reduced);
  } else if (src.reducer) rows.set(index, summaryRow(src.reducer, rec));
  const hash = contentHash(rec, curve?.source_sha256 ?? null, src.map?.sha256 ?? null);
  const d = classify(stored.get(identityKey(rec.lab, rec.testId)), hash, src.replace);
  if (d.kind === 'duplicate') return { kind: 'duplicate', index };
  if (d.kind === 'conflict')
    return { kind: 'rejection', rejection: reject(src.manifestPath, rec.line, 0, 'conflict', `test ${rec.lab}/${rec.testId} is stored with different content (version ${d.storedVersion}); use --replace to store this as a new version`) };
  const s = rec.summary;
  return {
    kind: 'test', index, content_sha256: hash, version: d.version, supersedes: d.kind === 'replace' ? d.supersedes : null, curve,
    values: { tested_on: rec.testedOn, shape: rec.shape, diameter_mm: rec.diameterMm, thickness_mm: rec.thicknessMm, width_mm: rec.widthMm, area_mm2: rec.areaMm2, gauge_length_mm: rec.gaugeLengthMm, orientation: rec.orientation, temperature_c: rec.temperatureC },
    summary: s ? { yield_mpa: s.yieldMpa, yield_definition: s.yieldDefinition, tensile_mpa: s.tensileMpa, uniform_elongation_pct: s.uniformElongationPct, elongation_pct: s.elongationPct } : null,
  };
}

/** What the curve pool reduces a record's curve with (null when the ingest does not reduce). */
export function curveReduceInput(reducer: IngestReducer | null) {
  return (rec: ManifestRecord) => {
    if (!reducer) return null;
    const { hash, settings } = reducer.settingsFor(rec.grade);
    return { settingsHash: hash, settings, areaMm2: rec.areaMm2, gaugeLengthMm: rec.gaugeLengthMm };
  };
}

export function testBatch(src: BatchSource): TestBatch {
  // the rows of the current attempt, by entry index (a split attempt reads its entries again)
  let rows = new Map<number, ReduceRow>();
  return {
    run: src.run,
    manifestSha256: src.manifestSha256,
    records: src.records.map((r) => batchRecord(r, src.manifestPath)),
    async *entries(indexes: number[], stored: Map<string, StoredVersion>) {
      rows = new Map();
      for (let k = 0; k < indexes.length; k++) yield await entry(src, indexes[k], stored, indexes.slice(k + 1, k + 1 + AHEAD).map((i) => src.records[i]), rows);
    },
    written: src.reducer
      ? async (tests) => {
          const out: ReduceRow[] = [];
          for (const t of tests) {
            const row = rows.get(t.index);
            if (row) out.push({ ...row, test_pk: t.rowId });
          }
          if (out.length) await src.reducer!.write(src.store, out);
        }
      : undefined,
  };
}
