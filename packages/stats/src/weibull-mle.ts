/**
 * Two-parameter Weibull maximum-likelihood estimates from the logarithms of complete data, no
 * goodness of fit: the core of `fit-weibull.ts` and of the pivot simulation of the exact
 * tolerance limit (`weibull-tolerance-factor.ts`), which calls it many thousands of times.
 *
 * The shape k̂ solves the profile score equation (Lawless 2003, *Statistical Models and Methods for
 * Lifetime Data*, §5.2)  Σ x^k ln x / Σ x^k − 1/k − mean(ln x) = 0, by safeguarded Newton iteration
 * from the moment estimate k₀ = π / (√6 · sd(ln x)); then λ̂ = (Σ x^k / n)^{1/k}. Logs are shifted by
 * max ln x so x^k never overflows. Written by hand: the packages that fit a Weibull use a general
 * optimizer, several times slower per sample and without a stated tolerance.
 *
 * Input: ln x in any order (finite). Output: shape k̂ (dimensionless) and ln λ̂ (log of the data's
 * unit). Degenerate input: fewer than 2 values or zero spread → null.
 */

export interface WeibullMle {
  shape: number;
  logScale: number;
}

export function weibullMleFromLogs(logs: ArrayLike<number>, work?: Float64Array): WeibullMle | null {
  const n = logs.length;
  if (n < 2) return null;
  let c = -Infinity;
  for (let i = 0; i < n; i++) if (logs[i] > c) c = logs[i];
  const t = work && work.length >= n ? work : new Float64Array(n);
  let meanT = 0;
  for (let i = 0; i < n; i++) {
    t[i] = logs[i] - c;
    meanT += t[i];
  }
  meanT /= n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (t[i] - meanT) ** 2;
  if (!(ss > 0)) return null;
  const sdLog = Math.sqrt(ss / (n - 1));

  // h(k) = A1/A0 − 1/k − mean(t), with A_j = Σ e^{k t} t^j; h is increasing in k.
  let a0 = 0;
  let hk = 0;
  let dh = 0;
  const evaluate = (k: number): void => {
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    for (let i = 0; i < n; i++) {
      const e = Math.exp(k * t[i]);
      s0 += e;
      s1 += e * t[i];
      s2 += e * t[i] * t[i];
    }
    const m1 = s1 / s0;
    a0 = s0;
    hk = m1 - 1 / k - meanT;
    dh = s2 / s0 - m1 * m1 + 1 / (k * k);
  };
  let k = Math.PI / (Math.sqrt(6) * sdLog);
  let lo = 0;
  let hi = Infinity;
  evaluate(k);
  for (let iter = 0; iter < 100; iter++) {
    if (hk > 0) hi = Math.min(hi, k);
    else lo = Math.max(lo, k);
    let next = k - hk / dh;
    // Keep Newton inside the bracket; bisect (or expand) otherwise.
    if (!(next > lo && next < hi)) next = Number.isFinite(hi) ? 0.5 * (lo + hi) : 2 * k;
    const done = Math.abs(next - k) <= 1e-13 * k;
    k = next;
    evaluate(k);
    if (done) break;
  }
  if (!(k > 0) || !Number.isFinite(k)) return null;
  return { shape: k, logScale: c + Math.log(a0 / n) / k };
}
