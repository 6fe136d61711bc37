/**
 * True stress on the common plastic-strain grid (checked against the Hollomon law solved for
 * εp = εt − σt/E, REFERENCES.md exact results of the laws), the curve shape class, and summary
 * records carried into the same property keys.
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_GRID, DEFAULT_REDUCE_SETTINGS, propertiesFromSummary, reduceCurve } from '@fractile/curves';
import { bilinearCurve, hollomonCurve, plateauCurve, rambergOsgoodCurve } from '@fractile/curves/testing';

const S = DEFAULT_REDUCE_SETTINGS;

/** Hollomon true stress at true plastic strain εp: solve εt − K εt^n / E = εp by bisection. */
function hollomonAtPlastic(k: number, n: number, e: number, ep: number): number {
  let lo = ep, hi = ep + 1;
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (mid - (k * Math.pow(mid, n)) / e < ep) lo = mid; else hi = mid;
  }
  return k * Math.pow((lo + hi) / 2, n);
}

describe('common plastic-strain grid', () => {
  it('Hollomon: grid values on the law, monotone, null beyond the uniform plastic strain', () => {
    const syn = hollomonCurve({ kMpa: 800, n: 0.2, points: 3000 });
    const r = reduceCurve(syn.input, S);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const g = r.result.grid;
    expect(g).toHaveLength(DEFAULT_GRID.length);
    // uniform true plastic strain: εt = n at maximum force (Considère), εp = n − Rm(1+Agt)/E
    const epU = 0.2 - (800 * Math.pow(0.2, 0.2)) / 205_000;
    DEFAULT_GRID.forEach((ep, i) => {
      if (ep === 0) return;
      if (ep < epU - 0.001) {
        const law = hollomonAtPlastic(800, 0.2, 205_000, ep);
        expect(Math.abs(g[i]! - law) / law, `εp = ${ep}`).toBeLessThan(2e-4);
      } else if (ep > epU + 0.001) expect(g[i], `εp = ${ep}`).toBeNull();
    });
    for (let i = 1; i < g.length && g[i] !== null; i++) expect(g[i]!).toBeGreaterThanOrEqual(g[i - 1]!);
    // grid value at 0: the stress at 0.01 % plastic strain
    const at0 = hollomonAtPlastic(800, 0.2, 205_000, 1e-4);
    expect(Math.abs(g[0]! - at0) / at0).toBeLessThan(2e-3);
  });

  it('a plateau curve is resampled monotone in plastic strain', () => {
    const syn = plateauCurve({ rehMpa: 330, relMpa: 300, ypeStrain: 0.02, undershootMpa: 15, serrationMpa: 4, noiseMpa: 1, seed: 2 });
    const r = reduceCurve(syn.input, S);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const g = r.result.grid.filter((v): v is number => v !== null);
    expect(g.length).toBeGreaterThan(100);
    // on the plateau the true stress is about ReL·(1 + e); after it the Voce hardening rises
    expect(g[10]).toBeGreaterThan(295);
    expect(g[10]).toBeLessThan(320);
    expect(g[g.length - 1]).toBeGreaterThan(g[30]);
  });

  it('a custom grid is honoured', () => {
    const syn = hollomonCurve({ kMpa: 800, n: 0.2 });
    const r = reduceCurve(syn.input, { ...S, gridPlasticStrain: [0.01, 0.05, 0.3] });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.result.grid).toHaveLength(3);
    expect(r.result.grid[1]!).toBeCloseTo(hollomonAtPlastic(800, 0.2, 205_000, 0.05), 0);
    expect(r.result.grid[2]).toBeNull();
  });
});

describe('shape class', () => {
  it('plateau, continuous and bilinear', () => {
    const cls = (c: { input: Parameters<typeof reduceCurve>[0] }) => { const r = reduceCurve(c.input, S); return r.ok ? r.result.properties.shape_class : r.code; };
    expect(cls(plateauCurve({ rehMpa: 330, relMpa: 300, ypeStrain: 0.02, undershootMpa: 10 }))).toBe('plateau');
    expect(cls(hollomonCurve({ kMpa: 800, n: 0.2 }))).toBe('continuous');
    expect(cls(rambergOsgoodCurve({ sigma0Mpa: 350, m: 12 }))).toBe('continuous');
    expect(cls(bilinearCurve({ yieldMpa: 300, hardeningMpa: 1500, uniformStrain: 0.1 }))).toBe('bilinear');
    expect(cls(bilinearCurve({ yieldMpa: 300, hardeningMpa: 1500, uniformStrain: 0.1, noiseMpa: 1, seed: 3 }))).toBe('bilinear');
  });
});

describe('summary-only records', () => {
  it('carry their given values, marked as given', () => {
    const p = propertiesFromSummary({ yieldMpa: 370, yieldDefinition: 'rp0.2', tensileMpa: 520, uniformElongationPct: 14, elongationPct: 24 }, S);
    expect(p).toMatchObject({ rp02_mpa: 370, yield_mpa: 370, yield_definition: 'rp0.2', rm_mpa: 520, ag_pct: 14, a_pct: 24, modulus_gpa: null, n_value: null, shape_class: null });
    expect(p.yt_ratio!).toBeCloseTo(370 / 520, 12);
    expect(p.flags).toEqual(['given']);
  });

  it('a yield of another definition than the grade asks for fills its own key only', () => {
    const p = propertiesFromSummary({ yieldMpa: 360, yieldDefinition: 'reh', tensileMpa: 510 }, { ...S, yieldDefinition: 'rel' });
    expect(p.reh_mpa).toBe(360);
    expect(p.rel_mpa).toBeNull();
    expect(p.yield_mpa).toBeNull();
    expect(p.yt_ratio).toBeNull();
    expect(p.flags).toEqual(['given', 'yield_definition_differs']);
  });

  it('a yield without a definition takes the grade\'s; missing and non-finite values are null', () => {
    const p = propertiesFromSummary({ yieldMpa: 300, tensileMpa: Number.NaN }, { ...S, yieldDefinition: 'rt0.5' });
    expect(p.rt05_mpa).toBe(300);
    expect(p.yield_mpa).toBe(300);
    expect(p.rm_mpa).toBeNull();
    expect(p.yt_ratio).toBeNull();
    expect(p.flags).toEqual(['given', 'yield_definition_assumed']);
    const q = propertiesFromSummary({}, S);
    expect(q.yield_definition).toBeNull();
    expect(Object.values(q).filter((v) => typeof v === 'number')).toEqual([]);
  });
});
