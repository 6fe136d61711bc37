/**
 * The group values a design curve starts from, where the caller does not pass them in: the
 * modulus (median of the tests' moduli, GPa in, MPa out), the characteristic yield (the lower
 * tolerance bound of the tests' yields, ISO 16269-6, same coverage, confidence and model as the
 * curve) and the median yield (median of the tests' yields). A value passed in is used when it is
 * a finite number (the modulus also positive). `null` where nothing is known (no modulus, fewer
 * than two yields for the bound, no yield for the median).
 */
import { median } from 'simple-statistics';
import { lowerToleranceBound, type ToleranceSpec } from './lower-tolerance-bound.ts';
import type { TestGridCurve } from './types.ts';

const given = (v: number | null | undefined): v is number => v !== undefined && v !== null && Number.isFinite(v);

function yieldsOf(tests: readonly TestGridCurve[]): number[] {
  return tests.map((t) => t.yield_mpa).filter((y): y is number => y !== null && Number.isFinite(y));
}

export function groupModulusMpa(tests: readonly TestGridCurve[], modulusGpa?: number | null): number | null {
  if (given(modulusGpa) && modulusGpa > 0) return modulusGpa * 1000;
  const moduli = tests.map((t) => t.modulus_gpa).filter((m): m is number => m !== null && Number.isFinite(m) && m > 0);
  return moduli.length > 0 ? median(moduli) * 1000 : null;
}

export function groupCharacteristicYield(tests: readonly TestGridCurve[], spec: ToleranceSpec, characteristicYieldMpa?: number | null): number | null {
  if (given(characteristicYieldMpa)) return characteristicYieldMpa;
  return lowerToleranceBound(yieldsOf(tests), spec)?.bound ?? null;
}

export function groupMedianYield(tests: readonly TestGridCurve[], medianYieldMpa?: number | null): number | null {
  if (given(medianYieldMpa)) return medianYieldMpa;
  const yields = yieldsOf(tests);
  return yields.length > 0 ? median(yields) : null;
}
