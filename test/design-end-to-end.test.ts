// From synthetic tensile records through per-test reduction to the characteristic curve.
import { DEFAULT_REDUCE_SETTINGS, reduceCurve } from '@fractile/curves';
import { hollomonCurve } from '@fractile/curves/testing';
import { describe, expect, it } from 'vitest';
import { characteristicCurve, DEFAULT_DESIGN_OPTIONS, type TestGridCurve } from '../packages/pipeline/src/design/index.ts';
import { hollomonAtPlastic, normals, PROV, scipyLowerBound } from './design-fixtures.ts';

describe('records of a Hollomon population, reduced and designed', () => {
  // Source: REFERENCES.md, exact results of the laws — Hollomon σt = K·εt^n with maximum force at
  // εt = n (Considère), so the uniform plastic strain is n − K·n^n/E; K_char by scipy.stats.nct
  // (ISO 16269-6). The per-test reduction stands between, so the check allows 2 %.
  it('gives a characteristic curve within 2 % of the law with K_char, valid to the uniform strain', () => {
    const E = 205_000;
    const nExp = 0.16;
    const ks = normals(901, 20, 780, 30);
    const tests: TestGridCurve[] = ks.map((k, i) => {
      const rec = hollomonCurve({ kMpa: k, n: nExp, eMpa: E, seed: 900 + i });
      const out = reduceCurve(rec.input, DEFAULT_REDUCE_SETTINGS);
      if (!out.ok) throw new Error(`reduction failed: ${out.code} ${out.message}`);
      return {
        test_id: `E2E-${i}`,
        stress_mpa: out.result.grid,
        uniform_plastic_strain: nExp - (k * Math.pow(nExp, nExp)) / E,
        modulus_gpa: out.result.properties.modulus_gpa,
        yield_mpa: out.result.properties.yield_mpa,
      };
    });
    const grid = DEFAULT_REDUCE_SETTINGS.gridPlasticStrain;
    const c = characteristicCurve({ group: { grade: 'TG-E2E' }, grid, tests }, { ...DEFAULT_DESIGN_OPTIONS }, PROV);
    const kChar = scipyLowerBound(ks, 0.95, 0.75).bound;
    const uChar = scipyLowerBound(tests.map((t) => t.uniform_plastic_strain!), 0.95, 0.75).bound;
    // valid to the last grid point not above the characteristic uniform strain, or where the
    // reduced curves (null past each test's own uniform strain) thin out
    expect(c.valid_to_plastic_strain!).toBeLessThanOrEqual(uChar + 1e-12);
    expect(c.valid_to_plastic_strain!).toBeGreaterThan(uChar - 0.01);
    expect(c.e_mpa! / E).toBeCloseTo(1, 2);
    let checked = 0;
    c.plastic_strain.forEach((e, i) => {
      if (e < 0.01) return; // the elastic–plastic knee: K enters nonlinearly there
      const law = hollomonAtPlastic(kChar, nExp, E, e);
      expect(Math.abs(c.characteristic_mpa[i] - law) / law).toBeLessThan(0.02);
      checked++;
    });
    expect(checked).toBeGreaterThan(100);
    // the curves start at the yields (Rp0.2 from the reduction): characteristic at the tolerance
    // bound of the yields (scipy.stats.nct), with no long plateau imposed and never above the median
    const yChar = scipyLowerBound(tests.map((t) => t.yield_mpa!), 0.95, 0.75).bound;
    expect(c.characteristic_mpa[0]).toBeCloseTo(yChar, 6);
    expect(c.warnings.filter((w) => w.startsWith('yield_above_curve') || w.startsWith('above_median'))).toEqual([]);
  });
});
