/**
 * Monte Carlo study of the characteristic-value methods: samples of size n drawn from a known
 * normal, lognormal or Weibull population (seeded), summarized by `summarizeProperty`, and each
 * method's value compared with the population's true lower (1 − p)-quantile. A tolerance limit
 * "covers" when it lies at or below that quantile; the share of samples that cover is the achieved
 * confidence. For the EN 1990 fractiles (prediction bounds, no confidence) the figure is the mean
 * population fraction below the value, which should be 5 %.
 *
 * True quantiles from the exact formulas (normal μ + σ·z; lognormal exp(μ + σ·z); Weibull
 * λ·(−ln p)^{1/k}); the checks spot-check them against SciPy's ppf.
 */
import { createMonitorRandom, normalCdf, normalQuantile, summarizeProperty, type CharacteristicMethod, type SummaryLevel } from '@fractile/stats';

export type Family = 'normal' | 'lognormal' | 'weibull';

/** Invented populations of a yield strength in MPa (CoV about 6–7 %). */
export const POPULATIONS: Record<Family, { params: Record<string, number> }> = {
  normal: { params: { mu: 400, sigma: 25 } },
  lognormal: { params: { mu: Math.log(400), sigma: 0.065 } },
  weibull: { params: { shape: 14, scale: 420 } },
};

/** P(X ≤ x) of the population. */
export function populationCdf(family: Family, x: number): number {
  const p = POPULATIONS[family].params;
  if (family === 'normal') return normalCdf((x - p.mu) / p.sigma);
  if (family === 'lognormal') return x > 0 ? normalCdf((Math.log(x) - p.mu) / p.sigma) : 0;
  return x > 0 ? -Math.expm1(-Math.pow(x / p.scale, p.shape)) : 0;
}

/** The value with a proportion `coverage` of the population above it. */
export function trueLowerQuantile(family: Family, coverage: number): number {
  const p = POPULATIONS[family].params;
  const z = normalQuantile(1 - coverage);
  if (family === 'normal') return p.mu + p.sigma * z;
  if (family === 'lognormal') return Math.exp(p.mu + p.sigma * z);
  return p.scale * Math.pow(-Math.log(coverage), 1 / p.shape);
}

/** The population's coefficient of variation (for the EN 1990 "V known" prior). */
export function populationCov(family: Family): number {
  const p = POPULATIONS[family].params;
  if (family === 'normal') return p.sigma / p.mu;
  if (family === 'lognormal') return Math.sqrt(Math.expm1(p.sigma * p.sigma));
  const g = (a: number) => Math.exp(lnGamma(a));
  const m1 = g(1 + 1 / p.shape);
  return Math.sqrt(g(1 + 2 / p.shape) - m1 * m1) / m1;
}

/** Lanczos ln Γ (g = 7, 9 terms), enough for the CoV above. */
function lnGamma(z: number): number {
  const c = [0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7];
  const x = z - 1;
  let a = c[0];
  const t = x + 7.5;
  for (let i = 1; i < 9; i++) a += c[i] / (x + i);
  return 0.5 * Math.log(2 * Math.PI) + (x + 0.5) * Math.log(t) - t + Math.log(a);
}

export function drawSample(family: Family, n: number, rng: ReturnType<typeof createMonitorRandom>): number[] {
  const p = POPULATIONS[family].params;
  const out = new Array<number>(n);
  for (let i = 0; i < n; i++) {
    if (family === 'normal') out[i] = p.mu + p.sigma * rng.normal();
    else if (family === 'lognormal') out[i] = Math.exp(p.mu + p.sigma * rng.normal());
    else {
      let u = rng.uniform();
      while (u === 0) u = rng.uniform();
      out[i] = p.scale * Math.pow(-Math.log1p(-u), 1 / p.shape);
    }
  }
  return out;
}

export interface CoverageCell {
  family: Family;
  n: number;
  runs: number;
  level: SummaryLevel;
  /** achieved confidence per tolerance method and of the headline: share of runs at or below the true quantile */
  achieved: Partial<Record<CharacteristicMethod | 'headline', number>>;
  /** runs in which the method gave a value */
  given: Partial<Record<CharacteristicMethod | 'headline', number>>;
  /** EN 1990 methods: mean population fraction below the value */
  fractionBelow: Partial<Record<'en1990-v-known' | 'en1990-v-unknown', number>>;
  /** how often the headline rule resolved each way */
  basis: Record<string, number>;
}

const TOLERANCE: CharacteristicMethod[] = ['tolerance-normal', 'tolerance-lognormal', 'tolerance-weibull', 'order-statistic'];

export function coverageCell(family: Family, n: number, runs: number, level: SummaryLevel, seed: number): CoverageCell {
  const rng = createMonitorRandom(seed);
  const q = trueLowerQuantile(family, level.coverage);
  const priorV = populationCov(family);
  const hits: Record<string, number> = {};
  const given: Record<string, number> = {};
  const below: Record<string, number> = {};
  const basis: Record<string, number> = {};
  for (let r = 0; r < runs; r++) {
    const s = summarizeProperty(drawSample(family, n, rng), { levels: [level], priorV });
    for (const c of s.characteristic) {
      if (c.value === null) continue;
      if (TOLERANCE.includes(c.method)) {
        given[c.method] = (given[c.method] ?? 0) + 1;
        if (c.value <= q) hits[c.method] = (hits[c.method] ?? 0) + 1;
      } else {
        given[c.method] = (given[c.method] ?? 0) + 1;
        below[c.method] = (below[c.method] ?? 0) + populationCdf(family, c.value);
      }
    }
    if (s.headline && s.headline.value !== null) {
      given.headline = (given.headline ?? 0) + 1;
      if (s.headline.value <= q) hits.headline = (hits.headline ?? 0) + 1;
    }
    basis[s.headline_basis ?? 'none'] = (basis[s.headline_basis ?? 'none'] ?? 0) + 1;
  }
  const achieved: CoverageCell['achieved'] = {};
  for (const m of [...TOLERANCE, 'headline'] as const) if (given[m]) achieved[m] = (hits[m] ?? 0) / given[m];
  const fractionBelow: CoverageCell['fractionBelow'] = {};
  for (const m of ['en1990-v-known', 'en1990-v-unknown'] as const) if (given[m]) fractionBelow[m] = below[m] / given[m];
  return { family, n, runs, level, achieved, given, fractionBelow, basis };
}
