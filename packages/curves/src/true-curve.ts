/**
 * True stress and strain from engineering values, valid up to maximum force (uniform
 * deformation, constant volume): σt = σe·(1 + e), εt = ln(1 + e); true plastic strain
 * εp = εt − σt/E (REFERENCES: exact results of the laws). Nothing past maximum force is
 * converted: after necking starts the engineering record no longer gives the true stress.
 *
 * In: engineering strain (mm/mm), stress (MPa), E (MPa), the index of maximum force (inclusive).
 * Out: three new arrays of length maxIndex + 1.
 */
import type { TrueCurve } from './types.ts';

export function trueCurve(strain: ArrayLike<number>, stressMpa: ArrayLike<number>, eMpa: number, maxIndex: number): TrueCurve {
  const n = maxIndex + 1;
  const trueStrain = new Float64Array(n);
  const trueStressMpa = new Float64Array(n);
  const plasticStrain = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const e = strain[i];
    const st = stressMpa[i] * (1 + e);
    const et = Math.log1p(e);
    trueStrain[i] = et;
    trueStressMpa[i] = st;
    plasticStrain[i] = et - st / eMpa;
  }
  return { trueStrain, trueStressMpa, plasticStrain };
}

/** One engineering point to true values (the worked example of REFERENCES: 400 MPa at 0.10 → 440 MPa, 0.09531). */
export function engineeringToTrue(strain: number, stressMpa: number): { trueStrain: number; trueStressMpa: number } {
  return { trueStrain: Math.log1p(strain), trueStressMpa: stressMpa * (1 + strain) };
}
