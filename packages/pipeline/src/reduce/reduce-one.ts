/**
 * Reduces one test (a curve, or the given values of a summary-only record) to its stored row.
 * Never throws: an unexpected exception becomes a stored failure with code `internal_error`, so one
 * bad curve cannot stop a batch. Pure; the reduce stage's workers and the ingest's curve workers
 * (`@fractile/pipeline/reduce-one`, which loads nothing but this file, task.ts and the curves
 * package) run the same function, so a test reduced at ingest gets the row `reduce` would write.
 * The input channels are read, never changed.
 */
import { propertiesFromSummary, reduceCurve, type TestProperties } from '@fractile/curves';
import type { ReduceRow, ReduceTask } from './task.ts';

export type { ReduceRow, ReduceTask } from './task.ts';
export { REDUCE_ROW_COLUMNS } from './task.ts';

const finiteOrNull = (x: number | null | undefined): number | null => (x === null || x === undefined || !Number.isFinite(x) ? null : x);

const NUMERIC_KEYS = [
  'modulus_gpa', 'rp02_mpa', 'rt05_mpa', 'reh_mpa', 'rel_mpa', 'ype_pct', 'rm_mpa', 'ag_pct', 'agt_pct', 'a_pct', 'yt_ratio', 'n_value', 'k_mpa', 'yield_mpa',
] as const;

/** The properties with every non-finite number stored as null (never NaN in the database). */
function propertyColumns(p: TestProperties): TestProperties {
  const out = { ...p };
  for (const k of NUMERIC_KEYS) out[k] = finiteOrNull(p[k]);
  return out;
}

const EMPTY_PROPERTIES: TestProperties = {
  modulus_gpa: null, rp02_mpa: null, rt05_mpa: null, reh_mpa: null, rel_mpa: null, ype_pct: null, rm_mpa: null, ag_pct: null, agt_pct: null,
  a_pct: null, yt_ratio: null, n_value: null, k_mpa: null, yield_mpa: null, yield_definition: null, shape_class: null, flags: [],
};

function failure(task: ReduceTask, code: string, message: string): ReduceRow {
  return {
    test_pk: task.testPk, settings_hash: task.settingsHash, ok: false, given: false, failure_code: code, failure_message: message,
    ...propertyColumns(EMPTY_PROPERTIES), uniform_plastic_strain: null, grid_stress_mpa: null, fits: null, details: null,
  };
}

export function reduceOne(task: ReduceTask): ReduceRow {
  try {
    if (task.curve) {
      const out = reduceCurve(task.curve, task.settings);
      if (!out.ok) return failure(task, out.code, out.message);
      const r = out.result;
      const ep = r.trueCurve.plasticStrain;
      return {
        test_pk: task.testPk, settings_hash: task.settingsHash, ok: true, given: false, failure_code: null, failure_message: null,
        ...propertyColumns(r.properties),
        uniform_plastic_strain: ep.length > 0 ? finiteOrNull(ep[ep.length - 1]) : null,
        grid_stress_mpa: r.grid.map((v) => finiteOrNull(v)),
        fits: r.fits ? JSON.stringify(r.fits) : null,
        details: JSON.stringify(r.details),
      };
    }
    if (task.summary) {
      const p = propertiesFromSummary(task.summary, task.settings);
      return {
        test_pk: task.testPk, settings_hash: task.settingsHash, ok: true, given: true, failure_code: null, failure_message: null,
        ...propertyColumns(p), uniform_plastic_strain: null, grid_stress_mpa: null, fits: null, details: JSON.stringify({ source: 'given summary values' }),
      };
    }
    return failure(task, 'no_data', 'the test has neither a curve nor summary values');
  } catch (e) {
    return failure(task, 'internal_error', `reduction raised: ${(e as Error).message}`);
  }
}
