/**
 * Characteristic true stress – true plastic strain curve of a group, on the group's common grid.
 * The steps, each a function of its own file:
 *
 *  1. the usable tests (`usable-tests.ts`);
 *  2. pointwise counts, medians and lower tolerance bounds (ISO 16269-6; `pointwise-bounds.ts`);
 *  3. the valid range (`validity-range.ts`);
 *  4. the group's modulus and yields (`group-values.ts`);
 *  5. the lower band: the pointwise bounds, or a simultaneous band over the valid range
 *     (`simultaneous-band.ts`) when `band: 'simultaneous'`;
 *  6. the valid part made non-decreasing and started at the yields — median by isotonic
 *     regression, characteristic as the largest non-decreasing curve below the band, held at or
 *     below the median (`valid-part.ts`);
 *  7. optionally, past the valid range, a fitted hardening law (`extend-curves.ts`);
 *  8. engineering counterparts (`engineering-counterpart.ts`) and idealizations (`idealize-curve.ts`).
 *
 * Units: MPa and mm/mm; E in MPa in the output (input GPa). Degenerate input (no valid point —
 * e.g. fewer tests than `minTestsPerPoint`) returns a curve with empty arrays, `idealized: null`
 * and a warning saying why; options out of range throw a `DesignInputError`.
 */
import { normalToleranceFactor } from '@fractile/stats';
import { bandStatement } from './band-statement.ts';
import { engineeringCounterpart } from './engineering-counterpart.ts';
import { extendCurves } from './extend-curves.ts';
import { groupCharacteristicYield, groupMedianYield, groupModulusMpa } from './group-values.ts';
import { idealizeCurve } from './idealize-curve.ts';
import type { ToleranceSpec } from './lower-tolerance-bound.ts';
import { pointwiseBounds } from './pointwise-bounds.ts';
import { designProvenance } from './provenance.ts';
import { simultaneousLowerBand } from './simultaneous-band.ts';
import type { BandKind, DesignCurve, DesignOptions, ProvenanceInput, SimultaneousBandInfo, TestGridCurve } from './types.ts';
import { usableTests, type UsableTest } from './usable-tests.ts';
import { validPart } from './valid-part.ts';
import { validityRange, type ValidityRange } from './validity-range.ts';

export class DesignInputError extends Error {
  constructor(
    readonly code: string,
    message: string,
  ) {
    super(message);
    this.name = 'DesignInputError';
  }
}

export interface CharacteristicCurveInput {
  group: Record<string, string>;
  grid: number[];
  tests: TestGridCurve[];
  /** The group's characteristic yield from the stats stage; computed from the tests if absent. */
  characteristicYieldMpa?: number | null;
  /** The group's median yield, where the median curve starts; the median of the tests' yields if absent. */
  medianYieldMpa?: number | null;
  /** The group's modulus; the median of the tests' moduli if absent. */
  modulusGpa?: number | null;
}

/** Seed of the simultaneous band's simulation (fixed: the same input gives the same curve). */
export const BAND_SEED = 20260314;

function checkOptions(grid: readonly number[], opts: DesignOptions): void {
  if (!(opts.coverage > 0 && opts.coverage < 1)) throw new DesignInputError('bad_coverage', `coverage must lie in (0, 1), got ${opts.coverage}`);
  if (!(opts.confidence > 0 && opts.confidence < 1)) throw new DesignInputError('bad_confidence', `confidence must lie in (0, 1), got ${opts.confidence}`);
  if (opts.model !== 'normal' && opts.model !== 'lognormal') throw new DesignInputError('bad_model', `model must be normal or lognormal, got ${String(opts.model)}`);
  if (opts.extrapolate !== null && !['swift', 'voce', 'hollomon'].includes(opts.extrapolate)) throw new DesignInputError('bad_law', `extrapolation law must be swift, voce or hollomon, got ${String(opts.extrapolate)}`);
  if (!Number.isInteger(opts.multilinearPoints) || opts.multilinearPoints < 2) throw new DesignInputError('bad_multilinear_points', `multilinear points must be an integer ≥ 2, got ${opts.multilinearPoints}`);
  if (!(opts.minTestsPerPoint >= 1)) throw new DesignInputError('bad_min_tests', `minimum tests per point must be ≥ 1, got ${opts.minTestsPerPoint}`);
  if (opts.extrapolateTo !== undefined && !Number.isFinite(opts.extrapolateTo)) throw new DesignInputError('bad_extrapolate_to', `extrapolate-to must be a finite plastic strain, got ${opts.extrapolateTo}`);
  if (opts.band !== undefined && opts.band !== 'pointwise' && opts.band !== 'simultaneous') throw new DesignInputError('bad_band', `band must be pointwise or simultaneous, got ${String(opts.band)}`);
  if (opts.bandSimulations !== undefined && !(Number.isInteger(opts.bandSimulations) && opts.bandSimulations >= 100)) throw new DesignInputError('bad_band_simulations', `band simulations must be an integer ≥ 100, got ${opts.bandSimulations}`);
  for (let i = 0; i < grid.length; i++) {
    if (!Number.isFinite(grid[i]) || grid[i] < 0) throw new DesignInputError('bad_grid', `grid point ${i} must be a finite plastic strain ≥ 0, got ${grid[i]}`);
    if (i > 0 && !(grid[i] > grid[i - 1])) throw new DesignInputError('bad_grid', `grid must increase strictly (point ${i}: ${grid[i]} after ${grid[i - 1]})`);
  }
}

/** Warnings on the size of the group. */
function sizeWarnings(n: number, opts: DesignOptions, spec: ToleranceSpec): string[] {
  if (n < Math.max(2, opts.minTestsPerPoint)) {
    return [`few_tests: ${n} test curve(s) in the group, fewer than the ${Math.max(2, Math.ceil(opts.minTestsPerPoint))} a point needs; tolerance bounds from so few tests are wide or undefined`];
  }
  if (n < 10) return [`small_sample: only ${n} test curves; the tolerance factor is large (k = ${normalToleranceFactor(n, spec.coverage, spec.confidence).toFixed(3)})`];
  return [];
}

/** Warnings on what ends the valid range. */
function rangeWarnings(grid: readonly number[], validity: ValidityRange, opts: DesignOptions): string[] {
  const out: string[] = [];
  if (validity.characteristicUniform === null) out.push('no_uniform_strain: fewer than two uniform plastic strains known; the valid range is set by the curves per point only');
  else if (validity.characteristicUniform <= (grid[0] ?? 0)) out.push(`uniform_strain_low: the characteristic uniform plastic strain ${validity.characteristicUniform.toPrecision(4)} does not reach past the start of the grid`);
  if (validity.limitedBy === 'tests-per-point' && validity.lastIndex >= 0) {
    out.push(`range_by_count: the valid range ends at plastic strain ${grid[validity.lastIndex]} where fewer than ${Math.max(2, Math.ceil(opts.minTestsPerPoint))} curves remain`);
  }
  return out;
}

/** The lower band over the valid part (points 0 … last): pointwise bounds or the simultaneous band. */
function lowerBand(kind: BandKind, tests: readonly UsableTest[], pointwise: readonly number[], last: number, opts: DesignOptions): { kind: BandKind; band: number[]; info: SimultaneousBandInfo | null } {
  const own = { kind: 'pointwise' as const, band: pointwise.slice(0, last + 1), info: null };
  if (kind === 'pointwise') return own;
  const simulations = opts.bandSimulations ?? 2000;
  const sim = simultaneousLowerBand(tests.map((t) => t.stress.slice(0, last + 1)), last + 1, { coverage: opts.coverage, confidence: opts.confidence, model: opts.model, simulations, seed: BAND_SEED });
  if (!sim?.bound.every(Number.isFinite)) return own;
  return {
    kind,
    band: sim.bound,
    info: { critical_value: sim.criticalValue, max_pointwise_factor: sim.maxPointwiseFactor, simulations, components: sim.components, seed: BAND_SEED },
  };
}

export function characteristicCurve(input: CharacteristicCurveInput, opts: DesignOptions, provenance: ProvenanceInput): DesignCurve {
  const grid = input.grid;
  checkOptions(grid, opts);
  const spec: ToleranceSpec = { coverage: opts.coverage, confidence: opts.confidence, model: opts.model };
  const requested: BandKind = opts.band ?? 'pointwise';

  // 1–3: tests, pointwise statistics, valid range
  const usable = usableTests(input.tests, grid.length);
  const tests = usable.tests;
  const n = tests.length;
  const warnings = [...usable.warnings, ...sizeWarnings(n, opts, spec)];
  const prov = designProvenance(input.group, tests.map((t) => t.id), opts, provenance);
  const pw = pointwiseBounds(grid.length, tests, spec);
  if (pw.lognormalUndefined) warnings.push('lognormal_nonpositive: a stress ≤ 0 leaves the lognormal bound undefined at some points');
  // a point without a bound ends the range as surely as a point without curves
  const usableCounts = pw.counts.map((c, i) => (Number.isFinite(pw.bound[i]) ? c : 0));
  const validity = validityRange(grid, usableCounts, tests.map((t) => t.src.uniform_plastic_strain), spec, opts.minTestsPerPoint);
  warnings.push(...rangeWarnings(grid, validity, opts));

  // 4: group values
  const sources = tests.map((t) => t.src);
  const eMpa = groupModulusMpa(sources, input.modulusGpa);
  if (eMpa === null) warnings.push('no_modulus: no modulus known; engineering counterparts and elastic parts are left out');
  let charYield = groupCharacteristicYield(sources, spec, input.characteristicYieldMpa);

  const L = validity.lastIndex;
  const head = (kind: BandKind) => ({ group: { ...input.group }, n, band: kind, band_statement: bandStatement(kind, opts.coverage, opts.confidence) });
  if (L < 0) {
    warnings.push('no_valid_range: no grid point carries enough curves for a tolerance bound; no characteristic curve');
    return {
      ...head(requested), simultaneous: null, plastic_strain: [], median_mpa: [], characteristic_mpa: [], n_at_point: [], valid_to_plastic_strain: null,
      characteristic_uniform_plastic_strain: validity.characteristicUniform, extrapolated_from: null, extrapolation: null, extrapolated: [], e_mpa: eMpa,
      characteristic_yield_mpa: charYield, median_yield_mpa: null, engineering: null, idealized: null, warnings, provenance: prov,
    };
  }
  if (charYield === null) {
    charYield = pw.bound[0];
    warnings.push('no_yield: fewer than two yields known; the characteristic yield is taken as the curve’s own bound at its start');
  }
  const medYield = groupMedianYield(sources, input.medianYieldMpa);

  // 5–6: band and valid part
  const x = grid.slice(0, L + 1);
  const counts = pw.counts.slice(0, L + 1);
  const lower = lowerBand(requested, tests, pw.bound, L, opts);
  const kind = lower.kind;
  if (kind !== requested) warnings.push('band_pointwise: no simultaneous band could be formed over the valid range; the curve is the pointwise bound');
  const valid = validPart(x, counts, pw.median.slice(0, L + 1), lower.band, kind, charYield, medYield);
  warnings.push(...valid.warnings);

  // 7: extrapolation
  const ext = extendCurves(grid, L, x, valid.median, valid.characteristic, counts, opts.extrapolate, opts.extrapolateTo, eMpa);
  warnings.push(...ext.warnings);

  // 8: engineering counterparts and idealizations
  const engM = engineeringCounterpart(ext.plastic, ext.median, eMpa);
  const engC = engineeringCounterpart(ext.plastic, ext.characteristic, eMpa);
  // a simultaneous band starts at or below the characteristic yield; its idealizations start with it
  const idealYield = kind === 'simultaneous' ? valid.characteristic[0] : charYield;
  const ideal = idealizeCurve({ plastic: x, characteristic: valid.characteristic }, { plastic: ext.plastic, characteristic: ext.characteristic, extrapolated: ext.extrapolated }, idealYield, eMpa, opts.multilinearPoints);
  warnings.push(...ideal.warnings);

  return {
    ...head(kind),
    simultaneous: lower.info,
    plastic_strain: ext.plastic,
    median_mpa: ext.median,
    characteristic_mpa: ext.characteristic,
    n_at_point: ext.counts,
    valid_to_plastic_strain: x[L],
    characteristic_uniform_plastic_strain: validity.characteristicUniform,
    extrapolated_from: ext.extrapolatedFrom,
    extrapolation: ext.extrapolation,
    extrapolated: ext.extrapolated,
    e_mpa: eMpa,
    characteristic_yield_mpa: charYield,
    median_yield_mpa: medYield,
    engineering: engM && engC ? { median: engM, characteristic: engC } : null,
    idealized: ideal.idealized,
    warnings,
    provenance: prov,
  };
}
