/**
 * Strength at a total extension, Rt (ISO 6892-1): the stress where the curve first crosses the
 * total strain e = t (measured from the toe-compensated origin), interpolated linearly.
 *
 * In: engineering strain (mm/mm), stress (MPa), strain origin, total strain t (mm/mm), index
 * range. Out: the crossing, or null when the curve never reaches t (or starts beyond it).
 */
import type { Crossing } from './offset-yield.ts';

export function totalExtensionYield(
  strain: ArrayLike<number>, stressMpa: ArrayLike<number>, strainOrigin: number, totalStrain: number,
  from = 0, to = strain.length,
): Crossing | null {
  let gPrev = strain[from] - strainOrigin - totalStrain;
  if (gPrev >= 0) return null;
  for (let i = from + 1; i < to; i++) {
    const g = strain[i] - strainOrigin - totalStrain;
    if (g >= 0) {
      const t = -gPrev / (g - gPrev);
      return { stressMpa: stressMpa[i - 1] + t * (stressMpa[i] - stressMpa[i - 1]), strain: totalStrain, index: i };
    }
    gPrev = g;
  }
  return null;
}
