/**
 * Games–Howell pairwise comparisons, Games & Howell (1976), "Pairwise multiple comparison
 * procedures with unequal n's and/or variances: a Monte Carlo study", Journal of Educational
 * Statistics 1:113–125 — the companion of Welch's ANOVA: neither equal variances nor equal
 * sizes are assumed. For groups a, b of k groups:
 *   d = x̄_a − x̄_b,  SE = √(s_a²/n_a + s_b²/n_b),  ν = Welch–Satterthwaite degrees of freedom,
 *   q = |d| / (SE/√2),  p = P(Q_{k,ν} > q),  interval d ± q_{1−α; k, ν} · SE/√2,
 * with Q the studentized range of k means. Intervals hold simultaneously for all pairs at level
 * 1 − α (approximately; Games & Howell's simulation). Studentized range from jstat (a port of
 * R's ptukey and qtukey) — no studentized range in @stdlib. Its quantile takes ~10 ms a call, so
 * q_{1−α;k,ν} is computed exactly at 19 values of ν per (k, level) and read between them
 * quadratically in 1/ν, the variable studentized-range tables are interpolated in (within 3e-4 of
 * SciPy, checked);
 * p-values (~2 ms a pair) are computed for up to 10 groups (45 pairs), and left null beyond —
 * the intervals say which pairs differ.
 * Units: d and its interval in the values' units. A pair whose groups have fewer than 2 values,
 * no spread, or ν < 2 (the distribution's own limit) is left out and reported as an error value.
 */
import jstat from 'jstat';
import type { MonitorError } from './types.ts';
import { groupMeanVar } from './welch-anova.ts';

export interface GamesHowellPair {
  a: string;
  b: string;
  /** x̄_a − x̄_b. */
  difference: number;
  ci: [number, number];
  level: number;
  /** Studentized range statistic. */
  statistic: number;
  df: number;
  /** P(Q > q); null for more than MAX_GROUPS_FOR_P groups. */
  p: number | null;
  method: 'games-howell';
}

/** ν at which the quantile is computed exactly; 1e5 stands for ∞ (jstat's large-ν branch). */
const NU_NODES = [2, 2.25, 2.5, 3, 3.5, 4, 5, 6, 7, 8, 10, 12, 15, 20, 30, 60, 120, 480, 1e5];
const quantileTables = new Map<string, number[]>();
export const MAX_GROUPS_FOR_P = 10;

/** q_{level; k, ν}: exact at the nodes, quadratic in 1/ν through the three nearest (ν ≥ 2). */
export function studentizedRangeQuantile(level: number, k: number, nu: number): number {
  const key = `${level}:${k}`;
  let table = quantileTables.get(key);
  if (!table) {
    table = NU_NODES.map((v) => jstat.jStat.tukey.inv(level, k, v));
    quantileTables.set(key, table);
  }
  const x = 1 / Math.min(Math.max(nu, 2), 1e5);
  let i = 1;
  while (i < NU_NODES.length - 1 && x < 1 / NU_NODES[i]) i++;
  // three nodes around x: i − 1, i and the next one on the side that exists
  const j = Math.min(Math.max(i - 1, 0), NU_NODES.length - 3);
  const xs = [1 / NU_NODES[j], 1 / NU_NODES[j + 1], 1 / NU_NODES[j + 2]];
  const ys = [table[j], table[j + 1], table[j + 2]];
  let q = 0;
  for (let a = 0; a < 3; a++) {
    let w = 1;
    for (let b = 0; b < 3; b++) if (b !== a) w *= (x - xs[b]) / (xs[a] - xs[b]);
    q += w * ys[a];
  }
  return q;
}

export function gamesHowell(groups: Record<string, ArrayLike<number>>, level = 0.95): { pairs: GamesHowellPair[]; errors: MonitorError[] } {
  const names = Object.keys(groups);
  const k = names.length;
  const stats = names.map((name) => groupMeanVar(groups[name]));
  const pairs: GamesHowellPair[] = [];
  const errors: MonitorError[] = [];
  for (let i = 0; i < k; i++) {
    for (let j = i + 1; j < k; j++) {
      const a = stats[i];
      const b = stats[j];
      const where = { group: `${names[i]}|${names[j]}` };
      if (a.n < 2 || b.n < 2) {
        errors.push({ code: 'group-too-small', message: `${names[i]} vs ${names[j]}: Games–Howell needs 2 or more values in each group`, location: where });
        continue;
      }
      const va = a.variance / a.n;
      const vb = b.variance / b.n;
      if (!(va + vb > 0)) {
        errors.push({ code: 'group-no-spread', message: `${names[i]} vs ${names[j]}: both groups have zero variance`, location: where });
        continue;
      }
      const df = ((va + vb) * (va + vb)) / ((va * va) / (a.n - 1) + (vb * vb) / (b.n - 1));
      if (!(df >= 2)) {
        errors.push({ code: 'df-too-small', message: `${names[i]} vs ${names[j]}: ${df.toFixed(2)} degrees of freedom; the studentized range needs 2 or more`, location: where });
        continue;
      }
      const half = Math.sqrt((va + vb) / 2);
      const d = a.mean - b.mean;
      const q = Math.abs(d) / half;
      const crit = studentizedRangeQuantile(level, k, df);
      const p = k <= MAX_GROUPS_FOR_P ? Math.min(1, Math.max(0, 1 - jstat.jStat.tukey.cdf(q, k, df))) : null;
      pairs.push({ a: names[i], b: names[j], difference: d, ci: [d - crit * half, d + crit * half], level, statistic: q, df, p, method: 'games-howell' });
    }
  }
  return { pairs, errors };
}
