/**
 * Pearson (product-moment) and Spearman (rank, midranks for ties) correlation matrices among
 * properties, pairwise complete: each pair uses the rows where both values are finite.
 * Pearson's r by simple-statistics' sampleCorrelation; Spearman's ρ is the Pearson correlation of
 * the midranks, as scipy.stats.spearmanr. The midranks are computed here once per column and reused
 * by every pair whose columns have the same rows present (ranking each pair afresh, as
 * sampleRankCorrelation does, would dominate the cost of a group of 12 properties).
 *
 * Input: columns of equal length (one row per test), NaN or non-finite = missing.
 * Output: `properties` in the order given; `pearson[i][j]`, `spearman[i][j]` (dimensionless, 1 on
 * the diagonal when the column has spread), `n[i][j]` the number of complete pairs. A coefficient
 * is null when fewer than 3 complete pairs exist or either column has no spread among them.
 */
import { sampleCorrelation } from 'simple-statistics';

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
  const len = properties.reduce((acc, p) => Math.min(acc, columns[p].length), Infinity);
  const rows = Number.isFinite(len) ? len : 0;

  // Per column, once: which rows are present, the present values and their midranks. Pairs whose
  // columns have the same rows present (the usual case) reuse them; others are ranked per pair.
  const cols = properties.map((p) => {
    const c = columns[p];
    const mask = new Uint8Array(rows);
    const values: number[] = [];
    for (let r = 0; r < rows; r++) {
      if (Number.isFinite(c[r])) {
        mask[r] = 1;
        values.push(c[r]);
      }
    }
    return { mask, values, ranks: midranks(values), key: maskKey(mask) };
  });

  for (let i = 0; i < m; i++) {
    for (let j = i; j < m; j++) {
      let xa: number[];
      let xb: number[];
      let ra: number[];
      let rb: number[];
      if (cols[i].key === cols[j].key) {
        xa = cols[i].values;
        xb = cols[j].values;
        ra = cols[i].ranks;
        rb = cols[j].ranks;
      } else {
        const a = columns[properties[i]];
        const b = columns[properties[j]];
        xa = [];
        xb = [];
        for (let r = 0; r < rows; r++) {
          if (cols[i].mask[r] && cols[j].mask[r]) {
            xa.push(a[r]);
            xb.push(b[r]);
          }
        }
        ra = midranks(xa);
        rb = midranks(xb);
      }
      counts[i][j] = counts[j][i] = xa.length;
      if (xa.length < MIN_N_CORRELATION || !hasSpread(xa) || !hasSpread(xb)) continue;
      pearson[i][j] = pearson[j][i] = i === j ? 1 : clamp(sampleCorrelation(xa, xb));
      // Spearman's ρ: the Pearson correlation of the midranks (as simple-statistics'
      // sampleRankCorrelation and scipy.stats.spearmanr), with the ranks computed once per column.
      spearman[i][j] = spearman[j][i] = i === j ? 1 : clamp(sampleCorrelation(ra, rb));
    }
  }
  return { properties, pearson, spearman, n: counts };
}

/** Ranks 1…n, ties given the mean of the ranks they span. */
export function midranks(x: ArrayLike<number>): number[] {
  const n = x.length;
  const idx = Array.from({ length: n }, (_, i) => i);
  idx.sort((a, b) => x[a] - x[b]);
  const out = new Array<number>(n);
  let i = 0;
  while (i < n) {
    let j = i;
    while (j + 1 < n && x[idx[j + 1]] === x[idx[i]]) j++;
    const r = (i + j) / 2 + 1;
    for (let k = i; k <= j; k++) out[idx[k]] = r;
    i = j + 1;
  }
  return out;
}

function maskKey(mask: Uint8Array): string {
  // Compact identity of the present-row pattern (run lengths), cheap to compare.
  const parts: number[] = [];
  let cur = 1;
  let run = 0;
  for (let r = 0; r < mask.length; r++) {
    if (mask[r] === cur) run++;
    else {
      parts.push(run);
      cur = mask[r];
      run = 1;
    }
  }
  parts.push(run);
  return parts.join(',');
}

function hasSpread(x: number[]): boolean {
  for (let i = 1; i < x.length; i++) if (x[i] !== x[0]) return true;
  return false;
}

function clamp(r: number): number | null {
  if (!Number.isFinite(r)) return null;
  return Math.max(-1, Math.min(1, r));
}
