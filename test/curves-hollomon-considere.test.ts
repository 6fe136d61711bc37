/**
 * Hollomon σt = K·εt^n: maximum force (Considère) at εt = n, so Rm = K·n^n·e^(−n) and
 * Agt = e^n − 1 (REFERENCES.md, exact results of the laws; example K = 800 MPa, n = 0.20 gives
 * Rm = 474.7 MPa and Agt = 22.14 %). The ISO 10275 log–log fit returns n and K of the law.
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_REDUCE_SETTINGS, reduceCurve } from '@fractile/curves';
import { hollomonCurve } from '@fractile/curves/testing';

const S = DEFAULT_REDUCE_SETTINGS;

describe('Hollomon curves and the Considère criterion', () => {
  it('K = 800 MPa, n = 0.20: Rm = 474.7 MPa and Agt = 22.14 % (REFERENCES.md example)', () => {
    const syn = hollomonCurve({ kMpa: 800, n: 0.2, points: 4000 });
    const r = reduceCurve(syn.input, S);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const p = r.result.properties;
    expect(p.rm_mpa!).toBeCloseTo(474.7, 1);
    expect(p.agt_pct!).toBeCloseTo(22.14, 1);
    // Ag = Agt − Rm/E (ISO 6892-1)
    expect(p.ag_pct!).toBeCloseTo(p.agt_pct! - (100 * p.rm_mpa!) / (p.modulus_gpa! * 1000), 10);
    // ISO 10275 on the exact law: n and K of the law
    expect(p.n_value!).toBeCloseTo(0.2, 5);
    expect(p.k_mpa!).toBeCloseTo(800, 2);
    expect(r.result.fits!.hollomon!.params.n).toBeCloseTo(0.2, 5);
    expect(r.result.fits!.hollomon!.params.k_mpa).toBeCloseTo(800, 2);
  });

  for (const [k, n] of [[600, 0.12], [900, 0.25], [520, 0.3], [1100, 0.08]] as const) {
    it(`K = ${k} MPa, n = ${n}: Rm = K n^n e^-n, Agt = e^n − 1`, () => {
      const syn = hollomonCurve({ kMpa: k, n, points: 3000 });
      const r = reduceCurve(syn.input, S);
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      const p = r.result.properties;
      const rm = k * Math.pow(n, n) * Math.exp(-n);
      const agt = 100 * Math.expm1(n);
      expect(Math.abs(p.rm_mpa! - rm) / rm).toBeLessThan(1e-5);
      // the strain at maximum force to within the sampling step (≤ 0.02 % strain here)
      expect(Math.abs(p.agt_pct! - agt)).toBeLessThan(0.02);
      if (p.flags.includes('n_window_reduced')) expect(p.ag_pct!).toBeLessThan(12);
      expect(Math.abs(p.n_value! - n)).toBeLessThan(1e-4);
    });
  }

  it('records the reduced n window when Ag is below 10 %', () => {
    const syn = hollomonCurve({ kMpa: 1100, n: 0.08 });
    const r = reduceCurve(syn.input, S);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const p = r.result.properties;
    expect(p.ag_pct!).toBeLessThan(10);
    expect(p.flags).toContain('n_window_reduced');
    const w = (r.result.details.n as { window_pct: [number, number]; reduced: boolean });
    expect(w.reduced).toBe(true);
    expect(w.window_pct[1]).toBeCloseTo(p.ag_pct!, 10);
    expect(w.window_pct[0]).toBeCloseTo(p.ag_pct! / 2, 10);
  });

  it('noise of 1 MPa moves Agt by less than 1 % strain and n by less than 0.005', () => {
    for (let seed = 1; seed <= 5; seed++) {
      const syn = hollomonCurve({ kMpa: 800, n: 0.2, noiseMpa: 1, strainNoise: 2e-6, seed });
      const r = reduceCurve(syn.input, S);
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      expect(Math.abs(r.result.properties.agt_pct! - 22.14)).toBeLessThan(1);
      expect(Math.abs(r.result.properties.n_value! - 0.2)).toBeLessThan(0.005);
    }
  });
});
