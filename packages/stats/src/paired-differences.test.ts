/**
 * Paired differences against SciPy: the mean difference's t interval equals
 * scipy.stats.ttest_rel(a, b).confidence_interval() (the paired t test), the SD numpy's ddof=1;
 * limits of agreement mean ± 1.96 SD (Bland & Altman 1986).
 */
import { describe, expect, it } from 'vitest';
import { scipy } from '../../../test/support/scipy.ts';
import { pairedDifferences } from './paired-differences.ts';

describe('paired differences', () => {
  it('agree with SciPy’s paired t test on a worked sample', () => {
    const a = [362, 371, 355, 380, 366, 359, 374, 368];
    const b = [350.2, 362.9, 349.1, 366.0, 357.7, 351.3, 360.8, 359.4];
    const r = pairedDifferences(a, b);
    const ref = scipy<{ mean: number; sd: number; lo: number; hi: number; rel: number }>(`
a = np.array(data["a"]); b = np.array(data["b"])
ci = stats.ttest_rel(a, b).confidence_interval(0.95)
d = a - b
print(json.dumps({"mean": d.mean(), "sd": d.std(ddof=1), "lo": ci.low, "hi": ci.high, "rel": float(np.mean(d / b) * 100)}))
`, { a, b });
    expect(r.n).toBe(8);
    expect(r.mean_difference).toBeCloseTo(ref.mean, 10);
    expect(r.sd_difference).toBeCloseTo(ref.sd, 10);
    expect(r.ci![0]).toBeCloseTo(ref.lo, 8);
    expect(r.ci![1]).toBeCloseTo(ref.hi, 8);
    expect(r.mean_relative_pct).toBeCloseTo(ref.rel, 10);
    expect(r.limits_of_agreement![0]).toBeCloseTo(ref.mean - 1.96 * ref.sd, 10);
  });

  it('skips incomplete pairs and degrades to nulls on too few', () => {
    expect(pairedDifferences([], [])).toMatchObject({ n: 0, mean_difference: null, ci: null });
    expect(pairedDifferences([5, Number.NaN], [3, 4])).toMatchObject({ n: 1, mean_difference: 2, sd_difference: null, ci: null, max_abs_difference: 2 });
  });
});
