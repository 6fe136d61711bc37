// Average run lengths of the CUSUM and EWMA charts, by seeded simulation, against the published
// tables (REFERENCES.md, "CUSUM / EWMA average run lengths", from memory of Montgomery's tables
// and Lucas & Saccucci 1990) and against Markov-chain values computed with SciPy. The
// simulation drives the very recursions the charts use.
// Note: REFERENCES.md attributes ARL 500 / 10.3 to λ = 0.10, L = 2.7; the Markov chain and the
// simulation agree that those belong to L = 2.814 (Lucas & Saccucci's design for ARL0 = 500),
// and L = 2.7 gives ≈ 369 / 9.7. Both facts are checked below.
//
// Tolerance: the mean of N independent run lengths has standard error s/√N (s: the sample SD of
// the run lengths, close to the ARL itself in control, as run lengths are nearly geometric). We
// accept |mean − table| ≤ 3.5·SE + half a unit in the table's last digit (its rounding); a
// correct chart fails this with probability ≈ 5e-4, while a wrong limit (e.g. h = 4.5 for 5, or
// exact instead of asymptotic EWMA limits) moves the in-control ARL by far more.
import { describe, expect, it } from 'vitest';
import { DEFAULT_EWMA, createMonitorRandom, cusumRunLength, ewmaRunLength } from '../packages/stats/src/monitor/index.ts';
import { CUSUM_ONE_SIDED_PY, scipy } from './monitor-scipy.ts';

function simulate(runs: number, one: () => number): { mean: number; se: number } {
  let s = 0;
  let s2 = 0;
  for (let i = 0; i < runs; i++) {
    const r = one();
    s += r;
    s2 += r * r;
  }
  const mean = s / runs;
  const sd = Math.sqrt((s2 - runs * mean * mean) / (runs - 1));
  return { mean, se: sd / Math.sqrt(runs) };
}

function expectArl(sim: { mean: number; se: number }, table: number, lastDigit: number): void {
  const tol = 3.5 * sim.se + lastDigit / 2;
  expect(Math.abs(sim.mean - table), `simulated ARL ${sim.mean.toFixed(2)} ± ${sim.se.toFixed(2)} vs ${table}`).toBeLessThanOrEqual(tol);
}

describe('tabular CUSUM ARL, k = 0.5 (Montgomery, table of ARLs; REFERENCES.md)', () => {
  it('h = 4: in control ≈ 168, 1σ shift ≈ 8.38', () => {
    const rng = createMonitorRandom(4001);
    const p = { k: 0.5, h: 4 };
    const ic = simulate(4000, () => cusumRunLength(() => rng.normal(), p));
    expectArl(ic, 168, 1);
    expect(ic.se / ic.mean).toBeLessThan(0.02); // the check is sharp: SE under 2 % of the ARL
    const oc = simulate(4000, () => cusumRunLength(() => rng.normal() + 1, p));
    expectArl(oc, 8.38, 0.01);
  });

  it('h = 5: in control ≈ 465, 1σ shift ≈ 10.4 (either direction)', () => {
    const rng = createMonitorRandom(5001);
    const p = { k: 0.5, h: 5 };
    const ic = simulate(3000, () => cusumRunLength(() => rng.normal(), p));
    expectArl(ic, 465, 1);
    const down = simulate(3000, () => cusumRunLength(() => rng.normal() - 1, p));
    expectArl(down, 10.4, 0.1);
    const up = simulate(3000, () => cusumRunLength(() => rng.normal() + 1, p));
    expectArl(up, 10.4, 0.1);
  });

  it('a wrong decision interval is detected by the same check', () => {
    // h = 4.5 lies between the two tabulated designs; its in-control ARL must miss both values.
    const rng = createMonitorRandom(4501);
    const ic = simulate(3000, () => cusumRunLength(() => rng.normal(), { k: 0.5, h: 4.5 }));
    expect(Math.abs(ic.mean - 168)).toBeGreaterThan(3.5 * ic.se + 0.5);
    expect(Math.abs(ic.mean - 465)).toBeGreaterThan(3.5 * ic.se + 0.5);
  });
});

// Zero-state ARLs by the Markov-chain method (Brook & Evans 1972, Biometrika 59:539; the method
// Lucas & Saccucci 1990 used for their tables), evaluated in Python with scipy.stats.norm.cdf
// and numpy's linear solver: an external computation of the same quantity, with no sampling
// error (discretization error < 0.2 % at 801 states).
const MARKOV = `
def ewma_arl(lam, L, shift, m=801):
    h = L*np.sqrt(lam/(2-lam)); w = 2*h/m
    c = -h + w*(np.arange(m)+0.5)
    up = (c[None,:]+w/2-(1-lam)*c[:,None])/lam; lo = (c[None,:]-w/2-(1-lam)*c[:,None])/lam
    P = stats.norm.cdf(up-shift) - stats.norm.cdf(lo-shift)
    return float(np.interp(0.0, c, np.linalg.solve(np.eye(m)-P, np.ones(m))))
${CUSUM_ONE_SIDED_PY}
out = {
  'ewma': [ewma_arl(q['lambda'], q['L'], q['shift']) for q in data['ewma']],
  'cusum': [1/(1/cusum_one_sided(q['k'], q['h'], q['shift'])+1/cusum_one_sided(q['k'], q['h'], -q['shift'])) for q in data['cusum']],
}
`;

describe('Markov-chain ARLs computed with SciPy agree with the tables and the simulation', () => {
  const q = scipy<{ ewma: number[]; cusum: number[] }>(MARKOV, {
    ewma: [
      { lambda: 0.1, L: 2.814, shift: 0 },
      { lambda: 0.1, L: 2.814, shift: 1 },
      { lambda: 0.1, L: 2.7, shift: 0 },
      { lambda: 0.1, L: 2.7, shift: 1 },
    ],
    cusum: [
      { k: 0.5, h: 4, shift: 0 },
      { k: 0.5, h: 4, shift: 1 },
      { k: 0.5, h: 5, shift: 0 },
      { k: 0.5, h: 5, shift: 1 },
    ],
  });

  it('CUSUM: the Markov chain reproduces Montgomery\'s 168, 8.38, 465, 10.4 (REFERENCES.md)', () => {
    expect(Math.abs(q.cusum[0] - 168)).toBeLessThan(1);
    expect(Math.abs(q.cusum[1] - 8.38)).toBeLessThan(0.02);
    expect(Math.abs(q.cusum[2] - 465)).toBeLessThan(1.5);
    expect(Math.abs(q.cusum[3] - 10.4)).toBeLessThan(0.06);
  });

  it('EWMA λ = 0.10, L = 2.814 (our default): 500 and 10.3, Lucas & Saccucci 1990 as tabulated by Montgomery (from memory)', () => {
    expect(Math.abs(q.ewma[0] - 500)).toBeLessThan(2);
    expect(Math.abs(q.ewma[1] - 10.3)).toBeLessThan(0.06);
    const rng = createMonitorRandom(2814);
    const p = { lambda: 0.1, L: 2.814 };
    expectArl(simulate(3000, () => ewmaRunLength(() => rng.normal(), p, 'asymptotic')), 500, 1);
    expectArl(simulate(4000, () => ewmaRunLength(() => rng.normal() - 1, p, 'asymptotic')), 10.3, 0.1);
    expect(DEFAULT_EWMA).toEqual(p);
  });

  it('EWMA λ = 0.10, L = 2.7: ARL ≈ 369 in control and ≈ 9.7 at 1σ, not the 500 / 10.3 quoted in REFERENCES.md', () => {
    // The simulation lands on the Markov-chain values (SciPy), within its sampling error.
    const rng = createMonitorRandom(2701);
    const p = { lambda: 0.1, L: 2.7 };
    const ic = simulate(3000, () => ewmaRunLength(() => rng.normal(), p, 'asymptotic'));
    expectArl(ic, q.ewma[2], 0);
    expect(Math.abs(ic.mean - 500)).toBeGreaterThan(3.5 * ic.se);
    const oc = simulate(4000, () => ewmaRunLength(() => rng.normal() + 1, p, 'asymptotic'));
    expectArl(oc, q.ewma[3], 0);
  });

  it('time-varying (exact) limits signal earlier in control than the tabulated design', () => {
    // Consequence of the exact variance: the limits are narrower at the start, so ARL0 < 500.
    const rng = createMonitorRandom(2702);
    const ic = simulate(3000, () => ewmaRunLength(() => rng.normal(), { lambda: 0.1, L: 2.814 }, 'exact'));
    expect(ic.mean).toBeLessThan(q.ewma[0] - 2 * ic.se);
  });
});
