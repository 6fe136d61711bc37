/**
 * Proof strength at a plastic extension, Rp (ISO 6892-1): the stress where the curve meets a
 * line parallel to the elastic line, offset by the plastic extension. Plastic strain of a point:
 * (e − origin) − σ/E. The first crossing is found and interpolated linearly between the two
 * points around it.
 *
 * In: engineering strain (mm/mm), stress (MPa), slope E (MPa), strain origin (mm/mm, the toe
 * shift), plastic extension (mm/mm), index range [from, to). Out: stress (MPa) and the index of
 * the point after the crossing, or null when the curve never reaches the offset.
 */
export interface Crossing { stressMpa: number; strain: number; index: number }

export function offsetYield(
  strain: ArrayLike<number>, stressMpa: ArrayLike<number>, eMpa: number, strainOrigin: number,
  plasticOffset: number, from = 0, to = strain.length,
): Crossing | null {
  if (!(eMpa > 0)) return null;
  let gPrev = strain[from] - strainOrigin - stressMpa[from] / eMpa - plasticOffset;
  if (gPrev >= 0) return null; // the offset is already passed at the first point: undefined
  for (let i = from + 1; i < to; i++) {
    const g = strain[i] - strainOrigin - stressMpa[i] / eMpa - plasticOffset;
    if (g >= 0) {
      const t = -gPrev / (g - gPrev);
      return {
        stressMpa: stressMpa[i - 1] + t * (stressMpa[i] - stressMpa[i - 1]),
        strain: strain[i - 1] + t * (strain[i] - strain[i - 1]) - strainOrigin,
        index: i,
      };
    }
    gPrev = g;
  }
  return null;
}
