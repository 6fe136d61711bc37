/**
 * Maximum force of a noisy record and the strain at it, from smooth fits to the top of the curve
 * instead of the largest recorded point (which lies 2.5–3 noise SDs above the curve, and on a
 * flat top wanders far along it).
 *
 *  1. The top: a 15-point moving average locates it; the band is the contiguous run of points
 *     where that average stays within `DROP_NOISE_SDS` noise SDs of its top (each side as far as
 *     it goes, at most `MAX_SIDE_POINTS` points).
 *  2. Rm: a split parabola s(x) = m − a_L·(x − t)² left of t, m − a_R·(x − t)² right of it
 *     (a_L, a_R ≥ 0), fitted to the band by least squares with the vertex t profiled over the
 *     band (linear least squares for m, a_L, a_R at each t; the t with the smallest residual sum
 *     of squares). Rm = m. The two curvatures let a slow rise meet a steep neck.
 *  3. The strain at maximum force: the maximum of a local quadratic smooth (local polynomial
 *     regression of degree 2, uniform kernel: Fan & Gijbels, *Local Polynomial Modelling and Its
 *     Applications*, 1996) over the band near t, with the window half-width h = the shorter side
 *     of the band measured from t, windows shrunk symmetrically at the band's ends; refined
 *     between samples by the parabola through the three highest smoothed values. A local
 *     quadratic fit over a symmetric window is exact for a cubic, so the top's asymmetry (a
 *     hardening law's rise, a neck's fall) does not move this maximum to that order, where the
 *     split parabola's vertex moves with it.
 *
 * Checked on Hollomon records with a chosen post-necking fall and seeded noise of 0.3, 1 and
 * 3 MPa (test/curves-maximum-force-bias.test.ts): Rm within 0.15 noise SD of the law's
 * K·nⁿ·e⁻ⁿ on average (the largest point: 2.3–2.8 SD high), Ag within 0.3 point of
 * eⁿ − 1 − Rm/E (one parabola's vertex: up to 1.2 points low).
 *
 * Hand-written: the fits are needed only at the top, on an uneven strain axis (samples are spaced
 * in time, not strain), with prefix sums so the cost stays O(points in the band); the smoothing
 * packages on npm assume evenly spaced abscissae, and none fits a split parabola.
 *
 * In: engineering strain (mm/mm, increasing), stress (MPa), the index of the largest recorded
 * stress, the noise SD (MPa), the end of the usable record (exclusive). Out: Rm (MPa), the strain
 * at it (mm/mm), the index of the last sample at or before that strain, the half-width of the
 * band. Degenerate cases: noise below 0.01 % of the top, fewer than `MIN_SIDE_POINTS` points on a
 * side of the band, or no concave fit return the largest recorded point, `smoothed: false`.
 */
export interface SmoothMaximum {
  stressMpa: number;
  strain: number;
  /** last sample at or before the maximum's strain */
  index: number;
  /** half the strain width of the band the fits used, mm/mm (0 when not smoothed) */
  halfWidth: number;
  smoothed: boolean;
}

/** The top's band: the moving average within this many noise SDs of its maximum. */
export const DROP_NOISE_SDS = 3;
const MA_HALF = 7;
const MIN_SIDE_POINTS = 5;
const MAX_SIDE_POINTS = 1000;
/** candidate vertices per interval between samples in the split-parabola profile */
const VERTEX_STEPS = 4;
const EDGE_SLACK = 1e-12;

/** Locates the top on the moving average and returns its band [a, b] and the average's top. */
function topBand(stressMpa: ArrayLike<number>, imax: number, noiseMpa: number, last: number): { a: number; b: number; top: number } {
  const mean = (j: number): number => {
    const lo = Math.max(0, j - MA_HALF), hi = Math.min(last, j + MA_HALF);
    let s = 0;
    for (let k = lo; k <= hi; k++) s += stressMpa[k];
    return s / (hi - lo + 1);
  };
  let jm = imax, top = -Infinity;
  for (let j = Math.max(0, imax - 20 * MA_HALF), until = Math.min(last, imax + 20 * MA_HALF); j <= until; j++) {
    const m = mean(j);
    if (m > top) { top = m; jm = j; }
  }
  const floor = top - DROP_NOISE_SDS * noiseMpa;
  let a = jm, b = jm;
  while (a > 0 && jm - a < MAX_SIDE_POINTS && mean(a - 1) >= floor) a--;
  while (b < last && b - jm < MAX_SIDE_POINTS && mean(b + 1) >= floor) b++;
  return { a, b, top };
}

export function smoothMaximum(strain: ArrayLike<number>, stressMpa: ArrayLike<number>, imax: number, noiseMpa: number, to = stressMpa.length): SmoothMaximum {
  const rm = stressMpa[imax];
  const raw: SmoothMaximum = { stressMpa: rm, strain: strain[imax], index: imax, halfWidth: 0, smoothed: false };
  if (!(3 * noiseMpa > 1e-4 * Math.abs(rm))) return raw; // noise below resolution: the highest point is best
  const last = to - 1;
  const { a, b, top } = topBand(stressMpa, imax, noiseMpa, last);
  const count = b - a + 1;
  const centre = (strain[a] + strain[b]) / 2, half = (strain[b] - strain[a]) / 2;
  if (count < 2 * MIN_SIDE_POINTS + 1 || !(half > 0)) return raw;

  // prefix sums of u^k (k ≤ 4) and v·u^k (k ≤ 2), u = (x − centre)/half ∈ [−1, 1], v = y − top
  const U = new Float64Array(count);
  const P = Array.from({ length: 5 }, () => new Float64Array(count + 1));
  const Q = Array.from({ length: 3 }, () => new Float64Array(count + 1));
  for (let i = 0; i < count; i++) {
    const u = (strain[a + i] - centre) / half, v = stressMpa[a + i] - top;
    U[i] = u;
    let p = 1;
    for (let k = 0; k <= 4; k++) {
      P[k][i + 1] = P[k][i] + p;
      if (k <= 2) Q[k][i + 1] = Q[k][i] + v * p;
      p *= u;
    }
  }

  // 2. split parabola, vertex t between sample split−1 and split
  const sumV = Q[0][count];
  /** Σ(u − t)², Σ(u − t)⁴ and Σv·(u − t)² of one side from its plain sums (binomial expansion) */
  const side = (p0: number, p1: number, p2: number, p3: number, p4: number, q0: number, q1: number, q2: number, t: number, out: Float64Array, at: number) => {
    const t2 = t * t;
    out[at] = p2 - 2 * t * p1 + t2 * p0;
    out[at + 1] = p4 - 4 * t * p3 + 6 * t2 * p2 - 4 * t2 * t * p1 + t2 * t2 * p0;
    out[at + 2] = q2 - 2 * t * q1 + t2 * q0;
  };
  const sums = new Float64Array(6);
  let lastM = NaN; // m of the last concave fit
  /** explained sum of squares of the fit with its vertex at t (the first `split` points left of it); NaN if not concave */
  const explained = (t: number, split: number): number => {
    const P0 = P[0], P1 = P[1], P2 = P[2], P3 = P[3], P4 = P[4], Q0 = Q[0], Q1 = Q[1], Q2 = Q[2];
    side(P0[split], P1[split], P2[split], P3[split], P4[split], Q0[split], Q1[split], Q2[split], t, sums, 0);
    side(P0[count] - P0[split], P1[count] - P1[split], P2[count] - P2[split], P3[count] - P3[split], P4[count] - P4[split],
      Q0[count] - Q0[split], Q1[count] - Q1[split], Q2[count] - Q2[split], t, sums, 3);
    const [l2, l4, ly, r2, r4, ry] = sums;
    // normal equations of v = m − a_L·dL² − a_R·dR², solved for m after eliminating a_L, a_R
    const den = count - (l2 * l2) / l4 - (r2 * r2) / r4;
    if (!(den > 0)) return NaN;
    const mm = (sumV - (l2 * ly) / l4 - (r2 * ry) / r4) / den;
    const aL = (l2 * mm - ly) / l4, aR = (r2 * mm - ry) / r4;
    if (!(aL >= 0 && aR >= 0)) return NaN; // not a maximum at t
    lastM = mm;
    return mm * sumV - aL * ly - aR * ry;
  };
  // coarse: the vertex midway between samples; fine: sub-steps in the best interval and its neighbours
  let best = -Infinity, bestSplit = -1;
  for (let split = MIN_SIDE_POINTS; split <= count - MIN_SIDE_POINTS; split++) {
    const e = explained((U[split - 1] + U[split]) / 2, split);
    if (e > best) { best = e; bestSplit = split; }
  }
  if (bestSplit < 0) return raw;
  let t = NaN, m = NaN;
  best = -Infinity;
  for (let split = Math.max(MIN_SIDE_POINTS, bestSplit - 1); split <= Math.min(count - MIN_SIDE_POINTS, bestSplit + 1); split++) {
    const lo = U[split - 1], hi = U[split];
    for (let q = 0; q < VERTEX_STEPS; q++) {
      const tq = lo + ((hi - lo) * (q + 0.5)) / VERTEX_STEPS;
      const e = explained(tq, split);
      if (e > best) { best = e; t = tq; m = lastM; }
    }
  }
  if (!Number.isFinite(t)) return raw;

  // 3. local quadratic smooth near t; window edges move monotonically, so two pointers suffice
  const h = Math.min(1 + t, 1 - t);
  let lo = 0, hi = -1, k = -1;
  const smooth = new Float64Array(count).fill(-Infinity);
  const seg = (A: Float64Array) => A[hi + 1] - A[lo];
  for (let j = 0; j < count; j++) {
    const uj = U[j];
    if (Math.abs(uj - t) > h) continue;
    const hj = Math.min(h, uj + 1, 1 - uj);
    // the slack keeps the band's end points in the windows they close (u = ±1 up to round-off)
    while (lo < j && U[lo] < uj - hj - EDGE_SLACK) lo++;
    if (hi < j) hi = j;
    while (hi + 1 < count && U[hi + 1] <= uj + hj + EDGE_SLACK) hi++;
    if (j - lo < 2 || hi - j < 2) continue;
    const s0 = seg(P[0]), s1 = seg(P[1]), s2 = seg(P[2]), s3 = seg(P[3]), s4 = seg(P[4]);
    const t0 = seg(Q[0]), t1 = seg(Q[1]), t2 = seg(Q[2]);
    // [s0 s1 s2; s1 s2 s3; s2 s3 s4]·c = [t0 t1 t2] by Cramer's rule, evaluated at u_j
    const det = s0 * (s2 * s4 - s3 * s3) - s1 * (s1 * s4 - s3 * s2) + s2 * (s1 * s3 - s2 * s2);
    if (!(Math.abs(det) > 0)) continue;
    const c0 = (t0 * (s2 * s4 - s3 * s3) - s1 * (t1 * s4 - s3 * t2) + s2 * (t1 * s3 - s2 * t2)) / det;
    const c1 = (s0 * (t1 * s4 - s3 * t2) - t0 * (s1 * s4 - s3 * s2) + s2 * (s1 * t2 - t1 * s2)) / det;
    const c2 = (s0 * (s2 * t2 - t1 * s3) - s1 * (s1 * t2 - t1 * s2) + t0 * (s1 * s3 - s2 * s2)) / det;
    smooth[j] = c0 + uj * (c1 + uj * c2);
    if (k < 0 || smooth[j] > smooth[k]) k = j;
  }
  let xs = centre + t * half;
  if (k >= 0) {
    xs = strain[a + k];
    if (k > 0 && k < count - 1 && Number.isFinite(smooth[k - 1]) && Number.isFinite(smooth[k + 1])) {
      // vertex of the parabola through the three highest smoothed values (uneven spacing)
      const xa = strain[a + k - 1], xb = xs, xc = strain[a + k + 1];
      const d1 = (smooth[k] - smooth[k - 1]) / (xb - xa), d2 = (smooth[k + 1] - smooth[k]) / (xc - xb);
      const curv = (d2 - d1) / (xc - xa);
      if (curv < 0) {
        const xv = (xa + xb) / 2 - d1 / (2 * curv);
        if (xv > xa && xv < xc) xs = xv;
      }
    }
  }
  let index = a;
  while (index < last && strain[index + 1] <= xs) index++;
  return { stressMpa: top + m, strain: xs, index, halfWidth: half, smoothed: true };
}
