/**
 * A batch of manifest records as the store's batch writer takes it (store test-batch.ts): the
 * records' identities and locations, and the entries to write for any subset of them — each
 * record's curve read (curve-pool.ts) and checked against its geometry, its content hash
 * (content-hash.ts) judged against the stored version (classify.ts): a test to write, a
 * duplicate, or a rejection.
 */
import type { BatchEntry, BatchRecord, StoredVersion, TestBatch } from '@fractile/store';
import { identityKey } from '@fractile/store';
import { classify } from './classify.ts';
import type { ColumnMap } from './column-map.ts';
import { contentHash } from './content-hash.ts';
import type { CurvePool } from './curve-pool.ts';
import type { ManifestRecord } from './manifest-reader.ts';
import { reject } from './rejection.ts';

export interface BatchSource {
  run: number;
  manifestPath: string;
  manifestSha256: string;
  map: { map: ColumnMap; sha256: string } | null;
  records: ManifestRecord[];
  pool: CurvePool;
  replace: boolean;
}

/** records whose curves may be read ahead of the one being written (the pool bounds how many) */
const AHEAD = 16;

const batchRecord = (r: ManifestRecord, file: string): BatchRecord => ({ lab: r.lab, testId: r.testId, grade: r.grade, supplier: r.supplier, heat: r.heat, file, line: r.line });

async function entry(src: BatchSource, index: number, stored: Map<string, StoredVersion>, next: ManifestRecord[]): Promise<BatchEntry> {
  const rec = src.records[index];
  const map = src.map?.map ?? null;
  for (const r of next) src.pool.ahead(r, map);
  let curve: Extract<BatchEntry, { kind: 'test' }>['curve'] = null;
  if (rec.curve) {
    const res = await src.pool.take(rec, map);
    if (!res.ok) return { kind: 'rejection', rejection: res.rejection };
    const ch = res.literals;
    const needsGeometry = !(ch.stress && ch.strain);
    const issue = needsGeometry ? (rec.geometryIssue ?? rec.gaugeIssue) : null;
    if (issue) return { kind: 'rejection', rejection: issue };
    curve = {
      n_points: res.nPoints, time_s: ch.time, force_n: ch.force, extension_mm: ch.extension, crosshead_mm: ch.crosshead, stress_mpa: ch.stress, strain: ch.strain,
      source_sha256: res.sha256, source_path: rec.curve.relPath, source_name: rec.curve.displayPath, size_bytes: res.sizeBytes,
    };
  }
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

export function testBatch(src: BatchSource): TestBatch {
  return {
    run: src.run,
    manifestSha256: src.manifestSha256,
    records: src.records.map((r) => batchRecord(r, src.manifestPath)),
    async *entries(indexes: number[], stored: Map<string, StoredVersion>) {
      for (let k = 0; k < indexes.length; k++) yield await entry(src, indexes[k], stored, indexes.slice(k + 1, k + 1 + AHEAD).map((i) => src.records[i]));
    },
  };
}
