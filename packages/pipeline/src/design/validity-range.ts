/**
 * Valid range of a characteristic curve on its grid.
 *
 * Rule: a grid point is valid when (a) its plastic strain does not exceed the group's
 * characteristic uniform plastic strain — the lower tolerance bound (same coverage, confidence and
 * model as the curve) of the tests' uniform plastic strains — and (b) it and every point before it
 * carry at least `minTestsPerPoint` curves (never fewer than 2, the least a tolerance bound needs).
 * The valid range runs from the first grid point to the last valid one, whichever rule ends it
 * first. Past maximum force the specimen necks and true stress from engineering data no longer
 * holds (common practice), which is why the uniform strain bounds the range.
 *
 * Returns `lastIndex = -1` when not even the first point is valid; `characteristicUniform` is
 * `null` when fewer than two uniform strains are known (then only rule (b) applies).
 */
import { lowerToleranceBound, type ToleranceSpec } from './lower-tolerance-bound.ts';

export type ValidityLimit = 'uniform-strain' | 'tests-per-point' | 'grid-end' | 'none';

export interface ValidityRange {
  lastIndex: number;
  characteristicUniform: number | null;
  limitedBy: ValidityLimit;
}

/** Relative slack when comparing a grid strain with the bound (grids are built by addition). */
const GRID_SLACK = 1e-9;

export function validityRange(
  grid: readonly number[],
  countsAtPoint: readonly number[],
  uniformPlasticStrains: readonly (number | null)[],
  spec: ToleranceSpec,
  minTestsPerPoint: number,
): ValidityRange {
  const minCount = Math.max(2, Math.ceil(minTestsPerPoint));
  const known = uniformPlasticStrains.filter((u): u is number => u !== null && Number.isFinite(u));
  const tol = lowerToleranceBound(known, spec);
  const characteristicUniform = tol ? tol.bound : null;
  let lastIndex = -1;
  let limitedBy: ValidityLimit = 'none';
  for (let i = 0; i < grid.length; i++) {
    if (countsAtPoint[i] < minCount) {
      limitedBy = 'tests-per-point';
      break;
    }
    if (characteristicUniform !== null && grid[i] > characteristicUniform + GRID_SLACK * Math.max(1e-3, Math.abs(characteristicUniform))) {
      limitedBy = 'uniform-strain';
      break;
    }
    lastIndex = i;
  }
  if (lastIndex === grid.length - 1) limitedBy = 'grid-end';
  if (lastIndex < 0 && limitedBy === 'none') limitedBy = 'tests-per-point';
  return { lastIndex, characteristicUniform, limitedBy };
}
