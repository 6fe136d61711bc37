/**
 * Types of the design stage: characteristic true stress – plastic strain curves per group,
 * their idealizations and provenance. Units: stress in MPa, strain in mm/mm (plastic true strain
 * unless a name says otherwise), modulus in MPa unless the name says GPa.
 */

import { HEADLINE_LEVEL } from '@fractile/stats/default-levels';

/** One test's true stress – true plastic strain curve, already resampled on the group's grid. */
export interface TestGridCurve {
  test_id: string;
  /** True stress on the grid, `null` beyond this test's uniform plastic strain (or where absent). */
  stress_mpa: (number | null)[];
  /** True plastic strain at maximum force (uniform elongation), or `null` if not known. */
  uniform_plastic_strain: number | null;
  modulus_gpa: number | null;
  /** Yield following the grade's yield definition. */
  yield_mpa: number | null;
}

export type ToleranceModel = 'normal' | 'lognormal';
/**
 * What the characteristic curve bounds: `pointwise` — at each plastic strain separately, the lower
 * tolerance bound (the curve as a whole lies below the population's fractile curve with less than
 * the stated confidence); `simultaneous` — the whole curve at once, with the stated confidence.
 */
export type BandKind = 'pointwise' | 'simultaneous';
export type ExtrapolationLaw = 'swift' | 'voce' | 'hollomon';

export interface DesignOptions {
  /** Proportion p of the population the lower bound must cover (e.g. 0.95). */
  coverage: number;
  /** Confidence γ of the tolerance bound (e.g. 0.75). */
  confidence: number;
  model: ToleranceModel;
  extrapolate: ExtrapolationLaw | null;
  /** Plastic strain up to which an extrapolation reaches; default: the end of the grid. */
  extrapolateTo?: number;
  /** Number of points (start and end included) of the multilinear idealization, ≥ 2. */
  multilinearPoints: number;
  /** A grid point with fewer curves than this lies outside the valid range (at least 2 is used). */
  minTestsPerPoint: number;
  /** Pointwise (default) or simultaneous lower band; see `BandKind`. */
  band?: BandKind;
  /** Monte Carlo replicates for the simultaneous band's critical value (default 2000). */
  bandSimulations?: number;
}

export const DEFAULT_DESIGN_OPTIONS: Readonly<DesignOptions> = Object.freeze({
  coverage: HEADLINE_LEVEL.coverage,
  confidence: HEADLINE_LEVEL.confidence,
  model: 'normal',
  extrapolate: null,
  multilinearPoints: 6,
  minTestsPerPoint: 5,
  band: 'pointwise',
  bandSimulations: 2000,
});

/** What the caller supplies for provenance; the design stage never reads the clock itself. */
export interface ProvenanceInput {
  code_version: string;
  /** ISO 8601 timestamp of the run. */
  generated_at: string;
  /** Upstream settings to record beside the design options (e.g. the reduce settings hash). */
  extra_settings?: Record<string, string | number | boolean | null>;
}

export type DesignSettings = Record<string, string | number | boolean | null>;

export interface DesignProvenance {
  group: Record<string, string>;
  n_tests: number;
  /** SHA-256 (hex) of the sorted test ids joined by "\n". */
  test_ids_sha256: string;
  settings: DesignSettings;
  /** SHA-256 (hex) of the settings as JSON with sorted keys. */
  settings_hash: string;
  code_version: string;
  generated_at: string;
  caution: string;
}

export interface EngineeringCurve {
  /** Engineering strain (total, elastic included). */
  strain: number[];
  stress_mpa: number[];
}

export interface IdealizedCurves {
  elastic_perfectly_plastic: { e_mpa: number | null; yield_mpa: number };
  /**
   * Linear hardening after yield. `hardening_modulus_mpa` is the slope of true stress against
   * true plastic strain (dσ/dεp); `tangent_modulus_mpa` the matching slope against total strain,
   * E·H/(E + H), where E is known.
   */
  bilinear: { e_mpa: number | null; yield_mpa: number; hardening_modulus_mpa: number; tangent_modulus_mpa: number | null; rmse_mpa: number };
  multilinear: { plastic_strain: number[]; stress_mpa: number[]; extrapolated: boolean[] };
  /**
   * ε = σ/E + 0.002·(σ/σ0)^m, σ0 = the characteristic curve's stress at εp = 0.002 (its Rp0.2 in
   * true stress) where the valid range covers it, m by least squares; `null` where the fit is not
   * possible. `rmse_mpa`: stress error of the set over the valid points.
   */
  ramberg_osgood: { e_mpa: number | null; sigma0_mpa: number; m: number; rmse_mpa: number } | null;
}

/** The simultaneous band's critical value and how it was found (see `simultaneous-band.ts`). */
export interface SimultaneousBandInfo {
  /** c in mean − c·s at every grid point of the valid range (log scale for the lognormal model). */
  critical_value: number;
  /** The largest pointwise factor k(n_i) over the same points, for comparison (c ≥ it). */
  max_pointwise_factor: number;
  simulations: number;
  /** Components of the correlation model the simulation used (the rest as independent noise). */
  components: number;
  seed: number;
}

/** One group's characteristic curve (JSON contract of `fractile curves`, extended). */
export interface DesignCurve {
  group: Record<string, string>;
  /** Number of tests whose curves enter the group. */
  n: number;
  plastic_strain: number[];
  median_mpa: number[];
  characteristic_mpa: number[];
  /** What `characteristic_mpa` bounds: each strain separately (`pointwise`) or the whole curve. */
  band: BandKind;
  /** The same in words, for whoever reads an export. */
  band_statement: string;
  /** Critical value of the simultaneous band; `null` for a pointwise band. */
  simultaneous: SimultaneousBandInfo | null;
  /** Tests contributing at each point (0 at extrapolated points). */
  n_at_point: number[];
  /** Last grid point inside the valid range, or `null` if no point is valid. */
  valid_to_plastic_strain: number | null;
  /** The group's characteristic uniform plastic strain (lower tolerance bound), if computable. */
  characteristic_uniform_plastic_strain: number | null;
  /** Plastic strain where extrapolation starts, or `null` without extrapolation. */
  extrapolated_from: number | null;
  /** The fitted law, the plastic strain its fit window starts at, and its stress error (characteristic). */
  extrapolation: {
    law: ExtrapolationLaw;
    fit_from_plastic_strain: number;
    params_characteristic: Record<string, number>;
    params_median: Record<string, number>;
    rmse_mpa: number;
  } | null;
  extrapolated: boolean[];
  e_mpa: number | null;
  characteristic_yield_mpa: number | null;
  /** The yield the median curve starts at (median of the tests' yields unless given). */
  median_yield_mpa: number | null;
  engineering: { median: EngineeringCurve; characteristic: EngineeringCurve } | null;
  idealized: IdealizedCurves | null;
  /** One line per finding, `code: message` (codes: few_tests, small_sample, no_valid_range, …). */
  warnings: string[];
  provenance: DesignProvenance;
}

/** An error as a value: code, message and, for parsed text, where it was found. */
export interface DesignError {
  code: string;
  message: string;
  location?: { line?: number; column?: number; path?: string };
}

export type DesignResult<T> = { ok: true; value: T } | { ok: false; error: DesignError };
