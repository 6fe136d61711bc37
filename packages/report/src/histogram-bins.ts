/**
 * Equal-width histogram bins on a "nice" step (1, 2 or 5 × 10^k), about Sturges' number of
 * bins (⌈log2 n⌉ + 1, at least 5, at most 30). Written here because the binning inside
 * Vega-Lite does not hand the step back, and the fitted density must be scaled by it
 * (expected count per bin = n · step · pdf). Non-finite values are ignored; no finite value
 * gives no bins; all values equal give one bin of width 1 unit around them.
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

function niceStep(rough: number): number {
  const power = 10 ** Math.floor(Math.log10(rough));
  const fraction = rough / power;
  const nice = fraction <= 1 ? 1 : fraction <= 2 ? 2 : fraction <= 5 ? 5 : 10;
  return nice * power;
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
  const target = Math.min(30, Math.max(5, Math.ceil(Math.log2(n)) + 1));
  const step = niceStep((max - min) / target);
  const first = Math.floor(min / step) * step;
  const count = Math.max(1, Math.ceil((max - first) / step + 1e-9));
  const bins: HistogramBin[] = Array.from({ length: count }, (_, i) => ({
    start: first + i * step,
    stop: first + (i + 1) * step,
    count: 0,
  }));
  for (const v of finite) {
    const index = Math.min(count - 1, Math.floor((v - first) / step + 1e-9));
    bins[index].count += 1;
  }
  return { step, bins, n };
}
