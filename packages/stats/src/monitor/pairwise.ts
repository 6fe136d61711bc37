/**
 * Pairwise comparisons between groups, with Holm's (1979) step-down correction of the p-values
 * (Scand. J. Statist. 6:65–70): sort p ascending, p_adj(i) = max_{j ≤ i} min(1, (m − j + 1)·p(j)).
 *  - After Welch's ANOVA: Welch's (1947) two-sample t test, t = (x̄_a − x̄_b)/√(s_a²/n_a + s_b²/n_b),
 *    Welch–Satterthwaite df, two-sided p.
 *  - After Kruskal–Wallis: Dunn's (1964) test (Technometrics 6:241–252) on the mean ranks of the
 *    pooled ranking, z = (R̄_a − R̄_b)/√([N(N+1)/12 − Σ(t³ − t)/(12(N − 1))]·(1/n_a + 1/n_b)),
 *    two-sided normal p.
 * Degenerate pairs (Welch: a group with < 2 values or both SDs zero) are left out and reported.
 */
import type { KruskalWallisResult } from './kruskal-wallis.ts';
import type { MonitorError } from './types.ts';
import { groupMeanVar } from './welch-anova.ts';
import { normalTwoSided, tTwoSided } from './upper-tail.ts';

export interface PairwiseComparison {
  a: string;
  b: string;
  statistic: number;
  p: number;
  p_adjusted: number;
  method: string;
  /** Welch: degrees of freedom; Dunn: absent. */
  df?: number;
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

export interface WelchTTest {
  statistic: number;
  df: number;
  p: number;
}

export function welchTTest(a: ArrayLike<number>, b: ArrayLike<number>): WelchTTest | MonitorError {
  const ga = groupMeanVar(a);
  const gb = groupMeanVar(b);
  if (ga.n < 2 || gb.n < 2) return { code: 'group-too-small', message: "Welch's t test needs 2 or more values in each group" };
  const va = ga.variance / ga.n;
  const vb = gb.variance / gb.n;
  if (!(va + vb > 0)) return { code: 'group-no-spread', message: "both groups have zero variance; Welch's t is undefined" };
  const t = (ga.mean - gb.mean) / Math.sqrt(va + vb);
  const df = ((va + vb) * (va + vb)) / ((va * va) / (ga.n - 1) + (vb * vb) / (gb.n - 1));
  return { statistic: t, df, p: tTwoSided(t, df) };
}

function isError(x: object): x is MonitorError {
  return 'code' in x;
}

export function pairwiseWelch(groups: Record<string, ArrayLike<number>>): { pairs: PairwiseComparison[]; errors: MonitorError[] } {
  const names = Object.keys(groups);
  const raw: Omit<PairwiseComparison, 'p_adjusted'>[] = [];
  const errors: MonitorError[] = [];
  for (let i = 0; i < names.length; i++) {
    for (let j = i + 1; j < names.length; j++) {
      const r = welchTTest(groups[names[i]], groups[names[j]]);
      if (isError(r)) {
        errors.push({ ...r, message: `${names[i]} vs ${names[j]}: ${r.message}`, location: { group: `${names[i]}|${names[j]}` } });
        continue;
      }
      raw.push({ a: names[i], b: names[j], statistic: r.statistic, p: r.p, df: r.df, method: 'welch-t-holm' });
    }
  }
  const adj = holmAdjust(raw.map((r) => r.p));
  return { pairs: raw.map((r, i) => ({ ...r, p_adjusted: adj[i] })), errors };
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
