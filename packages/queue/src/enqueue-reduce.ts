/**
 * `reduce --queue`: every current test, by row id, cut into batches of `batchSize` ids, one
 * `reduce` job each; each job reduces those of its ids that have no result for their grade's
 * settings and the algorithm version (a second request, or a retried job, computes nothing for
 * what is done). With `thenStages`, the last batch to finish enqueues one `stages` job.
 */
import type { Catalog, ReduceOverrides } from '@fractile/pipeline';
import type { Store } from '@fractile/store';
import { enqueueRequest, type EnqueuedRequest } from './enqueue.ts';
import { enqueueFollowUp } from './part-ledger.ts';
import type { ReduceJob, StagesJob } from './job-kinds.ts';

export interface EnqueueReduceOptions {
  catalog: Catalog | null;
  overrides?: ReduceOverrides;
  /** test ids per job (default 250) */
  batchSize?: number;
  /** enqueue aggregate, design curves and drift after the last batch, with these groupings */
  thenStages?: Omit<StagesJob, 'request' | 'catalog'> | null;
}

export async function enqueueReduce(store: Store, opts: EnqueueReduceOptions): Promise<EnqueuedRequest> {
  const size = Math.max(1, Math.floor(opts.batchSize ?? 250));
  const rows = await store.db.selectFrom('tests').select('id').where('is_current', '=', true).orderBy('id').execute();
  const ids = rows.map((r) => Number(r.id));
  const payloads: Omit<ReduceJob, 'request' | 'part'>[] = [];
  for (let i = 0; i < ids.length; i += size) payloads.push({ ids: ids.slice(i, i + size), catalog: opts.catalog, overrides: opts.overrides ?? {} });
  const stages = opts.thenStages ? { ...opts.thenStages, catalog: opts.catalog } : undefined;
  const req = await enqueueRequest(store, 'reduce', { batch_size: size, tests: ids.length, catalog: opts.catalog, overrides: opts.overrides ?? {}, stages }, payloads, Boolean(opts.thenStages));
  // no test at all: no batch will finish to enqueue the stages, so look now
  if (req.parts === 0) await enqueueFollowUp(store, req.request);
  return req;
}
