/**
 * Curve files read ahead of the batch writer: in worker threads (piscina) when there are enough
 * cores and rows, else in-process. `ahead(rec)` starts reading a record's curve if fewer than
 * `lookahead` reads are pending; `take(rec)` gives the read (started now if it was not), once.
 * Memory: at most `lookahead` parsed curves wait at a time, whatever the batch size. Reading
 * overlaps COPY: while a curve is written the next ones are parsed.
 *
 * Workers (default): one less than the cores, at most 8, and none below 4 cores, where the
 * database and the main thread need them; used only for inputs of at least 64 rows.
 */
import { availableParallelism } from 'node:os';
import { Piscina } from 'piscina';
import type { ColumnMap } from './column-map.ts';
import { runCurveTask, type CurveTask, type CurveTaskResult } from './curve-task.ts';
import type { ManifestRecord } from './manifest-reader.ts';

export interface CurvePool {
  ahead(rec: ManifestRecord, map: ColumnMap | null): void;
  take(rec: ManifestRecord, map: ColumnMap | null): Promise<CurveTaskResult>;
  destroy(): Promise<void>;
}

export function curvePool(rows: number, workersOption: number | undefined): CurvePool {
  const cores = availableParallelism();
  const workers = Math.max(0, Math.floor(workersOption ?? (cores >= 4 ? Math.min(8, cores - 1) : 0)));
  const pool =
    workers > 0 && rows >= 64
      ? new Piscina({ filename: new URL('./curve-worker.mjs', import.meta.url).href, minThreads: workers, maxThreads: workers, resourceLimits: { maxOldGenerationSizeMb: 96 } })
      : null;
  const lookahead = pool ? 2 * workers : 2;
  const pending = new Map<ManifestRecord, Promise<CurveTaskResult>>();
  const read = (rec: ManifestRecord, map: ColumnMap | null): Promise<CurveTaskResult> => {
    const task: CurveTask = { absPath: rec.curve!.absPath, displayPath: rec.curve!.displayPath, map };
    const p = pool ? (pool.run(task) as Promise<CurveTaskResult>) : runCurveTask(task);
    p.catch(() => {});
    return p;
  };
  return {
    ahead(rec, map) {
      if (rec.curve && !pending.has(rec) && pending.size < lookahead) pending.set(rec, read(rec, map));
    },
    take(rec, map) {
      const p = pending.get(rec);
      pending.delete(rec);
      return p ?? read(rec, map);
    },
    async destroy() {
      await pool?.destroy();
    },
  };
}
