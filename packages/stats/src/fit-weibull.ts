/**
 * Two-parameter Weibull fit by maximum likelihood (location fixed at 0, as
 * scipy.stats.weibull_min.fit(x, floc=0)), with its Anderson–Darling statistic and table p-value.
 *
 * F(x) = 1 − exp(−(x/λ)^k). The shape k̂ solves the profile score equation (Lawless 2003,
 * *Statistical Models and Methods for Lifetime Data*, §5.2)
 *   Σ x^k ln x / Σ x^k − 1/k − mean(ln x) = 0,
 * by safeguarded Newton iteration from the moment estimate k₀ = π / (√6 · sd(ln x)); then
 * λ̂ = (Σ x^k / n)^{1/k}. Logs are shifted by max ln x so x^k never overflows.
 * A² is computed on ln x against the smallest-extreme-value law with u = ln λ̂, b = 1/k̂, as
 * scipy.stats.anderson(ln x, 'gumbel_l') does; its p-value comes from the Stephens (1977) table.
 *
 * Units: scale in the data's unit, shape dimensionless. Degenerate input: fewer than 3 finite
 * values, any value ≤ 0, or zero spread → null.
 */
import { andersonDarlingPWeibull, andersonDarlingStatistic } from './anderson-darling.ts';
import type { FitResult } from './fit-types.ts';

export function fitWeibull(x: ArrayLike<number>): FitResult | null {
  const logs: number[] = [];
  for (let i = 0; i < x.length; i++) {
    const v = x[i];
    if (!Number.isFinite(v)) continue;
    if (!(v > 0)) return null;
    logs.push(Math.log(v));
  }
  return fitWeibullSortedLogs(Float64Array.from(logs).sort());
}

/** Weibull fit from ln x already sorted ascending. */
export function fitWeibullSortedLogs(sortedLogs: ArrayLike<number>): FitResult | null {
  const n = sortedLogs.length;
  if (n < 3) return null;
  const c = sortedLogs[n - 1];
  const t = new Float64Array(n);
  let meanT = 0;
  for (let i = 0; i < n; i++) {
    t[i] = sortedLogs[i] - c;
    meanT += t[i];
  }
  meanT /= n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (t[i] - meanT) ** 2;
  if (!(ss > 0)) return null;
  const sdLog = Math.sqrt(ss / (n - 1));

  // h(k) = A1/A0 − 1/k − mean(t), with A_j = Σ e^{k t} t^j; h is increasing in k.
  const h = (k: number): { h: number; dh: number; a0: number } => {
    let a0 = 0;
    let a1 = 0;
    let a2 = 0;
    for (let i = 0; i < n; i++) {
      const e = Math.exp(k * t[i]);
      a0 += e;
      a1 += e * t[i];
      a2 += e * t[i] * t[i];
    }
    const m1 = a1 / a0;
    return { h: m1 - 1 / k - meanT, dh: a2 / a0 - m1 * m1 + 1 / (k * k), a0 };
  };
  let k = Math.PI / (Math.sqrt(6) * sdLog);
  let lo = 0;
  let hi = Infinity;
  let cur = h(k);
  for (let iter = 0; iter < 100; iter++) {
    if (cur.h > 0) hi = Math.min(hi, k);
    else lo = Math.max(lo, k);
    let next = k - cur.h / cur.dh;
    // Keep Newton inside the bracket; bisect (or expand) otherwise.
    if (!(next > lo && next < hi)) next = Number.isFinite(hi) ? 0.5 * (lo + hi) : 2 * k;
    const done = Math.abs(next - k) <= 1e-13 * k;
    k = next;
    cur = h(k);
    if (done) break;
  }
  if (!(k > 0) || !Number.isFinite(k)) return null;
  const scale = Math.exp(c + Math.log(cur.a0 / n) / k);

  // Log-likelihood: Σ [ln k − k ln λ + (k − 1) ln x − (x/λ)^k]; Σ (x/λ)^k = n at the MLE.
  let sumLog = 0;
  for (let i = 0; i < n; i++) sumLog += sortedLogs[i];
  const lnScale = Math.log(scale);
  const loglik = n * Math.log(k) - n * k * lnScale + (k - 1) * sumLog - n;

  // A² on the smallest-extreme-value scale: z = k (ln x − ln λ), F = 1 − exp(−e^z).
  const logCdf = new Float64Array(n);
  const logSf = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const ez = Math.exp(k * (sortedLogs[i] - lnScale));
    logCdf[i] = Math.log(-Math.expm1(-ez));
    logSf[i] = -ez;
  }
  const ad = andersonDarlingStatistic(logCdf, logSf);
  const pv = andersonDarlingPWeibull(ad, n);
  return {
    model: 'weibull',
    params: { shape: k, scale },
    ad,
    p: pv.p,
    p_method: pv.method,
    loglik,
    aic: 4 - 2 * loglik,
    n,
  };
}
