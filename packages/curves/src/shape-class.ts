/**
 * Curve shape class: `plateau` when the curve yields discontinuously (discontinuous-yield.ts);
 * `bilinear` when the plastic part from Rp to maximum force is nearly straight — a line fit with
 * residual below 2 % of its stress rise, a rise of at least 2 % of Rm and a slope below E/20 —
 * so that the curve is two near-straight parts; otherwise `continuous`. The thresholds are ours.
 *
 * In: engineering strain and stress, the index range of the plastic part, E (MPa), Rm (MPa),
 * whether the yielding was discontinuous. Out: the class.
 */
import { fitLine } from './line-fit.ts';
import type { ShapeClass } from './types.ts';

export function shapeClass(strain: ArrayLike<number>, stressMpa: ArrayLike<number>, plasticFrom: number, maxIndex: number, eMpa: number, rmMpa: number, discontinuous: boolean): ShapeClass {
  if (discontinuous) return 'plateau';
  if (plasticFrom < 0 || maxIndex - plasticFrom < 10) return 'continuous';
  const fit = fitLine(strain, stressMpa, plasticFrom, maxIndex + 1);
  if (!fit) return 'continuous';
  const rise = stressMpa[maxIndex] - stressMpa[plasticFrom];
  if (rise >= 0.02 * rmMpa && fit.residualSd <= 0.02 * rise && fit.slope > 0 && fit.slope < eMpa / 20) return 'bilinear';
  return 'continuous';
}
