/**
 * The largest non-decreasing sequence at or below a given one: L_i = min_{k ≥ i} y_k (a running
 * minimum from the right). Every L_i ≤ y_i, L is non-decreasing, and any non-decreasing sequence
 * at or below y is at or below L (for it, u_i ≤ u_k ≤ y_k for all k ≥ i). Used for characteristic
 * curves: conservative by construction, where least-squares isotonic regression (pool-adjacent-
 * violators) can lift points above the bound it smooths.
 *
 * Units: those of y. Degenerate input: an empty sequence gives an empty one; a NaN propagates to
 * the points before it.
 */
export function largestNonDecreasingBelow(y: readonly number[]): number[] {
  const out = new Array<number>(y.length);
  let m = Infinity;
  for (let i = y.length - 1; i >= 0; i--) {
    m = Math.min(m, y[i]); // NaN once met
    out[i] = m;
  }
  return out;
}
