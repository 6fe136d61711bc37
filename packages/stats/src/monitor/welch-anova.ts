/**
 * Welch's heteroscedastic one-way ANOVA, Welch (1951), "On the comparison of several mean
 * values: an alternative approach", Biometrika 38:330–336. With w_i = n_i/s_i², W = Σw_i,
 * μ̃ = Σw_i·x̄_i/W, Λ = Σ(1 − w_i/W)²/(n_i − 1):
 *   F = [Σ w_i (x̄_i − μ̃)² / (k − 1)] / [1 + 2(k − 2)Λ/(k² − 1)],
 *   df = (k − 1, (k² − 1)/(3Λ)),  p = P(F_{df} > F).
 * Units: any (the statistic is dimensionless). Needs ≥ 2 groups, each with ≥ 2 values and a
 * nonzero SD; otherwise returns an error value naming the offending group.
 */
import type { MonitorError } from './types.ts';
import { fUpperTail } from './upper-tail.ts';
import { summarizeGroup } from './variance-components.ts';

export interface WelchAnovaResult {
  statistic: number;
  df: [number, number];
  p: number;
  groups: string[];
}

/** Size, mean and sample variance (n − 1; 0 for fewer than 2 values). */
export function groupMeanVar(values: ArrayLike<number>): { n: number; mean: number; variance: number } {
  const { n, mean, ss } = summarizeGroup(values);
  return { n, mean, variance: n > 1 ? ss / (n - 1) : 0 };
}

export function welchAnova(groups: Record<string, ArrayLike<number>>): WelchAnovaResult | MonitorError {
  const names = Object.keys(groups);
  if (names.length < 2) return { code: 'too-few-groups', message: `Welch's ANOVA needs at least 2 groups, got ${names.length}` };
  const stats = [];
  for (const name of names) {
    const g = groupMeanVar(groups[name]);
    if (g.n < 2) return { code: 'group-too-small', message: `group ${name} has ${g.n} value(s); Welch's ANOVA needs 2 or more`, location: { group: name } };
    if (!(g.variance > 0)) return { code: 'group-no-spread', message: `group ${name} has zero variance; Welch's weights are undefined`, location: { group: name } };
    stats.push(g);
  }
  const k = stats.length;
  let W = 0;
  let wm = 0;
  for (const g of stats) {
    const w = g.n / g.variance;
    W += w;
    wm += w * g.mean;
  }
  const mu = wm / W;
  let A = 0;
  let lambda = 0;
  for (const g of stats) {
    const w = g.n / g.variance;
    A += w * (g.mean - mu) ** 2;
    lambda += (1 - w / W) ** 2 / (g.n - 1);
  }
  A /= k - 1;
  const B = 1 + (2 * (k - 2) * lambda) / (k * k - 1);
  const F = A / B;
  const df1 = k - 1;
  const df2 = (k * k - 1) / (3 * lambda);
  return { statistic: F, df: [df1, df2], p: fUpperTail(F, df1, df2), groups: names };
}
