/**
 * Engineering to true stress and strain, and the true plastic strain (REFERENCES.md, "Exact
 * results of the laws").
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_REDUCE_SETTINGS, engineeringToTrue, reduceCurve, trueCurve } from '@fractile/curves';
import { hollomonCurve } from '@fractile/curves/testing';

describe('true stress and strain', () => {
  it('reproduces the worked example: 400 MPa at e = 0.10 gives 440 MPa and 0.09531', () => {
    // REFERENCES.md, exact results of the laws: σt = σe(1 + e), εt = ln(1 + e)
    const t = engineeringToTrue(0.1, 400);
    expect(t.trueStressMpa).toBeCloseTo(440, 10);
    expect(t.trueStrain).toBeCloseTo(0.09531, 5);
    const c = trueCurve(Float64Array.of(0, 0.1), Float64Array.of(0, 400), 200_000, 1);
    expect(c.trueStressMpa[1]).toBeCloseTo(440, 10);
    expect(c.trueStrain[1]).toBeCloseTo(0.09531, 5);
    // REFERENCES.md: εp = εt − σt/E → 0.0953102 − 440/200000
    expect(c.plasticStrain[1]).toBeCloseTo(Math.log(1.1) - 440 / 200_000, 12);
  });

  it('stops at maximum force and counts what lies past it', () => {
    // REFERENCES.md, facts of the trade: after maximum force the specimen necks and the true
    // stress from engineering data is no longer valid.
    const c = hollomonCurve({ kMpa: 800, n: 0.2 });
    const r = reduceCurve(c.input, DEFAULT_REDUCE_SETTINGS);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const tc = r.result.trueCurve;
    const last = tc.trueStrain.length - 1;
    // the last true strain is at maximum force, ln(1 + Agt) ≈ n for Hollomon (Considère)
    expect(tc.trueStrain[last]).toBeCloseTo(0.2, 3);
    expect(r.result.properties.flags).toContain('past_max_force_ignored');
    expect(r.result.details.points_past_max_force as number).toBeGreaterThan(100);
    // on the Hollomon part the true curve lies on the law: σt = K εt^n
    // (to 1e-5: the toe compensation moves the origin by the fitted intercept, ~1e-7 strain)
    for (let i = Math.floor(last / 2); i <= last; i += 50) {
      const law = 800 * Math.pow(tc.trueStrain[i], 0.2);
      expect(Math.abs(tc.trueStressMpa[i] - law) / law).toBeLessThan(1e-5);
    }
  });
});
