/**
 * Normal-score (van der Waerden) correlation matrix: the Pearson correlation of the normal scores
 * Φ⁻¹(r_i / (n + 1)) of the midranks r_i (van der Waerden 1952; Klaassen & Wellner 1997 show it is
 * an efficient estimate of the correlation of a Gaussian copula). Pairwise complete: each pair uses
 * the rows where both values are finite, ranked among those rows. Pearson's r from
 * simple-statistics; midranks written here (three lines; no package of ours ranks with ties).
 *
 * Input: columns of equal length, NaN = missing. Output: the matrix in the order of the columns
 * (dimensionless, 1 on the diagonal), null where fewer than 3 complete pairs or no spread.
 */
import { sampleCorrelation } from 'simple-statistics';
import { MIN_N_CORRELATION } from './correlation.ts';
import { normalQuantile } from './special/normal.ts';

function normalScores(x: number[]): number[] {
  const order = x.map((_, i) => i).sort((a, b) => x[a] - x[b]);
  const out = new Array<number>(x.length);
  for (let i = 0; i < order.length; ) {
    let j = i;
    while (j + 1 < order.length && x[order[j + 1]] === x[order[i]]) j++;
    const rank = (i + j) / 2 + 1;
    for (let k = i; k <= j; k++) out[order[k]] = normalQuantile(rank / (x.length + 1));
    i = j + 1;
  }
  return out;
}

export function normalScoreCorrelation(columns: readonly ArrayLike<number>[]): (number | null)[][] {
  const m = columns.length;
  const rows = columns.reduce((a, c) => Math.min(a, c.length), Infinity);
  const out: (number | null)[][] = Array.from({ length: m }, () => new Array<number | null>(m).fill(null));
  for (let i = 0; i < m; i++) {
    for (let j = i; j < m; j++) {
      const a: number[] = [];
      const b: number[] = [];
      for (let r = 0; r < rows; r++) {
        if (Number.isFinite(columns[i][r]) && Number.isFinite(columns[j][r])) {
          a.push(columns[i][r]);
          b.push(columns[j][r]);
        }
      }
      if (a.length < MIN_N_CORRELATION || a.every((v) => v === a[0]) || b.every((v) => v === b[0])) continue;
      const r = i === j ? 1 : sampleCorrelation(normalScores(a), normalScores(b));
      out[i][j] = out[j][i] = Number.isFinite(r) ? Math.max(-1, Math.min(1, r)) : null;
    }
  }
  return out;
}
