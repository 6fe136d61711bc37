/**
 * The FE material table of a design curve: two columns, true stress against true plastic strain,
 * the form a finite-element plasticity definition takes (common practice: one row per point,
 * stress first, the first row at zero plastic strain holding the initial yield stress, plastic
 * strain strictly increasing, stress non-decreasing). No comment lines: its provenance goes to a
 * sidecar JSON (exports/export-format.ts). Stress in MPa or, on request, ksi (1 ksi =
 * 6.894757293168… MPa exactly, curves units.ts `KSI_MPA`); strain dimensionless.
 *
 * The points: the characteristic (default) or median curve over its valid range, and past it only
 * where the curve was extrapolated by a fitted law (the sidecar says from where). A curve whose
 * grid does not begin at zero plastic strain gets a first row at zero with the curve's first
 * stress (yield plateau). Points with a non-finite stress are left out; a point whose strain is
 * not above the previous one is left out too. Returns no rows for a curve with no valid range.
 */
import { KSI_MPA } from '@fractile/curves';
import type { DesignCurve } from './types.ts';

export type StressUnit = 'MPa' | 'ksi';
export const STRESS_UNITS: readonly StressUnit[] = ['MPa', 'ksi'];

export interface FeTableOptions {
  curve?: 'characteristic' | 'median';
  unit?: StressUnit;
}

export interface FeTable {
  columns: [string, string];
  /** [true stress, true plastic strain] per row */
  rows: [number, number][];
  unit: StressUnit;
  curve: 'characteristic' | 'median';
  /** plastic strain from which rows are extrapolated, or null */
  extrapolated_from: number | null;
}

export function feColumns(unit: StressUnit): [string, string] {
  return [`true_stress_${unit}`, 'true_plastic_strain'];
}

export function feTable(c: DesignCurve, opts: FeTableOptions = {}): FeTable {
  const unit = opts.unit ?? 'MPa';
  const which = opts.curve ?? 'characteristic';
  const per = unit === 'ksi' ? 1 / KSI_MPA : 1;
  const stress = which === 'median' ? c.median_mpa : c.characteristic_mpa;
  const rows: [number, number][] = [];
  const out: FeTable = { columns: feColumns(unit), rows, unit, curve: which, extrapolated_from: c.extrapolated_from };
  if (c.valid_to_plastic_strain === null) return out;
  for (let i = 0; i < c.plastic_strain.length; i++) {
    const x = c.plastic_strain[i];
    const s = stress[i];
    if (x > c.valid_to_plastic_strain && !c.extrapolated[i]) continue;
    if (!Number.isFinite(s) || !Number.isFinite(x) || x < 0) continue;
    if (rows.length > 0 && x <= rows[rows.length - 1][1]) continue;
    if (rows.length === 0 && x > 0) rows.push([s * per, 0]);
    rows.push([s * per, x]);
  }
  return out;
}
