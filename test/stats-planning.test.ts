// Sample-size planning against a Monte Carlo of the tolerance limit at each n, run in NumPy/SciPy
// with its own generator: for every row, (a) the characteristic value of the tests at hand plus m
// values drawn from the fitted model — its mean and 5 / 95 % points — and (b) the standard
// deviation of the value from n + m values drawn afresh. SciPy computes the normal tolerance factor
// from scipy.stats.nct (ISO 16269-6), fits the Weibull by its own profile-likelihood root
// (scipy.optimize.brentq; the pivotal factor t is our shipped table's, SciPy has none), and the
// order-statistic rank from scipy.stats.binom. For the normal limit x̄ − k·s the spread from fresh
// samples is also exact: Var = σ²(1/n + k²(1 − c4²)), c4 = √(2/(n − 1))·Γ(n/2)/Γ((n − 1)/2)
// (the mean and SD of a normal sample are independent; E s = c4·σ).
//
// Monte Carlo error: ours uses R = 2,000 replicates per row, SciPy 20,000 (4,000 for the Weibull
// fits); every check allows 4 standard errors of the difference.
import gammaln from '@stdlib/math-base-special-gammaln';
import { describe, expect, it } from 'vitest';
import { fitLognormal, fitNormal, fitWeibull, normalToleranceFactor, planSampleSize, weibullToleranceFactor, type EstimatedMethod, type FitResult, type SampleSizePlan } from '@fractile/stats';
import { scipy } from './support/scipy.ts';

const R = 2000;
const LEVEL = { coverage: 0.95, confidence: 0.75 };
const ADDED = [10, 20, 50];

const data = scipy<{ normal: number[]; lognormal: number[]; weibull: number[]; os: number[] }>(`
rng = np.random.default_rng(3131)
print(json.dumps(dict(normal=rng.normal(355, 18, 20).tolist(), lognormal=rng.lognormal(np.log(480), 0.07, 25).tolist(),
                      weibull=(420 * rng.weibull(14, 30)).tolist(), os=rng.normal(510, 15, 70).tolist())))`);

interface Ref {
  /** `below` / `at_or_below`: SciPy's share of values < and ≤ our 5 and 95 % points */
  rows: { n: number; mean: number; sd: number; below: number[]; at_or_below: number[]; fresh_sd: number }[];
}

/** SciPy's Monte Carlo of the rows; `t` the Weibull factors by n (ours), `method` as planned. */
function reference(values: number[], method: EstimatedMethod, fit: Pick<FitResult, 'model' | 'params'>, level: { coverage: number; confidence: number }, reps: number, plan: SampleSizePlan): Ref {
  const ns = [values.length, ...ADDED.map((m) => values.length + m)];
  const t: Record<number, number> = {};
  for (const n of ns) t[n] = weibullToleranceFactor(n, level.coverage, level.confidence)!.t;
  return scipy<Ref>(
    `from scipy.optimize import brentq
x0 = np.array(data['x']); fam = data['fit']['model']; P = data['fit']['params']; p = data['p']; g = data['g']; R = data['R']
rng = np.random.default_rng(8080)
def draw(size):
    if fam == 'normal': return stats.norm.rvs(P['mu'], P['sigma'], size=size, random_state=rng)
    if fam == 'lognormal': return stats.lognorm.rvs(P['sigma'], 0, np.exp(P['mu']), size=size, random_state=rng)
    return stats.weibull_min.rvs(P['shape'], 0, P['scale'], size=size, random_state=rng)
def k(n): return stats.nct.ppf(g, n - 1, stats.norm.ppf(p) * np.sqrt(n)) / np.sqrt(n)
def normal_limit(X, log=False):
    Y = np.log(X) if log else X; n = X.shape[1]; v = Y.mean(1) - k(n) * Y.std(1, ddof=1)
    return np.exp(v) if log else v
def weibull_limit(X):
    n = X.shape[1]; out = np.empty(len(X))
    for i, x in enumerate(X):
        y = np.log(x); c = y.max(); tt = y - c
        h = lambda kk: np.sum(np.exp(kk * tt) * tt) / np.sum(np.exp(kk * tt)) - 1 / kk - tt.mean()
        kk = brentq(h, 1e-3, 1e3, xtol=1e-14)
        out[i] = np.exp(c + np.log(np.mean(np.exp(kk * tt))) / kk - data['t'][str(n)] / kk)
    return out
def os_limit(X):
    n = X.shape[1]; r = max(r for r in range(1, n + 1) if stats.binom.sf(r - 1, n, 1 - p) >= g)
    return np.sort(X, axis=1)[:, r - 1]
def limit(X):
    m = data['method']
    if m == 'tolerance-normal': return normal_limit(X)
    if m == 'tolerance-lognormal': return normal_limit(X, True)
    if m == 'tolerance-weibull': return weibull_limit(X)
    if m == 'order-statistic': return os_limit(X)
    return np.minimum(np.minimum(normal_limit(X), normal_limit(X, True)), weibull_limit(X))
rows = []
for m, ours in zip(data['added'], data['ours']):
    n = len(x0) + m
    cond = limit(np.hstack([np.tile(x0, (R, 1)), draw((R, m))])) if m > 0 else np.repeat(limit(x0[None, :]), R)
    fresh = limit(draw((R, n)))
    rows.append(dict(n=n, mean=float(cond.mean()), sd=float(cond.std(ddof=1)), below=[float(np.mean(cond < v)) for v in ours], at_or_below=[float(np.mean(cond <= v)) for v in ours], fresh_sd=float(fresh.std(ddof=1))))
print(json.dumps(dict(rows=rows)))`,
    { x: values, fit: { model: fit.model, params: fit.params }, p: level.coverage, g: level.confidence, R: reps, method, added: [0, ...ADDED], t, ours: plan.rows.map((r) => [r.p05, r.p95]) },
  );
}

/**
 * Our 5 and 95 % points checked as quantiles of SciPy's distribution: the share of SciPy's values
 * below a point must not exceed q, the share at or below must reach q (a bracket that also holds
 * where the value takes few distinct values, as the order statistic of the data often does), each
 * up to 4 binomial standard errors of the two Monte Carlo runs.
 */
function compare(plan: SampleSizePlan, ref: Ref, reps: number): void {
  plan.rows.forEach((row, i) => {
    const r = ref.rows[i];
    expect(row.n).toBe(r.n);
    if (row.added === 0) {
      // no added tests: the value now, exactly
      expect(row.expected).toBeCloseTo(r.mean, 8);
      expect(row.p05).toBe(row.expected);
    } else {
      const seMean = Math.sqrt(r.sd ** 2 / R + r.sd ** 2 / reps);
      expect(Math.abs(row.expected! - r.mean), `mean at n = ${r.n}`).toBeLessThan(4 * seMean);
      [0.05, 0.95].forEach((q, j) => {
        const tol = 4 * Math.sqrt(q * (1 - q) * (1 / R + 1 / reps));
        expect(r.below[j], `${q} point at n = ${r.n}: share below`).toBeLessThan(q + tol);
        expect(r.at_or_below[j], `${q} point at n = ${r.n}: share at or below`).toBeGreaterThan(q - tol);
      });
    }
    const seSd = r.fresh_sd * Math.sqrt(1 / (2 * R) + 1 / (2 * reps));
    expect(Math.abs(row.sd_fresh! - r.fresh_sd), `fresh SD at n = ${r.n}`).toBeLessThan(4 * seSd);
  });
}

describe('sample-size planning: the normal tolerance limit', () => {
  const fit = fitNormal(data.normal)!;
  const plan = planSampleSize(data.normal, 'tolerance-normal', LEVEL, fit, { added: ADDED, replicates: R, seed: 4 }) as SampleSizePlan;

  it('starts from the exact limit of the tests at hand, with the noncentral-t factor at each n (ISO 16269-6)', () => {
    expect('code' in plan).toBe(false);
    const n = data.normal.length;
    const m = data.normal.reduce((a, v) => a + v, 0) / n;
    const s = Math.sqrt(data.normal.reduce((a, v) => a + (v - m) ** 2, 0) / (n - 1));
    expect(plan.value_now).toBeCloseTo(m - normalToleranceFactor(n, 0.95, 0.75) * s, 9);
    plan.rows.forEach((r) => expect(r.factors.k).toBeCloseTo(normalToleranceFactor(r.n, 0.95, 0.75), 12));
    // the factor falls with n; k(20; 0.95, 0.75) = 1.932: published one-sided tables (ISO 16269-6; from memory, recomputed with scipy.stats.nct)
    expect(plan.rows[0].factors.k).toBeCloseTo(1.932, 3);
    for (let i = 1; i < plan.rows.length; i++) expect(plan.rows[i].factors.k!).toBeLessThan(plan.rows[i - 1].factors.k!);
  });

  it('gives the exact spread of the limit from fresh samples: σ√(1/n + k²(1 − c4²))', () => {
    const sigma = fit.params.sigma;
    for (const r of plan.rows) {
      const n = r.n;
      const c4 = Math.sqrt(2 / (n - 1)) * Math.exp(gammaln(n / 2) - gammaln((n - 1) / 2));
      const k = normalToleranceFactor(n, 0.95, 0.75);
      const exact = sigma * Math.sqrt(1 / n + k * k * (1 - c4 * c4));
      // R = 2,000: relative SE of a sampled SD ≈ 1/√(2R) = 1.6 %
      expect(Math.abs(r.sd_fresh! / exact - 1), `n = ${n}`).toBeLessThan(4 / Math.sqrt(2 * R));
    }
  });

  it('agrees with a SciPy Monte Carlo of the limit at each n', () => {
    compare(plan, reference(data.normal, 'tolerance-normal', fit, LEVEL, 20000, plan), 20000);
  });

  it('is reproducible from its seed; the value approaches the population fractile', () => {
    const again = planSampleSize(data.normal, 'tolerance-normal', LEVEL, fit, { added: ADDED, replicates: R, seed: 4 }) as SampleSizePlan;
    expect(again.rows).toEqual(plan.rows);
    expect(plan.population_fractile).toBeCloseTo(fit.params.mu - 1.6448536269514722 * fit.params.sigma, 9);
    // at n = 20,000 the normal limit lies k − z_p ≈ 0.005 SD below the fractile
    expect(Math.abs(plan.value_large_n! - plan.population_fractile)).toBeLessThan(0.01 * fit.params.sigma);
    expect(plan.rows.at(-1)!.expected!).toBeGreaterThan(plan.value_now);
  });
});

describe('sample-size planning against SciPy for the other methods', () => {
  it('Weibull tolerance limit on the Weibull MLEs (Thoman, Bain & Antle)', () => {
    const fit = fitWeibull(data.weibull)!;
    const plan = planSampleSize(data.weibull, 'tolerance-weibull', LEVEL, fit, { added: ADDED, replicates: R, seed: 5 }) as SampleSizePlan;
    compare(plan, reference(data.weibull, 'tolerance-weibull', fit, LEVEL, 4000, plan), 4000);
  });

  it('the headline rule: lowest of the normal, lognormal and Weibull limits, tests drawn from a lognormal fit', () => {
    const fit = fitLognormal(data.lognormal)!;
    const plan = planSampleSize(data.lognormal, 'lowest-model', LEVEL, fit, { added: ADDED, replicates: R, seed: 6 }) as SampleSizePlan;
    compare(plan, reference(data.lognormal, 'lowest-model', fit, LEVEL, 4000, plan), 4000);
    // the lowest-model rule heads below the lognormal fractile: it keeps the lowest family's limit
    expect(plan.value_large_n!).toBeLessThan(plan.population_fractile);
  });

  it('distribution-free order-statistic bound (ISO 16269-6), coverage 0.90, confidence 0.95', () => {
    const level = { coverage: 0.9, confidence: 0.95 };
    const fit = fitNormal(data.os)!;
    const plan = planSampleSize(data.os, 'order-statistic', level, fit, { added: ADDED, replicates: R, seed: 7 }) as SampleSizePlan;
    // smallest n with a bound: 29 (REFERENCES.md, exact arithmetic); n = 70 gives rank 3 here
    expect(plan.rows[0].factors.r).toBe(3);
    compare(plan, reference(data.os, 'order-statistic', fit, level, 20000, plan), 20000);
  });

  it('returns an error value where there is no value now or the counts are bad', () => {
    const fit = fitNormal(data.normal)!;
    expect(planSampleSize(data.normal.slice(0, 4), 'tolerance-normal', LEVEL, fit, { added: [10] })).toMatchObject({ code: 'no-value' });
    expect(planSampleSize(data.normal, 'tolerance-normal', LEVEL, fit, { added: [-1] })).toMatchObject({ code: 'bad-count' });
    expect(planSampleSize(data.normal, 'tolerance-normal', LEVEL, fit, { added: [10], replicates: 1 })).toMatchObject({ code: 'bad-count' });
  });
});
