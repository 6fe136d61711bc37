/**
 * Which specification limit applies to which property: yield min/max to the yield of the grade's
 * definition, tensile min/max to Rm, the Y/T maximum to the yield-to-tensile ratio, the elongation
 * minimum to A (elongation after fracture).
 */
import type { SpecLimits } from '../catalog.ts';
import type { PropertyKey } from '../properties.ts';

export interface PropertyLimits {
  lower: number | null;
  upper: number | null;
}

export function limitsFor(property: PropertyKey, spec: SpecLimits | null): PropertyLimits {
  const none = { lower: null, upper: null };
  if (!spec) return none;
  switch (property) {
    case 'yield_mpa':
      return { lower: spec.yield_min_mpa ?? null, upper: spec.yield_max_mpa ?? null };
    case 'rm_mpa':
      return { lower: spec.tensile_min_mpa ?? null, upper: spec.tensile_max_mpa ?? null };
    case 'yt_ratio':
      return { lower: null, upper: spec.yt_max ?? null };
    case 'a_pct':
      return { lower: spec.elongation_min_pct ?? null, upper: null };
    default:
      return none;
  }
}
