/**
 * Shared shapes of the monitoring functions: a series in time order, the options that tune the
 * charts, and error values. Plain data only; nothing here reads the clock, files or a database.
 */

/** One test's value of one property, already in time order (test date, then heat). */
export interface SeriesPoint {
  value: number;
  /** ISO 8601 date, yyyy-mm-dd. */
  date: string;
  testId: string;
  heat?: string | null;
}

/**
 * Which tests the chart's structure is studied on (heat effect, tests per point). Default: the
 * first 100 tests of the series (all if fewer). With `from`/`to` the tests dated
 * inside [from, to] (inclusive); with both a date range and `firstN`, the first `firstN` of them.
 */
export interface BaselineSpec {
  firstN?: number;
  from?: string;
  to?: string;
}

export interface EwmaParams {
  /** Smoothing weight 0 < λ ≤ 1. */
  lambda: number;
  /** Limit width in multiples of the EWMA's standard deviation. */
  L: number;
}

export interface CusumParams {
  /** Reference value (allowance), in standard deviations. */
  k: number;
  /** Decision interval, in standard deviations. */
  h: number;
}

export interface ChangePointOptions {
  /** Penalty per added change of the listing, on the −2·log-likelihood scale; 'bic' = 2·ln n (default). */
  penalty?: number | 'bic';
  /** A change becomes an alarm when the points up to a date find it at penalty factor·ln t (default 4). */
  alarmPenaltyFactor?: number;
  /** Shortest segment, in points (default 5). */
  minSegment?: number;
  /** Bootstrap resamples for the location interval (default 199; 0 switches it off). */
  bootstrap?: number;
  /** Seed of the bootstrap's generator (default 20260101), so results are reproducible. */
  seed?: number;
  /** Confidence level of the intervals (default 0.95). */
  level?: number;
}

export interface MonitorOptions {
  baseline?: BaselineSpec;
  /** Points charted: 'auto' (default; heat means when the baseline shows a heat effect), 'tests' or 'heat-means'. */
  unit?: 'auto' | 'tests' | 'heat-means';
  /** Level of the heat-effect F test (default 0.05). */
  heatEffectAlpha?: number;
  /** In-control ARL of each one-sided CUSUM, in tests (default 1500). */
  arl0Tests?: number;
  /** In-control ARL of each one-sided Shewhart limit, in tests (default 5000). */
  shewhartArl0Tests?: number;
  /** Shift the CUSUM is designed for, in SDs of one test (default 1; k is half of it). */
  designShiftSd?: number;
  /** Given CUSUM k and h (SDs of a charted point) instead of the design from the ARL. */
  cusum?: CusumParams;
  /** Default λ = 0.1, L = 2.814 (Lucas & Saccucci 1990: ARL0 ≈ 500 points). */
  ewma?: EwmaParams;
  /** 'asymptotic' (default; the limits behind the published ARL tables) or 'exact' (time-varying). */
  ewmaLimits?: 'asymptotic' | 'exact';
  /** Points included before charting starts (default 5). */
  warmup?: number;
  /** Grade minimum of the property, for capability; null or absent: no capability. */
  lowerSpec?: number | null;
  /** Trailing window of the rolling capability, in tests (default 50). */
  capabilityWindow?: number;
  /** Fewest tests in the window before capability is reported (default min(20, window)). */
  capabilityMinTests?: number;
  /** Modelled share of tests below the minimum above which 'capability-below-minimum' fires (default 0.05). */
  maxFractionBelow?: number;
  changePoint?: ChangePointOptions;
  /** Episodes of one alert rule at most this many points apart are joined (default 5). */
  alertMergeGap?: number;
}

/** An error as a value: a code, a message, and where it applies (index in the series). */
export interface MonitorError {
  code: string;
  message: string;
  location?: { index?: number; group?: string };
}
