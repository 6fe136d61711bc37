/**
 * Unit conversion to the canonical store units (N, mm, s, MPa, mm/mm, mm², °C).
 *
 * Factors are the exact values of NIST SP 811 (Guide for the Use of the International System of
 * Units), Appendix B: 1 in = 25.4 mm (exact), 1 lbf = 4.4482216152605 N, 1 kip = 1000 lbf,
 * 1 psi = 1 lbf/in² ≈ 6.894757293168e-3 MPa, 1 ksi = 1000 psi ≈ 6.894757293168 MPa (derived from the
 * lbf and inch factors, not rounded), t[°C] = (t[°F] − 32)/1.8,
 * t[°C] = T[K] − 273.15.
 *
 * Unit names are matched case-insensitively after trimming; an unknown unit returns `null`, never
 * a guess.
 */

export type Quantity = 'force' | 'length' | 'area' | 'stress' | 'strain' | 'time' | 'temperature' | 'percent';

export interface UnitDef {
  quantity: Quantity;
  /** canonical = value · factor + offset */
  factor: number;
  offset: number;
  /** canonical unit this converts to */
  canonical: string;
}

export const LBF_N = 4.4482216152605;
export const IN_MM = 25.4;
/** 1 ksi = 1000 lbf/in², derived exactly from the two factors above (6.894757293168361…). */
export const KSI_MPA = (1000 * LBF_N) / (IN_MM * IN_MM);

const linear = (quantity: Quantity, canonical: string, factor: number): UnitDef => ({ quantity, factor, offset: 0, canonical });

const UNITS: Record<string, UnitDef> = {
  // force → N
  n: linear('force', 'N', 1),
  kn: linear('force', 'N', 1000),
  lbf: linear('force', 'N', LBF_N),
  kip: linear('force', 'N', 1000 * LBF_N),
  kips: linear('force', 'N', 1000 * LBF_N),
  // length → mm
  mm: linear('length', 'mm', 1),
  m: linear('length', 'mm', 1000),
  um: linear('length', 'mm', 1e-3),
  in: linear('length', 'mm', IN_MM),
  // area → mm²
  mm2: linear('area', 'mm2', 1),
  'mm^2': linear('area', 'mm2', 1),
  'mm²': linear('area', 'mm2', 1),
  in2: linear('area', 'mm2', IN_MM * IN_MM),
  'in^2': linear('area', 'mm2', IN_MM * IN_MM),
  'in²': linear('area', 'mm2', IN_MM * IN_MM),
  // stress → MPa
  mpa: linear('stress', 'MPa', 1),
  'n/mm2': linear('stress', 'MPa', 1),
  'n/mm^2': linear('stress', 'MPa', 1),
  'n/mm²': linear('stress', 'MPa', 1),
  gpa: linear('stress', 'MPa', 1000),
  kpa: linear('stress', 'MPa', 1e-3),
  pa: linear('stress', 'MPa', 1e-6),
  psi: linear('stress', 'MPa', KSI_MPA / 1000),
  ksi: linear('stress', 'MPa', KSI_MPA),
  // strain → mm/mm
  'mm/mm': linear('strain', 'mm/mm', 1),
  'in/in': linear('strain', 'mm/mm', 1),
  '%': linear('strain', 'mm/mm', 0.01),
  // time → s
  s: linear('time', 's', 1),
  ms: linear('time', 's', 1e-3),
  min: linear('time', 's', 60),
  // temperature → °C
  c: { quantity: 'temperature', factor: 1, offset: 0, canonical: 'C' },
  '°c': { quantity: 'temperature', factor: 1, offset: 0, canonical: 'C' },
  degc: { quantity: 'temperature', factor: 1, offset: 0, canonical: 'C' },
  f: { quantity: 'temperature', factor: 1 / 1.8, offset: -32 / 1.8, canonical: 'C' },
  '°f': { quantity: 'temperature', factor: 1 / 1.8, offset: -32 / 1.8, canonical: 'C' },
  degf: { quantity: 'temperature', factor: 1 / 1.8, offset: -32 / 1.8, canonical: 'C' },
  k: { quantity: 'temperature', factor: 1, offset: -273.15, canonical: 'C' },
};

/** The unit's definition, or `null` if the unit is not known. */
export function lookupUnit(unit: string): UnitDef | null {
  return UNITS[unit.trim().toLowerCase()] ?? null;
}

/**
 * The definition of `unit` if it measures `quantity`, else `null` (unknown, or of another
 * quantity: `%` counts as a strain unit and also as a plain percentage).
 */
export function unitFor(quantity: Quantity, unit: string): UnitDef | null {
  const key = unit.trim().toLowerCase();
  if (quantity === 'percent') return key === '%' ? { quantity: 'percent', factor: 1, offset: 0, canonical: '%' } : null;
  const def = UNITS[key];
  return def && def.quantity === quantity ? def : null;
}

/** Converts one value to canonical units. */
export function toCanonical(value: number, def: UnitDef): number {
  return value * def.factor + def.offset;
}

/** Converts a whole channel in place-free fashion (returns a new Float64Array). */
export function channelToCanonical(values: ArrayLike<number>, def: UnitDef): Float64Array {
  const out = new Float64Array(values.length);
  for (let i = 0; i < values.length; i++) out[i] = values[i] * def.factor + def.offset;
  return out;
}
