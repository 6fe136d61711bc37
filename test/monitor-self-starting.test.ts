// Self-starting standardization (Hawkins 1987, The Statistician 36:299; Hawkins & Olwell 1998,
// ch. 7) and the CUSUM design by Siegmund's approximation (Siegmund 1985, as in Montgomery):
// the transform against SciPy's t and normal laws, its exact N(0, 1) law on independent data
// (Kolmogorov–Smirnov by SciPy), the random-heat version on data with a heat effect, and the
// simulated in-control ARL with estimated parameters against Montgomery's known-parameter 465.
import { describe, expect, it } from 'vitest';
import {
  createMonitorRandom,
  createSelfStarting,
  cusumDecisionInterval,
  cusumRunLength,
  selfStartingLimit,
  selfStartingScore,
  shewhartLimit,
  siegmundArl,
} from '../packages/stats/src/monitor/index.ts';
import { CUSUM_ONE_SIDED_PY, scipy } from './monitor-scipy.ts';

/** U of every point after the first `start`, each against the points before it. */
function scores(values: number[], heats: (string | null)[], unit: 'tests' | 'heat-means', start = 5): number[] {
  const ss = createSelfStarting(unit, start);
  const out: number[] = [];
  values.forEach((v, i) => {
    const p = ss.predict(1, heats[i]);
    if (p) out.push(selfStartingScore(v, p));
    ss.add(v, 1, 0, heats[i]);
  });
  return out;
}

describe('self-starting transform (Hawkins 1987)', () => {
  it('U = Φ⁻¹(F_t((x − x̄)/(s·√(1 + 1/m)); m − 1)) as scipy.stats.t.cdf and norm.ppf give it', () => {
    const v = [402, 395, 411, 399, 405, 390, 417, 401];
    const ref = scipy<number[]>(
      'x = np.asarray(data, float); out = []\nfor m in range(5, len(x)):\n    p = x[:m]; T = (x[m] - p.mean())/(p.std(ddof=1)*np.sqrt(1 + 1/m)); out.append(float(stats.norm.ppf(stats.t.cdf(T, m - 1))))',
      v,
    );
    const u = scores(v, v.map(() => null), 'tests');
    expect(u).toHaveLength(3);
    u.forEach((x, i) => expect(x).toBeCloseTo(ref[i], 9));
    // the limit in units is where the score equals the limit: U(limit) = −3.5
    const ss = createSelfStarting('tests', 5);
    v.slice(0, 6).forEach((x) => ss.add(x, 1, 0, null));
    const p = ss.predict(1, null)!;
    expect(selfStartingScore(selfStartingLimit(-3.5, p), p)).toBeCloseTo(-3.5, 9);
  });

  it('on independent normal data the scores are N(0, 1) and uncorrelated (KS test by SciPy)', () => {
    const rng = createMonitorRandom(21);
    const u: number[] = [];
    const lag: [number, number][] = [];
    for (let r = 0; r < 40; r++) {
      const v = Array.from({ length: 100 }, () => 355 + 14 * rng.normal());
      const s = scores(v, v.map(() => null), 'tests');
      u.push(...s);
      for (let i = 1; i < s.length; i++) lag.push([s[i - 1], s[i]]);
    }
    const ks = scipy<[number, number]>('r = stats.kstest(np.asarray(data), "norm"); out = [float(r.statistic), float(r.pvalue)]', u);
    expect(ks[1]).toBeGreaterThan(0.001);
    const r = scipy<number>('a = np.asarray(data); out = float(np.corrcoef(a[:, 0], a[:, 1])[0, 1])', lag);
    expect(Math.abs(r)).toBeLessThan(3.5 / Math.sqrt(lag.length));
  });

  it('equal heats: the heat-mean version is Hawkins on the heat means (exact identity)', () => {
    const rng = createMonitorRandom(22);
    const ssH = createSelfStarting('heat-means', 5);
    const ssT = createSelfStarting('tests', 5);
    for (let h = 0; h < 30; h++) {
      const b = 8 * rng.normal();
      const x = Array.from({ length: 4 }, () => 400 + b + 10 * rng.normal());
      const mean = x.reduce((s, y) => s + y, 0) / 4;
      const ss = x.reduce((s, y) => s + (y - mean) ** 2, 0);
      const pH = ssH.predict(4, null);
      const pT = ssT.predict(1, null);
      // identical while the between-heat estimate is positive (s_L² + s_r²/4 = sample variance of the means)
      if (pH && pT) {
        expect(pH.centre).toBeCloseTo(pT.centre, 9);
        expect(pH.df).toBe(pT.df);
        const diff = Math.abs(pH.scale - pT.scale) / pT.scale;
        expect(diff < 1e-9 || pH.scale > pT.scale).toBe(true); // truncated s_L² = 0: never narrower
      }
      ssH.add(mean, 4, ss, null);
      ssT.add(mean, 1, 0, null);
    }
  });

  it('tests with a heat effect: the random-heat scores stay N(0, 1) and drop the within-heat correlation', () => {
    // between-heat SD half the within-heat SD, heats of 4: tests of one heat correlate by 0.2
    const rng = createMonitorRandom(23);
    const re: [number, number][] = [];
    const iid: [number, number][] = [];
    const all: number[] = [];
    for (let r = 0; r < 40; r++) {
      const v: number[] = [];
      const heats: string[] = [];
      for (let h = 0; h < 40; h++) {
        const b = 5 * rng.normal();
        for (let j = 0; j < 4; j++) {
          v.push(400 + b + 10 * rng.normal());
          heats.push(`H${h}`);
        }
      }
      const withHeats = scores(v, heats, 'tests', 12);
      const plain = scores(v, v.map(() => null), 'tests', 12);
      all.push(...withHeats);
      // pairs of consecutive tests inside one heat
      for (let i = 13; i < v.length; i++) {
        if (heats[i] !== heats[i - 1]) continue;
        re.push([withHeats[i - 13], withHeats[i - 12]]);
        iid.push([plain[i - 13], plain[i - 12]]);
      }
    }
    const [rRe, rIid, sd] = scipy<number[]>('a = np.asarray(data["re"]); b = np.asarray(data["iid"]); out = [float(np.corrcoef(a[:,0], a[:,1])[0,1]), float(np.corrcoef(b[:,0], b[:,1])[0,1]), float(np.std(data["all"], ddof=1))]', { re, iid, all });
    expect(Math.abs(rRe)).toBeLessThan(0.06);
    expect(rIid).toBeGreaterThan(0.12); // the independent transform keeps ≈ 0.2
    // estimated components make the scores slightly conservative (SD a little under 1), never wide
    expect(sd).toBeGreaterThan(0.9);
    expect(sd).toBeLessThan(1.03);
  });
});

describe('in-control ARL with estimated parameters (simulated)', () => {
  it('self-starting CUSUM k = 0.5, h = 5 after 30 points: ARL ≈ 465 as with known parameters (Montgomery); plug-in estimates alarm early far more often', () => {
    // Montgomery's table: two-sided tabular CUSUM k = 0.5, h = 5, ARL0 ≈ 465 (REFERENCES.md).
    // Run lengths are nearly geometric, so P(RL < 100) ≈ 1 − (1 − 1/465)^99 ≈ 0.19 with known
    // parameters; with the mean and SD plugged in from 30 points, many charts sit too tight.
    const rng = createMonitorRandom(24);
    const p = { k: 0.5, h: 5 };
    const runs = 1000;
    const ss: number[] = [];
    const plug: number[] = [];
    for (let r = 0; r < runs; r++) {
      const chart = createSelfStarting('tests', 3);
      let s1 = 0;
      let s2 = 0;
      for (let i = 0; i < 30; i++) {
        const x = rng.normal();
        chart.add(x, 1, 0, null);
        s1 += x;
        s2 += x * x;
      }
      ss.push(cusumRunLength(() => {
        const x = rng.normal();
        const u = selfStartingScore(x, chart.predict(1, null)!);
        chart.add(x, 1, 0, null);
        return u;
      }, p, 100_000));
      const m = s1 / 30;
      const sd = Math.sqrt((s2 - 30 * m * m) / 29);
      plug.push(cusumRunLength(() => (rng.normal() - m) / sd, p, 100_000));
    }
    const mean = ss.reduce((a, b) => a + b, 0) / runs;
    const se = Math.sqrt(ss.reduce((a, b) => a + (b - mean) ** 2, 0) / (runs - 1) / runs);
    expect(Math.abs(mean - 465)).toBeLessThan(3.5 * se + 0.5);
    const short = (x: number[]) => x.filter((r) => r < 100).length / x.length;
    const geometric = 1 - (1 - 1 / 465) ** 99;
    expect(Math.abs(short(ss) - geometric)).toBeLessThan(3.5 * Math.sqrt((geometric * (1 - geometric)) / runs) + 0.02);
    expect(short(plug)).toBeGreaterThan(geometric + 0.1);
  });
});

// Zero-state one-sided CUSUM ARL by the Markov chain (Brook & Evans 1972) in SciPy.
const MARKOV = `${CUSUM_ONE_SIDED_PY}
out = [cusum_one_sided(q['k'], q['h'], q['shift']) for q in data]
`;

describe("CUSUM design by Siegmund's approximation", () => {
  it('the designed h gives the target one-sided ARL within 3 % for k ≤ 0.8, 8 % at k = 1, by the Markov chain (SciPy)', () => {
    const designs = [
      { k: 0.5, arl: 2000 },
      { k: 0.5, arl: 1000 },
      { k: 0.79, arl: 500 },
      { k: 1, arl: 250 },
    ].map((d) => ({ ...d, h: cusumDecisionInterval(d.k, d.arl) }));
    const q = scipy<number[]>(MARKOV, [...designs.map((d) => ({ k: d.k, h: d.h, shift: 0 })), ...designs.map((d) => ({ k: d.k, h: d.h, shift: 2 * d.k }))]);
    designs.forEach((d, i) => {
      expect(Math.abs(siegmundArl(d.k, d.h, 0) - d.arl) / d.arl).toBeLessThan(1e-9);
      // the approximation runs short for large k and small h: 233 for 250 at k = 1
      expect(Math.abs(q[i] - d.arl) / d.arl).toBeLessThan(d.k <= 0.8 ? 0.03 : 0.08);
      // at the design shift 2k the approximation holds within 5 %
      const at = q[i + designs.length];
      expect(Math.abs(siegmundArl(d.k, d.h, 2 * d.k) - at) / at).toBeLessThan(0.05);
    });
    // Montgomery's k = 0.5, h = 5: one-sided ≈ 2 × 465 = 930; Siegmund gives 938
    expect(siegmundArl(0.5, 5, 0)).toBeCloseTo(938.2, 1);
  });

  it('the Shewhart limit for a one-sided ARL of 5000 points is the 1 − 1/5000 normal quantile (SciPy)', () => {
    const z = scipy<number>('out = float(stats.norm.isf(1/5000))', null);
    expect(shewhartLimit(5000)).toBeCloseTo(z, 9);
  });
});
