/**
 * Sample percentile by linear interpolation between order statistics: Hyndman & Fan (1996)
 * definition 7, the default ('linear') of numpy.percentile and of R's quantile().
 *
 *   h = (n − 1)·q,  Q(q) = x_(⌊h⌋) + (h − ⌊h⌋)·(x_(⌊h⌋+1) − x_(⌊h⌋))   (0-based order statistics)
 *
 * `sorted` must be sorted ascending; q is a fraction in [0, 1] (not percent). Unit of the data.
 * Degenerate input: empty array or q outside [0, 1] → NaN.
 */
export function percentile(sorted: ArrayLike<number>, q: number): number {
  const n = sorted.length;
  if (n === 0 || !(q >= 0 && q <= 1)) return NaN;
  const h = (n - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  const frac = h - lo;
  const a = sorted[lo];
  const b = sorted[hi];
  // numpy's lerp form, exact at the end points.
  return frac === 0 ? a : a + frac * (b - a);
}
