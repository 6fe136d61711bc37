/**
 * Extends a group's valid median and characteristic curves past their valid range by a hardening
 * law (`extrapolate-law.ts`): fitted to each curve over the valid range without its first quarter,
 * joined at the last valid point. The extended characteristic curve is the smaller of the two
 * extended laws, held non-decreasing (min of two non-decreasing sequences stays so); the extended
 * points carry n = 0 and `extrapolated = true`.
 *
 * Units: MPa, mm/mm. Returns the curves unchanged (with a warning) where there is nothing to extend
 * or a law cannot be fitted.
 */
import { extrapolateJoined, extrapolationPoints, fitLaw, fitWindowStart } from './extrapolate-law.ts';
import type { DesignCurve, ExtrapolationLaw } from './types.ts';

export interface ExtendedCurves {
  plastic: number[];
  median: number[];
  characteristic: number[];
  counts: number[];
  extrapolated: boolean[];
  extrapolatedFrom: number | null;
  extrapolation: DesignCurve['extrapolation'];
  warnings: string[];
}

export function extendCurves(
  grid: readonly number[], lastValid: number, x: readonly number[], med: readonly number[], chr: readonly number[], counts: readonly number[],
  law: ExtrapolationLaw | null, extrapolateTo: number | undefined, eMpa: number | null,
): ExtendedCurves {
  const out: ExtendedCurves = {
    plastic: [...x], median: [...med], characteristic: [...chr], counts: [...counts], extrapolated: x.map(() => false),
    extrapolatedFrom: null, extrapolation: null, warnings: [],
  };
  if (law === null) return out;
  const target = extrapolateTo ?? grid[grid.length - 1];
  const at = extrapolationPoints(grid, lastValid, target);
  if (at.length === 0) {
    out.warnings.push(`nothing_to_extrapolate: the valid range already reaches plastic strain ${target}`);
    return out;
  }
  const iFit = fitWindowStart(x);
  const fitC = fitLaw(law, x.slice(iFit), chr.slice(iFit), eMpa);
  const fitM = fitLaw(law, x.slice(iFit), med.slice(iFit), eMpa);
  if (!fitC || !fitM) {
    out.warnings.push(`extrapolation_failed: the ${law} law could not be fitted to the valid part; no extrapolation`);
    return out;
  }
  const L = x.length - 1;
  const ec = extrapolateJoined(fitC, x[L], chr[L], at);
  const em = extrapolateJoined(fitM, x[L], med[L], at);
  let prev = chr[L];
  for (let j = 0; j < at.length; j++) {
    const c = Math.max(prev, Math.min(ec[j], em[j]));
    prev = c;
    out.plastic.push(at[j]);
    out.median.push(em[j]);
    out.characteristic.push(c);
    out.counts.push(0);
    out.extrapolated.push(true);
  }
  out.extrapolatedFrom = x[L];
  out.extrapolation = { law, fit_from_plastic_strain: x[iFit], params_characteristic: fitC.params, params_median: fitM.params, rmse_mpa: fitC.rmseMpa };
  out.warnings.push(`extrapolated: past plastic strain ${x[L]} the curves follow the fitted ${law} law, not test data`);
  return out;
}
