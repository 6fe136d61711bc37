// Characteristic curves as bounds: the largest non-decreasing curve below the pointwise bound, and
// the simultaneous band with its joint confidence measured by Monte Carlo. Sources beside each check.
import { describe, expect, it } from 'vitest';
import { seededNormal } from '@fractile/curves/testing';
import { isotonicNonDecreasing } from '@fractile/stats';
import {
  characteristicCurve,
  DEFAULT_DESIGN_OPTIONS,
  largestNonDecreasingBelow,
  lowerToleranceBound,
  simultaneousLowerBand,
  type DesignOptions,
  type TestGridCurve,
} from '../packages/pipeline/src/design/index.ts';
import { grid, PROV, rng } from './design-fixtures.ts';
import { scipy } from './support/scipy.ts';

const opts = (o: Partial<DesignOptions> = {}): DesignOptions => ({ ...DEFAULT_DESIGN_OPTIONS, ...o });

describe('largest non-decreasing curve below a sequence', () => {
  // Source: order theory, exact — L_i = min_{k ≥ i} y_k is at or below y, non-decreasing, and each
  // L_i is attained by some y_k with k ≥ i, so no non-decreasing u ≤ y has u_i > L_i (u_i ≤ u_k ≤ y_k).
  it('is below, non-decreasing and attained from the right, on random sequences', () => {
    const u = rng(17);
    for (let r = 0; r < 200; r++) {
      const y = Array.from({ length: 1 + Math.floor(40 * u()) }, () => 300 + 100 * u());
      const L = largestNonDecreasingBelow(y);
      for (let i = 0; i < y.length; i++) {
        expect(L[i]).toBeLessThanOrEqual(y[i]);
        if (i > 0) expect(L[i]).toBeGreaterThanOrEqual(L[i - 1]);
        expect(y.slice(i).includes(L[i])).toBe(true);
      }
    }
    expect(largestNonDecreasingBelow([])).toEqual([]);
    expect(largestNonDecreasingBelow([3, 1, 2])).toEqual([1, 1, 2]);
  });
});

/** Noisy hardening curves: σ = A + B·√(εp/0.1) + C·(εp/0.1)² + noise, A, B, C normal. */
function noisyGroup(seed: number, n: number, g: readonly number[], noiseMpa: number): TestGridCurve[] {
  const z = seededNormal(seed);
  return Array.from({ length: n }, (_, j) => {
    const a = 350 + 20 * z(), b = 150 + 15 * z(), c = -30 + 10 * z();
    const stress = g.map((e) => a + b * Math.sqrt(e / 0.1) + c * (e / 0.1) ** 2 + noiseMpa * z());
    return { test_id: `G${seed}-${j}`, stress_mpa: stress, uniform_plastic_strain: 0.5, modulus_gpa: 205, yield_mpa: stress[0] };
  });
}

describe('the characteristic curve never lies above the pointwise bound', () => {
  // Source: the pointwise bound x̄ − k·s with k = nct.ppf(γ, n − 1, z_p·√n)/√n by SciPy
  // (ISO 16269-6; NIST/SEMATECH 7.2.6.3), computed at every grid point of noisy populations.
  const g = grid(0, 0.1, 0.002);
  const groups = [1, 2, 3, 4, 5, 6].map((s) => noisyGroup(100 + s, 8 + 4 * s, g, 12));
  const bounds = scipy<number[][]>(
    `out = []
for grp in data['groups']:
    x = np.array(grp, dtype=float)
    n = x.shape[0]
    k = stats.nct.ppf(0.75, n - 1, stats.norm.ppf(0.95) * np.sqrt(n)) / np.sqrt(n)
    out.append((x.mean(axis=0) - k * x.std(axis=0, ddof=1)).tolist())
print(json.dumps(out))`,
    { groups: groups.map((grp) => grp.map((t) => t.stress_mpa)) },
  );

  it('at every point (held at the characteristic yield only where that lies above the bound)', () => {
    let paVaAbove = 0;
    groups.forEach((tests, k) => {
      const c = characteristicCurve({ group: { grade: 'TG-N' }, grid: g, tests }, opts(), PROV);
      expect(c.band).toBe('pointwise');
      expect(c.plastic_strain.length).toBe(g.length);
      const y0 = c.characteristic_yield_mpa!;
      c.characteristic_mpa.forEach((v, i) => {
        if (v !== y0) expect(v).toBeLessThanOrEqual(bounds[k][i] + 1e-9 * Math.abs(bounds[k][i]));
        if (i > 0) expect(v).toBeGreaterThanOrEqual(c.characteristic_mpa[i - 1]);
      });
      // what the pool-adjacent-violators smoothing did instead: it lifts points above the bound
      const iso = isotonicNonDecreasing(bounds[k], c.n_at_point);
      if (iso.some((v, i) => v > bounds[k][i] + 1e-6)) paVaAbove++;
    });
    expect(paVaAbove).toBe(groups.length);
  });
});

describe('simultaneous band', () => {
  it('at a single point its critical value is the noncentral-t factor (SciPy), within Monte Carlo error', () => {
    // Source: ISO 16269-6 pivot at one point; k = nct.ppf(γ, n − 1, z_p·√n)/√n by SciPy.
    for (const [n, gamma] of [[8, 0.75], [25, 0.95]] as const) {
      const z = seededNormal(n);
      const values = Array.from({ length: n }, () => [400 + 20 * z()]);
      const k = scipy<number>(`print(json.dumps(float(stats.nct.ppf(${gamma}, ${n - 1}, stats.norm.ppf(0.95) * np.sqrt(${n})) / np.sqrt(${n}))))`);
      const b = simultaneousLowerBand(values, 1, { coverage: 0.95, confidence: gamma, model: 'normal', simulations: 2000, seed: 3 })!;
      expect(b.criticalValue).toBeCloseTo(k, 8); // one point: nothing to take a maximum over
      const ref = lowerToleranceBound(values.map((v) => v[0]), { coverage: 0.95, confidence: gamma, model: 'normal' })!;
      expect(b.bound[0]).toBeCloseTo(ref.bound, 9);
    }
  });

  it('for curves that move together (one random factor) equals the pointwise bound, within Monte Carlo error', () => {
    // Source: exact — σ = K·f(εp) with K random makes T_i the same at every point, so the maximum
    // is one noncentral-t pivot: c = k(n) (SciPy) up to the simulation's sampling error.
    const n = 15;
    const z = seededNormal(41);
    const g = grid(0, 0.1, 0.005);
    const values = Array.from({ length: n }, () => { const K = 800 + 40 * z(); return g.map((e) => K * Math.pow(0.005 + e, 0.2)); });
    const k = scipy<number>(`print(json.dumps(float(stats.nct.ppf(0.75, ${n - 1}, stats.norm.ppf(0.95) * np.sqrt(${n})) / np.sqrt(${n}))))`);
    const b = simultaneousLowerBand(values, g.length, { coverage: 0.95, confidence: 0.75, model: 'normal', simulations: 4000, seed: 5 })!;
    expect(b.components).toBe(1);
    expect(b.criticalValue).toBeGreaterThanOrEqual(k);
    expect(b.criticalValue - k).toBeLessThan(0.04); // 3 SE of the 0.75-quantile of 4000 draws is about 0.03
  });

  /**
   * Joint confidence by Monte Carlo: populations with known truth (exact law): at each εp the
   * stress A + B·g(εp) + C·h(εp) + e, with A, B, C, e independent normal, is normal with mean
   * μ_A + μ_B·g + μ_C·h and variance σ_A² + g²σ_B² + h²σ_C² + σ_e², so the lower 5 % fractile
   * curve is exact. A band covers jointly when it lies below that curve at every grid point.
   * With `missing`, each test ends at its own plastic strain (as tests do at their uniform strain),
   * independently of its level; the band is checked where at least five curves remain.
   */
  function jointConfidence(n: number, gamma: number, populations: number, missing: boolean): { pointwise: number; simultaneous: number; meanC: number } {
    const g = grid(0, 0.1, 0.004);
    const zp = 1.6448536269514722; // Φ⁻¹(0.95)
    const gg = (e: number) => Math.sqrt(e / 0.1), hh = (e: number) => (e / 0.1) ** 2;
    const truth = g.map((e) => 350 + 150 * gg(e) - 30 * hh(e) - zp * Math.sqrt(400 + 225 * gg(e) ** 2 + 100 * hh(e) ** 2 + 9));
    const z = seededNormal(1000 * n + (missing ? 7 : 0) + Math.round(100 * gamma));
    let pw = 0, sim = 0, sumC = 0;
    for (let m = 0; m < populations; m++) {
      const tests = Array.from({ length: n }, () => {
        const a = 350 + 20 * z(), b = 150 + 15 * z(), c = -30 + 10 * z();
        const end = missing ? 0.05 + 0.06 * Math.abs(z()) / 2.5 : Infinity;
        return g.map((e) => (e <= end ? a + b * gg(e) + c * hh(e) + 3 * z() : null));
      });
      let last = 0;
      while (last + 1 < g.length && tests.filter((t) => t[last + 1] !== null).length >= 5) last++;
      const cols = tests.map((t) => t.slice(0, last + 1));
      const pointwise = cols[0].map((_, i) => lowerToleranceBound(cols.map((t) => t[i]).filter((v): v is number => v !== null), { coverage: 0.95, confidence: gamma, model: 'normal' })!.bound);
      const band = simultaneousLowerBand(cols, last + 1, { coverage: 0.95, confidence: gamma, model: 'normal', simulations: 1000, seed: 11 + m })!;
      if (pointwise.every((v, i) => v <= truth[i])) pw++;
      if (band.bound.every((v, i) => v <= truth[i])) sim++;
      // the simultaneous band is never above the pointwise bound
      band.bound.forEach((v, i) => expect(v).toBeLessThanOrEqual(pointwise[i] + 1e-9));
      sumC += band.criticalValue;
    }
    return { pointwise: pw / populations, simultaneous: sim / populations, meanC: sumC / populations };
  }

  for (const [n, gamma, missing] of [[10, 0.75, false], [30, 0.75, false], [30, 0.95, false], [20, 0.75, true]] as const) {
    it(`reaches its stated joint confidence (n = ${n}, γ = ${gamma}${missing ? ', curves of different lengths' : ''}); the pointwise band does not`, () => {
      const populations = 300;
      const r = jointConfidence(n, gamma, populations, missing);
      const se = Math.sqrt((gamma * (1 - gamma)) / populations);
      console.log(`joint confidence, n = ${n}, γ = ${gamma}${missing ? ', different lengths' : ''}, ${populations} populations: pointwise ${r.pointwise.toFixed(3)}, simultaneous ${r.simultaneous.toFixed(3)} (mean critical value ${r.meanC.toFixed(3)}); Monte Carlo SE ${se.toFixed(3)}`);
      // stated confidence reached within Monte Carlo error (3 SE), and not grossly exceeded
      expect(r.simultaneous).toBeGreaterThanOrEqual(gamma - 3 * se);
      expect(r.simultaneous).toBeLessThanOrEqual(gamma + 4 * se);
      // the pointwise band covers each point with γ but the whole curve clearly less often
      expect(r.pointwise).toBeLessThan(gamma - 3 * se);
    });
  }

  it('as the curves stage option: the curve lies at or below the band, states its kind, records its factor', () => {
    const g = grid(0, 0.1, 0.002);
    const tests = noisyGroup(7, 25, g, 5);
    const pw = characteristicCurve({ group: { grade: 'TG-S' }, grid: g, tests }, opts(), PROV);
    const c = characteristicCurve({ group: { grade: 'TG-S' }, grid: g, tests }, opts({ band: 'simultaneous', bandSimulations: 1000 }), PROV);
    const raw = simultaneousLowerBand(tests.map((t) => t.stress_mpa), g.length, { coverage: 0.95, confidence: 0.75, model: 'normal', simulations: 1000, seed: c.simultaneous!.seed })!;
    expect(c.band).toBe('simultaneous');
    expect(c.band_statement).toMatch(/^simultaneous: /);
    expect(pw.band_statement).toMatch(/^pointwise: /);
    expect(c.simultaneous!.critical_value).toBe(raw.criticalValue);
    expect(c.simultaneous!.critical_value).toBeGreaterThan(c.simultaneous!.max_pointwise_factor);
    expect(c.provenance.settings.band).toBe('simultaneous');
    expect(c.provenance.settings.band_simulations).toBe(1000);
    expect(c.provenance.settings_hash).not.toBe(pw.provenance.settings_hash);
    c.characteristic_mpa.forEach((v, i) => {
      expect(v).toBeLessThanOrEqual(raw.bound[i] + 1e-9);
      expect(v).toBeLessThanOrEqual(pw.characteristic_mpa[i] + 1e-9);
      if (i > 0) expect(v).toBeGreaterThanOrEqual(c.characteristic_mpa[i - 1]);
    });
    // the same input gives the same band (seeded)
    const again = characteristicCurve({ group: { grade: 'TG-S' }, grid: g, tests }, opts({ band: 'simultaneous', bandSimulations: 1000 }), PROV);
    expect(again.characteristic_mpa).toEqual(c.characteristic_mpa);
    // its idealizations start where the curve starts
    expect(c.idealized!.elastic_perfectly_plastic.yield_mpa).toBe(c.characteristic_mpa[0]);
  });
});
