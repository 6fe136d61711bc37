/**
 * Ramberg–Osgood written as e = σ/E + 0.002(σ/σ0)^m has Rp0.2 = σ0 exactly (REFERENCES.md,
 * exact results of the laws), and a 0.5 % total-extension yield is the stress where the curve
 * crosses e = 0.005.
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_REDUCE_SETTINGS, offsetYield, rambergOsgoodStress, reduceCurve } from '@fractile/curves';
import { rambergOsgoodCurve } from '@fractile/curves/testing';

const S = DEFAULT_REDUCE_SETTINGS;

describe('Ramberg–Osgood curves: Rp0.2 = σ0', () => {
  const cases = [
    { eMpa: 205_000, sigma0Mpa: 355, m: 15 },
    { eMpa: 200_000, sigma0Mpa: 250, m: 10 },
    { eMpa: 70_000, sigma0Mpa: 240, m: 20 },
    { eMpa: 195_000, sigma0Mpa: 900, m: 25 },
  ];
  for (const c of cases) {
    it(`E ${c.eMpa / 1000} GPa, σ0 ${c.sigma0Mpa} MPa, m ${c.m}`, () => {
      const syn = rambergOsgoodCurve({ ...c, uniformStrain: 0.12 });
      const r = reduceCurve(syn.input, { ...S, family: c.eMpa < 100_000 ? 'aluminium' : 'steel' });
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      const p = r.result.properties;
      // REFERENCES.md: Rp0.2 = σ0 exactly (our tolerance: 0.01 % for the sampled, fitted curve)
      expect(Math.abs(p.rp02_mpa! - c.sigma0Mpa) / c.sigma0Mpa).toBeLessThan(1e-4);
      // REFERENCES.md: Rt0.5 is the stress where the curve crosses e = 0.005
      const rt = rambergOsgoodStress({ e_mpa: c.eMpa, sigma0_mpa: c.sigma0Mpa, m: c.m }, 0.005);
      expect(Math.abs(p.rt05_mpa! - rt) / rt).toBeLessThan(1e-4);
      expect(Math.abs(p.modulus_gpa! * 1000 - c.eMpa) / c.eMpa).toBeLessThan(1e-3);
      expect(p.shape_class).toBe('continuous');
      expect(p.yield_mpa).toBe(p.rp02_mpa);
      // Ramberg–Osgood fit recovers the law (the curve is exact up to maximum force)
      const ro = r.result.fits!.ramberg_osgood!;
      expect(ro.params.sigma0_mpa).toBeCloseTo(c.sigma0Mpa, 1);
      expect(ro.params.m).toBeCloseTo(c.m, 1);
    });
  }

  it('gives Rp0.2 = σ0 to 1e-5 with the law\'s own E, also for a low exponent (m = 4, 6)', () => {
    for (const m of [4, 6]) {
      const syn = rambergOsgoodCurve({ eMpa: 200_000, sigma0Mpa: 250, m, points: 4000 });
      const rp = offsetYield(syn.strain, syn.stressMpa, 200_000, 0, 0.002);
      // REFERENCES.md: Rp0.2 = σ0 exactly; the residual is the linear interpolation between samples
      expect(Math.abs(rp!.stressMpa - 250) / 250).toBeLessThan(1e-5);
    }
  });

  it('m = 6: the fitted modulus sees the law\'s curvature in the 10–40 % window; Rp0.2 within 0.5 %', () => {
    // with m = 6 the plastic part at 0.4·σ0 is already 1.6 % of the elastic strain, so the
    // least-squares E is low and Rp0.2 moves with it; the method, not the law, limits this case
    const syn = rambergOsgoodCurve({ eMpa: 200_000, sigma0Mpa: 250, m: 6 });
    const r = reduceCurve(syn.input, S);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(Math.abs(r.result.properties.rp02_mpa! - 250) / 250).toBeLessThan(0.005);
    expect(r.result.properties.modulus_gpa!).toBeLessThan(200);
  });

  it('keeps Rp0.2 = σ0 within 0.5 % with a toe and realistic noise', () => {
    for (let seed = 1; seed <= 5; seed++) {
      const syn = rambergOsgoodCurve({ sigma0Mpa: 420, m: 12, noiseMpa: 0.8, strainNoise: 2e-6, toeStrain: 0.0006, toeStressMpa: 30, seed });
      const r = reduceCurve(syn.input, S);
      expect(r.ok).toBe(true);
      if (!r.ok) return;
      expect(Math.abs(r.result.properties.rp02_mpa! - 420) / 420).toBeLessThan(0.005);
      // the toe shift is found: the elastic line meets zero stress at the toe strain
      expect(r.result.details.toe_shift_strain as number).toBeCloseTo(0.0006, 4);
    }
  });

  it('uses any plastic extension for Rp and any total extension for Rt', () => {
    const p = { e_mpa: 205_000, sigma0_mpa: 355, m: 15 };
    const syn = rambergOsgoodCurve({ eMpa: p.e_mpa, sigma0Mpa: p.sigma0_mpa, m: p.m });
    const r = reduceCurve(syn.input, { ...S, rpOffsetPct: 1, rtTotalPct: 1.5, yieldDefinition: 'rt0.5' });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    // Rp1: 0.01 = 0.002 (σ/σ0)^m → σ = σ0·5^(1/m)  (the law solved for the offset)
    expect(r.result.properties.rp02_mpa!).toBeCloseTo(355 * Math.pow(5, 1 / 15), 1);
    const rt = rambergOsgoodStress(p, 0.015);
    expect(r.result.properties.rt05_mpa!).toBeCloseTo(rt, 1);
    expect(r.result.properties.yield_mpa).toBe(r.result.properties.rt05_mpa);
    expect(r.result.properties.yt_ratio!).toBeCloseTo(r.result.properties.rt05_mpa! / r.result.properties.rm_mpa!, 12);
  });
});
