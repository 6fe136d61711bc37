// Correlated property sets by the Gaussian copula: marginals and rank correlations checked with
// SciPy (scipy.stats.kstest, scipy.stats.spearmanr) on the generated sample.
import { describe, expect, it } from 'vitest';
import { sampleCorrelated, type CorrelatedSample, type FitResult } from '@fractile/stats';
import { scipy } from './support/scipy.ts';


const marginals: Pick<FitResult, 'model' | 'params'>[] = [
  { model: 'normal', params: { mu: 520, sigma: 20 } },
  { model: 'lognormal', params: { mu: Math.log(400), sigma: 0.05 } },
  { model: 'weibull', params: { shape: 8, scale: 18 } },
];
const target = [
  [1, 0.8, -0.3],
  [0.8, 1, -0.2],
  [-0.3, -0.2, 1],
];

describe('sampleCorrelated (Gaussian copula)', () => {
  const n = 20000;
  const out = sampleCorrelated(marginals, target, n, 7) as CorrelatedSample;

  it('reproduces the marginals (Kolmogorov–Smirnov, scipy.stats.kstest) and the Spearman matrix (scipy.stats.spearmanr)', () => {
    expect(out.shrinkage).toBe(0);
    const ref = scipy<{ d: number[]; rho: number[][] }>(
      `cols = [np.array(c) for c in data]
d = [stats.kstest(cols[0], 'norm', args=(520, 20)).statistic,
     stats.kstest(cols[1], 'lognorm', args=(0.05, 0, 400)).statistic,
     stats.kstest(cols[2], 'weibull_min', args=(8, 0, 18)).statistic]
print(json.dumps(dict(d=[float(v) for v in d], rho=stats.spearmanr(np.column_stack(cols)).correlation.tolist())))`,
      out.columns.map((c) => Array.from(c)),
    );
    // KS 1 % critical value ≈ 1.628/√n (asymptotic Kolmogorov distribution).
    for (const d of ref.d) expect(d).toBeLessThan(1.628 / Math.sqrt(n));
    // Spearman of the copula equals the target exactly (ρ = 2 sin(π ρ_S/6)); sampling SE ≈ 0.007 at most.
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(Math.abs(ref.rho[i][j] - target[i][j])).toBeLessThan(0.02);
  });

  it('is reproducible from its seed and changes with it', () => {
    const again = sampleCorrelated(marginals, target, 50, 7) as CorrelatedSample;
    const same = sampleCorrelated(marginals, target, 50, 7) as CorrelatedSample;
    const other = sampleCorrelated(marginals, target, 50, 8) as CorrelatedSample;
    expect(Array.from(again.columns[2])).toEqual(Array.from(same.columns[2]));
    expect(Array.from(again.columns[0])).not.toEqual(Array.from(other.columns[0]));
  });

  it('shrinks an inconsistent (not positive-definite) matrix towards the identity and says so', () => {
    const bad = [
      [1, 0.9, -0.9],
      [0.9, 1, 0.9],
      [-0.9, 0.9, 1],
    ];
    const r = sampleCorrelated(marginals, bad, 10, 1) as CorrelatedSample;
    expect(r.shrinkage).toBeGreaterThan(0);
    expect(r.columns[0].length).toBe(10);
  });

  it('returns an error value for a matrix of the wrong size or a bad count', () => {
    expect(sampleCorrelated(marginals, [[1]], 10, 1)).toMatchObject({ code: 'bad-size' });
    expect(sampleCorrelated(marginals, target, -1, 1)).toMatchObject({ code: 'bad-count' });
  });
});
