/**
 * Ordinary least-squares straight line y = a + b·x over an index range, by running sums (written
 * here rather than taken from a statistics package because it works on a slice of typed arrays
 * without allocating, which the per-test hot path needs).
 *
 * Sums are taken about the first point's x and y, which keeps them well conditioned for data far
 * from the origin. Returns null for fewer than 2 points or zero spread in x.
 */
export interface LineFit {
  slope: number;
  intercept: number;
  r2: number;
  points: number;
  /** residual standard deviation, y units */
  residualSd: number;
}

export function fitLine(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  from: number,
  to: number,
  include?: (i: number) => boolean,
): LineFit | null {
  let n = 0;
  let sx = 0, sy = 0, sxx = 0, sxy = 0, syy = 0;
  const x0 = x[from], y0 = y[from];
  for (let i = from; i < to; i++) {
    if (include && !include(i)) continue;
    const dx = x[i] - x0, dy = y[i] - y0;
    n++; sx += dx; sy += dy; sxx += dx * dx; sxy += dx * dy; syy += dy * dy;
  }
  if (n < 2) return null;
  const vxx = sxx - (sx * sx) / n;
  const vxy = sxy - (sx * sy) / n;
  const vyy = syy - (sy * sy) / n;
  if (!(vxx > 0)) return null;
  const slope = vxy / vxx;
  const intercept = y0 + sy / n - slope * (x0 + sx / n);
  const sse = Math.max(0, vyy - slope * vxy);
  const r2 = vyy > 0 ? 1 - sse / vyy : 1;
  return { slope, intercept, r2, points: n, residualSd: n > 2 ? Math.sqrt(sse / (n - 2)) : 0 };
}
