/**
 * Change points in the mean by PELT, Killick, Fearnhead & Eckley (2012), "Optimal detection of
 * changepoints with a linear computational cost", J. Am. Stat. Assoc. 107:1590–1598.
 * Cost of a segment: normal mean change with a common, known sigma, on the −2·log-likelihood
 * scale, C(y_{a..b−1}) = Σ (y_i − ȳ)² / σ². Minimizes Σ C(segment) + β·(number of changes),
 * exactly (the same optimum as the optimal-partitioning recursion of Jackson et al. 2005),
 * with pruning constant K = 0 (valid for this cost, since splitting never raises it).
 * Penalty β: a number, or 'bic' = 2·ln n, i.e. (p + 1)·ln n with p = 1 parameter per added
 * segment (its mean) plus its location, as in the penalties of Killick & Eckley (2014) — from
 * memory. Default sigma: MAD of first differences / √2, robust to the shifts themselves
 * (differencing as in Fryzlewicz 2014, Ann. Stat. 42:2243 — from memory), falling back to
 * MR̄/1.128 and then to the sample SD.
 * Input values in any unit; returns indices of the first point of each new segment, ascending.
 * Degenerate input: fewer than 2·minSegment points, or zero spread, gives no change points.
 */
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';

export interface PeltOptions {
  penalty?: number | 'bic';
  minSegment?: number;
  /** Sigma of the cost; default: robust estimate from first differences. */
  sigma?: number;
}

export interface PeltResult {
  /** Index of the first point of each new segment. */
  changes: number[];
  sigma: number;
  penalty: number;
  minSegment: number;
  /** Minimized total: segment costs + penalty × changes. */
  cost: number;
}

export const DEFAULT_MIN_SEGMENT = 5;

/** Robust sigma from first differences: median|Δy| / (√2 · Φ⁻¹(0.75)), with fallbacks; 0 if none. */
export function differenceSigma(values: ArrayLike<number>): number {
  const n = values.length;
  if (n < 2) return 0;
  const d = new Float64Array(n - 1);
  let sumAbs = 0;
  for (let i = 1; i < n; i++) {
    d[i - 1] = Math.abs(values[i] - values[i - 1]);
    sumAbs += d[i - 1];
  }
  d.sort();
  const m = d.length;
  const med = m % 2 === 1 ? d[(m - 1) / 2] : 0.5 * (d[m / 2 - 1] + d[m / 2]);
  if (med > 0) return med / (Math.SQRT2 * normalQuantile(0.75, 0, 1));
  if (sumAbs > 0) return sumAbs / m / 1.128;
  return 0;
}

/** Penalty value for n points. */
export function changePointPenalty(penalty: number | 'bic' | undefined, n: number): number {
  if (typeof penalty === 'number') return penalty;
  return 2 * Math.log(Math.max(n, 2));
}

/** Prefix sums of centred values and their squares, for O(1) segment costs. */
export interface SegmentSums {
  s1: Float64Array;
  s2: Float64Array;
  centre: number;
}

export function segmentSums(values: ArrayLike<number>): SegmentSums {
  const n = values.length;
  let centre = 0;
  for (let i = 0; i < n; i++) centre += values[i];
  centre = n > 0 ? centre / n : 0;
  const s1 = new Float64Array(n + 1);
  const s2 = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) {
    const y = values[i] - centre;
    s1[i + 1] = s1[i] + y;
    s2[i + 1] = s2[i] + y * y;
  }
  return { s1, s2, centre };
}

/** Residual sum of squares of values[a..b−1] about their mean. */
export function segmentRss(s: SegmentSums, a: number, b: number): number {
  const len = b - a;
  if (len <= 0) return 0;
  const t1 = s.s1[b] - s.s1[a];
  const r = s.s2[b] - s.s2[a] - (t1 * t1) / len;
  return r > 0 ? r : 0;
}

export function peltMeanChange(values: ArrayLike<number>, opts: PeltOptions = {}): PeltResult {
  const n = values.length;
  const m = Math.max(1, Math.floor(opts.minSegment ?? DEFAULT_MIN_SEGMENT));
  const beta = changePointPenalty(opts.penalty, n);
  const sigma = opts.sigma ?? differenceSigma(values);
  if (n < 2 * m || !(sigma > 0) || !Number.isFinite(sigma)) {
    return { changes: [], sigma, penalty: beta, minSegment: m, cost: 0 };
  }
  const sums = segmentSums(values);
  const inv = 1 / (sigma * sigma);
  const F = new Float64Array(n + 1).fill(Infinity);
  const last = new Int32Array(n + 1).fill(-1);
  F[0] = -beta;
  // Candidates: last change before t. A candidate failing the pruning test at time t can still be
  // optimal for t' < t + m (where t itself is not yet a feasible change), so it is dropped at t + m.
  // Typed arrays compacted in place keep the inner loop free of allocation.
  const cand = new Int32Array(n + 1);
  const dropAt = new Float64Array(n + 1);
  const vals = new Float64Array(n + 1);
  const { s1, s2 } = sums;
  let nc = 1;
  cand[0] = 0;
  dropAt[0] = Infinity;
  for (let t = m; t <= n; t++) {
    const fresh = t - m;
    if (fresh >= m) {
      cand[nc] = fresh;
      dropAt[nc] = Infinity;
      nc++;
    }
    let best = Infinity;
    let arg = -1;
    const s1t = s1[t];
    const s2t = s2[t];
    for (let j = 0; j < nc; j++) {
      const tau = cand[j];
      const d1 = s1t - s1[tau];
      let rss = s2t - s2[tau] - (d1 * d1) / (t - tau);
      if (rss < 0) rss = 0;
      const v = F[tau] + rss * inv + beta;
      vals[j] = v;
      if (v < best) {
        best = v;
        arg = tau;
      }
    }
    F[t] = best;
    last[t] = arg;
    let keep = 0;
    for (let j = 0; j < nc; j++) {
      let d = dropAt[j];
      if (d === Infinity && vals[j] - beta > best) d = t + m;
      if (d <= t + 1) continue; // not a candidate from the next step on
      cand[keep] = cand[j];
      dropAt[keep] = d;
      keep++;
    }
    nc = keep;
  }
  const changes: number[] = [];
  let t = n;
  while (t > 0) {
    const tau = last[t];
    if (tau > 0) changes.push(tau);
    t = tau;
  }
  changes.reverse();
  return { changes, sigma, penalty: beta, minSegment: m, cost: F[n] };
}
