/**
 * Pointwise statistics of a group's curves on its grid: at each grid point separately, the number
 * of curves, their median (simple-statistics) and their one-sided lower tolerance bound
 * (ISO 16269-6, `lower-tolerance-bound.ts`). NaN where a point has no curve (median) or too few
 * values for a bound; `lognormalUndefined` when a stress ≤ 0 left the lognormal bound undefined
 * at some point that had two or more values.
 */
import { median } from 'simple-statistics';
import { lowerToleranceBound, type ToleranceSpec } from './lower-tolerance-bound.ts';
import type { UsableTest } from './usable-tests.ts';

export interface PointwiseBounds {
  counts: number[];
  median: number[];
  bound: number[];
  lognormalUndefined: boolean;
}

/** The stresses present at grid point i. */
export function valuesAt(tests: readonly UsableTest[], i: number): number[] {
  const vals: number[] = [];
  for (const t of tests) {
    const v = t.stress[i];
    if (v !== null) vals.push(v);
  }
  return vals;
}

export function pointwiseBounds(gridLength: number, tests: readonly UsableTest[], spec: ToleranceSpec): PointwiseBounds {
  const out: PointwiseBounds = { counts: [], median: [], bound: [], lognormalUndefined: false };
  for (let i = 0; i < gridLength; i++) {
    const vals = valuesAt(tests, i);
    out.counts.push(vals.length);
    out.median.push(vals.length > 0 ? median(vals) : NaN);
    const b = lowerToleranceBound(vals, spec);
    if (!b && vals.length >= 2 && spec.model === 'lognormal') out.lognormalUndefined = true;
    out.bound.push(b ? b.bound : NaN);
  }
  return out;
}
