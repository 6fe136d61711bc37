/**
 * Tabular (two one-sided) CUSUM on standardized values z, Page (1954); form and average run
 * lengths as in Montgomery, "Introduction to Statistical Quality Control":
 *   C⁺_i = max(0, z_i − k + C⁺_{i−1}),  C⁻_i = max(0, −z_i − k + C⁻_{i−1}),  C⁺_0 = C⁻_0 = 0,
 * signal when C⁺ > h or C⁻ > h. N⁺/N⁻ count consecutive nonzero sums; Montgomery's estimate of
 * the shifted mean after a signal is k + C⁺/N⁺ (upward) or −(k + C⁻/N⁻) (downward), in SD.
 * No restart after a signal: a sustained shift gives one long episode, not a string of alarms.
 */
import type { CusumParams } from './types.ts';

export const DEFAULT_CUSUM: CusumParams = { k: 0.5, h: 5 };

export interface CusumChart {
  high: Float64Array;
  low: Float64Array;
  /** Consecutive points with a nonzero sum, ending here. */
  nHigh: Int32Array;
  nLow: Int32Array;
  outHigh: Uint8Array;
  outLow: Uint8Array;
}

export function cusumChart(z: ArrayLike<number>, params: CusumParams): CusumChart {
  const n = z.length;
  const high = new Float64Array(n);
  const low = new Float64Array(n);
  const nHigh = new Int32Array(n);
  const nLow = new Int32Array(n);
  const outHigh = new Uint8Array(n);
  const outLow = new Uint8Array(n);
  let cp = 0;
  let cm = 0;
  let np = 0;
  let nm = 0;
  for (let i = 0; i < n; i++) {
    cp = Math.max(0, z[i] - params.k + cp);
    cm = Math.max(0, -z[i] - params.k + cm);
    np = cp > 0 ? np + 1 : 0;
    nm = cm > 0 ? nm + 1 : 0;
    high[i] = cp;
    low[i] = cm;
    nHigh[i] = np;
    nLow[i] = nm;
    outHigh[i] = cp > params.h ? 1 : 0;
    outLow[i] = cm > params.h ? 1 : 0;
  }
  return { high, low, nHigh, nLow, outHigh, outLow };
}

/**
 * Run length of a fresh two-sided tabular CUSUM (zero start) fed by nextZ: the 1-based index of
 * the first signal on either side, or maxRun if none by then. Same recursion as cusumChart.
 */
export function cusumRunLength(nextZ: () => number, params: CusumParams, maxRun = 1_000_000): number {
  let cp = 0;
  let cm = 0;
  for (let i = 1; i <= maxRun; i++) {
    const z = nextZ();
    cp = Math.max(0, z - params.k + cp);
    cm = Math.max(0, -z - params.k + cm);
    if (cp > params.h || cm > params.h) return i;
  }
  return maxRun;
}
