/**
 * Curve files read (and, when the ingest reduces, reduced: curve-task.ts) ahead of the batch
 * writer: in worker threads (piscina) when asked for and there are enough rows, else in-process.
 * `ahead(rec)` starts reading a record's curve if the read-ahead bounds allow (READ_AHEAD);
 * `take(rec)` gives the read (started now if it was not), once. Memory: at most READ_AHEAD's
 * curves and bytes wait at a time, whatever the batch size. Reading overlaps COPY: while a curve is
 * written the next ones are parsed.
 *
 * Workers (default): one on two or three cores, one less than the cores from four on, at most 8;
 * used only for inputs of at least 64 rows. The embedded engine runs on the main thread, so even
 * on two cores one worker lets parsing and reducing overlap the database's work. Measured with
 * 1,000 tests × 2,000 points on two shared cores: see README, Benchmarks.
 * The compiled command line runs the compiled worker (`FRACTILE_INGEST_WORKER`, set by
 * packages/cli/build.mjs); from the sources, a bootstrap registers the TypeScript loader.
 */
import { availableParallelism } from 'node:os';
import { Piscina } from 'piscina';
import type { ColumnMap } from './column-map.ts';
import { runCurveTask, type CurveReduceInput, type CurveTask, type CurveTaskResult } from './curve-task.ts';
import type { ManifestRecord } from './manifest-reader.ts';

export interface CurvePool {
  ahead(rec: ManifestRecord, map: ColumnMap | null): void;
  take(rec: ManifestRecord, map: ColumnMap | null): Promise<CurveTaskResult>;
  destroy(): Promise<void>;
}

/** Set by the CLI build (packages/cli/build.mjs) to the compiled worker; undefined when run from the sources. */
declare const FRACTILE_INGEST_WORKER: string | undefined;
const WORKER_URL = typeof FRACTILE_INGEST_WORKER === 'string' ? FRACTILE_INGEST_WORKER : new URL('./curve-worker.mjs', import.meta.url).href;

/** The default number of curve workers on this machine. */
export function defaultCurveWorkers(cores = availableParallelism()): number {
  return cores >= 4 ? Math.min(8, cores - 1) : cores >= 2 ? 1 : 0;
}

/**
 * Read-ahead bounds: at most this many curves pending, and at most this many bytes of curve file
 * text pending (a parsed curve takes about twice its file's size; one read always starts, however
 * long the file). On 1,000 tests × 2,000 points, two curves ahead per worker left the worker idle
 * while the engine wrote a COPY chunk and the engine idle while the worker caught up: see README,
 * Benchmarks.
 */
export const READ_AHEAD = { curves: 64, bytes: 24 * 1024 * 1024 };

/**
 * @param reduceFor what to reduce a record's curve with, or null not to reduce it
 */
export function curvePool(rows: number, workersOption: number | undefined, reduceFor: (rec: ManifestRecord) => CurveReduceInput | null = () => null): CurvePool {
  const workers = Math.max(0, Math.floor(workersOption ?? defaultCurveWorkers()));
  const pool =
    workers > 0 && rows >= 64
      ? new Piscina({
          filename: WORKER_URL,
          minThreads: workers,
          maxThreads: workers,
          // tasks are handed to the workers ahead, not one at a time: the engine blocks the main
          // thread while it writes, and a worker that has to wait for its next task then idles
          concurrentTasksPerWorker: Math.ceil(READ_AHEAD.curves / workers),
          resourceLimits: { maxOldGenerationSizeMb: 96 },
        })
      : null;
  const lookahead = pool ? READ_AHEAD.curves : 2;
  const pending = new Map<ManifestRecord, Promise<CurveTaskResult>>();
  let pendingBytes = 0;
  const read = (rec: ManifestRecord, map: ColumnMap | null): Promise<CurveTaskResult> => {
    const task: CurveTask = { absPath: rec.curve!.absPath, displayPath: rec.curve!.displayPath, map, reduce: reduceFor(rec) };
    const p = pool ? (pool.run(task) as Promise<CurveTaskResult>) : runCurveTask(task);
    p.catch(() => {});
    return p;
  };
  return {
    ahead(rec, map) {
      if (!rec.curve || pending.has(rec) || pending.size >= lookahead) return;
      if (pending.size > 0 && pendingBytes + rec.curve.sizeBytes > READ_AHEAD.bytes) return;
      pendingBytes += rec.curve.sizeBytes;
      pending.set(rec, read(rec, map));
    },
    take(rec, map) {
      const p = pending.get(rec);
      if (p) {
        pending.delete(rec);
        pendingBytes -= rec.curve!.sizeBytes;
        return p;
      }
      return read(rec, map);
    },
    async destroy() {
      await pool?.destroy();
    },
  };
}
