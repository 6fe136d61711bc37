/**
 * One curve file made ready for COPY: read and validated (curve-reader.ts), then each channel
 * written as a float8[] array literal. Runs in a worker thread (curve-worker.mjs) or in-process;
 * only the literals cross back, so the main thread only forwards text to the database.
 *
 * The literal is written here (array-literal.ts) rather than with the store's encoder so that a
 * worker thread loads nothing of the database drivers (its memory stays small); where the reader
 * kept the cells' own text as a literal, that is used as it is.
 */
import type { ChannelName, ColumnMap } from './column-map.ts';
import { float8ArrayLiteral } from './array-literal.ts';
import { readCurveFile } from './curve-reader.ts';
import type { Rejection } from './rejection.ts';

export interface CurveTask {
  absPath: string;
  displayPath: string;
  map: ColumnMap | null;
}

export type CurveTaskResult =
  | { ok: true; sha256: string; sizeBytes: number; nPoints: number; literals: Record<ChannelName, string | null> }
  | { ok: false; rejection: Rejection };

export async function runCurveTask(task: CurveTask): Promise<CurveTaskResult> {
  const r = await readCurveFile(task.absPath, task.displayPath, task.map, { keepText: true });
  if (!r.ok) return r;
  const c = r.channels;
  const lit = (a: Float64Array | null, text: string | undefined) => (a === null ? null : (text ?? float8ArrayLiteral(a)));
  return {
    ok: true,
    sha256: r.sha256,
    sizeBytes: r.sizeBytes,
    nPoints: c.nPoints,
    literals: {
      time: lit(c.time, r.texts.time),
      force: lit(c.force, r.texts.force),
      extension: lit(c.extension, r.texts.extension),
      crosshead: lit(c.crosshead, r.texts.crosshead),
      stress: lit(c.stress, r.texts.stress),
      strain: lit(c.strain, r.texts.strain),
    },
  };
}

export default runCurveTask;
