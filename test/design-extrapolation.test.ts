// Extrapolation of characteristic curves past their valid range; sources beside each check.
import { describe, expect, it } from 'vitest';
import {
  characteristicCurve,
  DEFAULT_DESIGN_OPTIONS,
  designCurveToCsv,
  parseDesignCurveCsv,
  type DesignOptions,
  type TestGridCurve,
} from '../packages/pipeline/src/design/index.ts';
import { grid, hollomonAtPlastic, lawCurve, normals, PROV, scipyLowerBound } from './design-fixtures.ts';

const opts = (o: Partial<DesignOptions> = {}): DesignOptions => ({ ...DEFAULT_DESIGN_OPTIONS, ...o });

describe('extrapolation by a fitted law', () => {
  const g = grid(0, 0.2, 0.001);

  it('Swift: follows K_char(ε0 + εp)^n past the valid range, flagged in every output', () => {
    // Source: the Swift law — the characteristic curve of a population with normal K is
    // K_char(ε0 + εp)^n (linear in K), K_char by scipy.stats.nct (ISO 16269-6); the fitted law
    // extends it.
    const ks = normals(501, 25, 820, 35);
    const us = normals(502, 25, 0.1, 0.004);
    const eps0 = 0.008;
    const nExp = 0.21;
    const tests = ks.map((k, i) => lawCurve(`X-${i}`, g, (e) => k * Math.pow(eps0 + e, nExp), us[i], k * Math.pow(eps0, nExp)));
    const ref = scipyLowerBound(ks, 0.95, 0.75);
    const c = characteristicCurve({ group: { grade: 'TG-460' }, grid: g, tests }, opts({ extrapolate: 'swift' }), PROV);
    const validTo = c.valid_to_plastic_strain!;
    expect(validTo).toBeLessThan(0.1);
    expect(c.extrapolated_from).toBe(validTo);
    expect(c.plastic_strain[c.plastic_strain.length - 1]).toBeCloseTo(0.2, 12);
    c.plastic_strain.forEach((e, i) => {
      expect(c.extrapolated[i]).toBe(e > validTo);
      if (e > validTo) expect(c.n_at_point[i]).toBe(0);
      const exact = ref.bound * Math.pow(eps0 + e, nExp);
      expect(Math.abs(c.characteristic_mpa[i] - exact) / exact).toBeLessThan(0.005);
      expect(c.characteristic_mpa[i]).toBeLessThanOrEqual(c.median_mpa[i]);
      if (i > 0) expect(c.characteristic_mpa[i]).toBeGreaterThanOrEqual(c.characteristic_mpa[i - 1]);
    });
    expect(c.extrapolation!.law).toBe('swift');
    expect(c.extrapolation!.params_characteristic.n).toBeCloseTo(nExp, 2);
    expect(c.warnings.some((w) => w.startsWith('extrapolated'))).toBe(true);
    // the flags survive the CSV and reach the multilinear idealization
    const back = parseDesignCurveCsv(designCurveToCsv(c));
    expect(back.ok && back.value.extrapolated).toEqual(c.extrapolated);
    const ml = c.idealized!.multilinear;
    expect(ml.extrapolated[ml.extrapolated.length - 1]).toBe(true);
    expect(ml.extrapolated[0]).toBe(false);
  });

  it('Voce: reaches the saturation law of the population', () => {
    // Source: the Voce law σ = σ0 + Q(1 − e^(−b·εp)); with Q normal and σ0, b fixed the stress is
    // linear in Q, so the characteristic curve is the law with Q_char (scipy.stats.nct).
    const qs = normals(601, 20, 260, 20);
    const s0 = 330;
    const b = 22;
    const tests = qs.map((q, i) => lawCurve(`Vo-${i}`, g, (e) => s0 + q * (1 - Math.exp(-b * e)), 0.09, s0));
    const qRef = scipyLowerBound(qs, 0.95, 0.75);
    const c = characteristicCurve({ group: { grade: 'TG-460' }, grid: g, tests, characteristicYieldMpa: s0 }, opts({ extrapolate: 'voce', extrapolateTo: 0.16 }), PROV);
    expect(c.valid_to_plastic_strain).toBeCloseTo(0.09, 12);
    expect(c.plastic_strain[c.plastic_strain.length - 1]).toBeCloseTo(0.16, 12);
    c.plastic_strain.forEach((e, i) => {
      const exact = s0 + qRef.bound * (1 - Math.exp(-b * e));
      expect(Math.abs(c.characteristic_mpa[i] - exact) / exact).toBeLessThan(0.002);
    });
  });

  it('Hollomon: in total strain with E, beyond the grid up to extrapolateTo', () => {
    // Source: the Hollomon law σ = K·ε^n in total true strain (ISO 10275 form), solved for the
    // stress at each plastic strain; the population's bound is close to the law with K_char.
    const gh = grid(0, 0.12, 0.002);
    const ks = normals(701, 20, 760, 30);
    const nExp = 0.17;
    const E = 205_000;
    const tests: TestGridCurve[] = ks.map((k, i) => lawCurve(`Ho-${i}`, gh, (e) => hollomonAtPlastic(k, nExp, E, e), 0.06, hollomonAtPlastic(k, nExp, E, 0), 205));
    const ref = scipyLowerBound(ks, 0.95, 0.75);
    const c = characteristicCurve({ group: { grade: 'TG-460' }, grid: gh, tests }, opts({ extrapolate: 'hollomon', extrapolateTo: 0.3 }), PROV);
    expect(c.valid_to_plastic_strain).toBeCloseTo(0.06, 12);
    const last = c.plastic_strain.length - 1;
    expect(c.plastic_strain[last]).toBe(0.3);
    // beyond the grid the step of the grid is kept
    expect(c.plastic_strain[last - 1] - c.plastic_strain[last - 2]).toBeCloseTo(0.002, 12);
    c.plastic_strain.forEach((e, i) => {
      if (e < 0.01) return; // near εp = 0 the elastic part dominates and K enters nonlinearly
      const approx = hollomonAtPlastic(ref.bound, nExp, E, e);
      expect(Math.abs(c.characteristic_mpa[i] - approx) / approx).toBeLessThan(0.01);
    });
  });

  it('is not bent by a yield plateau: the law is fitted to the tail of the valid range', () => {
    // Source: the Swift law after a Lüders-like plateau, σ = K·max(c, (ε0 + εp)^n) — linear in K,
    // so the characteristic curve is K_char times the same shape (K_char by scipy.stats.nct).
    const eps0 = 0.002;
    const nExp = 0.2;
    const plateauEnd = 0.02;
    const c0 = Math.pow(eps0 + plateauEnd, nExp);
    const shape = (e: number) => Math.max(c0, Math.pow(eps0 + e, nExp));
    const ks = normals(551, 25, 800, 30);
    const tests = ks.map((k, i) => lawCurve(`P-${i}`, g, (e) => k * shape(e), 0.1, k * c0));
    const ref = scipyLowerBound(ks, 0.95, 0.75);
    const c = characteristicCurve({ group: {}, grid: g, tests }, opts({ extrapolate: 'swift' }), PROV);
    expect(c.valid_to_plastic_strain).toBeCloseTo(0.1, 12);
    expect(c.extrapolation!.fit_from_plastic_strain).toBeCloseTo(0.025, 12);
    c.plastic_strain.forEach((e, i) => {
      const exact = ref.bound * shape(e);
      expect(Math.abs(c.characteristic_mpa[i] - exact) / exact).toBeLessThan(0.0005);
    });
  });

  it('does nothing, and says so, where the valid range already reaches the target', () => {
    const ks = normals(801, 12, 800, 30);
    const tests = ks.map((k, i) => lawCurve(`N-${i}`, g, (e) => k * Math.pow(0.01 + e, 0.2), 0.2, k * Math.pow(0.01, 0.2)));
    const c = characteristicCurve({ group: {}, grid: g, tests }, opts({ extrapolate: 'swift' }), PROV);
    expect(c.extrapolated_from).toBeNull();
    expect(c.extrapolated.some((f) => f)).toBe(false);
    expect(c.warnings.some((w) => w.startsWith('nothing_to_extrapolate'))).toBe(true);
  });
});
