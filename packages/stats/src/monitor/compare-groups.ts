/**
 * Comparison of suppliers (or any groups) within a grade on one property: Welch's ANOVA with
 * Games–Howell pairwise intervals (neither assumes equal variances), and, rank-based,
 * Kruskal–Wallis (tie-corrected) with Dunn's test (Holm). See welch-anova.ts, games-howell.ts,
 * kruskal-wallis.ts and pairwise.ts for the methods and sources. Each group's box-plot numbers
 * come along for drawing. A test that cannot be computed (too few groups, an empty or constant
 * group) is left out of `comparisons` and reported in `errors`.
 */
import type { MonitorError } from './types.ts';
import type { PairwiseComparison } from './pairwise.ts';
import type { GamesHowellPair } from './games-howell.ts';
import { welchAnova } from './welch-anova.ts';
import { gamesHowell } from './games-howell.ts';
import { kruskalWallis } from './kruskal-wallis.ts';
import { pairwiseDunn } from './pairwise.ts';
import { boxSummary, type BoxSummary } from './box-summary.ts';

export interface GroupComparison {
  test: 'welch-anova' | 'kruskal-wallis';
  statistic: number;
  df: number[];
  p: number;
  /** Groups compared, in order. */
  group_names: string[];
  /** Welch: Games–Howell pairs with simultaneous intervals; Kruskal–Wallis: Dunn's test, Holm-adjusted. */
  pairwise: (GamesHowellPair | PairwiseComparison)[];
  /** Box-plot numbers of each group. */
  summaries: Record<string, BoxSummary>;
}

export function compareGroupsChecked(groups: Record<string, ArrayLike<number>>, level = 0.95): { comparisons: GroupComparison[]; errors: MonitorError[] } {
  const comparisons: GroupComparison[] = [];
  const errors: MonitorError[] = [];
  const summaries = Object.fromEntries(Object.entries(groups).map(([k, v]) => [k, boxSummary(v)]));
  const w = welchAnova(groups);
  if ('code' in w) errors.push({ ...w, message: `welch-anova: ${w.message}` });
  else {
    const gh = gamesHowell(groups, level);
    errors.push(...gh.errors);
    comparisons.push({ test: 'welch-anova', statistic: w.statistic, df: w.df, p: w.p, group_names: w.groups, pairwise: gh.pairs, summaries });
  }
  const kw = kruskalWallis(groups);
  if ('code' in kw) errors.push({ ...kw, message: `kruskal-wallis: ${kw.message}` });
  else comparisons.push({ test: 'kruskal-wallis', statistic: kw.statistic, df: kw.df, p: kw.p, group_names: kw.groups, pairwise: pairwiseDunn(kw), summaries });
  return { comparisons, errors };
}

/** The computable comparisons only; use compareGroupsChecked to see why one is missing. */
export function compareGroups(groups: Record<string, ArrayLike<number>>, level = 0.95): GroupComparison[] {
  return compareGroupsChecked(groups, level).comparisons;
}
