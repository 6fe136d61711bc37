/**
 * Rank-based pairwise comparisons after Kruskal–Wallis, with Holm's (1979) step-down correction
 * of the p-values (Scand. J. Statist. 6:65–70): sort p ascending,
 * p_adj(i) = max_{j ≤ i} min(1, (m − j + 1)·p(j)).
 *  - Dunn's (1964) test (Technometrics 6:241–252) on the mean ranks of the
 *    pooled ranking, z = (R̄_a − R̄_b)/√([N(N+1)/12 − Σ(t³ − t)/(12(N − 1))]·(1/n_a + 1/n_b)),
 *    two-sided normal p.
 * (After Welch's ANOVA the pairs are compared by Games–Howell, games-howell.ts.)
 */
import type { KruskalWallisResult } from './kruskal-wallis.ts';
import { normalTwoSided } from './upper-tail.ts';

export interface PairwiseComparison {
  a: string;
  b: string;
  statistic: number;
  p: number;
  p_adjusted: number;
  method: string;
}

/** Holm-adjusted p-values, in the input order. */
export function holmAdjust(p: readonly number[]): number[] {
  const m = p.length;
  const order = p.map((_, i) => i).sort((a, b) => p[a] - p[b]);
  const out = new Array<number>(m);
  let running = 0;
  for (let r = 0; r < m; r++) {
    const i = order[r];
    running = Math.max(running, Math.min(1, (m - r) * p[i]));
    out[i] = running;
  }
  return out;
}

export function pairwiseDunn(kw: KruskalWallisResult): PairwiseComparison[] {
  const N = kw.total;
  const base = (N * (N + 1)) / 12 - kw.tieSum / (12 * (N - 1));
  const raw: Omit<PairwiseComparison, 'p_adjusted'>[] = [];
  for (let i = 0; i < kw.groups.length; i++) {
    for (let j = i + 1; j < kw.groups.length; j++) {
      const se = Math.sqrt(base * (1 / kw.sizes[i] + 1 / kw.sizes[j]));
      const z = (kw.meanRanks[i] - kw.meanRanks[j]) / se;
      raw.push({ a: kw.groups[i], b: kw.groups[j], statistic: z, p: normalTwoSided(z), method: 'dunn-holm' });
    }
  }
  const adj = holmAdjust(raw.map((r) => r.p));
  return raw.map((r, i) => ({ ...r, p_adjusted: adj[i] }));
}
