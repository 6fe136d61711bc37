/**
 * Reduces one test (a curve, or the given values of a summary-only record) to its stored row.
 * Never throws: an unexpected exception becomes a stored failure with code `internal_error`, so one
 * bad curve cannot stop a batch.
 */
import { propertiesFromSummary, reduceCurve, type TestProperties } from '@fractile/curves';
import type { ReduceRow, ReduceTask } from './task.ts';

const finiteOrNull = (x: number | null | undefined): number | null => (x === null || x === undefined || !Number.isFinite(x) ? null : x);

function propertyColumns(p: TestProperties): Omit<ReduceRow, 'test_pk' | 'settings_hash' | 'ok' | 'given' | 'failure_code' | 'failure_message' | 'uniform_plastic_strain' | 'grid_stress_mpa' | 'fits' | 'details'> {
  return {
    modulus_gpa: finiteOrNull(p.modulus_gpa),
    rp02_mpa: finiteOrNull(p.rp02_mpa),
    rt05_mpa: finiteOrNull(p.rt05_mpa),
    reh_mpa: finiteOrNull(p.reh_mpa),
    rel_mpa: finiteOrNull(p.rel_mpa),
    ype_pct: finiteOrNull(p.ype_pct),
    rm_mpa: finiteOrNull(p.rm_mpa),
    ag_pct: finiteOrNull(p.ag_pct),
    agt_pct: finiteOrNull(p.agt_pct),
    a_pct: finiteOrNull(p.a_pct),
    yt_ratio: finiteOrNull(p.yt_ratio),
    n_value: finiteOrNull(p.n_value),
    k_mpa: finiteOrNull(p.k_mpa),
    yield_mpa: finiteOrNull(p.yield_mpa),
    yield_definition: p.yield_definition,
    shape_class: p.shape_class,
    flags: p.flags,
  };
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
