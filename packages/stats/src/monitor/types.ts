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
 * Which points estimate the in-control state. Default: the first 30 points, or all if fewer.
 * With `from`/`to` the points dated inside [from, to] (inclusive) are taken; with both a date
 * range and `firstN`, the first `firstN` of the points inside the range.
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
  /** Penalty per added change, on the −2·log-likelihood scale; 'bic' = 2·ln n (default). */
  penalty?: number | 'bic';
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
  /**
   * Sigma that standardizes the charts: 'moving-range' (default, MR̄/d2, Montgomery) or
   * 'sample-sd' (the baseline's SD, including spread between runs of tests such as heats).
   */
  sigma?: 'moving-range' | 'sample-sd';
  /** Default λ = 0.1, L = 2.814 (Lucas & Saccucci 1990: ARL0 ≈ 500); λ = 0.1, L = 2.7 gives ARL0 ≈ 369. */
  ewma?: EwmaParams;
  /** 'asymptotic' (default; the limits behind the published ARL tables) or 'exact' (time-varying). */
  ewmaLimits?: 'asymptotic' | 'exact';
  /** Default k = 0.5, h = 5 (Montgomery: ARL0 ≈ 465). */
  cusum?: CusumParams;
  /** Grade minimum of the property, for capability; null or absent: no capability. */
  lowerSpec?: number | null;
  /** Trailing window of the rolling capability, in points (default 30). */
  rollingWindow?: number;
  /** Fewest points in the trailing window before capability is reported (default min(10, window)). */
  rollingMinPoints?: number;
  /** Rolling Cpk below this raises 'capability-margin' (default 1.33, common practice). */
  minCpk?: number;
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
