// Correlated property sets by the Gaussian copula: marginals and rank correlations checked with
// SciPy (scipy.stats.kstest, scipy.stats.spearmanr) on the generated sample; the repair of a
// matrix that is not positive definite checked against Higham's published example (from memory)
// and against a direct minimization of the Frobenius distance in SciPy.
import { describe, expect, it } from 'vitest';
import { nearestCorrelation, sampleCorrelated, type CorrelatedSample, type FitResult } from '@fractile/stats';
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
    expect(out.repair).toBeNull();
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

  it('repairs an inconsistent (not positive-definite) matrix by the nearest correlation matrix and says so', () => {
    // targets 0.9 and 0.9 with 0.1 between them cannot hold together (it needs ≥ 0.62): the repair
    // moves the entries as little as the Frobenius norm allows, not all of them toward zero
    const bad = [
      [1, 0.9, 0.9],
      [0.9, 1, 0.1],
      [0.9, 0.1, 1],
    ];
    const r = sampleCorrelated(marginals, bad, 10, 1) as CorrelatedSample;
    expect(r.repair).not.toBeNull();
    expect(r.columns[0].length).toBe(10);
    const target = bad.map((row, i) => row.map((v, j) => (i === j ? 1 : 2 * Math.sin((Math.PI * v) / 6))));
    // the old shrinkage toward the identity needed α with (1 − α)·target ≥ PSD: its largest change
    let alpha = 0;
    for (; alpha <= 1; alpha += 0.01) {
      const a = (1 - alpha) * target[0][1], c = (1 - alpha) * target[1][2];
      if (1 - 2 * a * a + 2 * a * a * c - c * c > 0 && 1 - a * a > 0) break;
    }
    expect(r.repair!.max_change).toBeLessThan(alpha * target[0][1]);
  });
});

describe('nearestCorrelation (Higham 2002, alternating projections)', () => {
  it("reproduces Higham's example [[1,1,0],[1,1,1],[0,1,1]] → 0.7607, 0.1573 (from memory, IMA J. Numer. Anal. 22, 2002)", () => {
    const r = nearestCorrelation([[1, 1, 0], [1, 1, 1], [0, 1, 1]]);
    expect(r.converged).toBe(true);
    expect(r.matrix[0][1]).toBeCloseTo(0.7607, 4);
    expect(r.matrix[1][2]).toBeCloseTo(0.7607, 4);
    expect(r.matrix[0][2]).toBeCloseTo(0.1573, 4);
  });

  it('is the closest unit-diagonal positive semidefinite matrix: a direct SciPy minimization agrees', () => {
    // Source: scipy.optimize.minimize (BFGS, several starts) of ‖A − C(B)‖_F over C(B) = rows of B
    // normalized, C = B Bᵀ (every correlation matrix has this form) — an independent route.
    const cases = [
      [[1, 0.9, 0.9], [0.9, 1, 0.1], [0.9, 0.1, 1]],
      [[1, 0.8, -0.6, 0.3], [0.8, 1, 0.7, -0.2], [-0.6, 0.7, 1, 0.4], [0.3, -0.2, 0.4, 1]],
    ];
    const ref = scipy<number[]>(
      `from scipy.optimize import minimize
out = []
for A in data:
    A = np.array(A); m = len(A); best = None
    for seed in range(8):
        rng = np.random.default_rng(seed)
        def f(b):
            B = b.reshape(m, m); B = B / np.linalg.norm(B, axis=1, keepdims=True); C = B @ B.T
            return float(np.sum((A - C) ** 2))
        r = minimize(f, rng.normal(size=m * m), method='BFGS', options=dict(gtol=1e-12, maxiter=20000))
        best = r.fun if best is None else min(best, r.fun)
    out.append(float(np.sqrt(best)))
print(json.dumps(out))`,
      cases,
    );
    cases.forEach((a, i) => {
      const r = nearestCorrelation(a);
      expect(Math.abs(r.frobeniusDistance - ref[i]), `case ${i}`).toBeLessThan(1e-5);
      for (let k = 0; k < a.length; k++) expect(r.matrix[k][k]).toBe(1);
    });
  });

  it('leaves a positive-definite matrix as it is', () => {
    const r = nearestCorrelation(target);
    expect(r.iterations).toBe(0);
    expect(r.matrix).toEqual(target);
  });

  it('returns an error value for a matrix of the wrong size or a bad count', () => {
    expect(sampleCorrelated(marginals, [[1]], 10, 1)).toMatchObject({ code: 'bad-size' });
    expect(sampleCorrelated(marginals, target, -1, 1)).toMatchObject({ code: 'bad-count' });
  });
});
