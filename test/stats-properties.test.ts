// Laws that must hold for any input (property-based, fast-check, fixed seeds for reproducible runs): monotonicity of the tolerance
// factor and of the noncentral t distribution, inversion of the quantile, order of percentiles,
// and the isotonic fit's optimality conditions.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  fitWeibull,
  isotonicNonDecreasing,
  noncentralTCdf,
  noncentralTQuantile,
  normalToleranceFactor,
  percentile,
  summarizeProperty,
} from '@fractile/stats';

describe('laws of the tolerance factor (ISO 16269-6 construction)', () => {
  it('k falls with n and rises with coverage and confidence', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 3, max: 400 }),
        fc.double({ min: 0.6, max: 0.995, noNaN: true }),
        fc.double({ min: 0.55, max: 0.99, noNaN: true }),
        (n, p, g) => {
          const k = normalToleranceFactor(n, p, g);
          expect(normalToleranceFactor(n + 1, p, g)).toBeLessThan(k);
          expect(normalToleranceFactor(n, Math.min(0.999, p + 0.004), g)).toBeGreaterThan(k);
          expect(normalToleranceFactor(n, p, Math.min(0.995, g + 0.004))).toBeGreaterThan(k);
        },
      ),
      { numRuns: 80, seed: 16269 },
    );
  });
});

describe('laws of the noncentral t distribution', () => {
  it('cdf is non-decreasing in x, non-increasing in δ, and the quantile inverts it', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -8, max: 30, noNaN: true }),
        fc.double({ min: 0.5, max: 300, noNaN: true }),
        fc.double({ min: -5, max: 25, noNaN: true }),
        fc.double({ min: 1e-4, max: 1 - 1e-4, noNaN: true }),
        (x, df, delta, p) => {
          const f = noncentralTCdf(x, df, delta);
          expect(f).toBeGreaterThanOrEqual(0);
          expect(f).toBeLessThanOrEqual(1);
          expect(noncentralTCdf(x + 0.05, df, delta)).toBeGreaterThanOrEqual(f - 1e-15);
          expect(noncentralTCdf(x, df, delta + 0.05)).toBeLessThanOrEqual(f + 1e-15);
          const q = noncentralTQuantile(p, df, delta);
          // The incomplete beta underneath (@stdlib, a Boost port) is good to about 1e-12
          // relative at worst in this range, so the inversion is checked to 1e-11.
          expect(Math.abs(noncentralTCdf(q, df, delta) - p)).toBeLessThan(1e-11);
        },
      ),
      { numRuns: 400, seed: 1990 },
    );
  });
});

describe('laws of percentiles and isotonic regression', () => {
  it('percentiles are ordered in q and lie between min and max', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 1, maxLength: 60 }), fc.double({ min: 0, max: 1, noNaN: true }), (xs, q) => {
        const s = Float64Array.from(xs).sort();
        const v = percentile(s, q);
        expect(v).toBeGreaterThanOrEqual(s[0]);
        expect(v).toBeLessThanOrEqual(s[s.length - 1]);
        expect(percentile(s, Math.min(1, q + 0.01))).toBeGreaterThanOrEqual(v);
      }),
      { seed: 7 },
    );
  });

  it('the isotonic fit is non-decreasing, keeps the weighted sum, and each block mean is its members’ mean', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.double({ min: -100, max: 100, noNaN: true }), fc.double({ min: 0.1, max: 5, noNaN: true })), { minLength: 1, maxLength: 40 }),
        (pairs) => {
          const y = pairs.map((p) => p[0]);
          const w = pairs.map((p) => p[1]);
          const f = isotonicNonDecreasing(y, w);
          let sy = 0;
          let sf = 0;
          for (let i = 0; i < y.length; i++) {
            sy += w[i] * y[i];
            sf += w[i] * f[i];
            if (i > 0) expect(f[i]).toBeGreaterThanOrEqual(f[i - 1]);
          }
          // Optimality (Barlow et al. 1972): the weighted residuals sum to zero over the whole sequence.
          expect(Math.abs(sy - sf)).toBeLessThan(1e-9 * (1 + Math.abs(sy)));
        },
      ),
      { seed: 1972 },
    );
  });
});

describe('laws of the fits and of the summary', () => {
  it('the Weibull MLE satisfies its score equations for any positive sample with spread', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: 1e-3, max: 1e4, noNaN: true }), { minLength: 3, maxLength: 80 }), (xs) => {
        const f = fitWeibull(xs);
        if (new Set(xs).size < 2) return;
        expect(f).not.toBeNull();
        const { shape: k, scale: lam } = f!.params;
        let s0 = 0;
        let s1 = 0;
        let sl = 0;
        for (const v of xs) {
          const e = Math.pow(v / lam, k);
          s0 += e;
          s1 += e * Math.log(v);
          sl += Math.log(v);
        }
        expect(Math.abs(s0 / xs.length - 1)).toBeLessThan(1e-8);
        // Lawless (2003) profile score: Σ x^k ln x / Σ x^k − 1/k − mean(ln x) = 0, scaled by k.
        expect(Math.abs(k * (s1 / s0 - sl / xs.length) - 1)).toBeLessThan(1e-8);
      }),
      { seed: 2003, numRuns: 200 },
    );
  });

  it('summarizeProperty never throws and always returns plain JSON (no NaN), whatever the values', () => {
    const value = fc.oneof(fc.double({ min: -1e3, max: 1e3 }), fc.constantFrom(NaN, Infinity, 0, 350, 350.5));
    fc.assert(
      fc.property(fc.array(value, { maxLength: 70 }), fc.option(fc.double({ min: 0, max: 500, noNaN: true })), (xs, lower) => {
        const s = summarizeProperty(xs, { lower });
        const text = JSON.stringify(s);
        expect(text).not.toMatch(/NaN|Infinity/);
        expect(JSON.parse(text)).toEqual(s);
      }),
      { seed: 500, numRuns: 200 },
    );
  });
});
