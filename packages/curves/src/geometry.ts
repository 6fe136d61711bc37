/**
 * Original cross-sectional area S0 of a tensile specimen (ISO 6892-1 symbol S0), in mm².
 *
 * - `round`: S0 = π·d²/4 from the diameter d;
 * - `flat`: S0 = a·b from thickness a and width b;
 * - `area`: S0 given directly.
 *
 * Returns an error value (never NaN) when a needed dimension is missing, zero, negative or not
 * finite.
 */

export type SpecimenShape = 'round' | 'flat' | 'area';
export const SPECIMEN_SHAPES: readonly SpecimenShape[] = ['round', 'flat', 'area'];

export interface SpecimenDims {
  shape: SpecimenShape;
  diameterMm?: number | null;
  thicknessMm?: number | null;
  widthMm?: number | null;
  areaMm2?: number | null;
}

export type AreaResult = { ok: true; areaMm2: number } | { ok: false; code: 'missing_dimension' | 'nonpositive_dimension'; field: string; message: string };

function check(field: string, v: number | null | undefined): AreaResult | null {
  if (v === null || v === undefined || Number.isNaN(v)) return { ok: false, code: 'missing_dimension', field, message: `${field} is required for this shape` };
  if (!Number.isFinite(v) || v <= 0) return { ok: false, code: 'nonpositive_dimension', field, message: `${field} must be a positive finite number, got ${v}` };
  return null;
}

export function crossSectionArea(d: SpecimenDims): AreaResult {
  switch (d.shape) {
    case 'round': {
      const e = check('diameter', d.diameterMm);
      return e ?? { ok: true, areaMm2: (Math.PI * d.diameterMm! * d.diameterMm!) / 4 };
    }
    case 'flat': {
      const e = check('thickness', d.thicknessMm) ?? check('width', d.widthMm);
      return e ?? { ok: true, areaMm2: d.thicknessMm! * d.widthMm! };
    }
    case 'area': {
      const e = check('area', d.areaMm2);
      return e ?? { ok: true, areaMm2: d.areaMm2! };
    }
  }
}
