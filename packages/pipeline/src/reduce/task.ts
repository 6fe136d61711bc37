/**
 * What the reduce stage hands to a worker and gets back: one test's channels (canonical units) or
 * its given summary values, and the row to store. Plain, structured-clone-able data.
 */
import type { CurveInput, ReduceSettings, SummaryInput, TestProperties } from '@fractile/curves';

export interface ReduceTask {
  testPk: number;
  settingsHash: string;
  settings: ReduceSettings;
  curve: CurveInput | null;
  summary: SummaryInput | null;
}

/** One row of test_results as the reduce stage writes it (JSON columns as text). */
export interface ReduceRow extends TestProperties {
  test_pk: number;
  settings_hash: string;
  ok: boolean;
  given: boolean;
  failure_code: string | null;
  failure_message: string | null;
  uniform_plastic_strain: number | null;
  grid_stress_mpa: (number | null)[] | null;
  fits: string | null;
  details: string | null;
}

export const REDUCE_ROW_COLUMNS: readonly (keyof ReduceRow)[] = [
  'test_pk', 'settings_hash', 'ok', 'given', 'failure_code', 'failure_message', 'modulus_gpa', 'rp02_mpa', 'rt05_mpa', 'reh_mpa', 'rel_mpa',
  'ype_pct', 'rm_mpa', 'ag_pct', 'agt_pct', 'a_pct', 'yt_ratio', 'n_value', 'k_mpa', 'yield_mpa', 'yield_definition', 'shape_class', 'flags',
  'uniform_plastic_strain', 'grid_stress_mpa', 'fits', 'details',
];

/**
 * The channel buffers of a batch, to move (not copy) to a worker thread: structured cloning of
 * the channels would otherwise keep the main thread busy and the workers idle.
 */
export function channelBuffers(tasks: readonly ReduceTask[]): ArrayBuffer[] {
  const out = new Set<ArrayBuffer>();
  for (const t of tasks) {
    const c = t.curve;
    if (!c) continue;
    for (const a of [c.timeS, c.forceN, c.extensionMm, c.crossheadMm, c.stressMpa, c.strain]) if (a && a.buffer instanceof ArrayBuffer) out.add(a.buffer);
  }
  return [...out];
}
