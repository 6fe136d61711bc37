// Supplier comparisons against SciPy 1.10 (Debian's /usr/bin/python3) and exact identities.
import { describe, expect, it } from 'vitest';
import {
  boxSummary,
  compareGroups,
  compareGroupsChecked,
  createMonitorRandom,
  gamesHowell,
  studentizedRangeQuantile,
  holmAdjust,
  kruskalWallis,
  pairwiseDunn,
  welchAnova,
} from '../packages/stats/src/monitor/index.ts';
import type { MonitorError } from '../packages/stats/src/monitor/index.ts';
import { scipy } from './monitor-scipy.ts';

type Groups = Record<string, number[]>;

function relClose(a: number, b: number, rel = 1e-9, abs = 1e-300): void {
  expect(Math.abs(a - b), `${a} vs ${b}`).toBeLessThanOrEqual(Math.max(abs, rel * Math.abs(b)));
}

function sample(seed: number, spec: [string, number, number, number][], round?: number): Groups {
  const rng = createMonitorRandom(seed);
  const g: Groups = {};
  for (const [name, n, mean, sd] of spec) {
    g[name] = Array.from({ length: n }, () => {
      const v = mean + sd * rng.normal();
      return round ? Math.round(v / round) * round : v;
    });
  }
  return g;
}

function ok<T extends object>(x: T): Exclude<T, MonitorError> {
  if ('code' in x) {
    const e = x as unknown as MonitorError;
    throw new Error(`${e.code}: ${e.message}`);
  }
  return x as Exclude<T, MonitorError>;
}

// Welch (1951), Biometrika 38:330, formula evaluated in Python, p from scipy.stats.f.sf.
const WELCH_PY = `
res = []
for groups in data:
    g = [np.asarray(v, float) for v in groups]
    k = len(g); n = np.array([len(x) for x in g]); m = np.array([x.mean() for x in g]); v = np.array([x.var(ddof=1) for x in g])
    w = n/v; W = w.sum(); mu = (w*m).sum()/W
    A = (w*(m-mu)**2).sum()/(k-1); lam = ((1-w/W)**2/(n-1)).sum()
    F = A/(1+2*(k-2)*lam/(k*k-1)); df2 = (k*k-1)/(3*lam)
    res.append([F, k-1, df2, stats.f.sf(F, k-1, df2)])
out = res
`;

describe("Welch's ANOVA (Welch 1951)", () => {
  it("two groups: F equals the square of scipy.stats.ttest_ind(equal_var=False)'s t, same p (exact identity)", () => {
    const cases = [sample(1, [['A', 12, 410, 14], ['B', 20, 398, 25]]), sample(2, [['A', 5, 360, 3], ['B', 40, 356, 12]]), sample(3, [['A', 30, 500, 10], ['B', 30, 520, 11]])];
    const ref = scipy<[number, number][]>(
      'out = [[float(r.statistic), float(r.pvalue)] for r in (stats.ttest_ind(g["A"], g["B"], equal_var=False) for g in data)]',
      cases,
    );
    cases.forEach((g, i) => {
      const w = ok(welchAnova(g));
      relClose(w.statistic, ref[i][0] ** 2, 1e-10);
      relClose(w.p, ref[i][1], 1e-8);
      expect(w.df[0]).toBe(1);
    });
    // The third case has p ≈ 1e-9 or below: the upper tail keeps its relative precision.
    expect(ref[2][1]).toBeLessThan(1e-6);
  });

  it('k groups: statistic, df and p match the published formula evaluated with scipy.stats.f.sf', () => {
    const cases = [
      sample(10, [['A', 15, 420, 12], ['B', 9, 415, 30], ['C', 22, 430, 18]]),
      sample(11, [['A', 6, 355, 4], ['B', 8, 352, 9], ['C', 30, 358, 6], ['D', 12, 349, 15]]),
      sample(12, [['A', 40, 400, 10], ['B', 40, 400, 10], ['C', 40, 400, 10], ['D', 40, 401, 10], ['E', 40, 399, 10]]),
    ];
    const ref = scipy<number[][]>(WELCH_PY, cases.map((g) => Object.values(g)));
    cases.forEach((g, i) => {
      const w = ok(welchAnova(g));
      relClose(w.statistic, ref[i][0], 1e-10);
      expect(w.df[0]).toBe(ref[i][1]);
      relClose(w.df[1], ref[i][2], 1e-10);
      relClose(w.p, ref[i][3], 1e-8);
    });
  });

  it('degenerate groups give error values, not NaN', () => {
    expect(welchAnova({ A: [1, 2, 3] })).toMatchObject({ code: 'too-few-groups' });
    expect(welchAnova({ A: [1, 2, 3], B: [4] })).toMatchObject({ code: 'group-too-small', location: { group: 'B' } });
    expect(welchAnova({ A: [1, 2, 3], B: [4, 4, 4] })).toMatchObject({ code: 'group-no-spread', location: { group: 'B' } });
  });
});

describe('Kruskal–Wallis (Kruskal & Wallis 1952), tie-corrected, against scipy.stats.kruskal', () => {
  it('continuous data and heavily tied data (values rounded to 5 MPa, as on certificates)', () => {
    const cases = [
      sample(20, [['A', 11, 410, 14], ['B', 17, 400, 20], ['C', 25, 405, 9]]),
      sample(21, [['A', 30, 402, 8], ['B', 25, 398, 8], ['C', 12, 405, 8], ['D', 9, 400, 8]], 5),
      { A: [1, 1, 2, 2, 2, 3], B: [2, 3, 3, 3, 4], C: [1, 4, 4, 4, 4, 5, 5] },
    ];
    const ref = scipy<[number, number][]>('out = [[float(r.statistic), float(r.pvalue)] for r in (stats.kruskal(*g) for g in data)]', cases.map((g) => Object.values(g)));
    cases.forEach((g, i) => {
      const kw = ok(kruskalWallis(g));
      relClose(kw.statistic, ref[i][0], 1e-10);
      relClose(kw.p, ref[i][1], 1e-9);
      expect(kw.df).toEqual([Object.keys(g).length - 1]);
    });
    // The tie correction matters here: without it the statistic would differ.
    const tied = ok(kruskalWallis(cases[2]));
    expect(tied.tieSum).toBeGreaterThan(0);
  });

  it('all values equal is an error value', () => {
    expect(kruskalWallis({ A: [3, 3], B: [3, 3, 3] })).toMatchObject({ code: 'all-tied' });
    expect(kruskalWallis({ A: [3, 3], B: [] })).toMatchObject({ code: 'group-empty' });
  });
});

describe("Dunn's test (Dunn 1964) and Holm's correction (Holm 1979)", () => {
  it('two groups: Dunn z² equals the Kruskal–Wallis H and its p the Mann–Whitney normal p without continuity (SciPy), with ties', () => {
    const cases = [sample(30, [['A', 14, 400, 10], ['B', 19, 392, 10]], 5), sample(31, [['A', 8, 400, 10], ['B', 30, 410, 10]])];
    const ref = scipy<[number, number][]>(
      'out = [[float(stats.kruskal(g["A"], g["B"]).statistic), float(stats.mannwhitneyu(g["A"], g["B"], use_continuity=False, method="asymptotic").pvalue)] for g in data]',
      cases,
    );
    cases.forEach((g, i) => {
      const [pair] = pairwiseDunn(ok(kruskalWallis(g)));
      relClose(pair.statistic ** 2, ref[i][0], 1e-10);
      relClose(pair.p, ref[i][1], 1e-9);
      expect(pair.p_adjusted).toBe(pair.p); // one comparison: Holm leaves it alone
    });
  });

  it('k groups: z from mean ranks with the tie term, evaluated with scipy.stats.rankdata and norm.sf', () => {
    const g = sample(32, [['A', 14, 400, 10], ['B', 19, 392, 10], ['C', 9, 405, 10], ['D', 20, 399, 10]], 5);
    const ref = scipy<number[][]>(
      `
vals = np.concatenate([np.asarray(v, float) for v in data]); r = stats.rankdata(vals); N = len(vals)
_, t = np.unique(vals, return_counts=True); T = float((t**3 - t).sum())
base = N*(N+1)/12 - T/(12*(N-1))
idx = np.cumsum([0] + [len(v) for v in data]); mr = [r[idx[i]:idx[i+1]].mean() for i in range(len(data))]
out = []
for i in range(len(data)):
    for j in range(i+1, len(data)):
        z = (mr[i]-mr[j])/np.sqrt(base*(1/len(data[i])+1/len(data[j])))
        out.append([float(z), float(2*stats.norm.sf(abs(z)))])
`,
      Object.values(g),
    );
    const pairs = pairwiseDunn(ok(kruskalWallis(g)));
    expect(pairs.map((p) => `${p.a}-${p.b}`)).toEqual(['A-B', 'A-C', 'A-D', 'B-C', 'B-D', 'C-D']);
    pairs.forEach((p, i) => {
      relClose(p.statistic, ref[i][0], 1e-10);
      relClose(p.p, ref[i][1], 1e-9);
    });
  });

  it("Holm's step-down adjustment, worked by hand from Holm's (1979) definition", () => {
    // p = (0.01, 0.04, 0.03, 0.005), m = 4: sorted 0.005·4 = 0.02, 0.01·3 = 0.03, 0.03·2 = 0.06,
    // 0.04·1 = 0.04 → made monotone: 0.06. Exact arithmetic.
    const adj = holmAdjust([0.01, 0.04, 0.03, 0.005]);
    [0.03, 0.06, 0.06, 0.02].forEach((v, i) => expect(adj[i]).toBeCloseTo(v, 14));
    expect(holmAdjust([0.5, 0.9])).toEqual([1, 1]); // capped at 1
    expect(holmAdjust([])).toEqual([]);
  });

});

describe('Games–Howell pairwise intervals (Games & Howell 1976)', () => {
  // Formula of Games & Howell (1976), J. Educational Statistics 1:113–125: d = x̄_a − x̄_b,
  // SE = √(s_a²/n_a + s_b²/n_b), Welch–Satterthwaite ν, q = |d|/(SE/√2) against the studentized
  // range of k means, interval d ± q_{0.95;k,ν}·SE/√2. Worked by hand (exact arithmetic):
  // A = 10, 12, 14 (x̄ 12, s² 4); B = 15, 17, 19, 21 (x̄ 18, s² 20/3); C = 9 … 13 (x̄ 11, s² 2.5).
  //  A−B: s²/n = 4/3 and 5/3, SE² = 3, ν = 9/(16/18 + 25/27) = 4.959184, q = 6/√1.5 = 4.898979
  //  A−C: 4/3 and 1/2, SE² = 11/6, ν = (11/6)²/(16/18 + 1/16) = 3.532847, q = 1/√(11/12) = 1.044466
  //  B−C: 5/3 and 1/2, SE² = 13/6, ν = (13/6)²/(25/27 + 1/16) = 4.749415, q = 7/√(13/12) = 6.725382
  const g = { A: [10, 12, 14], B: [15, 17, 19, 21], C: [9, 10, 11, 12, 13] };
  const hand = [
    { a: 'A', b: 'B', d: -6, se2: 3, df: 4.959184, q: 4.898979 },
    { a: 'A', b: 'C', d: 1, se2: 11 / 6, df: 3.532847, q: 1.044466 },
    { a: 'B', b: 'C', d: 7, se2: 13 / 6, df: 4.749415, q: 6.725382 },
  ];

  it('differences, degrees of freedom and q equal the hand computation', () => {
    const { pairs, errors } = gamesHowell(g);
    expect(errors).toEqual([]);
    pairs.forEach((p, i) => {
      expect(`${p.a}-${p.b}`).toBe(`${hand[i].a}-${hand[i].b}`);
      expect(p.difference).toBeCloseTo(hand[i].d, 12);
      expect(p.df).toBeCloseTo(hand[i].df, 5);
      expect(p.statistic).toBeCloseTo(hand[i].q, 5);
      expect(p.method).toBe('games-howell');
    });
  });

  it('intervals and p-values use the studentized range of scipy.stats.studentized_range', () => {
    const ref = scipy<[number, number][]>('out = [[float(stats.studentized_range.ppf(0.95, 3, h["df"])), float(stats.studentized_range.sf(h["q"], 3, h["df"]))] for h in data]', hand);
    const { pairs } = gamesHowell(g);
    pairs.forEach((p, i) => {
      const half = ref[i][0] * Math.sqrt(hand[i].se2 / 2);
      expect(p.ci[0]).toBeCloseTo(hand[i].d - half, 2);
      expect(p.ci[1]).toBeCloseTo(hand[i].d + half, 2);
      expect(Math.abs((p.p as number) - ref[i][1])).toBeLessThan(2e-6);
    });
    // A−B and B−C differ at 95 %: their intervals exclude zero; A−C does not.
    expect(pairs.map((p) => p.ci[0] > 0 || p.ci[1] < 0)).toEqual([true, false, true]);
    // Tukey's table (from memory): q(0.95; 3, 20) = 3.578, the same distribution at integer ν.
    const t = scipy<number>('out = float(stats.studentized_range.ppf(0.95, 3, 20))', null);
    expect(t).toBeCloseTo(3.578, 3);
  });

  it('the quantile read between exact values of ν stays within 3e-4 (relative) of SciPy', () => {
    const cases = [[3, 2.7], [3, 4.96], [4, 11.3], [6, 25.5], [12, 47], [40, 333], [40, 5000], [2, 9.5]];
    const ref = scipy<number[]>('out = [float(stats.studentized_range.ppf(0.95, k, v)) for k, v in data]', cases);
    cases.forEach(([k, v], i) => expect(Math.abs(studentizedRangeQuantile(0.95, k, v) - ref[i]) / ref[i]).toBeLessThan(3e-4));
    // beyond ten groups the intervals come without p-values
    const many = Object.fromEntries(Array.from({ length: 11 }, (_, j) => [`G${j}`, [1 + j, 2 + j, 4 + j]]));
    expect(gamesHowell(many).pairs.every((p) => p.p === null && p.ci[0] < p.ci[1])).toBe(true);
  });

  it('degenerate pairs are reported, not computed', () => {
    const r = gamesHowell({ A: [1, 2, 3], B: [4], C: [5, 5, 5], D: [6, 6, 6] });
    expect(r.errors.map((e) => e.code)).toEqual(['group-too-small', 'group-too-small', 'group-too-small', 'group-no-spread']);
    expect(r.pairs.map((p) => `${p.a}-${p.b}`)).toEqual(['A-C', 'A-D']);
  });
});

describe('box-plot numbers', () => {
  it('quartiles as numpy.percentile, whiskers by the 1.5 × IQR rule', () => {
    const v = [3, 1, 4, 1, 5, 9, 2, 6, 5, 3, 5, 40];
    const ref = scipy<number[]>('x = np.asarray(data, float); q1, q2, q3 = np.percentile(x, [25, 50, 75]); i = q3 - q1; w = x[(x >= q1 - 1.5*i) & (x <= q3 + 1.5*i)]; out = [q1, q2, q3, float(w.min()), float(w.max()), float(x.mean())]', v);
    const b = boxSummary(v);
    [b.q1, b.median, b.q3, b.whisker_low, b.whisker_high, b.mean].forEach((x, i) => expect(x).toBeCloseTo(ref[i], 12));
    expect(b.max).toBe(40);
    expect(b.whisker_high).toBe(9); // 40 lies beyond the whisker
  });
});

describe('compareGroups', () => {
  it('returns both tests with their pairwise comparisons; a test that cannot run is reported', () => {
    const g = sample(50, [['North Mill', 20, 400, 10], ['Harbour Steel', 18, 390, 12], ['Eastfield', 25, 401, 9]]);
    const c = compareGroups(g);
    expect(c.map((x) => x.test)).toEqual(['welch-anova', 'kruskal-wallis']);
    expect(c[0].pairwise).toHaveLength(3);
    expect(c[0].pairwise.every((p) => p.method === 'games-howell')).toBe(true);
    expect(c[1].pairwise.every((p) => p.method === 'dunn-holm' && 'p_adjusted' in p && p.p_adjusted >= p.p)).toBe(true);
    expect(Object.keys(c[0].summaries)).toEqual(['North Mill', 'Harbour Steel', 'Eastfield']);
    expect(c[0].summaries['Eastfield'].n).toBe(25);
    const bad = compareGroupsChecked({ A: [1, 2, 3], B: [5, 5, 5] });
    expect(bad.comparisons.map((x) => x.test)).toEqual(['kruskal-wallis']);
    expect(bad.errors[0]).toMatchObject({ code: 'group-no-spread' });
  });
});
