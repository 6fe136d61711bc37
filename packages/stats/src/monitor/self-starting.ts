/**
 * Self-starting standardization of a series: each new point is judged against the points before
 * it only, so a chart needs no separately estimated baseline and its in-control run lengths are
 * those of known parameters. Hawkins (1987), "Self-starting CUSUM charts for location and scale",
 * The Statistician 36:299–316; Hawkins & Olwell (1998), Cumulative Sum Charts and Charting for
 * Quality Improvement, Springer, chapter 7.
 *
 * Independent values (Hawkins): after m included values with mean x̄ and SD s,
 *   T = (x − x̄) / (s·√(1 + 1/m)) ~ t(m − 1),  U = Φ⁻¹(F_t(T; m − 1)) ~ N(0, 1),
 * exactly for normal data, and U is independent of the earlier U's (Hawkins 1987).
 * 'tests' with heats: the included tests' variance components s_L², s_r² (ISO 5725-2 one-way
 * layout, see variance-components.ts). Where s_L² = 0, or no heat has two tests, the values are
 * taken as independent (above). Otherwise a test is predicted from the mean μ̂ of all included
 * tests and the n_c earlier tests of its own heat (mean x̄_c), as the random-effects model does
 * (best linear prediction; e.g. Searle, Casella & McCulloch 1992, Variance Components, ch. 7 —
 * from memory):
 *   w = n_c·s_L² / (s_r² + n_c·s_L²),  prediction μ̂ + w·(x̄_c − μ̂),
 *   variance s_r² + s_L²·(1 − w) + Var μ̂·(1 − w)²,  Var μ̂ = (s_L²·Σn_i² + s_r²·N)/N²,
 * with t degrees of freedom p − 1 (p heats). Under the model these standardized innovations are
 * independent, so the chart of tests keeps its in-control rate when tests of a heat agree more
 * than tests of different heats; with estimated components it is an approximation (ours;
 * simulated with heats of 4 and a between-heat SD of half the within-heat SD, the scores' SD is
 * 0.94–0.98, a little conservative, and the within-heat correlation is gone).
 * 'heat-means' (one point per heat, the mean of its n tests): the prior heats' components give
 * the new heat mean's variance τ² = s_L² + s_r²/n; its centre is the unweighted mean μ̂ of the
 * m prior heat means, Var μ̂ = (s_L² + s_r²·mean(1/n_j))/m, and
 *   T = (ȳ − μ̂) / √(τ² + Var μ̂),  df = m − 1.
 * With equal heat sizes (and s_L² > 0) τ² is the sample variance of the heat means and this is
 * Hawkins' transform of the heat means, exact; with unequal sizes an approximation (ours).
 * A point enters the running estimates only when the caller adds it (a chart leaves out points
 * while it signals, so a shift does not become the new normal — Hawkins & Olwell 1998, 7.2).
 * Units: values in the property's units; U in standard normal units.
 * Degenerate input: fewer than `minPoints` included points (default 5), or no spread, gives null.
 */
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import normalCdf from '@stdlib/stats-base-dists-normal-cdf';
import tCdf from '@stdlib/stats-base-dists-t-cdf';
import tQuantile from '@stdlib/stats-base-dists-t-quantile';

export type ChartUnit = 'tests' | 'heat-means';

export interface Prediction {
  /** Centre for the new point, property units. */
  centre: number;
  /** SD of (new point − centre), property units. */
  scale: number;
  /** Degrees of freedom of the t reference. */
  df: number;
}

export interface SelfStarting {
  /** The prediction for a new point of `size` tests (of heat `heat`), or null while too few points are in. */
  predict(size: number, heat: string | null): Prediction | null;
  /** Includes a point: its value, test count, within-point sum of squares and heat. */
  add(value: number, size: number, ss: number, heat: string | null): void;
  /** Points included so far. */
  readonly count: number;
}

/** U = Φ⁻¹(F_t(T; df)), kept finite in the far tails. */
export function selfStartingScore(value: number, p: Prediction): number {
  const t = (value - p.centre) / p.scale;
  const c = tCdf(t, p.df);
  if (c <= 0) return -40;
  if (c >= 1) return 40;
  // the upper tail from the lower one keeps precision for large t
  return t > 0 ? -normalQuantile(tCdf(-t, p.df), 0, 1) : normalQuantile(c, 0, 1);
}

/** Value at which a point's score equals u: the chart's limit in property units. */
export function selfStartingLimit(u: number, p: Prediction): number {
  return p.centre + p.scale * tQuantile(normalCdf(u, 0, 1), p.df);
}

/**
 * Half-width factor t_{df}⁻¹(Φ(u)) of the limit at score u, by degrees of freedom, computed once
 * per df (the t quantile is iterative; degrees of freedom are whole numbers here): the limits are
 * centre ± scale·factor(df).
 */
export function limitFactor(u: number): (df: number) => number {
  const cache = new Map<number, number>();
  const q = normalCdf(Math.abs(u), 0, 1);
  return (df: number) => {
    let f = cache.get(df);
    if (f === undefined) {
      f = tQuantile(q, df);
      cache.set(df, f);
    }
    return f;
  };
}

/** Hawkins' prediction for independent values from their count, sum and sum of squares (centred). */
function independent(ref: number, m: number, sum: number, sumSq: number): Prediction | null {
  const mean = sum / m;
  const v = (sumSq - m * mean * mean) / (m - 1);
  return v > 0 ? { centre: ref + mean, scale: Math.sqrt(v * (1 + 1 / m)), df: m - 1 } : null;
}

/** Running one-way components of the included points (groups of size n with mean ȳ and within SS). */
interface Components {
  msW: number;
  vb: number;
}

function components(m: number, N: number, N2: number, s1: number, s2: number, ssw: number): Components | null {
  const dfw = N - m;
  if (dfw < 1 || m < 2) return null;
  const msW = ssw / dfw;
  const grand = s1 / N;
  const msB = (s2 - N * grand * grand) / (m - 1);
  const nBar = (N - N2 / N) / (m - 1);
  return { msW, vb: Math.max(0, (msB - msW) / nBar) };
}

function createHeatMeans(minM: number): SelfStarting {
  let ref = NaN;
  // included heats: count, Σ n, Σ n², Σ n·(ȳ − ref), Σ n·(ȳ − ref)², Σ (ȳ − ref), Σ (ȳ − ref)², Σ 1/n, Σ within SS
  let m = 0;
  let N = 0;
  let N2 = 0;
  let s1 = 0;
  let s2 = 0;
  let u1 = 0;
  let u2 = 0;
  let inv = 0;
  let ssw = 0;
  return {
    get count() {
      return m;
    },
    predict(size: number): Prediction | null {
      if (m < minM) return null;
      const c = components(m, N, N2, s1, s2, ssw);
      // no replicates yet: the heat means' own spread
      if (!c) return independent(ref, m, u1, u2);
      const varMu = (c.vb + (c.msW * inv) / m) / m;
      const v = c.vb + c.msW / size + varMu;
      return v > 0 ? { centre: ref + u1 / m, scale: Math.sqrt(v), df: m - 1 } : null;
    },
    add(value: number, size: number, ss: number): void {
      if (Number.isNaN(ref)) ref = value;
      const y = value - ref;
      m++;
      N += size;
      N2 += size * size;
      s1 += size * y;
      s2 += size * y * y;
      u1 += y;
      u2 += y * y;
      inv += 1 / size;
      ssw += ss;
    },
  };
}

function createTests(minM: number): SelfStarting {
  let ref = NaN;
  const heats = new Map<string, { n: number; sum: number }>();
  // included tests: count, Σ y, Σ y² (centred); heats: count, Σ n², Σ sum²/n
  let N = 0;
  let sum = 0;
  let sumSq = 0;
  let p = 0;
  let N2 = 0;
  let between = 0;
  let singles = 0;
  return {
    get count() {
      return N;
    },
    predict(_size: number, heat: string | null): Prediction | null {
      if (N < minM) return null;
      // Σ n·ȳ² = between, Σ n·ȳ = sum; within SS = Σ y² − Σ sum²/n
      const c = components(p, N, N2, sum, between, sumSq - between);
      if (!c || !(c.vb > 0)) return independent(ref, N, sum, sumSq);
      const mu = sum / N;
      const own = heat === null ? undefined : heats.get(heat);
      const nc = own?.n ?? 0;
      const w = nc > 0 ? (nc * c.vb) / (c.msW + nc * c.vb) : 0;
      const centre = nc > 0 ? mu + w * (own!.sum / nc - mu) : mu;
      const varMu = (c.vb * N2) / (N * N) + c.msW / N;
      const v = c.msW + c.vb * (1 - w) + varMu * (1 - w) * (1 - w);
      return { centre: ref + centre, scale: Math.sqrt(v), df: p - 1 };
    },
    add(value: number, _size: number, _ss: number, heat: string | null): void {
      if (Number.isNaN(ref)) ref = value;
      const y = value - ref;
      N++;
      sum += y;
      sumSq += y * y;
      const key = heat ?? `\u0000single ${singles++}`;
      const h = heats.get(key);
      if (!h) {
        heats.set(key, { n: 1, sum: y });
        p++;
        N2 += 1;
        between += y * y;
        return;
      }
      between -= (h.sum * h.sum) / h.n;
      N2 += 2 * h.n + 1;
      h.n++;
      h.sum += y;
      between += (h.sum * h.sum) / h.n;
    },
  };
}

export function createSelfStarting(unit: ChartUnit, minPoints = 5): SelfStarting {
  const minM = Math.max(3, Math.floor(minPoints));
  return unit === 'tests' ? createTests(minM) : createHeatMeans(minM);
}
