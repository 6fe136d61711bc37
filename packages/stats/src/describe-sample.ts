/**
 * Descriptive statistics of one property's values and the sample every characteristic method
 * reads: finite values sorted, mean, sample SD (divisor n − 1, simple-statistics), CoV = SD/|mean|,
 * extremes, percentiles (Hyndman & Fan type 7, percentile.ts), and the normal, lognormal and
 * two-parameter Weibull fits by maximum likelihood (fit-normal.ts, fit-weibull.ts).
 *
 * Input in the property's unit; NaN and ±∞ are missing (counted in n_missing). Degenerate input:
 * numbers that cannot be computed are null and `warnings` says why; nothing throws.
 */
import { mean as ssMean, sampleStandardDeviation } from 'simple-statistics';
import { MIN_N_AD_P, MIN_N_FIT, type Sample } from './characteristic-types.ts';
import { fitLognormalSortedLogs, fitNormalSorted } from './fit-normal.ts';
import type { FitResult } from './fit-types.ts';
import { fitWeibullSortedLogs } from './fit-weibull.ts';
import { percentile } from './percentile.ts';

export interface Description {
  sample: Sample;
  n_missing: number;
  min: number | null;
  max: number | null;
  median: number | null;
  percentiles: { p05: number | null; p50: number | null; p95: number | null };
  warnings: string[];
}

export function describeSample(values: ArrayLike<number>): Description {
  const warnings: string[] = [];
  const finite: number[] = [];
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) finite.push(values[i]);
  const n = finite.length;
  const nMissing = values.length - n;
  const sorted = Float64Array.from(finite).sort();
  const mean = n >= 1 ? ssMean(finite) : null;
  const sd = n >= 2 ? sampleStandardDeviation(finite) : null;
  const cov = mean !== null && sd !== null && mean !== 0 ? sd / Math.abs(mean) : null;
  const pct = (q: number): number | null => (n >= 1 ? percentile(sorted, q) : null);

  if (n === 0) warnings.push('no values');
  else if (n < 2) warnings.push('n = 1: no standard deviation, fits or characteristic values');
  if (nMissing > 0) warnings.push(`${nMissing} missing or non-finite value(s) ignored`);
  if (sd === 0) warnings.push('all values equal: no spread, no fits');

  let logs: Float64Array | null = null;
  if (n > 0 && sorted[0] > 0) logs = sorted.map(Math.log);
  const fits: FitResult[] = [];
  if (n >= MIN_N_FIT && sd !== null && sd > 0) {
    const fn = fitNormalSorted(sorted);
    if (fn) fits.push(fn);
    if (logs) {
      const fl = fitLognormalSortedLogs(logs);
      if (fl) fits.push(fl);
      const fw = fitWeibullSortedLogs(logs);
      if (fw) fits.push(fw);
    } else {
      warnings.push('values ≤ 0 present: lognormal and Weibull not fitted');
    }
    if (n < MIN_N_AD_P) warnings.push(`n = ${n} < ${MIN_N_AD_P}: Anderson–Darling p-values are not calibrated for so few values`);
  } else if (n >= 1 && n < MIN_N_FIT) {
    warnings.push(`n = ${n} < ${MIN_N_FIT}: no distribution fits`);
  }
  return {
    sample: { n, sorted, logs, mean, sd, cov, fits },
    n_missing: nMissing,
    min: n >= 1 ? sorted[0] : null,
    max: n >= 1 ? sorted[n - 1] : null,
    median: pct(0.5),
    percentiles: { p05: pct(0.05), p50: pct(0.5), p95: pct(0.95) },
    warnings,
  };
}
