/**
 * Between-heat and within-heat variance components by the one-way random-effects analysis of
 * variance, in the form ISO 5725-2 (section 7.4) gives for unbalanced data with laboratories as
 * the random factor; here the heats are the groups. With p groups of sizes n_i (N = Σ n_i), group
 * means ȳ_i, grand mean ȳ = Σ n_i ȳ_i / N:
 *   MS_w = Σ_i Σ_j (y_ij − ȳ_i)² / (N − p)                       (s_r², within heats)
 *   MS_b = Σ_i n_i (ȳ_i − ȳ)² / (p − 1)
 *   n̄   = (N − Σ n_i² / N) / (p − 1)
 *   s_L² = max(0, (MS_b − MS_w) / n̄)                              (between heats)
 * and the F test of "no heat effect", F = MS_b / MS_w on (p − 1, N − p) degrees of freedom, upper
 * tail (Montgomery, Design and Analysis of Experiments, the random-effects model).
 * Input: per group its size, mean and sum of squares about its own mean (so running sums can be
 * fed without the values); units: the property's; variances in units².
 * Degenerate input: fewer than 2 groups, or no group with 2 or more values (no within-group
 * degrees of freedom), gives an error value naming the reason.
 */
import type { MonitorError } from './types.ts';
import { fUpperTail } from './upper-tail.ts';

export interface GroupSummary {
  n: number;
  mean: number;
  /** Σ (y − mean)² over the group's values. */
  ss: number;
}

export interface VarianceComponents {
  groups: number;
  n: number;
  df_between: number;
  df_within: number;
  ms_between: number;
  ms_within: number;
  /** n̄ of ISO 5725-2 (equal to the common group size for balanced data). */
  n_bar: number;
  /** s_r², within groups. */
  var_within: number;
  /** s_L², between groups (0 when MS_b ≤ MS_w). */
  var_between: number;
  /** s_r² + s_L²: variance of one value. */
  var_total: number;
  /** s_L² / (s_r² + s_L²), the intraclass correlation. */
  icc: number;
  f: number;
  p: number;
}

/** Size, mean and sum of squares of one group of values. */
export function summarizeGroup(values: ArrayLike<number>): GroupSummary {
  const n = values.length;
  let s = 0;
  for (let i = 0; i < n; i++) s += values[i];
  const mean = n > 0 ? s / n : NaN;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (values[i] - mean) ** 2;
  return { n, mean, ss };
}

export function varianceComponents(groups: readonly GroupSummary[]): VarianceComponents | MonitorError {
  const p = groups.length;
  if (p < 2) return { code: 'too-few-groups', message: `variance components need at least 2 groups, got ${p}` };
  let N = 0;
  let sumN2 = 0;
  let ssWithin = 0;
  const centre = groups[0].mean;
  let s1 = 0;
  for (const g of groups) {
    N += g.n;
    sumN2 += g.n * g.n;
    ssWithin += g.ss;
    s1 += g.n * (g.mean - centre);
  }
  const dfWithin = N - p;
  if (dfWithin < 1) return { code: 'no-replicates', message: 'no group has 2 or more values; the within-group variance is not estimable' };
  const grand = s1 / N;
  let ssBetween = 0;
  for (const g of groups) ssBetween += g.n * (g.mean - centre - grand) ** 2;
  const dfBetween = p - 1;
  const msB = ssBetween / dfBetween;
  const msW = ssWithin / dfWithin;
  const nBar = (N - sumN2 / N) / dfBetween;
  const varBetween = Math.max(0, (msB - msW) / nBar);
  const total = msW + varBetween;
  const f = msW > 0 ? msB / msW : msB > 0 ? Infinity : NaN;
  return {
    groups: p,
    n: N,
    df_between: dfBetween,
    df_within: dfWithin,
    ms_between: msB,
    ms_within: msW,
    n_bar: nBar,
    var_within: msW,
    var_between: varBetween,
    var_total: total,
    icc: total > 0 ? varBetween / total : 0,
    f,
    p: Number.isNaN(f) ? 1 : fUpperTail(f, dfBetween, dfWithin),
  };
}
