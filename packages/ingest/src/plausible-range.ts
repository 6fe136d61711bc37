/**
 * Plausibility bounds of a value once converted to canonical units (N, mm, mm², s, MPa, mm/mm,
 * °C, %): a value outside them is a rejection with its location, never stored. A cell such as
 * `1e306` in kN is finite as written but not once scaled (1e309 N), and values far beyond any
 * tensile test are typing or export errors, not data.
 *
 * The bounds are deliberately generous, orders of magnitude past the physical ones (from memory,
 * common practice: the largest tensile frames apply well below 1e8 N; no engineering material's
 * strength approaches 1e5 MPa = 100 GPa; fracture strains of metals stay below 2, i.e. 200 %), so
 * no real record is turned away. Curve channels may be negative (a toe, a zero offset, a little
 * compression); manifest dimensions and summary strengths must be positive (checked by the
 * reader), elongations not negative. Temperatures are bounded below by absolute zero.
 *
 * `checkRange` returns `null` when the value is finite and inside, else the message naming the
 * bound (the caller adds file, line and column).
 */

import type { Quantity } from '@fractile/curves';

/** |value| ≤ bound, in canonical units */
export const PLAUSIBLE_BOUND: Record<Quantity, { bound: number; unit: string }> = {
  time: { bound: 1e9, unit: 's' },
  force: { bound: 1e9, unit: 'N' },
  length: { bound: 1e6, unit: 'mm' },
  area: { bound: 1e10, unit: 'mm²' },
  stress: { bound: 1e5, unit: 'MPa' },
  strain: { bound: 100, unit: 'mm/mm' },
  temperature: { bound: 1e4, unit: '°C' },
  percent: { bound: 1e4, unit: '%' },
};

export function checkRange(kind: Quantity, value: number): string | null {
  const { bound, unit } = PLAUSIBLE_BOUND[kind];
  if (Number.isFinite(value) && Math.abs(value) <= bound) return null;
  const shown = Number.isFinite(value) ? value.toPrecision(4) : value > 0 ? 'beyond +1.8e308 (overflow)' : value < 0 ? 'beyond −1.8e308 (overflow)' : 'not a number';
  return `${shown} ${unit} after unit conversion is outside the plausible range ±${bound.toExponential(0)} ${unit}`;
}

/** Whether `value` lies within the bound (the fast path of the plain curve reader). */
export function inRange(kind: Quantity, value: number): boolean {
  return Math.abs(value) <= PLAUSIBLE_BOUND[kind].bound;
}
