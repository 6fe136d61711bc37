/**
 * Exact factor t of the one-sided lower Weibull tolerance limit L = λ̂·exp(−t/k̂) = exp(û − t·b̂):
 * with confidence γ at least a proportion p of the population lies above L (Thoman, Bain & Antle
 * 1969/1970; Lawless 2003, *Statistical Models and Methods for Lifetime Data*, §5.2.2).
 *
 * The p-content lower bound of y = ln x is y_p = u + w·b with w = ln(−ln p). With the pivots
 * Z₁ = (û − u)/b and Z₂ = b̂/b (`weibull-pivot.ts`),
 *   P(û − t·b̂ ≤ u + w·b) = P((Z₁ − w)/Z₂ ≤ t),
 * so t is the γ-quantile of (Z₁ − w)/Z₂ — the same for every Weibull population, hence exact up to
 * the Monte Carlo error of the simulated quantile (taken as the ⌈γM⌉-th smallest of M draws).
 *
 * Where the factor comes from (`source`):
 * - `table`: `weibull-factor-table.ts`, written by `scripts/generate-weibull-factors.ts` from
 *   WEIBULL_TABLE_SAMPLES draws per n (seed pivotSeed(n)), for every tabulated n and level;
 * - `interpolated`: a tabulated level at an n between tabulated sizes above 200 (or beyond the
 *   last): √n·(t + w) is interpolated linearly in 1/√n; it tends to z_γ·√(V_uu + 2w·V_ub + w²·V_bb)
 *   as n → ∞ (the large-sample normal law of the MLEs, `SEV_INVERSE_INFORMATION`), which serves as
 *   the node at n = ∞;
 * - `simulated`: any other level, simulated on demand with ON_DEMAND_SAMPLES draws (fewer for very
 *   large n, at least 4,000) and cached in memory per n.
 *
 * Dimensionless. Degenerate input: n < 3, or p, γ outside (0, 1) → null.
 */
import { normalQuantile } from './special/normal.ts';
import { SEV_INVERSE_INFORMATION } from './sev-information.ts';
import { WEIBULL_FACTOR_TABLE } from './weibull-factor-table.ts';
import { simulateWeibullPivots, type WeibullPivots } from './weibull-pivot.ts';

/** The shipped table: rows follow `n`, columns follow `levels` ([p, γ]); every n up to `denseTo`. */
export interface WeibullFactorTable {
  samples: number;
  denseTo: number;
  levels: readonly (readonly [number, number])[];
  n: readonly number[];
  t: readonly (readonly number[])[];
}

export interface WeibullFactor {
  t: number;
  source: 'table' | 'interpolated' | 'simulated';
  /** Monte Carlo draws behind the factor (of the nearest node when interpolated) */
  samples: number;
}

/** Draws per n behind the shipped table. */
export const WEIBULL_TABLE_SAMPLES = 50_000;
/** Draws per n when a level is simulated on demand. */
export const ON_DEMAND_SAMPLES = 20_000;
/** Points (n × draws) an on-demand simulation may cost before it draws fewer samples. */
const ON_DEMAND_BUDGET = 4_000_000;
const MIN_ON_DEMAND_SAMPLES = 4_000;

/** γ-quantile of (Z₁ − w)/Z₂ over simulated pivots: the ⌈γM⌉-th smallest value. */
export function pivotFactor(pivots: Pick<WeibullPivots, 'z1' | 'z2'>, coverage: number, confidence: number): number {
  const m = pivots.z1.length;
  if (m === 0) return NaN;
  const w = Math.log(-Math.log(coverage));
  const v = new Float64Array(m);
  for (let i = 0; i < m; i++) v[i] = (pivots.z1[i] - w) / pivots.z2[i];
  v.sort();
  return v[Math.min(m - 1, Math.max(0, Math.ceil(confidence * m) - 1))];
}

/** lim √n·(t + w) as n → ∞: z_γ times the large-sample SD of û + w·b̂ (per unit b, times √n). */
function asymptoticNormalized(coverage: number, confidence: number): number {
  const w = Math.log(-Math.log(coverage));
  const v = SEV_INVERSE_INFORMATION;
  return normalQuantile(confidence) * Math.sqrt(v.uu + 2 * w * v.ub + w * w * v.bb);
}

const pivotCache = new Map<number, WeibullPivots>();
const factorCache = new Map<string, WeibullFactor>();
const MAX_CACHED = 64;

function onDemand(n: number, coverage: number, confidence: number): WeibullFactor {
  const key = `${n}|${coverage}|${confidence}`;
  const hit = factorCache.get(key);
  if (hit) return hit;
  let p = pivotCache.get(n);
  if (!p) {
    const samples = Math.max(MIN_ON_DEMAND_SAMPLES, Math.min(ON_DEMAND_SAMPLES, Math.floor(ON_DEMAND_BUDGET / n)));
    p = simulateWeibullPivots(n, samples);
    if (pivotCache.size >= MAX_CACHED) pivotCache.delete(pivotCache.keys().next().value as number);
    pivotCache.set(n, p);
  }
  const f: WeibullFactor = { t: pivotFactor(p, coverage, confidence), source: 'simulated', samples: p.z1.length };
  if (factorCache.size > 10_000) factorCache.clear();
  factorCache.set(key, f);
  return f;
}

function tableColumn(coverage: number, confidence: number): number {
  return WEIBULL_FACTOR_TABLE.levels.findIndex(([p, g]) => p === coverage && g === confidence);
}

/** The largest n of the table below which every integer size is tabulated. */
const DENSE_TO = WEIBULL_FACTOR_TABLE.denseTo;

export function weibullToleranceFactor(n: number, coverage: number, confidence: number): WeibullFactor | null {
  if (!(Number.isInteger(n) && n >= 3 && coverage > 0 && coverage < 1 && confidence > 0 && confidence < 1)) return null;
  const col = tableColumn(coverage, confidence);
  const sizes = WEIBULL_FACTOR_TABLE.n;
  const samples = WEIBULL_FACTOR_TABLE.samples;
  if (col >= 0) {
    const row = sizes.indexOf(n);
    if (row >= 0) return { t: WEIBULL_FACTOR_TABLE.t[row][col], source: 'table', samples };
    if (n > DENSE_TO) {
      const w = Math.log(-Math.log(coverage));
      const hi = sizes.findIndex((m) => m > n);
      const x = 1 / Math.sqrt(n);
      const lo = hi === -1 ? sizes.length - 1 : hi - 1;
      const nLo = sizes[lo];
      const yLo = Math.sqrt(nLo) * (WEIBULL_FACTOR_TABLE.t[lo][col] + w);
      const xLo = 1 / Math.sqrt(nLo);
      let xHi = 0;
      let yHi = asymptoticNormalized(coverage, confidence);
      if (hi !== -1) {
        xHi = 1 / Math.sqrt(sizes[hi]);
        yHi = Math.sqrt(sizes[hi]) * (WEIBULL_FACTOR_TABLE.t[hi][col] + w);
      }
      const y = yLo + ((x - xLo) / (xHi - xLo)) * (yHi - yLo);
      return { t: y / Math.sqrt(n) - w, source: 'interpolated', samples };
    }
  }
  return onDemand(n, coverage, confidence);
}
