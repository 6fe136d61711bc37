/**
 * Individuals (X) and moving-range (MR, span 2) chart, Montgomery, "Introduction to Statistical
 * Quality Control", section on control charts for individual measurements:
 *   centre x̄, limits x̄ ± 2.66·MR̄ (2.66 = 3/d2, d2 = 1.128 for n = 2), MR UCL = D4·MR̄ = 3.267·MR̄,
 *   process sigma estimated as MR̄/d2.
 * Values in the property's units (e.g. MPa); limits in the same units.
 * Degenerate input: a baseline of fewer than 2 points has no moving range; the sigma then falls
 * back to the sample SD, and is 0 only for a constant baseline (the caller reports that).
 */
import type { BaselineSpec, SeriesPoint } from './types.ts';

export const MR_D2 = 1.128;
export const INDIVIDUALS_E2 = 2.66;
export const MR_D4 = 3.267;
export const DEFAULT_BASELINE_N = 30;

export interface BaselineStats {
  /** Points in the baseline. */
  n: number;
  /** Index of the baseline's first and last point in the series. */
  start: number;
  end: number;
  mean: number;
  /** Sample standard deviation (n − 1). */
  sd: number;
  /** Mean moving range of consecutive baseline points (0 with fewer than 2). */
  mrBar: number;
  /** Sigma used to standardize: MR̄/d2, or the sample SD where MR̄ = 0 or n < 2. */
  sigma: number;
  sigmaSource: 'moving-range' | 'sample-sd' | 'none';
}

export interface IndividualsLimits {
  center: number;
  ucl: number;
  lcl: number;
  mrUcl: number;
}

/**
 * Indices [start, end] (inclusive) of the baseline. Points are in time order, so a date range
 * is a contiguous run. Returns null when no point falls in the range.
 */
export function selectBaseline(points: readonly SeriesPoint[], spec: BaselineSpec = {}): { start: number; end: number } | null {
  const n = points.length;
  if (n === 0) return null;
  let start = 0;
  let end = n - 1;
  if (spec.from !== undefined || spec.to !== undefined) {
    start = -1;
    for (let i = 0; i < n; i++) {
      const d = points[i].date;
      if ((spec.from === undefined || d >= spec.from) && (spec.to === undefined || d <= spec.to)) {
        if (start < 0) start = i;
        end = i;
      }
    }
    if (start < 0) return null;
    if (spec.firstN !== undefined) end = Math.min(end, start + Math.max(1, Math.floor(spec.firstN)) - 1);
  } else {
    const firstN = spec.firstN ?? DEFAULT_BASELINE_N;
    end = Math.min(n, Math.max(1, Math.floor(firstN))) - 1;
  }
  return { start, end };
}

/** Mean, SD, MR̄ and sigma of values[start..end]. */
/**
 * `sigmaFrom`: 'moving-range' (default; Montgomery's MR̄/d2, the short-term spread) or
 * 'sample-sd' (the baseline's sample SD, which also holds the spread between consecutive runs such
 * as heats — the right yardstick where tests come in runs from one heat).
 */
export function baselineStats(values: ArrayLike<number>, start: number, end: number, sigmaFrom: 'moving-range' | 'sample-sd' = 'moving-range'): BaselineStats {
  const n = end - start + 1;
  let sum = 0;
  for (let i = start; i <= end; i++) sum += values[i];
  const mean = sum / n;
  let ss = 0;
  for (let i = start; i <= end; i++) ss += (values[i] - mean) ** 2;
  const sd = n > 1 ? Math.sqrt(ss / (n - 1)) : 0;
  let mrSum = 0;
  for (let i = start + 1; i <= end; i++) mrSum += Math.abs(values[i] - values[i - 1]);
  const mrBar = n > 1 ? mrSum / (n - 1) : 0;
  let sigma = 0;
  let sigmaSource: BaselineStats['sigmaSource'] = 'none';
  if (sigmaFrom === 'sample-sd' && sd > 0) {
    sigma = sd;
    sigmaSource = 'sample-sd';
  } else if (mrBar > 0) {
    sigma = mrBar / MR_D2;
    sigmaSource = 'moving-range';
  } else if (sd > 0) {
    sigma = sd;
    sigmaSource = 'sample-sd';
  }
  return { n, start, end, mean, sd, mrBar, sigma, sigmaSource };
}

/**
 * Montgomery's individuals and MR limits from a baseline: x̄ ± 2.66·MR̄ (= 3·MR̄/d2); with a
 * sample-SD sigma, x̄ ± 3·s.
 */
export function individualsLimits(b: BaselineStats): IndividualsLimits {
  const half = b.sigmaSource === 'sample-sd' ? 3 * b.sigma : INDIVIDUALS_E2 * b.mrBar;
  return {
    center: b.mean,
    ucl: b.mean + half,
    lcl: b.mean - half,
    mrUcl: MR_D4 * b.mrBar,
  };
}

/** Moving ranges |x_i − x_{i−1}|; the first is null. */
export function movingRanges(values: ArrayLike<number>): (number | null)[] {
  const out: (number | null)[] = new Array(values.length);
  for (let i = 0; i < values.length; i++) out[i] = i === 0 ? null : Math.abs(values[i] - values[i - 1]);
  return out;
}
