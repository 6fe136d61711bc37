/**
 * Size and uncertainty of each detected change in the mean.
 * Shift: mean after − mean before, over the neighbouring segments (between the adjacent change
 * points), in the property's units. Its interval: Welch's (1947) t interval with the two segment
 * SDs and the Welch–Satterthwaite degrees of freedom. It is conditional on the location found,
 * so it is somewhat optimistic (the location was chosen to maximize the difference).
 * Location: residual bootstrap (resampling residuals about the segment means, re-locating the
 * single change inside the two segments by least squares; e.g. Hušková & Kirch 2008,
 * J. Time Ser. Anal. 29:947 — from memory), percentile interval, with a seeded generator.
 * A segment of one point borrows the series sigma as its SD.
 */
import tQuantile from '@stdlib/stats-base-dists-t-quantile';
import { createMonitorRandom } from './random.ts';

export interface ChangePoint {
  /** Index of the first point after the change. */
  index: number;
  date: string;
  testId: string;
  /** mean_after − mean_before, property units. */
  shift: number;
  /** Confidence interval of the shift (property units), at `level`. */
  ci: [number, number];
  shift_se: number;
  shift_df: number;
  /** Shift in units of the series sigma used by the detector. */
  shift_sd: number;
  level: number;
  mean_before: number;
  mean_after: number;
  sd_before: number;
  sd_after: number;
  n_before: number;
  n_after: number;
  /** Interval of the location (index of the first point after the change, and its date). */
  location_ci: { index: [number, number]; date: [string, string]; method: 'residual-bootstrap'; resamples: number } | null;
}

export interface ChangePointUncertaintyOptions {
  level?: number;
  bootstrap?: number;
  seed?: number;
  minSegment?: number;
  /** Series sigma (as used by the detector). */
  sigma: number;
}

function meanSd(values: ArrayLike<number>, a: number, b: number, fallbackSd: number): { mean: number; sd: number } {
  const n = b - a;
  let s = 0;
  for (let i = a; i < b; i++) s += values[i];
  const mean = s / n;
  if (n < 2) return { mean, sd: fallbackSd };
  let ss = 0;
  for (let i = a; i < b; i++) ss += (values[i] - mean) ** 2;
  return { mean, sd: Math.sqrt(ss / (n - 1)) };
}

function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  // Type-7 (linear) quantile of a sorted sample.
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/**
 * Least-squares location of one change inside values[a..b−1], each side at least m points:
 * the index of the first point after the change, or −1 if the stretch is shorter than 2m.
 * `scratch` (length ≥ b − a + 1) avoids allocation in bootstrap loops.
 */
export function locateSingleChange(values: ArrayLike<number>, a: number, b: number, m: number, scratch?: Float64Array): number {
  const len = b - a;
  if (len < 2 * m) return -1;
  const s1 = scratch && scratch.length > len ? scratch : new Float64Array(len + 1);
  const c0 = values[a];
  s1[0] = 0;
  for (let i = 0; i < len; i++) s1[i + 1] = s1[i] + (values[a + i] - c0);
  // RSS(0,τ) + RSS(τ,len) = Σy² − S(τ)²/τ − (S(len) − S(τ))²/(len − τ): maximize the last two.
  const total = s1[len];
  let best = -Infinity;
  let arg = -1;
  for (let tau = m; tau <= len - m; tau++) {
    const st = s1[tau];
    const rest = total - st;
    const v = (st * st) / tau + (rest * rest) / (len - tau);
    if (v > best) {
      best = v;
      arg = tau;
    }
  }
  return a + arg;
}

export function describeChangePoints(
  values: ArrayLike<number>,
  dates: readonly string[],
  testIds: readonly string[],
  changes: readonly number[],
  opts: ChangePointUncertaintyOptions,
): ChangePoint[] {
  const level = opts.level ?? 0.95;
  const B = Math.max(0, Math.floor(opts.bootstrap ?? 199));
  const m = Math.max(1, Math.floor(opts.minSegment ?? 5));
  const rng = createMonitorRandom(opts.seed ?? 20260101);
  const bounds = [0, ...changes, values.length];
  const out: ChangePoint[] = [];
  for (let j = 1; j < bounds.length - 1; j++) {
    const a = bounds[j - 1];
    const c = bounds[j];
    const b = bounds[j + 1];
    const before = meanSd(values, a, c, opts.sigma);
    const after = meanSd(values, c, b, opts.sigma);
    const nA = c - a;
    const nB = b - c;
    const vA = (before.sd * before.sd) / nA;
    const vB = (after.sd * after.sd) / nB;
    const se = Math.sqrt(vA + vB);
    const shift = after.mean - before.mean;
    // Welch–Satterthwaite df; a one-point segment contributes with nA − 1 = 0 → use 1.
    const dfDen = (nA > 1 ? (vA * vA) / (nA - 1) : vA * vA) + (nB > 1 ? (vB * vB) / (nB - 1) : vB * vB);
    const df = dfDen > 0 ? ((vA + vB) * (vA + vB)) / dfDen : nA + nB - 2;
    const tq = se > 0 ? tQuantile(1 - (1 - level) / 2, Math.max(df, 1)) : 0;
    let location: ChangePoint['location_ci'] = null;
    if (B > 0 && b - a >= 2 * m) {
      const fitted = new Float64Array(b - a);
      const resid = new Float64Array(b - a);
      for (let i = a; i < b; i++) {
        fitted[i - a] = i < c ? before.mean : after.mean;
        resid[i - a] = values[i] - fitted[i - a];
      }
      const star = new Float64Array(b - a);
      const taus = new Float64Array(B);
      const scratch = new Float64Array(star.length + 1);
      for (let r = 0; r < B; r++) {
        for (let i = 0; i < star.length; i++) star[i] = fitted[i] + resid[rng.index(resid.length)];
        taus[r] = a + locateSingleChange(star, 0, star.length, m, scratch);
      }
      taus.sort();
      const lo = Math.round(quantileSorted(taus, (1 - level) / 2));
      const hi = Math.round(quantileSorted(taus, 1 - (1 - level) / 2));
      location = { index: [lo, hi], date: [dates[lo], dates[hi]], method: 'residual-bootstrap', resamples: B };
    }
    out.push({
      index: c,
      date: dates[c],
      testId: testIds[c],
      shift,
      ci: [shift - tq * se, shift + tq * se],
      shift_se: se,
      shift_df: df,
      shift_sd: opts.sigma > 0 ? shift / opts.sigma : 0,
      level,
      mean_before: before.mean,
      mean_after: after.mean,
      sd_before: before.sd,
      sd_after: after.sd,
      n_before: nA,
      n_after: nB,
      location_ci: location,
    });
  }
  return out;
}
