/**
 * Equal-width histogram bins by the Freedman–Diaconis rule: bin width h = 2·IQR·n^(−1/3)
 * (D. Freedman, P. Diaconis, "On the histogram as a density estimator: L2 theory",
 * Z. Wahrscheinlichkeitstheorie verw. Gebiete 57 (1981) 453–476), IQR the distance between the
 * sample quartiles (linear interpolation between order statistics, Hyndman & Fan definition 7).
 * The bins span [min, max] exactly in k = ⌈(max − min)/h⌉ equal steps, the last bin closed — the
 * edges and counts of numpy.histogram(values, bins='fd') — with k held to at least MIN_BINS (a
 * small sample, or IQR = 0 from many equal values) and at most MAX_BINS (a long tail or an
 * outlier far out). Written here because the binning inside Vega-Lite does not hand the step
 * back, and the fitted density must be scaled by it (expected count per bin = n · step · pdf).
 * Non-finite values are ignored; no finite value gives no bins; all values equal give one bin
 * of width 1 unit around them.
 */
export interface HistogramBin {
  start: number;
  stop: number;
  count: number;
}

export interface Histogram {
  step: number;
  bins: HistogramBin[];
  n: number;
}

export const MIN_BINS = 5;
export const MAX_BINS = 60;

/** Sample quantile q of sorted values, linear between order statistics (Hyndman & Fan 7, numpy's default). */
function quantile(sorted: readonly number[], q: number): number {
  const h = (sorted.length - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/** The number of Freedman–Diaconis bins over [min, max] before the floor and the cap (1 when IQR = 0, as numpy). */
export function freedmanDiaconisCount(values: readonly number[]): number {
  const sorted = values.filter((v) => Number.isFinite(v)).sort((a, b) => a - b);
  const n = sorted.length;
  if (n === 0) return 0;
  const range = sorted[n - 1] - sorted[0];
  const width = (2 * (quantile(sorted, 0.75) - quantile(sorted, 0.25))) / Math.cbrt(n);
  if (!(width > 0) || !(range > 0)) return 1;
  return Math.ceil(range / width);
}

export function histogramBins(values: readonly number[]): Histogram {
  const finite = values.filter((v) => Number.isFinite(v));
  const n = finite.length;
  if (n === 0) return { step: 0, bins: [], n: 0 };
  let min = Infinity;
  let max = -Infinity;
  for (const v of finite) {
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (max === min) return { step: 1, bins: [{ start: min - 0.5, stop: min + 0.5, count: n }], n };
  const count = Math.min(MAX_BINS, Math.max(MIN_BINS, freedmanDiaconisCount(finite)));
  const step = (max - min) / count;
  // edges as numpy.linspace(min, max, count + 1): min + i·step, the last exactly max
  const edges = Array.from({ length: count + 1 }, (_, i) => (i === count ? max : min + i * step));
  const bins: HistogramBin[] = Array.from({ length: count }, (_, i) => ({ start: edges[i], stop: edges[i + 1], count: 0 }));
  for (const v of finite) {
    // the index by arithmetic, corrected against the edges for rounding (as numpy does); the last bin is closed
    let index = Math.min(count - 1, Math.floor(((v - min) * count) / (max - min)));
    if (v < edges[index]) index -= 1;
    else if (index < count - 1 && v >= edges[index + 1]) index += 1;
    bins[index].count += 1;
  }
  return { step, bins, n };
}
