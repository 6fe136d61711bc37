/**
 * Kruskal–Wallis rank test, Kruskal & Wallis (1952), J. Am. Stat. Assoc. 47:583–621, with the
 * tie correction: H = [12/(N(N+1)) Σ R_i²/n_i − 3(N+1)] / [1 − Σ(t³ − t)/(N³ − N)],
 * df = k − 1, p = P(χ²_{k−1} > H) (large-sample approximation).
 * Needs ≥ 2 groups, each non-empty, and not all values equal; otherwise an error value.
 */
import type { MonitorError } from './types.ts';
import { midRanks } from './ranks.ts';
import { chiSquareUpperTail } from './upper-tail.ts';

export interface KruskalWallisResult {
  statistic: number;
  df: [number];
  p: number;
  groups: string[];
  /** Mean rank of each group, in the order of `groups`. */
  meanRanks: number[];
  sizes: number[];
  /** Total N and Σ(t³ − t), for post-hoc comparisons. */
  total: number;
  tieSum: number;
}

export function kruskalWallis(groups: Record<string, ArrayLike<number>>): KruskalWallisResult | MonitorError {
  const names = Object.keys(groups);
  if (names.length < 2) return { code: 'too-few-groups', message: `Kruskal–Wallis needs at least 2 groups, got ${names.length}` };
  const sizes: number[] = [];
  const pooled: number[] = [];
  for (const name of names) {
    const g = groups[name];
    if (g.length < 1) return { code: 'group-empty', message: `group ${name} has no values`, location: { group: name } };
    sizes.push(g.length);
    for (let i = 0; i < g.length; i++) pooled.push(g[i]);
  }
  const N = pooled.length;
  const { ranks, tieSum } = midRanks(pooled);
  const correction = 1 - tieSum / (N * N * N - N);
  if (!(correction > 0)) return { code: 'all-tied', message: 'all values are equal; the Kruskal–Wallis statistic is undefined' };
  let off = 0;
  let sumSq = 0;
  const meanRanks: number[] = [];
  for (const n of sizes) {
    let r = 0;
    for (let i = off; i < off + n; i++) r += ranks[i];
    off += n;
    sumSq += (r * r) / n;
    meanRanks.push(r / n);
  }
  const H = ((12 / (N * (N + 1))) * sumSq - 3 * (N + 1)) / correction;
  const k = names.length;
  return { statistic: H, df: [k - 1], p: chiSquareUpperTail(H, k - 1), groups: names, meanRanks, sizes, total: N, tieSum };
}
