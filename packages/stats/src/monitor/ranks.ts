/**
 * Mid-ranks (average ranks for ties, 1-based) of pooled values and the tie sum Σ(t³ − t) over
 * tie groups, as used by the Kruskal–Wallis and Dunn statistics. O(N log N).
 */
export function midRanks(values: ArrayLike<number>): { ranks: Float64Array; tieSum: number } {
  const n = values.length;
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => values[a] - values[b]);
  const ranks = new Float64Array(n);
  let tieSum = 0;
  let i = 0;
  while (i < n) {
    let j = i;
    while (j + 1 < n && values[order[j + 1]] === values[order[i]]) j++;
    const r = (i + j + 2) / 2;
    for (let q = i; q <= j; q++) ranks[order[q]] = r;
    const t = j - i + 1;
    if (t > 1) tieSum += t * t * t - t;
    i = j + 1;
  }
  return { ranks, tieSum };
}
