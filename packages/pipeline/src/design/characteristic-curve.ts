/**
 * Characteristic true stress – true plastic strain curve of a group, on the group's common grid.
 *
 * Method (per grid point, ISO 16269-6 one-sided tolerance limit):
 *  1. The nominal curve is the pointwise median of the tests' stresses; the raw characteristic
 *     curve is the pointwise lower tolerance bound (normal x̄ − k·s, or lognormal), with the exact
 *     factor k for the number of curves at that point.
 *  2. Both are made non-decreasing by isotonic regression (pool-adjacent-violators, weights = curves
 *     per point) over the valid range (see `validity-range.ts`).
 *  3. Each curve starts at its yield — the median curve at the median yield, the characteristic
 *     curve at the characteristic yield (passed in, or the median / tolerance bound of the tests'
 *     yields) — and is held at or above it: the first point of a plastic curve is the yield (common
 *     practice for nonlinear analysis input; with an offset yield, e.g. Rp0.2, the recorded stress
 *     at εp = 0 is the end of proportionality, below the yield). The characteristic curve is then
 *     held at or below the median; min/max of non-decreasing sequences stay non-decreasing.
 *  4. Optionally, past the valid range, a hardening law fitted to each curve (over the valid range
 *     without its first quarter: the tail the extrapolation continues) extends it, joined at the
 *     last valid point; those points are flagged `extrapolated`.
 * Idealizations (elastic–perfectly plastic, bilinear, multilinear, Ramberg–Osgood) are fitted to
 * the valid part (the multilinear one to the whole output, flags kept), and engineering
 * counterparts follow from E.
 *
 * Units: MPa and mm/mm; E in MPa in the output (input GPa). Degenerate input (no valid point —
 * e.g. fewer tests than `minTestsPerPoint`) returns a curve with empty arrays, `idealized: null`
 * and a warning saying why; options out of range throw a `DesignInputError`.
 */
import { isotonicNonDecreasing, normalToleranceFactor } from '@fractile/stats';
import { median } from 'simple-statistics';
import { engineeringCounterpart } from './engineering-counterpart.ts';
import { extrapolateJoined, extrapolationPoints, fitLaw, fitWindowStart } from './extrapolate-law.ts';
import { fitBilinearHardening } from './idealize-bilinear.ts';
import { multilinearBreakpoints } from './idealize-multilinear.ts';
import { fitRambergOsgoodPlastic, interpolateAt, RO_OFFSET } from './idealize-ramberg-osgood.ts';
import { lowerToleranceBound, type ToleranceSpec } from './lower-tolerance-bound.ts';
import { designProvenance } from './provenance.ts';
import type { DesignCurve, DesignOptions, IdealizedCurves, ProvenanceInput, TestGridCurve } from './types.ts';
import { validityRange } from './validity-range.ts';

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

/** Plastic strain beyond which holding the curve at the characteristic yield is reported (mm/mm). */
const YIELD_LIFT_WARN = 0.005;
/** Relative gap by which a characteristic yield below the curve's own start is reported. */
const YIELD_BELOW_WARN = 0.02;

function checkOptions(grid: readonly number[], opts: DesignOptions): void {
  if (!(opts.coverage > 0 && opts.coverage < 1)) throw new DesignInputError('bad_coverage', `coverage must lie in (0, 1), got ${opts.coverage}`);
  if (!(opts.confidence > 0 && opts.confidence < 1)) throw new DesignInputError('bad_confidence', `confidence must lie in (0, 1), got ${opts.confidence}`);
  if (opts.model !== 'normal' && opts.model !== 'lognormal') throw new DesignInputError('bad_model', `model must be normal or lognormal, got ${String(opts.model)}`);
  if (opts.extrapolate !== null && !['swift', 'voce', 'hollomon'].includes(opts.extrapolate)) throw new DesignInputError('bad_law', `extrapolation law must be swift, voce or hollomon, got ${String(opts.extrapolate)}`);
  if (!Number.isInteger(opts.multilinearPoints) || opts.multilinearPoints < 2) throw new DesignInputError('bad_multilinear_points', `multilinear points must be an integer ≥ 2, got ${opts.multilinearPoints}`);
  if (!(opts.minTestsPerPoint >= 1)) throw new DesignInputError('bad_min_tests', `minimum tests per point must be ≥ 1, got ${opts.minTestsPerPoint}`);
  if (opts.extrapolateTo !== undefined && !Number.isFinite(opts.extrapolateTo)) throw new DesignInputError('bad_extrapolate_to', `extrapolate-to must be a finite plastic strain, got ${opts.extrapolateTo}`);
  for (let i = 0; i < grid.length; i++) {
    if (!Number.isFinite(grid[i]) || grid[i] < 0) throw new DesignInputError('bad_grid', `grid point ${i} must be a finite plastic strain ≥ 0, got ${grid[i]}`);
    if (i > 0 && !(grid[i] > grid[i - 1])) throw new DesignInputError('bad_grid', `grid must increase strictly (point ${i}: ${grid[i]} after ${grid[i - 1]})`);
  }
}

export function characteristicCurve(input: CharacteristicCurveInput, opts: DesignOptions, provenance: ProvenanceInput): DesignCurve {
  const grid = input.grid;
  checkOptions(grid, opts);
  const warnings: string[] = [];
  const spec: ToleranceSpec = { coverage: opts.coverage, confidence: opts.confidence, model: opts.model };

  // usable tests: stresses on this grid with at least one finite value
  const seen = new Set<string>();
  const mismatched: string[] = [];
  const empty: string[] = [];
  const duplicates: string[] = [];
  const tests: { id: string; stress: (number | null)[]; src: TestGridCurve }[] = [];
  for (const t of input.tests) {
    if (t.stress_mpa.length !== grid.length) {
      mismatched.push(t.test_id);
      continue;
    }
    const stress = t.stress_mpa.map((v) => (v !== null && Number.isFinite(v) ? v : null));
    if (!stress.some((v) => v !== null)) {
      empty.push(t.test_id);
      continue;
    }
    if (seen.has(t.test_id)) duplicates.push(t.test_id);
    seen.add(t.test_id);
    tests.push({ id: t.test_id, stress, src: t });
  }
  const list = (ids: string[]) => ids.slice(0, 5).join(', ') + (ids.length > 5 ? `, … (${ids.length} in all)` : '');
  if (mismatched.length > 0) warnings.push(`grid_mismatch: ${mismatched.length} test(s) with a stress count other than the ${grid.length} grid points left out: ${list(mismatched)}`);
  if (empty.length > 0) warnings.push(`no_curve: ${empty.length} test(s) without stress on the grid left out: ${list(empty)}`);
  if (duplicates.length > 0) warnings.push(`duplicate_test: test id(s) appearing more than once: ${list(duplicates)}`);
  const n = tests.length;
  const prov = designProvenance(input.group, tests.map((t) => t.id), opts, provenance);
  if (n < Math.max(2, opts.minTestsPerPoint)) {
    warnings.push(`few_tests: ${n} test curve(s) in the group, fewer than the ${Math.max(2, Math.ceil(opts.minTestsPerPoint))} a point needs; tolerance bounds from so few tests are wide or undefined`);
  } else if (n < 10) {
    warnings.push(`small_sample: only ${n} test curves; the tolerance factor is large (k = ${normalToleranceFactor(n, spec.coverage, spec.confidence).toFixed(3)})`);
  }

  // pointwise counts, medians and raw bounds
  const counts: number[] = [];
  const medRaw: number[] = [];
  const boundRaw: number[] = [];
  let lognormalDropped = false;
  for (let i = 0; i < grid.length; i++) {
    const vals: number[] = [];
    for (const t of tests) {
      const v = t.stress[i];
      if (v !== null) vals.push(v);
    }
    counts.push(vals.length);
    medRaw.push(vals.length > 0 ? median(vals) : NaN);
    const b = lowerToleranceBound(vals, spec);
    if (!b && vals.length >= 2 && spec.model === 'lognormal') lognormalDropped = true;
    boundRaw.push(b ? b.bound : NaN);
  }
  if (lognormalDropped) warnings.push('lognormal_nonpositive: a stress ≤ 0 leaves the lognormal bound undefined at some points');
  // a point without a bound ends the range as surely as a point without curves
  const usableCounts = counts.map((c, i) => (Number.isFinite(boundRaw[i]) ? c : 0));

  const validity = validityRange(grid, usableCounts, tests.map((t) => t.src.uniform_plastic_strain), spec, opts.minTestsPerPoint);
  if (validity.characteristicUniform === null) warnings.push('no_uniform_strain: fewer than two uniform plastic strains known; the valid range is set by the curves per point only');
  else if (validity.characteristicUniform <= (grid[0] ?? 0)) warnings.push(`uniform_strain_low: the characteristic uniform plastic strain ${validity.characteristicUniform.toPrecision(4)} does not reach past the start of the grid`);
  if (validity.limitedBy === 'tests-per-point' && validity.lastIndex >= 0) {
    warnings.push(`range_by_count: the valid range ends at plastic strain ${grid[validity.lastIndex]} where fewer than ${Math.max(2, Math.ceil(opts.minTestsPerPoint))} curves remain`);
  }

  // modulus
  let eMpa: number | null = null;
  if (input.modulusGpa !== undefined && input.modulusGpa !== null && Number.isFinite(input.modulusGpa) && input.modulusGpa > 0) eMpa = input.modulusGpa * 1000;
  else {
    const moduli = tests.map((t) => t.src.modulus_gpa).filter((m): m is number => m !== null && Number.isFinite(m) && m > 0);
    if (moduli.length > 0) eMpa = median(moduli) * 1000;
    else warnings.push('no_modulus: no modulus known; engineering counterparts and elastic parts are left out');
  }

  // characteristic yield
  let charYield: number | null = null;
  if (input.characteristicYieldMpa !== undefined && input.characteristicYieldMpa !== null && Number.isFinite(input.characteristicYieldMpa)) charYield = input.characteristicYieldMpa;
  else {
    const yields = tests.map((t) => t.src.yield_mpa).filter((y): y is number => y !== null && Number.isFinite(y));
    const b = lowerToleranceBound(yields, spec);
    if (b) charYield = b.bound;
  }

  const L = validity.lastIndex;
  if (L < 0) {
    warnings.push('no_valid_range: no grid point carries enough curves for a tolerance bound; no characteristic curve');
    return {
      group: { ...input.group },
      n,
      plastic_strain: [],
      median_mpa: [],
      characteristic_mpa: [],
      n_at_point: [],
      valid_to_plastic_strain: null,
      characteristic_uniform_plastic_strain: validity.characteristicUniform,
      extrapolated_from: null,
      extrapolation: null,
      extrapolated: [],
      e_mpa: eMpa,
      characteristic_yield_mpa: charYield,
      median_yield_mpa: null,
      engineering: null,
      idealized: null,
      warnings,
      provenance: prov,
    };
  }

  if (charYield === null) {
    charYield = boundRaw[0];
    warnings.push('no_yield: fewer than two yields known; the characteristic yield is taken as the curve’s own bound at its start');
  }
  let medYield: number | null = null;
  if (input.medianYieldMpa !== undefined && input.medianYieldMpa !== null && Number.isFinite(input.medianYieldMpa)) medYield = input.medianYieldMpa;
  else {
    const yields = tests.map((t) => t.src.yield_mpa).filter((y): y is number => y !== null && Number.isFinite(y));
    if (yields.length > 0) medYield = median(yields);
  }

  // valid part: isotonic; each curve starts at its yield (median / characteristic) and is held at
  // or above it; the characteristic curve is held at or below the median
  const x = grid.slice(0, L + 1);
  const w = counts.slice(0, L + 1);
  const startAt = (curve: number[], y: number | null): number[] => (y === null ? curve : curve.map((v, i) => (i === 0 ? y : Math.max(v, y))));
  const med = startAt(Array.from(isotonicNonDecreasing(medRaw.slice(0, L + 1), w)), medYield);
  const iso = Array.from(isotonicNonDecreasing(boundRaw.slice(0, L + 1), w));
  const y0 = charYield;
  const lifted = startAt(iso, y0);
  let liftedTo = -1;
  for (let i = 1; i <= L; i++) if (iso[i] < y0) liftedTo = i;
  if (liftedTo >= 0 && x[liftedTo] - x[0] > YIELD_LIFT_WARN) {
    warnings.push(
      `yield_above_curve: the characteristic yield ${y0.toFixed(1)} MPa lies above the curves’ own bound up to plastic strain ${x[liftedTo]}; the curve is held at the yield there`,
    );
  }
  if (y0 < boundRaw[0] * (1 - YIELD_BELOW_WARN)) {
    warnings.push(`yield_below_curve: the characteristic yield ${y0.toFixed(1)} MPa lies more than ${YIELD_BELOW_WARN * 100} % below the curves’ own bound at the start (${boundRaw[0].toFixed(1)} MPa)`);
  }
  let clampedToMedian = false;
  const chr = lifted.map((v, i) => {
    if (v > med[i]) {
      clampedToMedian = true;
      return med[i];
    }
    return v;
  });
  if (clampedToMedian) warnings.push('above_median: the bound came out above the median at some points and was held at the median');

  // extrapolation
  const plastic = [...x];
  const medOut = [...med];
  const chrOut = [...chr];
  const nAt = [...w];
  const flags = x.map(() => false);
  let extrapolatedFrom: number | null = null;
  let extrapolation: DesignCurve['extrapolation'] = null;
  if (opts.extrapolate !== null) {
    const target = opts.extrapolateTo ?? grid[grid.length - 1];
    const at = extrapolationPoints(grid, L, target);
    if (at.length === 0) {
      warnings.push(`nothing_to_extrapolate: the valid range already reaches plastic strain ${target}`);
    } else {
      const iFit = fitWindowStart(x);
      const fitC = fitLaw(opts.extrapolate, x.slice(iFit), chr.slice(iFit), eMpa);
      const fitM = fitLaw(opts.extrapolate, x.slice(iFit), med.slice(iFit), eMpa);
      if (!fitC || !fitM) {
        warnings.push(`extrapolation_failed: the ${opts.extrapolate} law could not be fitted to the valid part; no extrapolation`);
      } else {
        const ec = extrapolateJoined(fitC, x[L], chr[L], at);
        const em = extrapolateJoined(fitM, x[L], med[L], at);
        let prev = chr[L];
        for (let j = 0; j < at.length; j++) {
          // min of two non-decreasing sequences stays non-decreasing
          const c = Math.max(prev, Math.min(ec[j], em[j]));
          prev = c;
          plastic.push(at[j]);
          medOut.push(em[j]);
          chrOut.push(c);
          nAt.push(0);
          flags.push(true);
        }
        extrapolatedFrom = x[L];
        extrapolation = { law: opts.extrapolate, fit_from_plastic_strain: x[iFit], params_characteristic: fitC.params, params_median: fitM.params, rmse_mpa: fitC.rmseMpa };
        warnings.push(`extrapolated: past plastic strain ${x[L]} the curves follow the fitted ${opts.extrapolate} law, not test data`);
      }
    }
  }

  // engineering counterparts
  const engM = engineeringCounterpart(plastic, medOut, eMpa);
  const engC = engineeringCounterpart(plastic, chrOut, eMpa);
  const engineering = engM && engC ? { median: engM, characteristic: engC } : null;

  // idealizations
  const bil = fitBilinearHardening(x, chr, y0, eMpa);
  const ml = multilinearBreakpoints(plastic, chrOut, opts.multilinearPoints);
  const rp02 = interpolateAt(x, chr, RO_OFFSET);
  const ro = fitRambergOsgoodPlastic(x, chr, rp02 ?? undefined);
  if (!ro) warnings.push('no_ramberg_osgood: the Ramberg–Osgood set could not be fitted (too few points or no hardening)');
  const idealized: IdealizedCurves = {
    elastic_perfectly_plastic: { e_mpa: eMpa, yield_mpa: y0 },
    bilinear: { e_mpa: eMpa, yield_mpa: y0, hardening_modulus_mpa: bil.hardeningModulusMpa, tangent_modulus_mpa: bil.tangentModulusMpa, rmse_mpa: bil.rmseMpa },
    multilinear: {
      plastic_strain: ml.indices.map((i) => plastic[i]),
      stress_mpa: ml.indices.map((i) => chrOut[i]),
      extrapolated: ml.indices.map((i) => flags[i]),
    },
    ramberg_osgood: ro ? { e_mpa: eMpa, sigma0_mpa: ro.sigma0Mpa, m: ro.m, rmse_mpa: ro.rmseMpa } : null,
  };

  return {
    group: { ...input.group },
    n,
    plastic_strain: plastic,
    median_mpa: medOut,
    characteristic_mpa: chrOut,
    n_at_point: nAt,
    valid_to_plastic_strain: x[L],
    characteristic_uniform_plastic_strain: validity.characteristicUniform,
    extrapolated_from: extrapolatedFrom,
    extrapolation,
    extrapolated: flags,
    e_mpa: eMpa,
    characteristic_yield_mpa: y0,
    median_yield_mpa: medYield,
    engineering,
    idealized,
    warnings,
    provenance: prov,
  };
}
