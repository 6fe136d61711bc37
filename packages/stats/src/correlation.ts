/**
 * Pearson (product-moment) and Spearman (rank, midranks for ties) correlation matrices among
 * properties, pairwise complete: each pair uses the rows where both values are finite.
 * Computed with simple-statistics (sampleCorrelation, sampleRankCorrelation); Spearman's ρ is the
 * Pearson correlation of the midranks, as scipy.stats.spearmanr.
 *
 * Input: columns of equal length (one row per test), NaN or non-finite = missing.
 * Output: `properties` in the order given; `pearson[i][j]`, `spearman[i][j]` (dimensionless, 1 on
 * the diagonal when the column has spread), `n[i][j]` the number of complete pairs. A coefficient
 * is null when fewer than 3 complete pairs exist or either column has no spread among them.
 */
import { sampleCorrelation, sampleRankCorrelation } from 'simple-statistics';

export interface CorrelationMatrices {
  properties: string[];
  pearson: (number | null)[][];
  spearman: (number | null)[][];
  n: number[][];
}

export const MIN_N_CORRELATION = 3;

export function correlationMatrices(columns: Record<string, ArrayLike<number>>): CorrelationMatrices {
  const properties = Object.keys(columns);
  const m = properties.length;
  const pearson: (number | null)[][] = Array.from({ length: m }, () => new Array<number | null>(m).fill(null));
  const spearman: (number | null)[][] = Array.from({ length: m }, () => new Array<number | null>(m).fill(null));
  const counts: number[][] = Array.from({ length: m }, () => new Array<number>(m).fill(0));
  for (let i = 0; i < m; i++) {
    for (let j = i; j < m; j++) {
      const a = columns[properties[i]];
      const b = columns[properties[j]];
      const len = Math.min(a.length, b.length);
      const xa: number[] = [];
      const xb: number[] = [];
      for (let r = 0; r < len; r++) {
        if (Number.isFinite(a[r]) && Number.isFinite(b[r])) {
          xa.push(a[r]);
          xb.push(b[r]);
        }
      }
      counts[i][j] = counts[j][i] = xa.length;
      if (xa.length < MIN_N_CORRELATION || !hasSpread(xa) || !hasSpread(xb)) continue;
      const rp = clamp(sampleCorrelation(xa, xb));
      const rs = clamp(sampleRankCorrelation(xa, xb));
      pearson[i][j] = pearson[j][i] = i === j ? 1 : rp;
      spearman[i][j] = spearman[j][i] = i === j ? 1 : rs;
    }
  }
  return { properties, pearson, spearman, n: counts };
}

function hasSpread(x: number[]): boolean {
  for (let i = 1; i < x.length; i++) if (x[i] !== x[0]) return true;
  return false;
}

function clamp(r: number): number | null {
  if (!Number.isFinite(r)) return null;
  return Math.max(-1, Math.min(1, r));
}
