/** Worker-thread entry: reduces a batch of tests (see reduce-one.ts). */
import { reduceOne } from './reduce-one.ts';
import type { ReduceRow, ReduceTask } from './task.ts';

export default function reduceBatch(tasks: ReduceTask[]): ReduceRow[] {
  return tasks.map(reduceOne);
}
