/**
 * The five numbers of a box plot and the whiskers of Tukey's rule (Tukey 1977, Exploratory Data
 * Analysis; as drawn by most plotting libraries): quartiles by percentile.ts (Hyndman & Fan
 * definition 7), whiskers at the most extreme values within 1.5 × IQR of the box, and the mean.
 * Units: the values'. Degenerate input: no values gives n = 0 and NaN elsewhere.
 */
import { percentile } from '../percentile.ts';

export interface BoxSummary {
  n: number;
  mean: number;
  min: number;
  q1: number;
  median: number;
  q3: number;
  max: number;
  whisker_low: number;
  whisker_high: number;
}

export function boxSummary(values: ArrayLike<number>): BoxSummary {
  const sorted = Float64Array.from(values).sort();
  const n = sorted.length;
  let s = 0;
  for (let i = 0; i < n; i++) s += sorted[i];
  const q1 = percentile(sorted, 0.25);
  const q3 = percentile(sorted, 0.75);
  const lo = q1 - 1.5 * (q3 - q1);
  const hi = q3 + 1.5 * (q3 - q1);
  let wl = NaN;
  let wh = NaN;
  for (let i = 0; i < n; i++) {
    if (Number.isNaN(wl) && sorted[i] >= lo) wl = sorted[i];
    if (sorted[i] <= hi) wh = sorted[i];
  }
  return { n, mean: n > 0 ? s / n : NaN, min: n > 0 ? sorted[0] : NaN, q1, median: percentile(sorted, 0.5), q3, max: n > 0 ? sorted[n - 1] : NaN, whisker_low: wl, whisker_high: wh };
}
