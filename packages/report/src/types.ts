/**
 * Input of the report: plain typed data assembled by the pipeline from the stage outputs.
 * The report never reads the database, the files or the clock; everything it shows is here.
 *
 * The shapes of `CharacteristicCurve`, `PropertyStats` and `DriftResult` follow the JSON
 * contracts of `fractile curves`, `fractile stats` and `fractile drift` (same keys, snake_case).
 * The rest (samples, raw values, chart series) is what the pipeline adds for drawing.
 */
import type {
  CharacteristicValue as StatsCharacteristicValue,
  Compliance as StatsCompliance,
  FitSummary,
  PropertySummary,
} from '@fractile/stats';

/** Any JSON value; used where a stage output is open-ended (idealizations, provenance). */
export type JsonValue = string | number | boolean | null | readonly JsonValue[] | { readonly [key: string]: JsonValue };

/** A population's identity, e.g. `{ grade: 'G355', supplier: 'Northmill' }` or `{ grade: 'G355' }`. */
export type GroupKey = Readonly<Record<string, string>>;

/** Counts over the whole database at report time. */
export interface ReportCounts {
  tests: number;
  curves: number;
  summary_only: number;
  rejected: number;
  failed: number;
  flagged: number;
  /** tests excluded by an engineer (with a recorded reason) */
  excluded?: number;
  /** per-test values left out of the statistics (excluded tests and flagged values), over all properties of the groups */
  values_left_out?: number;
}

/** One grade of the catalog as the report lists it. */
export interface CatalogGradeSummary {
  grade: string;
  family?: string;
  yield_definition?: string;
  /** Specification limits by name (`yield_min_mpa`, `tensile_max_mpa`, …); null where unset. */
  spec?: Readonly<Record<string, number | null>>;
}

export interface CatalogSummary {
  /** Where the catalog came from (file name as given by the user), or null for the built-in default. */
  source: string | null;
  /** SHA-256 of the catalog content, or null. */
  hash: string | null;
  grades: readonly CatalogGradeSummary[];
}

export interface ReportMeta {
  title: string;
  /** ISO 8601 time stamp of the run; passed in, never read from the clock here. */
  generated_at: string;
  code_version: string;
  database: { engine: string; target: string };
  /** Settings hash per stage or purpose, e.g. `{ reduce: 'a1b2…', stats: 'c3d4…' }`. */
  settings_hashes: Readonly<Record<string, string>>;
  catalog: CatalogSummary;
  counts: ReportCounts;
}

// ---------------------------------------------------------------------------------------------
// curves stage (contract of `fractile curves --format json`)

/** Median and characteristic true stress–plastic strain curve of one group. */
export interface CharacteristicCurve {
  group: GroupKey;
  n: number;
  /** Common abscissa, true plastic strain [–]. */
  plastic_strain: readonly number[];
  /** Median true stress at each abscissa [MPa]. */
  median_mpa: readonly number[];
  /** Characteristic (lower-fractile) true stress at each abscissa [MPa]. */
  characteristic_mpa: readonly number[];
  /** What the characteristic curve bounds: each strain separately, or the whole curve (default pointwise). */
  band?: 'pointwise' | 'simultaneous';
  /** The same in words, as the curves stage states it. */
  band_statement?: string;
  /** Largest plastic strain [–] up to which the curve is supported by the data; null if unknown. */
  valid_to_plastic_strain: number | null;
  /** Plastic strain [–] beyond which the curve is extrapolated by a fitted law, or null. */
  extrapolated_from: number | null;
  /** The law used beyond `extrapolated_from` (curves stage extension), where known. */
  extrapolation?: { law: string } | null;
  /** Idealizations of the characteristic curve, shown in the trade's words and units. */
  idealized: IdealizedCurves | null;
  /** Provenance as the curves stage records it; its `caution` is not repeated on the page. */
  provenance: CurveProvenance | null;
  /** Yields the curves start at [MPa], and the modulus used for the elastic part [MPa]. */
  characteristic_yield_mpa?: number | null;
  median_yield_mpa?: number | null;
  e_mpa?: number | null;
}

/** The idealizations of a characteristic curve (curves stage). Stresses in MPa, strains [–]. */
export interface IdealizedCurves {
  elastic_perfectly_plastic: { e_mpa: number | null; yield_mpa: number };
  /** Linear hardening: slope against true plastic strain, and against total strain E·H/(E + H). */
  bilinear: { e_mpa: number | null; yield_mpa: number; hardening_modulus_mpa: number; tangent_modulus_mpa: number | null; rmse_mpa: number };
  multilinear: { plastic_strain: readonly number[]; stress_mpa: readonly number[]; extrapolated: readonly boolean[] };
  /** ε = σ/E + 0.002·(σ/σ0)^m */
  ramberg_osgood: { e_mpa: number | null; sigma0_mpa: number; m: number; rmse_mpa: number } | null;
}

/** How a characteristic curve came about: tests, settings and their hash, code version, date. */
export interface CurveProvenance {
  group: GroupKey;
  n_tests: number;
  test_ids_sha256: string;
  settings: Readonly<Record<string, string | number | boolean | null>>;
  settings_hash: string;
  code_version: string;
  generated_at: string;
  caution?: string;
}

/** One measured test curve (already thinned by the pipeline), true stress on plastic strain. */
export interface SampleCurve {
  test_id: string;
  plastic_strain: readonly number[];
  stress_mpa: readonly number[];
}

// ---------------------------------------------------------------------------------------------
// stats stage (contract of `fractile stats --format json`)

/*
 * The stats shapes the report reads are taken from the stats package (stats/src), so a renamed
 * key there fails here: the report picks the keys it draws and widens a few of them (method and
 * model names as plain strings, nullable notes and levels, the later keys optional) because it
 * also draws the stored JSON of earlier runs and hand-made inputs.
 */

/**
 * A fitted distribution. Parameters by model: normal `{ mu, sigma }` (`{ mean, sd }` also read);
 * lognormal `{ mu, sigma }` of ln x; weibull `{ shape, scale }`. `ad` is the Anderson–Darling statistic, `p` its p-value.
 */
export interface DistributionFit extends Pick<FitSummary, 'p'> {
  model: string;
  params: Readonly<FitSummary['params']>;
  ad: FitSummary['ad'] | null;
}

export interface CharacteristicValue extends Pick<StatsCharacteristicValue, 'confidence' | 'value'> {
  method: string;
  coverage: StatsCharacteristicValue['coverage'] | null;
  note: StatsCharacteristicValue['note'] | null;
}

/** Null counts where the limit on that side is not set. */
export type Compliance = Pick<StatsCompliance, 'lower' | 'upper' | 'n_below' | 'n_above' | 'fraction_outside' | 'tail_below' | 'tail_above' | 'cpk'>;

export interface PropertyStats
  extends Pick<PropertySummary, 'n' | 'mean' | 'sd' | 'cov' | 'min' | 'max' | 'median' | 'percentiles'>,
    Partial<Pick<PropertySummary, 'best_fit_rule' | 'headline_rule'>> {
  group: GroupKey;
  /** Property key as in `fractile properties` (`rp02_mpa`, `rm_mpa`, `ag_pct`, `n_value`, …). */
  property: string;
  fits: readonly DistributionFit[];
  best_fit: string | null;
  characteristic: readonly CharacteristicValue[];
  /** The design value: the characteristic value the stats stage's headline rule chose. */
  headline?: CharacteristicValue | null;
  /** How the rule resolved here (`lowest-model`, `catalog-model`, `distribution-free-fallback`, `no-model-fits`). */
  headline_basis?: string | null;
  /** Values left out of this property's statistics, by reason (`excluded` or a flag name). */
  left_out?: { n: number; by_reason: Readonly<Record<string, number>> };
  compliance: Compliance | null;
  warnings: readonly string[];
}

/** A property of a group: its statistics and the raw values the histogram is drawn from. */
export interface ReportProperty {
  stats: PropertyStats;
  values: readonly number[];
  /**
   * Method of the characteristic value marked in the histogram and listed first; default the
   * stats stage's `headline`, else the first method with a value.
   */
  headline_method?: string;
}

export interface ReportGroup {
  key: GroupKey;
  curves: CharacteristicCurve | null;
  sample_curves: readonly SampleCurve[];
  properties: readonly ReportProperty[];
  /** the group's statistics split further (by supplier within a grade); absent or null: none */
  breakdown?: ReportBreakdown | null;
}

/** A group's statistics split by further fields (e.g. supplier), one row per subgroup. */
export interface ReportBreakdown {
  /** the fields the rows differ in */
  by: readonly string[];
  rows: readonly { key: GroupKey; stats: readonly PropertyStats[] }[];
}

// ---------------------------------------------------------------------------------------------
// curve versus certificate

/** Certificate − curve differences of one supplier and property (paired, Bland–Altman). */
export interface CrossCheckRow {
  supplier: string;
  property: string;
  /** the curve value compared, e.g. `rp02_mpa` for a yield given as Rp0.2 */
  curve_key: string;
  unit: string;
  n: number;
  mean_difference: number | null;
  sd_difference: number | null;
  ci: readonly [number, number] | null;
  level: number;
  limits_of_agreement: readonly [number, number] | null;
  mean_relative_pct: number | null;
  max_abs_difference: number | null;
  /** the interval of the mean difference excludes zero */
  systematic: boolean;
}

export interface CrossCheck {
  /** tests with both a curve and certificate values */
  tests: number;
  rows: readonly CrossCheckRow[];
}

// ---------------------------------------------------------------------------------------------
// drift stage (contract of `fractile drift --format json`)

/** A test named by an alert: its id, or lab and id. */
export type DriftTestRef = string | { lab?: string; test_id: string };

export interface DriftAlert {
  /** Stable id of the alert (12 hex digits); absent in hand-made inputs. */
  id?: string;
  group: GroupKey;
  property: string;
  rule: string;
  /** The contract's date: the same as `detected_on` where that is given. */
  first_date: string;
  /** Date of the first test at which the rule fires using only the data up to that date. */
  detected_on?: string;
  /** Estimated start of the shift, where the rule estimates one. */
  change_date?: string | null;
  magnitude: number | null;
  /** 'property-units', 'fraction' or 'sd'; absent means unstated. */
  magnitude_unit?: string;
  /** 'tests' or 'heat-means': what the chart's points are. */
  chart?: string;
  /** 'open', 'acknowledged' or 'closed', with who and the note of the latest action. */
  state?: string;
  state_by?: string | null;
  state_note?: string | null;
  /** First reported by the run this report shows. */
  new?: boolean;
  tests: readonly DriftTestRef[];
}

export interface ChangePoint {
  group: GroupKey;
  property: string;
  date: string;
  /** When the data up to then would have shown it (null: not an alarm). */
  detected_on?: string | null;
  shift: number | null;
  /** Confidence interval of the shift, as the drift stage states it. */
  ci: readonly JsonValue[] | Readonly<Record<string, JsonValue>> | null;
}

/** Box-plot numbers of one group in a comparison. */
export interface BoxNumbers {
  n: number;
  mean: number;
  q1: number;
  median: number;
  q3: number;
  whisker_low: number;
  whisker_high: number;
}

/** A pairwise comparison: Games–Howell (difference with interval) or a rank test (p only). */
export interface PairComparison {
  a: string;
  b: string;
  method: string;
  /** null where not computed (Games–Howell beyond 10 groups). */
  p: number | null;
  p_adjusted?: number;
  difference?: number;
  ci?: readonly [number, number];
  level?: number;
}

/** One test of the supplier comparison within a grade (Welch's ANOVA or Kruskal–Wallis). */
export interface DriftComparison {
  grade: string;
  property: string;
  test: string;
  statistic: number;
  df: readonly number[];
  p: number;
  pairwise: readonly PairComparison[];
  summaries: Readonly<Record<string, BoxNumbers>>;
}

export interface DriftResult {
  alerts: readonly DriftAlert[];
  change_points: readonly ChangePoint[];
  comparisons: readonly DriftComparison[];
}

/** One charted point (a test or a heat mean) with the chart's values at it. */
export interface ControlPoint {
  /** ISO 8601 date of the point (a heat mean: its last test). */
  date: string;
  value: number;
  test_id: string;
  lab?: string;
  /** The tests of a heat mean (ids as alerts name them). */
  members?: readonly string[];
  /** Running centre and limits judged from the points before this one; null before charting starts. */
  center: number | null;
  lcl: number | null;
  ucl: number | null;
  ewma?: number | null;
  ewma_lcl?: number | null;
  ewma_ucl?: number | null;
  /** Upper and lower CUSUM, SD of a point. */
  cusum_high?: number | null;
  cusum_low?: number | null;
  mr?: number | null;
  mr_ucl?: number | null;
}

/** Data for one control chart: individuals, and where `panels` is set moving range, CUSUM and EWMA. */
export interface ControlSeries {
  group: GroupKey;
  property: string;
  points: readonly ControlPoint[];
  spec_min?: number | null;
  spec_max?: number | null;
  /** what one point is, plural (default 'tests'; e.g. 'heat means') */
  point_label?: string;
  /** why the points are what they are, in words */
  structure_note?: string;
  cusum?: { k: number; h: number } | null;
  ewma?: { lambda: number; L: number } | null;
  /** draw the moving-range, CUSUM and EWMA panels below the individuals */
  panels?: boolean;
}

export interface ReportDrift {
  result: DriftResult;
  series: readonly ControlSeries[];
  /** alerts first reported by the run shown */
  new_alerts?: number;
}

// ---------------------------------------------------------------------------------------------
// data quality

export interface RejectionRow {
  file: string;
  line: number | null;
  column: number | null;
  code: string;
  message: string;
}

export interface FailedTestRow {
  lab: string;
  test_id: string;
  code: string;
  message: string;
}

export interface FlaggedTestRow {
  lab: string;
  test_id: string;
  flags: readonly string[];
}

/** A test left out of every statistic by an engineer's decision. */
export interface ExclusionRow {
  lab: string;
  test_id: string;
  reason: string;
  decided_by: string;
  /** ISO 8601 time of the decision */
  decided_at: string;
}

export interface ReportQuality {
  rejections: readonly RejectionRow[];
  failed: readonly FailedTestRow[];
  flagged: readonly FlaggedTestRow[];
  /** exclusions in force (absent: none recorded) */
  exclusions?: readonly ExclusionRow[];
}

// ---------------------------------------------------------------------------------------------
// sample-size planning (the `plans` of `fractile plan --format json`)

export interface PlanningRow {
  /** tests added to those at hand */
  added: number;
  /** tests then */
  n: number;
  /** factors at n: k (normal, lognormal limits), t (Weibull), r (order statistic rank) */
  factors: { readonly k?: number; readonly t?: number; readonly r?: number };
  /** mean of the characteristic value after adding the tests */
  expected: number | null;
  p05: number | null;
  p95: number | null;
  /** expected − the value now */
  gain: number | null;
  /** spread (SD) of the value from n tests drawn afresh */
  sd_fresh: number | null;
}

export interface PlanningPlan {
  method: string;
  level: { coverage: number; confidence: number };
  /** the model the added tests are drawn from */
  model: { model: string; params: Readonly<Record<string, number>> };
  n_now: number;
  value_now: number;
  population_fractile: number;
  value_large_n: number | null;
  replicates: number;
  seed: number;
  rows: readonly PlanningRow[];
}

/** One group and property: its plan, or why there is none. */
export interface PropertyPlanning {
  group: GroupKey;
  property: string;
  headline_basis: string | null;
  plan: PlanningPlan | null;
  note: string | null;
}

// ---------------------------------------------------------------------------------------------

export interface ReportOptions {
  /** Rows shown per data-quality or drift table before truncation (default 200). */
  max_rows?: number;
}

/** Complete lists written beside the report (file names relative to it), linked from it. */
export interface ReportLists {
  flagged?: string;
  failed?: string;
  rejections?: string;
  crosscheck?: string;
}

export interface ReportData {
  meta: ReportMeta;
  /** curve versus certificate (absent or null: not computed) */
  crosscheck?: CrossCheck | null;
  /** complete lists beside the report (absent: none written) */
  lists?: ReportLists;
  /** Caution shown at top and bottom; default `DESIGN_VALUE_CAUTION`. */
  caution?: string;
  groups: readonly ReportGroup[];
  drift: ReportDrift | null;
  quality: ReportQuality;
  /** sample-size planning per group and property (absent: not computed) */
  planning?: readonly PropertyPlanning[];
  options?: ReportOptions;
}
