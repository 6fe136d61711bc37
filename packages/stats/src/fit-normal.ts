/**
 * Normal and lognormal fits by maximum likelihood, each with its Anderson–Darling statistic and
 * p-value (parameters estimated, Stephens 1974 / D'Agostino & Stephens 1986 — see anderson-darling.ts).
 *
 * MLE: μ̂ = mean, σ̂ = √(Σ(x − μ̂)²/n) (as scipy.stats.norm.fit). The lognormal is the normal fit of
 * ln x with location fixed at 0 (as scipy.stats.lognorm.fit(x, floc=0)).
 * The Anderson–Darling statistic standardizes with the sample standard deviation (divisor n − 1),
 * as Stephens' case-3 tables and scipy.stats.anderson do.
 *
 * Units: normal params in the data's unit; lognormal params of ln x. Degenerate input: fewer than
 * 3 finite values, zero spread, or (lognormal) any value ≤ 0 → null.
 */
import { andersonDarlingPNormal, andersonDarlingStatistic } from './anderson-darling.ts';
import type { FitResult } from './fit-types.ts';
import { normalLogCdf } from './special/normal.ts';

const LN_2PI = Math.log(2 * Math.PI);

interface NormalCore {
  n: number;
  mu: number;
  sigmaMle: number;
  ad: number;
  p: number;
}

/** Fit of already sorted, finite values (ascending). */
function normalCore(sorted: ArrayLike<number>): NormalCore | null {
  const n = sorted.length;
  if (n < 3) return null;
  let s = 0;
  for (let i = 0; i < n; i++) s += sorted[i];
  const mu = s / n;
  let ss = 0;
  for (let i = 0; i < n; i++) {
    const d = sorted[i] - mu;
    ss += d * d;
  }
  if (!(ss > 0)) return null;
  const sigmaMle = Math.sqrt(ss / n);
  const sd = Math.sqrt(ss / (n - 1));
  const logCdf = new Float64Array(n);
  const logSf = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const z = (sorted[i] - mu) / sd;
    logCdf[i] = normalLogCdf(z);
    logSf[i] = normalLogCdf(-z);
  }
  const ad = andersonDarlingStatistic(logCdf, logSf);
  return { n, mu, sigmaMle, ad, p: andersonDarlingPNormal(ad, n) };
}

function sortedFinite(x: ArrayLike<number>, map?: (v: number) => number): Float64Array | null {
  const out: number[] = [];
  for (let i = 0; i < x.length; i++) {
    const v = x[i];
    if (!Number.isFinite(v)) continue;
    if (map) {
      const m = map(v);
      if (!Number.isFinite(m)) return null;
      out.push(m);
    } else out.push(v);
  }
  return Float64Array.from(out).sort();
}

/** Normal fit of the finite values of x (NaN = missing). */
export function fitNormal(x: ArrayLike<number>): FitResult | null {
  const y = sortedFinite(x);
  return y ? fitNormalSorted(y) : null;
}

/** Normal fit of finite values already sorted ascending (no copy). */
export function fitNormalSorted(sorted: ArrayLike<number>): FitResult | null {
  const c = normalCore(sorted);
  if (!c) return null;
  const loglik = -c.n * Math.log(c.sigmaMle) - 0.5 * c.n * LN_2PI - 0.5 * c.n;
  return {
    model: 'normal',
    params: { mu: c.mu, sigma: c.sigmaMle },
    ad: c.ad,
    p: c.p,
    p_method: 'stephens-formula',
    loglik,
    aic: 4 - 2 * loglik,
    n: c.n,
  };
}

/** Lognormal fit (location 0) of the finite values of x; null if any value is ≤ 0. */
export function fitLognormal(x: ArrayLike<number>): FitResult | null {
  const y = sortedFinite(x, (v) => (v > 0 ? Math.log(v) : NaN));
  return y ? fitLognormalSortedLogs(y) : null;
}

/** Lognormal fit from ln x already sorted ascending. */
export function fitLognormalSortedLogs(sortedLogs: ArrayLike<number>): FitResult | null {
  const c = normalCore(sortedLogs);
  if (!c) return null;
  let sumLog = 0;
  for (let i = 0; i < sortedLogs.length; i++) sumLog += sortedLogs[i];
  // Density of x: the normal density of ln x times the Jacobian 1/x.
  const loglik = -sumLog - c.n * Math.log(c.sigmaMle) - 0.5 * c.n * LN_2PI - 0.5 * c.n;
  return {
    model: 'lognormal',
    params: { mu: c.mu, sigma: c.sigmaMle },
    ad: c.ad,
    p: c.p,
    p_method: 'stephens-formula',
    loglik,
    aic: 4 - 2 * loglik,
    n: c.n,
  };
}
