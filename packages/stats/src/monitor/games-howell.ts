/**
 * Games–Howell pairwise comparisons, Games & Howell (1976), "Pairwise multiple comparison
 * procedures with unequal n's and/or variances: a Monte Carlo study", Journal of Educational
 * Statistics 1:113–125 — the companion of Welch's ANOVA: neither equal variances nor equal
 * sizes are assumed. For groups a, b of k groups:
 *   d = x̄_a − x̄_b,  SE = √(s_a²/n_a + s_b²/n_b),  ν = Welch–Satterthwaite degrees of freedom,
 *   q = |d| / (SE/√2),  p = P(Q_{k,ν} > q),  interval d ± q_{1−α; k, ν} · SE/√2,
 * with Q the studentized range of k means. Intervals hold simultaneously for all pairs at level
 * 1 − α (approximately; Games & Howell's simulation). Studentized range from jstat (a port of
 * R's ptukey and qtukey) — no studentized range in @stdlib.
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
  p: number;
  method: 'games-howell';
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
      const crit = jstat.jStat.tukey.inv(level, k, df);
      const p = Math.min(1, Math.max(0, 1 - jstat.jStat.tukey.cdf(q, k, df)));
      pairs.push({ a: names[i], b: names[j], difference: d, ci: [d - crit * half, d + crit * half], level, statistic: q, df, p, method: 'games-howell' });
    }
  }
  return { pairs, errors };
}
