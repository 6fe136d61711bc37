/**
 * Rolling capability of individual tests against a lower specification limit (the grade minimum,
 * which applies to each test), over a trailing window of tests, for a normal population
 * (Montgomery, process capability ratios; one-sided):
 *   margin_sd      = (x̄ − LSL) / s                 (s: sample SD of the window)
 *   ppk            = margin_sd / 3
 *   cpk            = (x̄ − LSL) / (3 · MR̄/d2)       (within-process sigma from moving ranges)
 *   fraction_below = Φ((LSL − x̄) / s)              (the fitted model's share of tests below)
 *   observed_below = (tests in the window below LSL) / (tests in the window)
 * O(n) with running sums (centred to keep precision). Units: values and LSL in the property's
 * units; margin in SD; fraction as a probability in [0, 1].
 * Degenerate input: fewer than `minPoints` in the window, or zero spread, gives nulls.
 */
import normalCdf from '@stdlib/stats-base-dists-normal-cdf';
import { MR_D2 } from './moving-range.ts';

export interface CapabilityPoint {
  index: number;
  date: string;
  /** Points in the window. */
  n: number;
  mean: number | null;
  sd: number | null;
  margin_sd: number | null;
  cpk: number | null;
  ppk: number | null;
  fraction_below: number | null;
  /** Tests in the window below the limit, and their share. */
  n_below: number;
  observed_below: number;
}

export function rollingCapability(
  values: ArrayLike<number>,
  dates: readonly string[],
  lowerSpec: number,
  window = 50,
  minPoints = Math.min(20, window),
): CapabilityPoint[] {
  const n = values.length;
  const W = Math.max(2, Math.floor(window));
  const minN = Math.max(2, Math.min(W, Math.floor(minPoints)));
  const out: CapabilityPoint[] = new Array(n);
  const c = n > 0 ? values[0] : 0;
  let s1 = 0;
  let s2 = 0;
  let mrSum = 0;
  let scale = 0;
  let below = 0;
  for (let i = 0; i < n; i++) {
    const y = values[i] - c;
    s1 += y;
    s2 += y * y;
    if (values[i] < lowerSpec) below++;
    if (i > 0) mrSum += Math.abs(values[i] - values[i - 1]);
    if (i >= W) {
      const yo = values[i - W] - c;
      s1 -= yo;
      s2 -= yo * yo;
      if (values[i - W] < lowerSpec) below--;
      mrSum -= Math.abs(values[i - W + 1] - values[i - W]);
    }
    scale = Math.max(scale, Math.abs(y));
    const k = Math.min(i + 1, W);
    if (k < minN) {
      out[i] = { index: i, date: dates[i], n: k, mean: null, sd: null, margin_sd: null, cpk: null, ppk: null, fraction_below: null, n_below: below, observed_below: below / k };
      continue;
    }
    const mean = c + s1 / k;
    const v = (s2 - (s1 * s1) / k) / (k - 1);
    // Treat round-off residue as zero spread.
    const sd = v > 1e-24 * (scale * scale + 1) ? Math.sqrt(v) : 0;
    const mrBar = Math.max(0, mrSum) / (k - 1);
    const sigmaWithin = mrBar / MR_D2;
    const margin = sd > 0 ? (mean - lowerSpec) / sd : null;
    out[i] = {
      index: i,
      date: dates[i],
      n: k,
      mean,
      sd,
      margin_sd: margin,
      ppk: margin === null ? null : margin / 3,
      cpk: sigmaWithin > 1e-12 * (Math.abs(mean) + 1) ? (mean - lowerSpec) / (3 * sigmaWithin) : null,
      fraction_below: sd > 0 ? normalCdf(lowerSpec, mean, sd) : null,
      n_below: below,
      observed_below: below / k,
    };
  }
  return out;
}
