/**
 * Law fits cross-checked against SciPy: `scipy.optimize.curve_fit` (Levenberg–Marquardt, the
 * reference least-squares implementation) on the same generated points must find the same
 * parameters and residual. SciPy is a required test dependency: its absence fails the test.
 */
import { describe, expect, it } from 'vitest';
import { evalHollomon, evalRambergOsgood, evalSwift, evalVoce, fitHollomon, fitRambergOsgood, fitSwift, fitVoce } from '@fractile/curves';
import { seededNormal } from '@fractile/curves/testing';
import { runPython, scipyVersion } from './support/scipy.ts';

const PY = `
import numpy as np
from scipy.optimize import curve_fit
laws = {
  'hollomon': lambda x, k, n: k * x**n,
  'swift': lambda x, k, e0, n: k * (e0 + x)**n,
  'voce': lambda x, s0, q, b: s0 + q * (1 - np.exp(-b * x)),
  'ro': lambda s, E, s0, m: s / E + 0.002 * (s / s0)**m,
}
out = []
for case in data:
    f = laws[case['law']]
    x = np.array(case['x']); y = np.array(case['y'])
    p, _ = curve_fit(f, x, y, p0=case['p0'], method='lm', maxfev=100000, xtol=1e-14, ftol=1e-14)
    r = y - f(x, *p)
    out.append({'p': p.tolist(), 'rms': float(np.sqrt(np.mean(r**2)))})
print(json.dumps(out))
`;

interface Case { law: string; x: number[]; y: number[]; p0: number[]; ours: number[]; oursRms: number }

function linspace(a: number, b: number, n: number): number[] {
  return Array.from({ length: n }, (_, i) => a + ((b - a) * i) / (n - 1));
}

describe('law fits agree with scipy.optimize.curve_fit', () => {
  it('SciPy is available for the cross-checks', () => {
    expect(scipyVersion()).not.toBeNull();
  });

  const cases: Case[] = [];
  for (let seed = 1; seed <= 4; seed++) {
    const nrm = seededNormal(seed);
    const noise = 1.5 * seed;
    // Hollomon on true strain 0.005–0.25
    {
      const p = { k_mpa: 700 + 40 * seed, n: 0.12 + 0.03 * seed };
      const x = linspace(0.005, 0.25, 150);
      const y = x.map((e) => evalHollomon(p, e) + noise * nrm());
      const f = fitHollomon(x, y)!;
      cases.push({ law: 'hollomon', x, y, p0: [500, 0.3], ours: [f.params.k_mpa, f.params.n], oursRms: f.rmseMpa });
    }
    // Swift on plastic strain 0–0.2
    {
      const p = { k_mpa: 650 + 30 * seed, eps0: 0.004 * seed, n: 0.15 + 0.02 * seed };
      const x = linspace(0, 0.2, 150);
      const y = x.map((e) => evalSwift(p, e) + noise * nrm());
      const f = fitSwift(x, y)!;
      cases.push({ law: 'swift', x, y, p0: [600, 0.01, 0.2], ours: [f.params.k_mpa, f.params.eps0, f.params.n], oursRms: f.rmseMpa });
    }
    // Voce on plastic strain 0–0.2
    {
      const p = { sigma0_mpa: 250 + 10 * seed, q_mpa: 200 + 20 * seed, b: 8 + 4 * seed };
      const x = linspace(0, 0.2, 150);
      const y = x.map((e) => evalVoce(p, e) + noise * nrm());
      const f = fitVoce(x, y)!;
      cases.push({ law: 'voce', x, y, p0: [200, 150, 10], ours: [f.params.sigma0_mpa, f.params.q_mpa, f.params.b], oursRms: f.rmseMpa });
    }
    // Ramberg–Osgood: strain on stress (as fitted), relative strain noise
    {
      const p = { e_mpa: 70_000 + 5000 * seed, sigma0_mpa: 200 + 50 * seed, m: 8 + 3 * seed };
      const y0 = linspace(5, p.sigma0_mpa * 1.25, 150);
      const x = y0;
      const y = x.map((s) => evalRambergOsgood(p, s) * (1 + 0.002 * nrm()));
      const f = fitRambergOsgood(y, x)!;
      cases.push({ law: 'ro', x, y, p0: [p.e_mpa * 0.9, p.sigma0_mpa * 0.9, 10], ours: [f.params.e_mpa, f.params.sigma0_mpa, f.params.m], oursRms: f.rmseMpa });
    }
  }

  it('gives the same parameters as curve_fit (relative 1e-6) on 16 generated data sets', () => {
    const ref = runPython<{ p: number[]; rms: number }[]>(PY, cases.map(({ law, x, y, p0 }) => ({ law, x, y, p0 })));
    expect(ref).toHaveLength(cases.length);
    cases.forEach((c, i) => {
      c.ours.forEach((v, k) => {
        expect(Math.abs(v - ref[i].p[k]) / Math.abs(ref[i].p[k]), `${c.law} #${i} parameter ${k}: ours ${v}, SciPy ${ref[i].p[k]}`).toBeLessThan(1e-6);
      });
      // stress-law residuals: same RMS as SciPy's (Ramberg–Osgood is fitted in strain, its rmseMpa is in stress)
      if (c.law !== 'ro') expect(c.oursRms).toBeCloseTo(ref[i].rms, 6);
    });
  });
});
