/**
 * Weighted least-squares isotonic (non-decreasing) regression by the pool-adjacent-violators
 * algorithm (Barlow, Bartholomew, Bremner & Brunk 1972, *Statistical Inference under Order
 * Restrictions*): the non-decreasing sequence f minimizing Σ w_i (y_i − f_i)².
 *
 * Units: as y. Weights default to 1. Entries with non-finite y or weight ≤ 0 (or non-finite) carry
 * no information: they take the fitted value of the nearest informative entry before them (after
 * them at the start). Degenerate input: empty y → empty result; no informative entry → all NaN.
 */
export function isotonicNonDecreasing(y: ArrayLike<number>, w?: ArrayLike<number>): Float64Array {
  const n = y.length;
  const out = new Float64Array(n).fill(NaN);
  const idx: number[] = [];
  for (let i = 0; i < n; i++) {
    const wi = w ? w[i] : 1;
    if (Number.isFinite(y[i]) && Number.isFinite(wi) && wi > 0) idx.push(i);
  }
  const m = idx.length;
  if (m === 0) return out;
  // Stack of blocks: weighted mean, total weight, number of informative points.
  const mean = new Float64Array(m);
  const weight = new Float64Array(m);
  const count = new Int32Array(m);
  let top = -1;
  for (const i of idx) {
    let mu = y[i];
    let wt = w ? w[i] : 1;
    let c = 1;
    while (top >= 0 && mean[top] > mu) {
      const W = weight[top] + wt;
      mu = (mean[top] * weight[top] + mu * wt) / W;
      wt = W;
      c += count[top];
      top--;
    }
    top++;
    mean[top] = mu;
    weight[top] = wt;
    count[top] = c;
  }
  let k = 0;
  for (let b = 0; b <= top; b++) for (let j = 0; j < count[b]; j++) out[idx[k++]] = mean[b];
  // Fill the uninformative entries.
  let last = out[idx[0]];
  for (let i = 0; i < n; i++) {
    if (Number.isNaN(out[i])) out[i] = last;
    else last = out[i];
  }
  return out;
}
