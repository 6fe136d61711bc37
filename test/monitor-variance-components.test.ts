// Between-heat and within-heat variance components (one-way random effects, ISO 5725-2 layout)
// against a one-way ANOVA by SciPy/NumPy on generated data: scipy.stats.f_oneway for F and p,
// NumPy sums of squares for the mean squares, and the ISO 5725-2 formulas for n̄ and s_L².
import { describe, expect, it } from 'vitest';
import { chartStructure, createMonitorRandom, summarizeGroup, varianceComponents } from '../packages/stats/src/monitor/index.ts';
import type { VarianceComponents } from '../packages/stats/src/monitor/index.ts';
import { scipy } from './monitor-scipy.ts';

function heats(seed: number, sizes: number[], sb: number, sw: number): number[][] {
  const rng = createMonitorRandom(seed);
  return sizes.map((n) => {
    const b = sb * rng.normal();
    return Array.from({ length: n }, () => 400 + b + sw * rng.normal());
  });
}

const ANOVA = `
out = []
for groups in data:
    g = [np.asarray(v, float) for v in groups]
    p = len(g); n = np.array([len(x) for x in g]); N = n.sum(); grand = np.concatenate(g).mean()
    msw = sum(((x - x.mean())**2).sum() for x in g) / (N - p)
    msb = sum(len(x)*(x.mean() - grand)**2 for x in g) / (p - 1)
    nbar = (N - (n**2).sum()/N) / (p - 1)
    r = stats.f_oneway(*g)
    out.append([float(msw), float(msb), float(nbar), float(max(0.0, (msb - msw)/nbar)), float(r.statistic), float(r.pvalue)])
`;

describe('variance components (ISO 5725-2 one-way layout)', () => {
  const cases = [
    heats(1, new Array(25).fill(4), 6, 10), // balanced, heat effect
    heats(2, [2, 5, 3, 6, 4, 4, 1, 7, 3, 2, 5, 4], 8, 9), // unbalanced, one single-test heat
    heats(3, new Array(30).fill(3), 0, 12), // no heat effect
  ];
  const ref = scipy<number[][]>(ANOVA, cases);

  it('mean squares, n̄, s_L², F and p equal the NumPy/SciPy one-way ANOVA', () => {
    cases.forEach((g, i) => {
      const vc = varianceComponents(g.map(summarizeGroup)) as VarianceComponents;
      const [msw, msb, nbar, sl2, f, p] = ref[i];
      expect(vc.ms_within).toBeCloseTo(msw, 8);
      expect(vc.ms_between).toBeCloseTo(msb, 8);
      expect(vc.n_bar).toBeCloseTo(nbar, 10);
      expect(vc.var_between).toBeCloseTo(sl2, 8);
      expect(vc.var_within).toBe(vc.ms_within);
      expect(vc.var_total).toBeCloseTo(msw + sl2, 8);
      expect(vc.f).toBeCloseTo(f, 8);
      expect(Math.abs(vc.p - p)).toBeLessThanOrEqual(1e-10 + 1e-7 * p);
      expect(vc.df_between).toBe(g.length - 1);
    });
    // balanced: n̄ is the common size (ISO 5725-2 reduces to the balanced formula)
    expect(ref[0][2]).toBeCloseTo(4, 12);
  });

  it('degenerate layouts give error values', () => {
    expect(varianceComponents([summarizeGroup([1, 2, 3])])).toMatchObject({ code: 'too-few-groups' });
    expect(varianceComponents([summarizeGroup([1]), summarizeGroup([2]), summarizeGroup([4])])).toMatchObject({ code: 'no-replicates' });
  });

  it('the chart structure follows the heat effect: heat means when it is shown, tests otherwise', () => {
    const asTests = (groups: number[][]) => groups.flatMap((g, h) => g.map((value, j) => ({ value, date: `2024-01-${String(1 + (h % 28)).padStart(2, '0')}`, testId: `T${h}-${j}`, heat: `H${h}` })));
    const withEffect = chartStructure(asTests(cases[0]), { start: 0, end: 99 });
    expect(withEffect.unit).toBe('heat-means');
    expect(withEffect.tests_per_point).toBe(4);
    // SD of a heat mean: √(s_L² + s_r²/4)
    expect(withEffect.point_sd).toBeCloseTo(Math.sqrt(ref[0][3] + ref[0][0] / 4), 8);
    expect(withEffect.components?.p).toBeLessThan(0.05);
    const without = chartStructure(asTests(cases[2]), { start: 0, end: 89 });
    expect(ref[2][5]).toBeGreaterThan(0.05);
    expect(without.unit).toBe('tests');
    expect(without.point_sd).toBe(without.test_sd);
    const noHeats = chartStructure(asTests(cases[2]).map((t) => ({ ...t, heat: null })), { start: 0, end: 89 });
    expect(noHeats.unit).toBe('tests');
    expect(noHeats.reason).toMatch(/no heats/);
  });
});
