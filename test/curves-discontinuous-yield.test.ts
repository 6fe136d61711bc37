/**
 * Discontinuous yielding: ReH, ReL (ignoring the initial transient) and the yield-point extension
 * as ISO 6892-1 defines them, on generated curves with an upper yield point whose values are
 * known by construction. The shape of such a curve (upper yield point, dip, plateau) is a fact of
 * the trade (REFERENCES.md, common practice).
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_REDUCE_SETTINGS, reduceCurve } from '@fractile/curves';
import { hollomonCurve, plateauCurve } from '@fractile/curves/testing';

const S = DEFAULT_REDUCE_SETTINGS;

describe('upper and lower yield strength and the yield-point extension', () => {
  it('noise-free: ReH and ReL exact, the transient undershoot ignored, Ae within 0.1 % strain', () => {
    const syn = plateauCurve({ rehMpa: 330, relMpa: 300, ypeStrain: 0.02, undershootMpa: 15, serrationMpa: 4 });
    const r = reduceCurve(syn.input, { ...S, yieldDefinition: 'rel' });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const p = r.result.properties;
    expect(p.shape_class).toBe('plateau');
    // ISO 6892-1: ReH is the highest stress before the first fall in force
    expect(p.reh_mpa!).toBeCloseTo(330, 6);
    // ISO 6892-1: ReL is the lowest stress during yielding ignoring the initial transient —
    // the 285 MPa undershoot of the transient must not be taken
    expect(p.rel_mpa!).toBeCloseTo(300, 1);
    // yield-point extension: from ReH to the start of work hardening, 2 % by construction
    expect(Math.abs(p.ype_pct! - 2)).toBeLessThan(0.1);
    expect(p.yield_mpa).toBe(p.rel_mpa);
    expect(p.yield_definition).toBe('rel');
    expect(p.yt_ratio!).toBeCloseTo(p.rel_mpa! / p.rm_mpa!, 12);
    // Rm, Agt from the Voce hardening of the generator (maximum force where dσt/dεt = σt)
    expect(p.rm_mpa!).toBeCloseTo(syn.exact.rm_mpa, 3);
    expect(Math.abs(p.agt_pct! - 100 * syn.exact.agt_strain)).toBeLessThan(0.02);
    // the n window starts after the plateau (here it is the default 10 % anyway)
    const nw = r.result.details.n as { window_pct: [number, number] };
    expect(nw.window_pct[0]).toBeGreaterThanOrEqual(10);
  });

  it('a long plateau pushes the n window start to the end of the yield-point extension', () => {
    const syn = plateauCurve({ rehMpa: 300, relMpa: 280, ypeStrain: 0.12, undershootMpa: 5, qMpa: 300, b: 8 });
    const r = reduceCurve(syn.input, S);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const nw = r.result.details.n as { window_pct: [number, number] };
    const ypeEnd = (r.result.details.discontinuous as { plateau_end_strain: number }).plateau_end_strain;
    expect(nw.window_pct[0]).toBeCloseTo(100 * ypeEnd, 3); // details round to 6 digits
    expect(nw.window_pct[0]).toBeGreaterThan(12);
  });

  it('with noise (1 MPa) and a toe: ReH within 1.5 %, ReL within 1 %, Ae within 0.3 % strain (10 seeds)', () => {
    for (let seed = 1; seed <= 10; seed++) {
      const syn = plateauCurve({ rehMpa: 345, relMpa: 310, ypeStrain: 0.015 + 0.002 * seed, undershootMpa: 12, serrationMpa: 3, noiseMpa: 1, strainNoise: 2e-6, toeStrain: 0.0006, seed });
      const r = reduceCurve(syn.input, { ...S, yieldDefinition: 'reh' });
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      const p = r.result.properties;
      expect(p.shape_class, `seed ${seed}`).toBe('plateau');
      expect(Math.abs(p.reh_mpa! - 345) / 345).toBeLessThan(0.015);
      expect(Math.abs(p.rel_mpa! - 310) / 310).toBeLessThan(0.01);
      expect(Math.abs(p.ype_pct! - 100 * (0.015 + 0.002 * seed))).toBeLessThan(0.3);
      expect(p.yield_mpa).toBe(p.reh_mpa);
    }
  });

  it('a plateau without an upper yield point is still discontinuous; ReH = ReL level', () => {
    const syn = plateauCurve({ rehMpa: 300, relMpa: 300, ypeStrain: 0.015 });
    const r = reduceCurve(syn.input, S);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.result.properties.shape_class).toBe('plateau');
    expect(r.result.properties.rel_mpa!).toBeCloseTo(300, 3);
    expect(Math.abs(r.result.properties.ype_pct! - 1.5)).toBeLessThan(0.15);
  });

  it('a continuous curve has no ReH/ReL; asking for them gives null and a flag, never a substitute', () => {
    const syn = hollomonCurve({ kMpa: 800, n: 0.2, noiseMpa: 1, seed: 9 });
    const r = reduceCurve(syn.input, { ...S, yieldDefinition: 'reh' });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const p = r.result.properties;
    expect(p.shape_class).toBe('continuous');
    expect(p.reh_mpa).toBeNull();
    expect(p.rel_mpa).toBeNull();
    expect(p.ype_pct).toBeNull();
    expect(p.yield_mpa).toBeNull();
    expect(p.yt_ratio).toBeNull();
    expect(p.flags).toContain('yield_definition_not_applicable');
  });
});
