/**
 * Tensile strength and elongations (ISO 6892-1): Rm = maximum force / S0; Agt = total extension
 * at maximum force; Ag = Agt − Rm/E (plastic extension at maximum force); A (from the curve) =
 * plastic extension at fracture = e_f − σ_f/E; At = total extension at fracture.
 *
 * Maximum force and its strain come from smooth fits to the top of the curve (`smooth-maximum.ts`):
 * the largest recorded point of a noisy record lies several noise SDs above the curve, and on a
 * flat top its strain wanders far. Where the noise is below 0.01 % of the top, the largest
 * recorded point is taken.
 *
 * Fracture is the last point before the final drop: the last point after maximum force that
 * stands more than 10 % of Rm above everything after it, stepped back over a drop spread across a
 * few samples. Without such a drop the last point is taken (flag `fracture_not_detected`).
 *
 * In: engineering strain (mm/mm, toe-compensated) and stress (MPa), E (MPa), noise (MPa).
 * Out: indices and values in mm/mm and MPa.
 */
import { smoothMaximum } from './smooth-maximum.ts';

export interface TensileResult {
  /** last sample at or before maximum force */
  maxIndex: number;
  /** maximum of the smoothed top (the largest recorded stress where the noise is negligible) */
  rmMpa: number;
  smoothedMaximum: boolean;
  /** total strain at maximum force, mm/mm */
  uniformStrain: number;
  fractureIndex: number;
  fractureDetected: boolean;
  fractureStrain: number;
  fractureStressMpa: number;
}

export function indexOfMax(stressMpa: ArrayLike<number>, from = 0, to = stressMpa.length): number {
  let im = from;
  for (let i = from + 1; i < to; i++) if (stressMpa[i] > stressMpa[im]) im = i;
  return im;
}

export function findFracture(stressMpa: ArrayLike<number>, imax: number): { index: number; detected: boolean } {
  const n = stressMpa.length;
  const rm = stressMpa[imax];
  let sufMax = -Infinity;
  let f = -1;
  for (let i = n - 2; i >= imax; i--) {
    if (stressMpa[i + 1] > sufMax) sufMax = stressMpa[i + 1];
    if (stressMpa[i] - sufMax > 0.1 * rm) { f = i; break; }
  }
  if (f < 0) return { index: n - 1, detected: false };
  while (f - 1 >= imax && stressMpa[f - 1] - stressMpa[f] > 0.05 * rm) f--;
  return { index: f, detected: true };
}

export function tensileValues(strain: ArrayLike<number>, stressMpa: ArrayLike<number>, noiseMpa: number): TensileResult {
  const highest = indexOfMax(stressMpa);
  const fr = findFracture(stressMpa, highest);
  const ef = strain[fr.index];
  const top = smoothMaximum(strain, stressMpa, highest, noiseMpa, fr.index + 1);
  const eu = Math.min(top.strain, ef);
  return {
    maxIndex: Math.min(top.index, fr.index), rmMpa: top.stressMpa, uniformStrain: eu, smoothedMaximum: top.smoothed,
    fractureIndex: fr.index, fractureDetected: fr.detected, fractureStrain: ef, fractureStressMpa: stressMpa[fr.index],
  };
}
