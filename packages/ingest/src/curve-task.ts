/**
 * One curve file read and validated (curve-reader.ts) and, when asked, reduced at once while its
 * channels are in memory (the pipeline's per-test reduction, `@fractile/pipeline/reduce-one`,
 * pure; the row comes back without its test row id, which the batch writer assigns). Runs in a
 * worker thread (curve-worker.mjs, or the compiled `ingest-worker.mjs`) or in-process; the
 * channels come back as Float64Arrays whose buffers the worker transfers (not copies), ready for
 * binary COPY.
 *
 * The reduction is speculative: a record that turns out to be a duplicate or is rejected for its
 * geometry afterwards has been reduced for nothing (its row is dropped).
 */
import { reduceOne, type ReduceRow } from '@fractile/pipeline/reduce-one';
import type { ReduceSettings } from '@fractile/curves';
import type { ColumnMap } from './column-map.ts';
import { readCurveFile, type CurveChannels } from './curve-reader.ts';
import type { Rejection } from './rejection.ts';

/** What to reduce a curve with: its grade's settings (and their hash) and the record's geometry. */
export interface CurveReduceInput {
  settingsHash: string;
  settings: ReduceSettings;
  areaMm2: number | null;
  gaugeLengthMm: number | null;
}

export interface CurveTask {
  absPath: string;
  displayPath: string;
  map: ColumnMap | null;
  reduce: CurveReduceInput | null;
}

export type CurveTaskResult =
  | { ok: true; sha256: string; sizeBytes: number; channels: CurveChannels; reduced: ReduceRow | null }
  | { ok: false; rejection: Rejection };

export async function runCurveTask(task: CurveTask): Promise<CurveTaskResult> {
  const r = await readCurveFile(task.absPath, task.displayPath, task.map);
  if (!r.ok) return r;
  const c = r.channels;
  const reduced = task.reduce
    ? reduceOne({
        testPk: 0,
        settingsHash: task.reduce.settingsHash,
        settings: task.reduce.settings,
        curve: { timeS: c.time, forceN: c.force, extensionMm: c.extension, crossheadMm: c.crosshead, stressMpa: c.stress, strain: c.strain, areaMm2: task.reduce.areaMm2, gaugeLengthMm: task.reduce.gaugeLengthMm },
        summary: null,
      })
    : null;
  return { ok: true, sha256: r.sha256, sizeBytes: r.sizeBytes, channels: c, reduced };
}

/** The channel buffers of a result, to transfer from the worker. */
export function resultBuffers(r: CurveTaskResult): ArrayBuffer[] {
  if (!r.ok) return [];
  const c = r.channels;
  return [c.time, c.force, c.extension, c.crosshead, c.stress, c.strain].flatMap((a) => (a && a.buffer instanceof ArrayBuffer ? [a.buffer] : []));
}

export default runCurveTask;
