/**
 * Comparison of suppliers (or any groups) within a grade on one property: Welch's ANOVA with
 * pairwise Welch t tests (Holm), and Kruskal–Wallis (tie-corrected) with Dunn's test (Holm).
 * See welch-anova.ts, kruskal-wallis.ts and pairwise.ts for the methods and sources.
 * A test that cannot be computed (too few groups, an empty or constant group) is left out of
 * `comparisons` and reported in `errors`.
 */
import type { MonitorError } from './types.ts';
import type { PairwiseComparison } from './pairwise.ts';
import { welchAnova } from './welch-anova.ts';
import { kruskalWallis } from './kruskal-wallis.ts';
import { pairwiseDunn, pairwiseWelch } from './pairwise.ts';

export interface GroupComparison {
  test: 'welch-anova' | 'kruskal-wallis';
  statistic: number;
  df: number[];
  p: number;
  /** Groups compared, in order. */
  group_names: string[];
  pairwise: PairwiseComparison[];
}

export function compareGroupsChecked(groups: Record<string, ArrayLike<number>>): { comparisons: GroupComparison[]; errors: MonitorError[] } {
  const comparisons: GroupComparison[] = [];
  const errors: MonitorError[] = [];
  const w = welchAnova(groups);
  if ('code' in w) errors.push({ ...w, message: `welch-anova: ${w.message}` });
  else {
    const pw = pairwiseWelch(groups);
    errors.push(...pw.errors);
    comparisons.push({ test: 'welch-anova', statistic: w.statistic, df: w.df, p: w.p, group_names: w.groups, pairwise: pw.pairs });
  }
  const kw = kruskalWallis(groups);
  if ('code' in kw) errors.push({ ...kw, message: `kruskal-wallis: ${kw.message}` });
  else comparisons.push({ test: 'kruskal-wallis', statistic: kw.statistic, df: kw.df, p: kw.p, group_names: kw.groups, pairwise: pairwiseDunn(kw) });
  return { comparisons, errors };
}

/** The computable comparisons only; use compareGroupsChecked to see why one is missing. */
export function compareGroups(groups: Record<string, ArrayLike<number>>): GroupComparison[] {
  return compareGroupsChecked(groups).comparisons;
}
