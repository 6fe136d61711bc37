/**
 * The jobs of the queue and their payloads (JSON, as graphile-worker stores them). Every job
 * belongs to a request (`queue_requests`) and is one part of it; its job key `r<request>:<part>`
 * names it across retries.
 *   - `ingest`: the records of one manifest whose line is in [from, to) (ingest-manifests.ts
 *     `lines`); the manifest is named by absolute path and checked by SHA-256 before it is read.
 *   - `reduce`: a batch of test row ids (reduce stage `runReduceBatch`).
 *   - `stages`: aggregate, design curves and drift, once every reduce part of its request is done.
 */
import type { Catalog, ReduceOverrides } from '@fractile/pipeline';

export const JOB_KINDS = ['ingest', 'reduce', 'stages'] as const;
export type JobKind = (typeof JOB_KINDS)[number];

/** Attempts before a job counts as failed (graphile-worker's `max_attempts`). */
export const MAX_ATTEMPTS = 10;

export interface IngestJob {
  request: number;
  part: number;
  manifest: string;
  map: string | null;
  sha256: string;
  from: number;
  to: number;
  replace: boolean;
  batchSize: number;
}

export interface ReduceJob {
  request: number;
  part: number;
  ids: number[];
  catalog: Catalog | null;
  overrides: ReduceOverrides;
}

export interface StagesJob {
  request: number;
  catalog: Catalog | null;
  by: string;
  driftBy: string;
}

export const jobKey = (request: number, part: number | 'stages') => `r${request}:${part}`;
