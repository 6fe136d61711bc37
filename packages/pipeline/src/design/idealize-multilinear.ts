/**
 * Multilinear idealization with N points: the N points of the curve (first and last included)
 * whose piecewise-linear interpolation has the least squared stress error over all curve points.
 * Found exactly by dynamic programming over breakpoints (optimal segmentation, Bellman 1961,
 * "On the approximation of curves by line segments using dynamic programming", Comm. ACM 4:284);
 * each segment's error comes in O(1) from prefix sums. Written by hand: no maintained package
 * does this segmentation. Breakpoints lie on the curve, so for a concave hardening curve the
 * idealization lies on or below it.
 *
 * Units: as given. Degenerate input: N ≥ point count returns all points; fewer than two points
 * returns them unchanged.
 */
export interface MultilinearPoints {
  indices: number[];
}

export function multilinearBreakpoints(xIn: readonly number[], yIn: readonly number[], nPoints: number): MultilinearPoints {
  const m = xIn.length;
  const want = Math.max(2, Math.floor(nPoints));
  if (m <= want) return { indices: xIn.map((_, i) => i) };
  // shifted to the first point to keep the prefix sums small (less cancellation)
  const x = xIn.map((v) => v - xIn[0]);
  const y = yIn.map((v) => v - yIn[0]);
  // prefix sums of x, y, x², xy, y² for O(1) segment error
  const px = new Float64Array(m + 1);
  const py = new Float64Array(m + 1);
  const pxx = new Float64Array(m + 1);
  const pxy = new Float64Array(m + 1);
  const pyy = new Float64Array(m + 1);
  for (let i = 0; i < m; i++) {
    px[i + 1] = px[i] + x[i];
    py[i + 1] = py[i] + y[i];
    pxx[i + 1] = pxx[i] + x[i] * x[i];
    pxy[i + 1] = pxy[i] + x[i] * y[i];
    pyy[i + 1] = pyy[i] + y[i] * y[i];
  }
  // squared error of the chord from point i to point j over points i..j
  const segmentError = (i: number, j: number): number => {
    const dx = x[j] - x[i];
    const b = dx !== 0 ? (y[j] - y[i]) / dx : 0;
    const a = y[i] - b * x[i];
    const c = j - i + 1;
    const sx = px[j + 1] - px[i];
    const sy = py[j + 1] - py[i];
    const sxx = pxx[j + 1] - pxx[i];
    const sxy = pxy[j + 1] - pxy[i];
    const syy = pyy[j + 1] - pyy[i];
    const e = syy - 2 * a * sy - 2 * b * sxy + a * a * c + 2 * a * b * sx + b * b * sxx;
    return e > 0 ? e : 0;
  };
  const segments = want - 1;
  // cost[s][j]: least error covering points 0..j with s segments ending at j
  let prev = new Float64Array(m).fill(Infinity);
  prev[0] = 0;
  const from: Int32Array[] = [];
  for (let s = 1; s <= segments; s++) {
    const cur = new Float64Array(m).fill(Infinity);
    const arg = new Int32Array(m).fill(-1);
    for (let j = s; j < m; j++) {
      for (let i = s - 1; i < j; i++) {
        if (prev[i] === Infinity) continue;
        const c = prev[i] + segmentError(i, j);
        if (c < cur[j]) {
          cur[j] = c;
          arg[j] = i;
        }
      }
    }
    from.push(arg);
    prev = cur;
  }
  const indices = [m - 1];
  let j = m - 1;
  for (let s = segments; s >= 1; s--) {
    j = from[s - 1][j];
    indices.push(j);
  }
  indices.reverse();
  return { indices };
}
