/**
 * Worker-thread entry of the curve pool (curve-pool.ts): reads (and reduces) one curve file
 * (curve-task.ts) and moves its channel buffers back to the main thread instead of copying them.
 */
import { move, transferableSymbol, valueSymbol } from 'piscina';
import { resultBuffers, runCurveTask, type CurveTask } from './curve-task.ts';

export default async function curveWorker(task: CurveTask) {
  const r = await runCurveTask(task);
  return move({ [transferableSymbol]: resultBuffers(r), [valueSymbol]: r } as never);
}
