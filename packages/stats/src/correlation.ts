/**
 * Pearson (product-moment) and Spearman (rank, midranks for ties) correlation matrices among
 * properties, pairwise complete: each pair uses the rows where both values are finite.
 * Pearson's r by two-pass centred sums, r = Σ(x−x̄)(y−ȳ) / √(Σ(x−x̄)² · Σ(y−ȳ)²); Spearman's ρ is the
 * Pearson correlation of the midranks, as scipy.stats.spearmanr. Written here rather than taken from
 * simple-statistics (sampleCorrelation / sampleRankCorrelation give the same numbers): a group of
 * 12 properties needs 156 coefficients, and their repeated compensated sums, allocations and a
 * fresh sort per pair made correlation the larger part of the aggregate's cost. Each column is
 * sorted once; pairs with the same rows present reuse its ranks, others walk its sorted order.
 *
 * Input: columns of equal length (one row per test), NaN or non-finite = missing.
 * Output: `properties` in the order given; `pearson[i][j]`, `spearman[i][j]` (dimensionless, 1 on
 * the diagonal when the column has spread), `n[i][j]` the number of complete pairs. A coefficient
 * is null when fewer than 3 complete pairs exist or either column has no spread among them.
 */

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

  // Per column, once: which rows are present, the present values, their midranks, and the rows in
  // ascending order of value. Pairs whose columns have the same rows present (the usual case) reuse
  // the ranks; other pairs rank their complete rows by walking the stored order (no new sort).
  const cols = properties.map((p) => {
    const c = columns[p];
    const mask = new Uint8Array(rows);
    const values: number[] = [];
    const present: number[] = [];
    for (let r = 0; r < rows; r++) {
      if (Number.isFinite(c[r])) {
        mask[r] = 1;
        values.push(c[r]);
        present.push(r);
      }
    }
    const order = present.slice().sort((a, b) => c[a] - c[b]);
    const own = new Int32Array(rows);
    for (let k = 0; k < present.length; k++) own[present[k]] = k;
    return { c, mask, values, ranks: ranksWithin(order, c, mask, own, present.length), order, key: maskKey(mask) };
  });
  const pos = new Int32Array(rows);

  for (let i = 0; i < m; i++) {
    for (let j = i; j < m; j++) {
      const A = cols[i];
      const B = cols[j];
      let xa: number[];
      let xb: number[];
      let ra: number[];
      let rb: number[];
      if (A.key === B.key) {
        xa = A.values;
        xb = B.values;
        ra = A.ranks;
        rb = B.ranks;
      } else {
        xa = [];
        xb = [];
        for (let r = 0; r < rows; r++) {
          if (A.mask[r] && B.mask[r]) {
            pos[r] = xa.length;
            xa.push(A.c[r]);
            xb.push(B.c[r]);
          }
        }
        ra = ranksWithin(A.order, A.c, B.mask, pos, xa.length);
        rb = ranksWithin(B.order, B.c, A.mask, pos, xa.length);
      }
      counts[i][j] = counts[j][i] = xa.length;
      if (xa.length < MIN_N_CORRELATION || !hasSpread(xa) || !hasSpread(xb)) continue;
      pearson[i][j] = pearson[j][i] = i === j ? 1 : clamp(pearsonR(xa, xb));
      // Spearman's ρ: the Pearson correlation of the midranks (as scipy.stats.spearmanr).
      spearman[i][j] = spearman[j][i] = i === j ? 1 : clamp(pearsonR(ra, rb));
    }
  }
  return { properties, pearson, spearman, n: counts };
}

/** Pearson's r of two equally long arrays (two-pass centred sums). */
function pearsonR(x: ArrayLike<number>, y: ArrayLike<number>): number {
  const n = x.length;
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mx += x[i];
    my += y[i];
  }
  mx /= n;
  my /= n;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dx = x[i] - mx;
    const dy = y[i] - my;
    sxy += dx * dy;
    sxx += dx * dx;
    syy += dy * dy;
  }
  return sxy / Math.sqrt(sxx * syy);
}

/**
 * Midranks of a column restricted to the rows where `other` is present: walk the column's rows in
 * ascending order of value, keep those rows, and give tied values the mean of their ranks. The
 * result is indexed by `pos[row]` (the row's place among the complete rows).
 */
function ranksWithin(order: number[], c: ArrayLike<number>, other: Uint8Array, pos: Int32Array, len: number): number[] {
  const out = new Array<number>(len);
  const kept: number[] = [];
  for (const r of order) if (other[r]) kept.push(r);
  let i = 0;
  while (i < kept.length) {
    let j = i;
    while (j + 1 < kept.length && c[kept[j + 1]] === c[kept[i]]) j++;
    const rank = (i + j) / 2 + 1;
    for (let k = i; k <= j; k++) out[pos[kept[k]]] = rank;
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
