/**
 * A worker process: graphile-worker's runner with our three job kinds (job-handlers.ts),
 * `concurrency` jobs at a time, on the database of `store`. Each of its workers holds its
 * liveness lock (worker-liveness.ts); every `reapSeconds` (and at start) the jobs of workers that
 * died are unlocked for a retry. `stop()` lets running jobs finish (graphile-worker's graceful
 * shutdown) and then closes the queue's connections; a job that cannot finish is left to the
 * retry of another worker. When the connection holding the liveness locks fails (a server
 * restart), the worker stops at once with an error: its jobs count as gone and are retried.
 */
import { EventEmitter } from 'node:events';
import { run, type Runner, type Task, type WorkerEvents } from 'graphile-worker';
import { type Store, StoreError } from '@fractile/store';
import { handleIngest, handleReduce, handleStages, type HandlerContext } from './job-handlers.ts';
import type { IngestJob, ReduceJob, StagesJob } from './job-kinds.ts';
import { prepareQueue, queueOptions } from './queue-schema.ts';
import pg from 'pg';
import { openLiveness } from './worker-liveness.ts';

export interface WorkerOptions {
  concurrency?: number;
  /** worker threads each job may use (default 0: the job's own thread; run one process per core) */
  threads?: number;
  codeVersion: string;
  /** how often to look for jobs of dead workers, in seconds (default 2) */
  reapSeconds?: number;
  /** how often to look for jobs when no notification came, in milliseconds (default 1000) */
  pollMs?: number;
  onEvent?: (message: string) => void;
}

export interface RunningWorker {
  /** resolves when the worker has stopped; rejects when it failed */
  done: Promise<void>;
  stop(): Promise<void>;
}

export async function startWorker(store: Store, opts: WorkerOptions): Promise<RunningWorker> {
  if (store.engine !== 'postgres') throw new Error('the job queue needs a PostgreSQL server');
  const url = store.target;
  await prepareQueue(url);
  const concurrency = Math.max(1, Math.floor(opts.concurrency ?? 1));
  const ctx: HandlerContext = { store, codeVersion: opts.codeVersion, threads: Math.max(0, Math.floor(opts.threads ?? 0)) };
  let lost: ((e: Error) => void) | null = null;
  const lostPromise = new Promise<never>((_, reject) => (lost = reject));
  lostPromise.catch(() => {});
  const liveness = await openLiveness(url, (e) => lost?.(new StoreError('database_unavailable', `lost the connection that marks this worker alive (${e.message}); this worker stops, its jobs will be retried by other workers`, { cause: e })));
  const events: WorkerEvents = new EventEmitter();
  const holds: Promise<void>[] = [];
  events.on('worker:create', ({ worker }) => {
    holds.push(liveness.hold(worker.workerId).catch((e: Error) => lost?.(e)));
  });
  const reap = async () => {
    const dead = await liveness.reap().catch(() => [] as string[]);
    if (dead.length) opts.onEvent?.(`unlocked the jobs of ${dead.length} worker(s) gone: ${dead.join(', ')}`);
  };
  await reap();
  const taskList: Record<string, Task> = {
    ingest: (p, h) => handleIngest(ctx, p as IngestJob, h),
    reduce: (p, h) => handleReduce(ctx, p as ReduceJob, h),
    stages: (p) => handleStages(ctx, p as StagesJob),
  };
  // our own pool, so that a connection the server ends (a restart) stops the worker with a reason
  // instead of an 'error' event nobody listens to once graphile-worker has begun to shut down
  const pool = new pg.Pool({ connectionString: url, max: concurrency + 2 });
  const onLostConnection = (e: Error) => lost?.(new StoreError('database_unavailable', `lost a connection to the server (${e.message}); this worker stops, its jobs will be retried by other workers`, { cause: e }));
  pool.on('error', onLostConnection);
  // a checked-out client is not heard by the pool: each client listens for its whole life
  pool.on('connect', (client) => client.on('error', onLostConnection));
  let runner: Runner;
  try {
    runner = await run({ ...queueOptions(url), connectionString: undefined, pgPool: pool, concurrency, noHandleSignals: true, pollInterval: opts.pollMs ?? 1000, taskList, events });
  } catch (e) {
    await pool.end().catch(() => {});
    await liveness.close();
    throw e;
  }
  await Promise.all(holds);
  const timer = setInterval(reap, Math.max(0.2, opts.reapSeconds ?? 2) * 1000);
  let stopping: Promise<void> | null = null;
  const stop = () =>
    (stopping ??= (async () => {
      clearInterval(timer);
      await runner.stop().catch(() => {});
      await pool.end().catch(() => {});
      await liveness.close();
    })());
  const done = Promise.race([runner.promise, lostPromise]).then(
    () => stop(),
    async (e) => {
      await stop();
      throw e;
    },
  );
  return { done, stop };
}
