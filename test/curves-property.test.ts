/**
 * Property-based checks (fast-check): random valid curves never throw and never give a NaN, and
 * the ordering of ISO 6892-1 quantities holds — Rp0.2 ≤ Rm, Ag ≤ Agt ≤ At (At = total extension
 * at fracture, details.at_pct), ReL ≤ ReH.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { DEFAULT_REDUCE_SETTINGS, reduceCurve } from '@fractile/curves';
import { hollomonCurve, plateauCurve, rambergOsgoodCurve } from '@fractile/curves/testing';
import type { ReduceOutcome } from '@fractile/curves';
import type { SyntheticCurve } from '@fractile/curves/testing';

const common = fc.record({
  eMpa: fc.double({ min: 60_000, max: 220_000, noNaN: true }),
  points: fc.integer({ min: 200, max: 2500 }),
  noiseMpa: fc.double({ min: 0, max: 3, noNaN: true }),
  strainNoise: fc.double({ min: 0, max: 5e-6, noNaN: true }),
  toeStrain: fc.double({ min: 0, max: 0.001, noNaN: true }),
  seed: fc.integer({ min: 1, max: 1_000_000 }),
  fractureFraction: fc.double({ min: 0.5, max: 0.95, noNaN: true }),
  neckStrain: fc.double({ min: 0.01, max: 0.1, noNaN: true }),
});

const curve: fc.Arbitrary<SyntheticCurve> = fc.oneof(
  fc.tuple(common, fc.double({ min: 150, max: 1000, noNaN: true }), fc.double({ min: 4, max: 40, noNaN: true }), fc.double({ min: 0.02, max: 0.3, noNaN: true }))
    .map(([c, s0, m, eu]) => rambergOsgoodCurve({ ...c, elasticPoints: Math.floor(c.points / 6), sigma0Mpa: s0, m, uniformStrain: eu })),
  fc.tuple(common, fc.double({ min: 300, max: 1500, noNaN: true }), fc.double({ min: 0.05, max: 0.4, noNaN: true }))
    .map(([c, k, n]) => hollomonCurve({ ...c, elasticPoints: Math.floor(c.points / 6), kMpa: k, n })),
  fc.tuple(common, fc.double({ min: 200, max: 500, noNaN: true }), fc.double({ min: 0, max: 0.15, noNaN: true }), fc.double({ min: 0.003, max: 0.05, noNaN: true }))
    .map(([c, rel, up, ype]) => plateauCurve({ ...c, elasticPoints: Math.floor(c.points / 6), relMpa: rel, rehMpa: rel * (1 + up), ypeStrain: ype, undershootMpa: rel * up * 0.3 })),
);

function noNaN(v: unknown, path: string): void {
  if (typeof v === 'number') expect(Number.isNaN(v), path).toBe(false);
  else if (Array.isArray(v)) v.forEach((x, i) => noNaN(x, `${path}[${i}]`));
  else if (v && typeof v === 'object' && !ArrayBuffer.isView(v)) for (const [k, x] of Object.entries(v)) noNaN(x, `${path}.${k}`);
}

describe('random valid curves', () => {
  it('reduce without throwing, without NaN, and keep Rp0.2 ≤ Rm, Ag ≤ Agt ≤ At, ReL ≤ ReH', () => {
    fc.assert(
      fc.property(curve, fc.boolean(), (syn, fitLaws) => {
        let r: ReduceOutcome;
        expect(() => { r = reduceCurve(syn.input, { ...DEFAULT_REDUCE_SETTINGS, fitLaws }); }).not.toThrow();
        r = r!;
        // these records are all reducible (a maximum, a fracture, noise well below 3 % of Rm)
        expect(r.ok, r.ok ? '' : `${r.code}: ${r.message}`).toBe(true);
        if (!r.ok) return;
        const p = r.result.properties;
        noNaN(p, 'properties');
        noNaN(r.result.details, 'details');
        noNaN(r.result.grid, 'grid');
        noNaN(r.result.fits, 'fits');
        for (const a of [r.result.trueCurve.trueStrain, r.result.trueCurve.trueStressMpa, r.result.trueCurve.plasticStrain]) {
          for (const x of a) expect(Number.isFinite(x)).toBe(true);
        }
        expect(p.rm_mpa).not.toBeNull();
        if (p.rp02_mpa !== null) expect(p.rp02_mpa).toBeLessThanOrEqual(p.rm_mpa!);
        if (p.ag_pct !== null && p.agt_pct !== null) expect(p.ag_pct).toBeLessThanOrEqual(p.agt_pct);
        const at = r.result.details.at_pct as number | null;
        if (p.agt_pct !== null && at !== null) expect(p.agt_pct).toBeLessThanOrEqual(at);
        if (p.reh_mpa !== null) expect(p.rel_mpa!).toBeLessThanOrEqual(p.reh_mpa);
        if (p.a_pct !== null && at !== null) expect(p.a_pct).toBeLessThanOrEqual(at);
        // the grid is null beyond the uniform plastic strain and finite before it
        const g = r.result.grid;
        const firstNull = g.indexOf(null);
        if (firstNull >= 0) for (let i = firstNull; i < g.length; i++) expect(g[i]).toBeNull();
      }),
      { numRuns: 200, seed: 20261201 },
    );
  });

  it('arbitrary arrays (including junk) never throw and give a value or a failure code', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.double(), fc.double()), { minLength: 0, maxLength: 300 }),
        fc.option(fc.double(), { nil: null }),
        fc.option(fc.double(), { nil: null }),
        (rows, a, l) => {
          const r = reduceCurve({ forceN: Float64Array.from(rows, (t) => t[0]), extensionMm: Float64Array.from(rows, (t) => t[1]), areaMm2: a, gaugeLengthMm: l }, DEFAULT_REDUCE_SETTINGS);
          if (!r.ok) expect(r.code.length).toBeGreaterThan(0);
          else { noNaN(r.result.properties, 'properties'); noNaN(r.result.details, 'details'); }
        },
      ),
      { numRuns: 500, seed: 7 },
    );
  });

  it('valid curves with injected blanks, infinities and spikes never throw and never give NaN', () => {
    const base = hollomonCurve({ kMpa: 800, n: 0.2, points: 600, noiseMpa: 0.5, seed: 3 });
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: 0, max: 599 }), fc.constantFrom(Number.NaN, Infinity, -Infinity, 0, -1e6, 1e9), fc.boolean()), { minLength: 1, maxLength: 20 }),
        fc.boolean(),
        (hits, fitLaws) => {
          const f = base.input.forceN!.slice(), x = base.input.extensionMm!.slice();
          for (const [i, v, onForce] of hits) (onForce ? f : x)[i] = v;
          const r = reduceCurve({ ...base.input, forceN: f, extensionMm: x }, { ...DEFAULT_REDUCE_SETTINGS, fitLaws });
          if (!r.ok) { expect(r.code.length).toBeGreaterThan(0); return; }
          noNaN(r.result.properties, 'properties');
          noNaN(r.result.details, 'details');
          noNaN(r.result.grid, 'grid');
          noNaN(r.result.fits, 'fits');
        },
      ),
      { numRuns: 300, seed: 8 },
    );
  });
});

describe('yield-point detection on random curves', () => {
  const mild = fc.record({
    points: fc.integer({ min: 800, max: 3000 }),
    noiseMpa: fc.double({ min: 0, max: 1, noNaN: true }),
    strainNoise: fc.double({ min: 0, max: 2e-6, noNaN: true }),
    toeStrain: fc.double({ min: 0, max: 0.0008, noNaN: true }),
    seed: fc.integer({ min: 1, max: 1_000_000 }),
  });

  it('curves with an upper yield point (≥ 3 %) and a plateau (≥ 1 %) are classed plateau, ReH and ReL within 1.5 %', () => {
    fc.assert(
      fc.property(mild, fc.double({ min: 220, max: 480, noNaN: true }), fc.double({ min: 0.03, max: 0.15, noNaN: true }), fc.double({ min: 0.01, max: 0.05, noNaN: true }), fc.double({ min: 0, max: 3, noNaN: true }),
        (c, rel, up, ype, serr) => {
          const syn = plateauCurve({ ...c, relMpa: rel, rehMpa: rel * (1 + up), ypeStrain: ype, undershootMpa: 0.3 * rel * up, serrationMpa: serr });
          const r = reduceCurve(syn.input, DEFAULT_REDUCE_SETTINGS);
          expect(r.ok).toBe(true);
          if (!r.ok) return;
          const p = r.result.properties;
          expect(p.shape_class).toBe('plateau');
          expect(Math.abs(p.reh_mpa! - rel * (1 + up)) / (rel * (1 + up))).toBeLessThan(0.015);
          expect(Math.abs(p.rel_mpa! - rel) / rel).toBeLessThan(0.015);
          expect(Math.abs(p.ype_pct! - 100 * ype)).toBeLessThan(0.5);
          expect(p.flags).not.toContain('slipping');
        }),
      { numRuns: 150, seed: 11 },
    );
  });

  it('continuously hardening curves (Hollomon n 0.08–0.3, Ramberg–Osgood m 8–30) are never classed plateau', () => {
    fc.assert(
      fc.property(mild, fc.boolean(), fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }),
        (c, ro, a, b) => {
          const syn = ro
            ? rambergOsgoodCurve({ ...c, sigma0Mpa: 250 + 600 * a, m: 8 + 22 * b, uniformStrain: 0.05 + 0.2 * a })
            : hollomonCurve({ ...c, kMpa: 600 + 700 * a, n: 0.08 + 0.22 * b });
          const r = reduceCurve(syn.input, DEFAULT_REDUCE_SETTINGS);
          expect(r.ok).toBe(true);
          if (!r.ok) return;
          expect(r.result.properties.shape_class).not.toBe('plateau');
          expect(r.result.properties.reh_mpa).toBeNull();
        }),
      { numRuns: 200, seed: 12 },
    );
  });
});
