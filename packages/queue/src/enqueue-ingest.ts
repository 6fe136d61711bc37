/**
 * `ingest --queue`: each manifest cut into parts of `partRows` data lines (line numbers of the
 * file: part k holds the records and rejections on lines [2 + k·rows, 2 + (k+1)·rows); the first
 * part also holds whole-file findings, line 0, and the header, line 1; the last runs to the end),
 * one `ingest` job per part. Workers read the same files, so the manifest is named by absolute
 * path (a folder every worker machine mounts at the same place) and its SHA-256 is checked before
 * a part is read. A test whose identity appears in two parts is judged in the order the parts
 * commit, which can differ from the order of the file (one process judges the later line second).
 */
import { resolve } from 'node:path';
import { scanFile } from '@fractile/ingest';
import type { Store } from '@fractile/store';
import { enqueueRequest, type EnqueuedRequest } from './enqueue.ts';
import type { IngestJob } from './job-kinds.ts';

export interface EnqueueIngestOptions {
  map?: string | null;
  replace?: boolean;
  /** tests per transaction within a part (default 200) */
  batchSize?: number;
  /** data lines per job (default 500) */
  partRows?: number;
}

const END = 2 ** 31 - 1;

/** The line ranges of a manifest of `lines` lines (header included) cut into parts of `rows`. */
export function partRanges(lines: number, rows: number): { from: number; to: number }[] {
  const parts = Math.max(1, Math.ceil(Math.max(0, lines - 1) / rows));
  return Array.from({ length: parts }, (_, k) => ({ from: k === 0 ? 0 : 2 + k * rows, to: k === parts - 1 ? END : 2 + (k + 1) * rows }));
}

export async function enqueueIngest(store: Store, manifests: string[], opts: EnqueueIngestOptions = {}): Promise<EnqueuedRequest> {
  const rows = Math.max(1, Math.floor(opts.partRows ?? 500));
  const payloads: Omit<IngestJob, 'request' | 'part'>[] = [];
  const map = opts.map ? resolve(opts.map) : null;
  for (const m of manifests) {
    const manifest = resolve(m);
    const scan = await scanFile(manifest);
    for (const r of partRanges(scan.lines, rows)) payloads.push({ manifest, map, sha256: scan.sha256, ...r, replace: opts.replace ?? false, batchSize: opts.batchSize ?? 200 });
  }
  return enqueueRequest(store, 'ingest', { manifests: manifests.map((m) => resolve(m)), map, part_rows: rows }, payloads);
}
