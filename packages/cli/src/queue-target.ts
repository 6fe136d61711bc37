/**
 * The job queue from the command line: it lives on a PostgreSQL server only (an embedded folder
 * is held by one process, and there the commands run in-process as always), and `--watch` shows
 * a queued request's progress on stderr until nothing of it is left to run.
 */
import type { RequestProgress } from '@fractile/queue';
import type { Store } from '@fractile/store';
import { CliError, log, type GlobalOptions } from './context.ts';
import { chooseDb } from './db-target.ts';
import { print } from './output.ts';
import { progressBar } from './progress.ts';

/** A whole-number option ≥ `min`, else a usage error naming it. */
export function wholeNumber(s: string, name: string, min: number): number {
  const x = Number(s);
  if (!Number.isInteger(x) || x < min) throw new CliError(`${name} must be a whole number ≥ ${min}, got "${s}"`);
  return x;
}

/** Throws a usage error (exit 2) unless the database is a server. */
export async function requireServer(g: GlobalOptions, what: string): Promise<void> {
  const target = chooseDb(g, g.project).target;
  const { isServerTarget } = await import('@fractile/store');
  if (!isServerTarget(target)) throw new CliError(`${what} needs a PostgreSQL server (--db postgres://… or DATABASE_URL); "${target}" is an embedded database folder, which one process uses at a time: run the command without the queue there`);
}

const line = (p: RequestProgress) =>
  `request ${p.request} (${p.kind}): ${p.done}/${p.parts} parts done, ${p.running} running, ${p.pending} pending, ${p.failed} failed${p.then_stages ? `, stages ${p.stages_done ? 'done' : 'waiting'}` : ''}${p.cancelled ? ', cancelled' : ''}`;

/** Watches a request; returns its last state and sets exit 1 when it ended with failed jobs. */
export async function watchOnStderr(store: Store, request: number, mode: string): Promise<RequestProgress> {
  const { watchRequest } = await import('@fractile/queue');
  const bar = mode === 'bar' ? progressBar(`request ${request}`) : null;
  const last = await watchRequest(store, request, (p) => (bar ? bar.update(p.done, p.parts) : mode === 'lines' ? log(line(p)) : undefined));
  bar?.stop();
  log(line(last));
  if (last.failed > 0) {
    log(`request ${last.request}: ${last.failed} job(s) failed; see \`fractile queue failed\`, then \`fractile queue retry\``);
    process.exitCode = 1;
  }
  return last;
}

/** `ingest --queue`: enqueues the manifests in parts; with `watch`, waits for them. */
export async function queueIngest(g: GlobalOptions, manifests: string[], o: { map?: string; replace?: boolean; batchSize: number; partRows: number; watch: boolean; progress: string }): Promise<void> {
  await requireServer(g, '--queue');
  const { enqueueIngest } = await import('@fractile/queue');
  const { withStore } = await import('./common-options.ts');
  await withStore(g, async (store) => {
    const r = await enqueueIngest(store, manifests, { map: o.map ?? null, replace: o.replace, batchSize: o.batchSize, partRows: o.partRows });
    log(`ingest: request ${r.request}: ${r.parts} part(s) of at most ${o.partRows} manifest rows queued; \`fractile worker\` runs them`);
    const last = o.watch ? await watchOnStderr(store, r.request, o.progress) : null;
    print(g, { kind: 'queue request', data: { ...r, progress: last }, rows: [{ request: r.request, parts: r.parts, done: last?.done ?? null, failed: last?.failed ?? null }], title: 'fractile queue: request enqueued', result: false });
  });
}

/** `reduce --queue`: enqueues every current test in batches; with `watch`, waits for them. */
export async function queueReduce(
  g: GlobalOptions,
  o: { catalog?: string; fits: boolean; batchSize: number; thenStages: boolean; by: string; driftBy: string; watch: boolean; progress: string },
): Promise<void> {
  await requireServer(g, '--queue');
  const { enqueueReduce } = await import('@fractile/queue');
  const { parseGroupBy } = await import('@fractile/pipeline');
  const { resolveCatalog, withStore } = await import('./common-options.ts');
  parseGroupBy(o.by);
  parseGroupBy(o.driftBy);
  await withStore(g, async (store) => {
    const catalog = await resolveCatalog(store.db, o.catalog);
    const r = await enqueueReduce(store, { catalog, overrides: o.fits ? {} : { fitLaws: false }, batchSize: o.batchSize, thenStages: o.thenStages ? { by: o.by, driftBy: o.driftBy } : null });
    log(`reduce: request ${r.request}: ${r.parts} batch(es) of at most ${o.batchSize} tests queued${o.thenStages ? ', then stats, curves and drift' : ''}; \`fractile worker\` runs them`);
    const last = o.watch ? await watchOnStderr(store, r.request, o.progress) : null;
    print(g, { kind: 'queue request', data: { ...r, progress: last }, rows: [{ request: r.request, parts: r.parts, done: last?.done ?? null, failed: last?.failed ?? null }], title: 'fractile queue: request enqueued', result: false });
  });
}
