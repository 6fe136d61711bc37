/**
 * A manifest's records cut into batches of at most `size`, each with the rejections of the rows
 * read meanwhile. A batch is also cut before a record whose identity (lab, test_id) it already
 * holds, so that the second is judged against the first once that is stored. `onRecord` sees
 * each record as it is read (to start reading its curve early). With `keep`, only the records
 * and rejections whose line it keeps are read on (a queued part of the manifest).
 */
import type { ManifestRecord } from './manifest-reader.ts';
import { readManifest } from './manifest-reader.ts';
import type { Rejection } from './rejection.ts';

export interface ManifestBatch {
  records: ManifestRecord[];
  rejections: Rejection[];
}

export async function* manifestBatches(manifestPath: string, size: number, onRecord: (r: ManifestRecord) => void, keep?: (line: number) => boolean): AsyncGenerator<ManifestBatch> {
  let batch: ManifestBatch = { records: [], rejections: [] };
  let ids = new Set<string>();
  for await (const item of readManifest(manifestPath)) {
    if (keep && !keep(item.kind === 'rejection' ? item.rejection.line : item.record.line)) continue;
    if (item.kind === 'rejection') {
      batch.rejections.push(item.rejection);
      continue;
    }
    const key = `${item.record.lab}\u0000${item.record.testId}`;
    if (ids.has(key) || batch.records.length >= size) {
      yield batch;
      batch = { records: [], rejections: [] };
      ids = new Set();
    }
    batch.records.push(item.record);
    ids.add(key);
    onRecord(item.record);
  }
  if (batch.records.length || batch.rejections.length) yield batch;
}
