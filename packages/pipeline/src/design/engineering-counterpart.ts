/**
 * Engineering counterpart of a true stress – true plastic strain curve: total true strain
 * ε_t = ε_p + σ_t/E, engineering strain e = exp(ε_t) − 1 and engineering stress
 * σ_e = σ_t/(1 + e) — the inverse of σ_t = σ_e(1 + e), ε_t = ln(1 + e) (constant volume, valid up to
 * uniform elongation; ISO 6892-1 quantities, exact relations of the definitions).
 *
 * Units: MPa and mm/mm in and out; `eMpa` in MPa. Returns `null` when E is not a positive finite
 * number (the elastic part is then unknown).
 */
import type { EngineeringCurve } from './types.ts';

export function engineeringCounterpart(plasticStrain: readonly number[], trueStressMpa: readonly number[], eMpa: number | null): EngineeringCurve | null {
  if (eMpa === null || !Number.isFinite(eMpa) || eMpa <= 0) return null;
  const strain: number[] = [];
  const stress: number[] = [];
  for (let i = 0; i < plasticStrain.length; i++) {
    const trueStrain = plasticStrain[i] + trueStressMpa[i] / eMpa;
    const e = Math.expm1(trueStrain);
    strain.push(e);
    stress.push(trueStressMpa[i] / (1 + e));
  }
  return { strain, stress_mpa: stress };
}
