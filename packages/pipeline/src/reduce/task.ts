/**
 * What the reduce stage hands to a worker and gets back: one test's channels (canonical units) or
 * its given summary values, and the row to store. Plain, structured-clone-able data.
 */
import type { CurveInput, ReduceSettings, SummaryInput } from '@fractile/curves';

export interface ReduceTask {
  testPk: number;
  settingsHash: string;
  settings: ReduceSettings;
  curve: CurveInput | null;
  summary: SummaryInput | null;
}

export interface ReduceRow {
  test_pk: number;
  settings_hash: string;
  ok: boolean;
  given: boolean;
  failure_code: string | null;
  failure_message: string | null;
  modulus_gpa: number | null;
  rp02_mpa: number | null;
  rt05_mpa: number | null;
  reh_mpa: number | null;
  rel_mpa: number | null;
  ype_pct: number | null;
  rm_mpa: number | null;
  ag_pct: number | null;
  agt_pct: number | null;
  a_pct: number | null;
  yt_ratio: number | null;
  n_value: number | null;
  k_mpa: number | null;
  yield_mpa: number | null;
  yield_definition: string | null;
  shape_class: string | null;
  flags: string[];
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
