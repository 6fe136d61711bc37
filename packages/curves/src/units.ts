/**
 * Unit conversion to the canonical store units (N, mm, s, MPa, mm/mm, mm², °C).
 *
 * Factors are the exact values of NIST SP 811 (Guide for the Use of the International System of
 * Units), Appendix B: 1 in = 25.4 mm (exact), 1 lbf = 4.4482216152605 N, 1 kip = 1000 lbf,
 * 1 psi = 1 lbf/in² ≈ 6.894757293168e-3 MPa, 1 ksi = 1000 psi ≈ 6.894757293168 MPa (derived from the
 * lbf and inch factors, not rounded), t[°C] = (t[°F] − 32)/1.8,
 * t[°C] = T[K] − 273.15.
 *
 * Unit symbols are case-sensitive, as SI prefixes and symbols are (the SI Brochure, 9th edition,
 * 2019, §5: `mPa` is the millipascal, `MPa` the megapascal; `Mm` is the megametre): they are
 * matched exactly after trimming, in the spellings listed below (the SI symbol, and the customary
 * `N/mm2`, `mm^2`, `um`, `degC`, `lbf`, `kip`, `psi`, `ksi`, `in` spellings). An unknown unit —
 * including a known one in the wrong case — returns `null`, never a guess; `caseHint` names the
 * unit meant where only the case differs.
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

const C_DEF: UnitDef = { quantity: 'temperature', factor: 1, offset: 0, canonical: 'C' };
const F_DEF: UnitDef = { quantity: 'temperature', factor: 1 / 1.8, offset: -32 / 1.8, canonical: 'C' };

const UNITS: Record<string, UnitDef> = {
  // force → N
  N: linear('force', 'N', 1),
  kN: linear('force', 'N', 1000),
  lbf: linear('force', 'N', LBF_N),
  kip: linear('force', 'N', 1000 * LBF_N),
  kips: linear('force', 'N', 1000 * LBF_N),
  // length → mm
  mm: linear('length', 'mm', 1),
  m: linear('length', 'mm', 1000),
  um: linear('length', 'mm', 1e-3),
  'µm': linear('length', 'mm', 1e-3),
  'μm': linear('length', 'mm', 1e-3),
  in: linear('length', 'mm', IN_MM),
  // area → mm²
  mm2: linear('area', 'mm2', 1),
  'mm^2': linear('area', 'mm2', 1),
  'mm²': linear('area', 'mm2', 1),
  in2: linear('area', 'mm2', IN_MM * IN_MM),
  'in^2': linear('area', 'mm2', IN_MM * IN_MM),
  'in²': linear('area', 'mm2', IN_MM * IN_MM),
  // stress → MPa
  MPa: linear('stress', 'MPa', 1),
  'N/mm2': linear('stress', 'MPa', 1),
  'N/mm^2': linear('stress', 'MPa', 1),
  'N/mm²': linear('stress', 'MPa', 1),
  GPa: linear('stress', 'MPa', 1000),
  kPa: linear('stress', 'MPa', 1e-3),
  Pa: linear('stress', 'MPa', 1e-6),
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
  C: C_DEF,
  '°C': C_DEF,
  degC: C_DEF,
  F: F_DEF,
  '°F': F_DEF,
  degF: F_DEF,
  K: { quantity: 'temperature', factor: 1, offset: -273.15, canonical: 'C' },
};

/** The unit's definition, or `null` if the unit is not known. */
export function lookupUnit(unit: string): UnitDef | null {
  return Object.hasOwn(UNITS, unit.trim()) ? UNITS[unit.trim()] : null;
}

/** The listed spelling that differs from `unit` only in case (`mpa` → `MPa`), or `null`. */
export function caseHint(unit: string): string | null {
  const lower = unit.trim().toLowerCase();
  return Object.keys(UNITS).find((k) => k.toLowerCase() === lower && k !== unit.trim()) ?? null;
}

/**
 * The definition of `unit` if it measures `quantity`, else `null` (unknown, or of another
 * quantity: `%` counts as a strain unit and also as a plain percentage).
 */
export function unitFor(quantity: Quantity, unit: string): UnitDef | null {
  const key = unit.trim();
  if (quantity === 'percent') return key === '%' ? { quantity: 'percent', factor: 1, offset: 0, canonical: '%' } : null;
  const def = lookupUnit(key);
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
