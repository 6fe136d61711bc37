// Rolling capability of individual tests against the grade minimum, against a direct
// window-by-window computation in numpy with scipy.stats.norm.cdf for the fraction below (normal
// model, Montgomery's one-sided capability ratios) and a count for the observed fraction.
import { describe, expect, it } from 'vitest';
import { createMonitorRandom, rollingCapability } from '../packages/stats/src/monitor/index.ts';
import { scipy } from './monitor-scipy.ts';

describe('rolling capability', () => {
  it('margin, Ppk, Cpk, modelled and observed fraction below match numpy/SciPy on every window', () => {
    const rng = createMonitorRandom(8);
    // A mill drifting toward a 355 MPa minimum: 380 → 365 over 120 tests, SD 7.
    const v = Array.from({ length: 120 }, (_, i) => 380 - (15 * i) / 119 + 7 * rng.normal());
    const dates = v.map((_, i) => new Date(Date.UTC(2025, 5, 1) + i * 86400000).toISOString().slice(0, 10));
    const cap = rollingCapability(v, dates, 355, 30, 10);
    const ref = scipy<(number[] | null)[]>(
      `
y = np.asarray(data, float); out = []
for i in range(len(y)):
    w = y[max(0, i-29):i+1]
    if len(w) < 10: out.append(None); continue
    nb = int((w < 355).sum())
    m = w.mean(); s = w.std(ddof=1); sw = np.abs(np.diff(w)).mean()/1.128
    out.append([len(w), float(m), float(s), float((m-355)/s), float((m-355)/(3*sw)), float(stats.norm.cdf(355, m, s)), nb])
`,
      v,
    );
    cap.forEach((c, i) => {
      const r = ref[i];
      if (r === null) {
        expect(c.margin_sd).toBeNull();
        expect(c.fraction_below).toBeNull();
        return;
      }
      expect(c.n).toBe(r[0]);
      expect(c.mean).toBeCloseTo(r[1], 9);
      expect(c.sd).toBeCloseTo(r[2], 9);
      expect(c.margin_sd).toBeCloseTo(r[3], 9);
      expect(c.ppk).toBeCloseTo(r[3] / 3, 9);
      expect(c.cpk).toBeCloseTo(r[4], 9);
      expect(Math.abs((c.fraction_below as number) - r[5])).toBeLessThanOrEqual(1e-12 + 1e-9 * r[5]);
      expect(c.n_below).toBe(r[6]);
      expect(c.observed_below).toBeCloseTo(r[6] / r[0], 14);
    });
    // The drift shows: the margin shrinks from the first full window to the last.
    expect(cap[119].margin_sd as number).toBeLessThan((cap[29].margin_sd as number) - 0.5);
  });

  it('a constant window has no SD: nulls, not NaN or Infinity', () => {
    const cap = rollingCapability(new Array(15).fill(400), new Array(15).fill('2025-01-01'), 355, 10, 5);
    expect(cap[14]).toMatchObject({ n: 10, mean: 400, sd: 0, margin_sd: null, cpk: null, ppk: null, fraction_below: null, n_below: 0, observed_below: 0 });
  });
});
