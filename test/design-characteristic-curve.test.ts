// Characteristic true stress – plastic strain curves: each check names its source beside it.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { characteristicCurve, DEFAULT_DESIGN_OPTIONS, DesignInputError, type DesignOptions, type TestGridCurve } from '../packages/pipeline/src/design/index.ts';
import { grid, lawCurve, normals, PROV, rng, scipyLowerBound } from './design-fixtures.ts';

const opts = (o: Partial<DesignOptions> = {}): DesignOptions => ({ ...DEFAULT_DESIGN_OPTIONS, ...o });

/** Swift σ = K(ε0 + εp)^n with K normal across the tests and ε0, n fixed. */
function swiftPopulation(seed: number, count: number, kMean: number, kSd: number, eps0: number, n: number, g: number[], uniform: (i: number) => number | null) {
  const ks = normals(seed, count, kMean, kSd);
  const tests = ks.map((k, i) => lawCurve(`S-${seed}-${String(i).padStart(3, '0')}`, g, (e) => k * Math.pow(eps0 + e, n), uniform(i), k * Math.pow(eps0, n)));
  return { ks, tests };
}

describe('characteristic curve of a Swift population', () => {
  // Source: the Swift law σ = K(ε0 + εp)^n. The stress is linear in K, so the pointwise
  // mean − k·s of the curves is exactly K_char·(ε0 + εp)^n with K_char = mean_K − k·sd_K; k and
  // K_char are computed independently with scipy.stats.nct (ISO 16269-6, NIST/SEMATECH 7.2.6.3).
  const eps0 = 0.005;
  const nExp = 0.2;
  const g = grid(0, 0.2, 0.001);
  // Considère (maximum force) in plastic strain, elasticity neglected: εp_u = n − ε0 (exact for Swift)
  const uniform = nExp - eps0;
  const { ks, tests } = swiftPopulation(11, 30, 800, 40, eps0, nExp, g, () => uniform);

  it('lies within 2 % of the analytic tolerance bound (and matches it to rounding)', () => {
    const ref = scipyLowerBound(ks, 0.95, 0.75);
    const c = characteristicCurve({ group: { grade: 'TG-420' }, grid: g, tests }, opts(), PROV);
    expect(c.plastic_strain.length).toBeGreaterThan(100);
    let maxRel = 0;
    c.plastic_strain.forEach((e, i) => {
      const exact = ref.bound * Math.pow(eps0 + e, nExp);
      maxRel = Math.max(maxRel, Math.abs(c.characteristic_mpa[i] - exact) / exact);
    });
    expect(maxRel).toBeLessThan(0.02); // the contract check
    expect(maxRel).toBeLessThan(1e-9); // linear in K: exact up to rounding
    // the characteristic yield computed from the tests' yields is the same bound at εp = 0
    expect(c.characteristic_yield_mpa!).toBeCloseTo(ref.bound * Math.pow(eps0, nExp), 6);
  });

  it('is non-decreasing, never above the median, and the median is the pointwise median', () => {
    const c = characteristicCurve({ group: { grade: 'TG-420' }, grid: g, tests }, opts(), PROV);
    for (let i = 1; i < c.characteristic_mpa.length; i++) expect(c.characteristic_mpa[i]).toBeGreaterThanOrEqual(c.characteristic_mpa[i - 1]);
    c.characteristic_mpa.forEach((v, i) => expect(v).toBeLessThanOrEqual(c.median_mpa[i]));
    // Swift is monotone in K, so the median curve is the curve of the median K (exact, law)
    const sorted = [...ks].sort((a, b) => a - b);
    const kMed = (sorted[14] + sorted[15]) / 2;
    c.plastic_strain.forEach((e, i) => expect(c.median_mpa[i]).toBeCloseTo(kMed * Math.pow(eps0 + e, nExp), 8));
  });

  it('is valid up to the characteristic uniform strain (here the Considère strain n − ε0)', () => {
    // Source: Considère's condition dσ/dε = σ for the Swift law gives ε_u = n − ε0 (law, exact).
    const c = characteristicCurve({ group: { grade: 'TG-420' }, grid: g, tests }, opts(), PROV);
    expect(c.valid_to_plastic_strain).toBeCloseTo(0.195, 12);
    expect(c.plastic_strain[c.plastic_strain.length - 1]).toBeCloseTo(0.195, 12);
    expect(c.extrapolated.every((f) => !f)).toBe(true);
    expect(c.extrapolated_from).toBeNull();
  });

  it('with the lognormal model, matches the lognormal bound exp(mean ln K − k·sd ln K)·(ε0+εp)^n', () => {
    // Source: ln σ = ln K + n·ln(ε0 + εp) is linear in ln K; k from scipy.stats.nct (ISO 16269-6).
    const lnK = normals(29, 25, Math.log(800), 0.06);
    const kLog = lnK.map(Math.exp);
    const lt = kLog.map((k, i) => lawCurve(`L-${i}`, g, (e) => k * Math.pow(eps0 + e, nExp), uniform, k * Math.pow(eps0, nExp)));
    const ref = scipyLowerBound(kLog, 0.95, 0.75, 'lognormal');
    const refNormal = scipyLowerBound(kLog, 0.95, 0.75, 'normal');
    const c = characteristicCurve({ group: { grade: 'TG-420' }, grid: g, tests: lt }, opts({ model: 'lognormal' }), PROV);
    c.plastic_strain.forEach((e, i) => {
      const exact = ref.bound * Math.pow(eps0 + e, nExp);
      expect(Math.abs(c.characteristic_mpa[i] - exact) / exact).toBeLessThan(1e-9);
    });
    // and it differs from the normal bound, so the option is really used
    expect(Math.abs(ref.bound - refNormal.bound)).toBeGreaterThan(0.5);
  });

  it('honours coverage and confidence', () => {
    // Source: scipy.stats.nct bound at p = 0.90, γ = 0.95 (ISO 16269-6), against the curve's.
    const ref = scipyLowerBound(ks, 0.9, 0.95);
    const c = characteristicCurve({ group: { grade: 'TG-420' }, grid: g, tests }, opts({ coverage: 0.9, confidence: 0.95 }), PROV);
    expect(c.characteristic_mpa[50]).toBeCloseTo(ref.bound * Math.pow(eps0 + g[50], nExp), 6);
    expect(c.provenance.settings.coverage).toBe(0.9);
    expect(c.provenance.settings.confidence).toBe(0.95);
  });
});

describe('characteristic curve of noisy, non-monotone data', () => {
  // Source: the definition of isotonic (non-decreasing) regression and of the median; property
  // check over random populations (fast-check, fixed seed).
  it('is always non-decreasing, never above the median, and starts at the characteristic yield', () => {
    const g = grid(0, 0.1, 0.002);
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1_000_000 }), fc.integer({ min: 5, max: 40 }), fc.boolean(), (seed, count, lognormal) => {
        const u = rng(seed);
        const tests: TestGridCurve[] = [];
        for (let t = 0; t < count; t++) {
          const base = 300 + 80 * u();
          const uni = 0.04 + 0.06 * u();
          tests.push({
            test_id: `N-${t}`,
            stress_mpa: g.map((e) => (e <= uni ? base + 900 * Math.sqrt(e) + 25 * (u() - 0.5) : null)),
            uniform_plastic_strain: uni,
            modulus_gpa: 200 + 10 * u(),
            yield_mpa: base + 10 * (u() - 0.5),
          });
        }
        const c = characteristicCurve({ group: { grade: 'X' }, grid: g, tests }, opts({ model: lognormal ? 'lognormal' : 'normal', minTestsPerPoint: 3 }), PROV);
        if (c.plastic_strain.length === 0) return c.warnings.some((w) => w.startsWith('no_valid_range'));
        for (let i = 1; i < c.characteristic_mpa.length; i++) if (c.characteristic_mpa[i] < c.characteristic_mpa[i - 1]) return false;
        for (let i = 1; i < c.median_mpa.length; i++) if (c.median_mpa[i] < c.median_mpa[i - 1]) return false;
        for (let i = 0; i < c.characteristic_mpa.length; i++) if (c.characteristic_mpa[i] > c.median_mpa[i]) return false;
        if (c.characteristic_mpa[0] !== Math.min(c.characteristic_yield_mpa!, c.median_mpa[0])) return false;
        const ys = tests.map((t) => t.yield_mpa!).sort((a, b) => a - b);
        const medY = ys.length % 2 ? ys[(ys.length - 1) / 2] : (ys[ys.length / 2 - 1] + ys[ys.length / 2]) / 2;
        if (Math.abs(c.median_mpa[0] - medY) > 1e-9 * medY) return false;
        return c.characteristic_mpa.every(Number.isFinite);
      }),
      { seed: 20260314, numRuns: 60 },
    );
  });
});

describe('validity range', () => {
  const g = grid(0, 0.2, 0.001);
  const law = (k: number) => (e: number) => k * Math.pow(0.004 + e, 0.18);

  it('ends at the last grid point not above the lower tolerance bound of the uniform strains', () => {
    // Source: ISO 16269-6 bound of the uniform strains, computed with scipy.stats.nct.
    const ks = normals(5, 20, 760, 30);
    const us = normals(6, 20, 0.14, 0.012);
    const tests = ks.map((k, i) => lawCurve(`V-${i}`, g, law(k), us[i], law(k)(0)));
    const ref = scipyLowerBound(us, 0.95, 0.75);
    const c = characteristicCurve({ group: { grade: 'TG-500' }, grid: g, tests }, opts(), PROV);
    expect(c.characteristic_uniform_plastic_strain!).toBeCloseTo(ref.bound, 10);
    const expected = g.filter((e) => e <= ref.bound).pop()!;
    expect(c.valid_to_plastic_strain).toBe(expected);
    expect(c.plastic_strain[c.plastic_strain.length - 1]).toBe(expected);
    expect(c.plastic_strain.length).toBe(g.indexOf(expected) + 1);
  });

  it('ends earlier where fewer than minTestsPerPoint curves remain, and says so', () => {
    // Source: the documented rule (validity-range.ts); counts are exact.
    const tests: TestGridCurve[] = [];
    for (let i = 0; i < 10; i++) {
      const k = 700 + 10 * i;
      // six tests stop at 0.05, four run to 0.2; uniform strains not known
      tests.push(lawCurve(`C-${i}`, g, law(k), i < 6 ? 0.05 : 0.2, law(k)(0)));
      tests[i].uniform_plastic_strain = null;
    }
    const c = characteristicCurve({ group: { grade: 'TG-500' }, grid: g, tests }, opts({ minTestsPerPoint: 5 }), PROV);
    expect(c.valid_to_plastic_strain).toBeCloseTo(0.05, 12);
    expect(c.n_at_point.every((n) => n === 10)).toBe(true);
    expect(c.warnings.some((w) => w.startsWith('range_by_count'))).toBe(true);
    expect(c.warnings.some((w) => w.startsWith('no_uniform_strain'))).toBe(true);
    // with a lower minimum the four long curves carry the range to the end of the grid
    const c4 = characteristicCurve({ group: { grade: 'TG-500' }, grid: g, tests }, opts({ minTestsPerPoint: 4 }), PROV);
    expect(c4.valid_to_plastic_strain).toBeCloseTo(0.2, 12);
  });

  it('takes the smaller of the two limits', () => {
    // Source: the documented rule; the uniform-strain bound from scipy.stats.nct (ISO 16269-6).
    const ks = normals(8, 12, 760, 30);
    const us = normals(9, 12, 0.12, 0.008);
    // eight records were cut at 0.06 although their uniform strains lie near 0.12
    const tests = ks.map((k, i) => ({ ...lawCurve(`M-${i}`, g, law(k), i < 8 ? 0.06 : us[i], law(k)(0)), uniform_plastic_strain: us[i] }));
    const ref = scipyLowerBound(us, 0.95, 0.75);
    expect(ref.bound).toBeGreaterThan(0.08);
    const c = characteristicCurve({ group: { grade: 'TG-500' }, grid: g, tests }, opts(), PROV);
    expect(c.valid_to_plastic_strain).toBeCloseTo(0.06, 12);
    expect(c.characteristic_uniform_plastic_strain!).toBeCloseTo(ref.bound, 10);
    // with all twelve curves intact, the uniform-strain bound ends the range instead
    const full = ks.map((k, i) => lawCurve(`M-${i}`, g, law(k), us[i], law(k)(0)));
    const c2 = characteristicCurve({ group: { grade: 'TG-500' }, grid: g, tests: full }, opts(), PROV);
    expect(c2.valid_to_plastic_strain).toBe(g.filter((e) => e <= ref.bound).pop());
  });
});

describe('small groups and bad input', () => {
  const g = grid(0, 0.1, 0.005);
  const law = (k: number) => (e: number) => k * Math.pow(0.004 + e, 0.2);
  const group = (count: number) => Array.from({ length: count }, (_, i) => lawCurve(`F-${i}`, g, law(700 + 13 * i), 0.08 + 0.001 * i, law(700 + 13 * i)(0)));

  it('warns and returns no curve when there are fewer tests than a point needs', () => {
    const c = characteristicCurve({ group: { grade: 'TG-1' }, grid: g, tests: group(3) }, opts(), PROV);
    expect(c.n).toBe(3);
    expect(c.plastic_strain).toEqual([]);
    expect(c.valid_to_plastic_strain).toBeNull();
    expect(c.idealized).toBeNull();
    expect(c.warnings.some((w) => w.startsWith('few_tests'))).toBe(true);
    expect(c.warnings.some((w) => w.startsWith('no_valid_range'))).toBe(true);
    expect(c.provenance.caution).toMatch(/licensed engineer/);
  });

  it('warns of a small sample and states its tolerance factor', () => {
    // Source: REFERENCES.md, one-sided tolerance factor, p = 0.95, γ = 0.75, n = 5: k = 2.463.
    const c = characteristicCurve({ group: { grade: 'TG-1' }, grid: g, tests: group(5) }, opts(), PROV);
    const w = c.warnings.find((x) => x.startsWith('small_sample'));
    expect(w).toBeDefined();
    expect(w).toContain('k = 2.463');
    expect(c.plastic_strain.length).toBeGreaterThan(0);
  });

  it('rejects options out of range with a coded error', () => {
    expect(() => characteristicCurve({ group: {}, grid: g, tests: group(6) }, opts({ coverage: 1.2 }), PROV)).toThrow(DesignInputError);
    try {
      characteristicCurve({ group: {}, grid: [0, 0.01, 0.005], tests: [] }, opts(), PROV);
      expect.unreachable();
    } catch (e) {
      expect((e as DesignInputError).code).toBe('bad_grid');
    }
  });

  it('leaves out a test whose stresses do not match the grid, with a warning', () => {
    const tests = group(6);
    tests.push({ ...tests[0], test_id: 'short', stress_mpa: [400, 410] });
    const c = characteristicCurve({ group: {}, grid: g, tests }, opts(), PROV);
    expect(c.n).toBe(6);
    expect(c.warnings.some((w) => w.startsWith('grid_mismatch'))).toBe(true);
  });
});

describe('start of the curve and the characteristic yield', () => {
  // Source: the documented rule (characteristic-curve.ts): each curve starts at its yield and is
  // held at or above it (the characteristic one also at or below the median).
  const g = grid(0, 0.1, 0.002);
  const ks = normals(41, 15, 760, 30);
  const law = (k: number) => (e: number) => k * Math.pow(0.004 + e, 0.18);
  const tests = ks.map((k, i) => lawCurve(`Y-${i}`, g, law(k), 0.1, law(k)(0)));

  it('starts at a characteristic yield passed in, and warns when it differs from the curves', () => {
    const own = characteristicCurve({ group: {}, grid: g, tests }, opts(), PROV);
    expect(own.warnings.some((w) => w.startsWith('yield_'))).toBe(false);
    const given = own.characteristic_mpa[0] * 1.25;
    const c = characteristicCurve({ group: {}, grid: g, tests, characteristicYieldMpa: given, medianYieldMpa: given * 1.1 }, opts(), PROV);
    expect(c.characteristic_mpa[0]).toBe(given);
    expect(c.median_mpa[0]).toBe(given * 1.1);
    expect(c.characteristic_yield_mpa).toBe(given);
    expect(c.idealized!.elastic_perfectly_plastic.yield_mpa).toBe(given);
    expect(c.characteristic_mpa.every((v) => v >= given)).toBe(true);
    // held at the yield while the curves' own bound is below it: (0.004 + εp)/0.004 = 1.25^(1/0.18)
    const liftEnd = 0.004 * (Math.pow(1.25, 1 / 0.18) - 1);
    c.plastic_strain.forEach((e, i) => {
      if (e < liftEnd - 1e-9) expect(c.characteristic_mpa[i]).toBe(given);
      if (e > liftEnd + 0.002) expect(c.characteristic_mpa[i]).toBeCloseTo(own.characteristic_mpa[i], 9);
    });
    expect(c.warnings.some((w) => w.startsWith('yield_above_curve'))).toBe(true);
    const low = characteristicCurve({ group: {}, grid: g, tests, characteristicYieldMpa: own.characteristic_mpa[0] * 0.9 }, opts(), PROV);
    expect(low.characteristic_mpa[0]).toBeCloseTo(own.characteristic_mpa[0] * 0.9, 9);
    expect(low.characteristic_mpa[1]).toBeCloseTo(own.characteristic_mpa[1], 9);
    expect(low.warnings.some((w) => w.startsWith('yield_below_curve'))).toBe(true);
  });

  it('uses the given modulus, else the median of the tests’ moduli', () => {
    const c = characteristicCurve({ group: {}, grid: g, tests, modulusGpa: 196 }, opts(), PROV);
    expect(c.e_mpa).toBe(196_000);
    const t2 = tests.map((t, i) => ({ ...t, modulus_gpa: 200 + i }));
    expect(characteristicCurve({ group: {}, grid: g, tests: t2 }, opts(), PROV).e_mpa).toBe(207_000);
    const t3 = tests.map((t) => ({ ...t, modulus_gpa: null }));
    const c3 = characteristicCurve({ group: {}, grid: g, tests: t3 }, opts(), PROV);
    expect(c3.e_mpa).toBeNull();
    expect(c3.engineering).toBeNull();
    expect(c3.warnings.some((w) => w.startsWith('no_modulus'))).toBe(true);
  });
});
