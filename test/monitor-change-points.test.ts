// PELT change points in the mean (Killick, Fearnhead & Eckley 2012) and the uncertainty of the
// shift and of its location.
import { describe, expect, it } from 'vitest';
import { createMonitorRandom, describeChangePoints, differenceSigma, peltMeanChange } from '../packages/stats/src/monitor/index.ts';
import { scipy } from './monitor-scipy.ts';

function series(seed: number, n: number, shifts: [number, number][], sd = 1): number[] {
  const rng = createMonitorRandom(seed);
  return Array.from({ length: n }, (_, i) => {
    let mu = 0;
    for (const [at, size] of shifts) if (i >= at) mu += size;
    return mu + sd * rng.normal();
  });
}

// Optimal partitioning (Jackson et al. 2005, IEEE Signal Process. Lett. 12:105), the exhaustive
// O(n²) recursion whose optimum PELT must reproduce exactly (Killick et al. 2012, Theorem 3.2),
// written independently in Python/numpy.
const OPTIMAL_PARTITIONING = `
out = []
for case in data:
    y = np.asarray(case['y'], float); n = len(y); beta = case['beta']; m = case['m']; s2 = case['sigma']**2
    c1 = np.concatenate([[0.0], np.cumsum(y)]); c2 = np.concatenate([[0.0], np.cumsum(y*y)])
    cost = lambda a, b: (c2[b]-c2[a]-(c1[b]-c1[a])**2/(b-a))/s2
    F = [np.inf]*(n+1); F[0] = -beta; last = [-1]*(n+1)
    for t in range(m, n+1):
        for tau in [0] + list(range(m, t-m+1)):
            v = F[tau] + cost(tau, t) + beta
            if v < F[t]: F[t] = v; last[t] = tau
    cps = []; t = n
    while t > 0:
        if last[t] > 0: cps.append(last[t])
        t = last[t]
    out.append({'cost': float(F[n]), 'changes': sorted(cps)})
`;

describe('PELT (Killick, Fearnhead & Eckley 2012)', () => {
  it('finds exactly the optimum of optimal partitioning, for several penalties and minimum segments', () => {
    const cases: { y: number[]; beta: number; m: number; sigma: number }[] = [];
    let seed = 100;
    for (const m of [1, 2, 5, 10]) {
      for (const beta of [3, 2 * Math.log(150), 25]) {
        const y = series(seed++, 150, [[30, 1.2], [70, -2], [71, 0.5], [120, 1]]);
        cases.push({ y, beta, m, sigma: differenceSigma(y) });
      }
    }
    cases.push({ y: series(seed++, 80, []), beta: 2 * Math.log(80), m: 5, sigma: 1 });
    const ref = scipy<{ cost: number; changes: number[] }[]>(OPTIMAL_PARTITIONING, cases);
    cases.forEach((c, i) => {
      const r = peltMeanChange(c.y, { penalty: c.beta, minSegment: c.m, sigma: c.sigma });
      expect(r.cost).toBeCloseTo(ref[i].cost, 8);
      expect(r.changes).toEqual(ref[i].changes);
    });
    // The small penalty really does find several changes, so the comparison has teeth.
    expect(ref.some((r) => r.changes.length >= 4)).toBe(true);
  });

  it("'bic' is 2·ln n; the default sigma is median|Δy|/(√2·Φ⁻¹(0.75)) (scipy.stats.norm.ppf)", () => {
    const y = series(7, 90, [[45, 36]], 12);
    const r = peltMeanChange(y);
    expect(r.penalty).toBeCloseTo(2 * Math.log(90), 12);
    const ref = scipy<number>('y = np.asarray(data, float); out = float(np.median(np.abs(np.diff(y)))/(np.sqrt(2)*stats.norm.ppf(0.75)))', y);
    expect(r.sigma).toBeCloseTo(ref, 10);
    expect(r.changes.length).toBe(1);
    expect(Math.abs(r.changes[0] - 45)).toBeLessThanOrEqual(3);
  });

  it('false change points on in-control series are rare with the default penalty', () => {
    // Property of the default design (no table): over 300 seeded null series of 250 points, the
    // share with any change point stays under 10 % (measured ≈ 5 %).
    let hits = 0;
    for (let k = 0; k < 300; k++) if (peltMeanChange(series(1000 + k, 250, [])).changes.length > 0) hits++;
    expect(hits / 300).toBeLessThan(0.1);
  });

  it('degenerate input gives no change points', () => {
    expect(peltMeanChange([1, 2, 3]).changes).toEqual([]);
    expect(peltMeanChange(new Array(40).fill(5)).changes).toEqual([]);
    expect(peltMeanChange(new Array(40).fill(5)).sigma).toBe(0);
  });

  it('finds every change of a long series with regular changes (the pruned search stays exact)', () => {
    const y = Array.from(series(9, 20000, []), (v, i) => v + (Math.floor(i / 500) % 2) * 2);
    const r = peltMeanChange(y);
    expect(r.changes.length).toBe(39);
  });
});

describe('shift and location uncertainty', () => {
  it("the shift's interval is Welch's t interval (scipy.stats.t.ppf with Welch–Satterthwaite df)", () => {
    const y = series(21, 100, [[55, -14]], 10).map((v) => v + 400);
    const r = peltMeanChange(y);
    const ids = y.map((_, i) => `T${i}`);
    const dates = y.map((_, i) => new Date(Date.UTC(2025, 0, 1 + i)).toISOString().slice(0, 10));
    const [c] = describeChangePoints(y, dates, ids, r.changes, { sigma: r.sigma, seed: 3 });
    const ref = scipy<number[]>(
      `
y = np.asarray(data['y'], float); c = data['c']; a, b = y[:c], y[c:]
va, vb = a.var(ddof=1)/len(a), b.var(ddof=1)/len(b); se = np.sqrt(va+vb)
df = (va+vb)**2/(va**2/(len(a)-1)+vb**2/(len(b)-1)); d = b.mean()-a.mean(); q = stats.t.ppf(0.975, df)
out = [float(d), float(d-q*se), float(d+q*se), float(df)]
`,
      { y, c: c.index },
    );
    expect(c.shift).toBeCloseTo(ref[0], 9);
    expect(c.ci[0]).toBeCloseTo(ref[1], 8);
    expect(c.ci[1]).toBeCloseTo(ref[2], 8);
    expect(c.shift_df).toBeCloseTo(ref[3], 8);
    expect(c.date).toBe(dates[c.index]);
    expect(c.testId).toBe(ids[c.index]);
    expect(c.location_ci?.index[0]).toBeLessThanOrEqual(c.index);
    expect(c.location_ci?.index[1]).toBeGreaterThanOrEqual(c.index);
  });

  it('intervals cover the true shift and location about 95 % of the time (seeded simulation)', () => {
    // 300 series, a 1.5σ drop after 60 of 120 points. Binomial SE of a 95 % coverage over
    // ~270 usable series ≈ 0.013; we accept 0.90–0.995 (post-selection makes the shift interval
    // slightly optimistic, the bootstrap location interval slightly wide). Measured 0.944 / 0.959.
    let used = 0;
    let coverShift = 0;
    let coverLoc = 0;
    for (let k = 0; k < 300; k++) {
      const y = series(5000 + k, 120, [[60, -1.5]]);
      const r = peltMeanChange(y);
      const cps = describeChangePoints(y, y.map(String), y.map(String), r.changes, { sigma: r.sigma, seed: k + 1, bootstrap: 199 });
      if (cps.length !== 1 || Math.abs(cps[0].index - 60) > 10) continue;
      used++;
      const c = cps[0];
      if (c.ci[0] <= -1.5 && -1.5 <= c.ci[1]) coverShift++;
      if (c.location_ci && c.location_ci.index[0] <= 60 && 60 <= c.location_ci.index[1]) coverLoc++;
    }
    expect(used).toBeGreaterThan(240);
    expect(coverShift / used).toBeGreaterThan(0.9);
    expect(coverShift / used).toBeLessThan(0.995);
    expect(coverLoc / used).toBeGreaterThan(0.9);
    expect(coverLoc / used).toBeLessThan(0.995);
  });

  it('the bootstrap is reproducible for a given seed', () => {
    const y = series(31, 80, [[40, 1]]);
    const r = peltMeanChange(y);
    const a = describeChangePoints(y, y.map(String), y.map(String), r.changes, { sigma: r.sigma, seed: 9 });
    const b = describeChangePoints(y, y.map(String), y.map(String), r.changes, { sigma: r.sigma, seed: 9 });
    expect(a).toEqual(b);
  });
});
