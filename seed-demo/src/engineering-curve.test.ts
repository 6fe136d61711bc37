import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { buildEngineeringCurve } from './engineering-curve.ts';
import type { HardeningLaw } from './hardening-laws.ts';
import { lawTrueStress, swiftEps0ForRatio } from './hardening-laws.ts';

const NECK = { fractureStressRatio: 0.75, totalElongationRatio: 1.6, exponent: 2 };

/** Linear interpolation of y at x on a rising x. */
function interp(xs: ArrayLike<number>, ys: ArrayLike<number>, x: number, upTo: number): number {
  for (let i = 1; i <= upTo; i++) {
    if (xs[i] >= x) {
      const f = (x - xs[i - 1]) / (xs[i] - xs[i - 1]);
      return ys[i - 1] + f * (ys[i] - ys[i - 1]);
    }
  }
  return NaN;
}

describe('engineering curve from a hardening law', () => {
  it('reproduces Hollomon Rm = K·n^n·e^(−n) and Agt = e^n − 1 (REFERENCES.md, exact results of the laws)', () => {
    // Ramberg–Osgood with m = 1/n and a modulus so large that the elastic strain vanishes is
    // Hollomon σt = K·εt^n with K = σ0·0.002^(−n). Check value: K = 800 MPa, n = 0.20 gives
    // Rm = 474.7 MPa, Agt = 22.14 % (REFERENCES.md).
    const n = 0.2;
    const law: HardeningLaw = { kind: 'ramberg-osgood', modulusMpa: 1e12, sigma0Mpa: 800 * Math.pow(0.002, n), m: 1 / n };
    const c = buildEngineeringCurve(law, NECK);
    expect(c.truth.rmMpa).toBeCloseTo(474.7, 1);
    expect(c.truth.agtPct).toBeCloseTo(22.14, 2);
  });

  it('has Rp0.2 of the true curve equal to σ0 for Ramberg–Osgood (REFERENCES.md, exact results of the laws)', () => {
    const law: HardeningLaw = { kind: 'ramberg-osgood', modulusMpa: 205_000, sigma0Mpa: 780, m: 15 };
    const c = buildEngineeringCurve(law, NECK);
    // back to true: σt = σe(1 + e), εt = ln(1 + e) (REFERENCES.md); plastic εp = εt − σt/E
    const m = c.iMax + 1;
    const epsP = new Float64Array(m);
    const sigT = new Float64Array(m);
    for (let i = 0; i < m; i++) {
      sigT[i] = c.stressMpa[i] * (1 + c.strain[i]);
      epsP[i] = Math.log1p(c.strain[i]) - sigT[i] / law.modulusMpa;
    }
    expect(interp(epsP, sigT, 0.002, c.iMax)).toBeCloseTo(780, 1);
  });

  it('locates maximum force where SciPy finds the maximum of σt·exp(−εt) (scipy.optimize.minimize_scalar)', () => {
    const laws: HardeningLaw[] = [
      { kind: 'ramberg-osgood', modulusMpa: 205_000, sigma0Mpa: 780, m: 15 },
      { kind: 'voce', modulusMpa: 70_000, sigma0Mpa: 268, qMpa: 85, b: 18 },
    ];
    const script = `
import json, math
from scipy.optimize import minimize_scalar
out = []
for law in json.loads(input()):
    E = law['modulusMpa']
    if law['kind'] == 'voce':
        sig = lambda p: law['sigma0Mpa'] + law['qMpa'] * (1 - math.exp(-law['b'] * p))
    else:
        sig = lambda p: law['sigma0Mpa'] * (p / 0.002) ** (1 / law['m'])
    f = lambda p: -sig(p) * math.exp(-(p + sig(p) / E))
    r = minimize_scalar(f, bounds=(1e-6, 0.5), method='bounded', options={'xatol': 1e-10})
    s = sig(r.x)
    out.append({'rm': -r.fun, 'agt': 100 * math.expm1(r.x + s / E)})
print(json.dumps(out))
`;
    const ref = JSON.parse(execFileSync('/usr/bin/python3', ['-c', script], { input: JSON.stringify(laws) + '\n' }).toString()) as { rm: number; agt: number }[];
    laws.forEach((law, i) => {
      const c = buildEngineeringCurve(law, NECK);
      expect(c.truth.rmMpa).toBeCloseTo(ref[i].rm, 3);
      expect(c.truth.agtPct).toBeCloseTo(ref[i].agt, 2);
    });
  });

  it('for the plateau law: ReH, the plateau at ReL, then the shifted Swift law exactly', () => {
    const E = 205_000;
    const reh = 425;
    const rel = 405;
    const luders = 0.018;
    const n = 0.18;
    const eEnd = reh / E + luders;
    const epsPL = Math.log1p(eEnd) - (rel * (1 + eEnd)) / E;
    const eps0 = swiftEps0ForRatio(n, 1.33, eEnd, epsPL)!;
    const k = (rel * (1 + eEnd)) / Math.pow(eps0, n);
    const law: HardeningLaw = { kind: 'plateau-swift', modulusMpa: E, rehMpa: reh, relMpa: rel, ludersStrain: luders, serrationAmplitude: 0.004, kMpa: k, n, eps0, epsPlateauEnd: epsPL };
    const c = buildEngineeringCurve(law, NECK);
    let peak = 0;
    for (let i = 0; i <= c.iMax; i++) if (c.strain[i] < reh / E + 0.0005) peak = Math.max(peak, c.stressMpa[i]);
    expect(peak).toBeCloseTo(reh, 6);
    // plateau: between the drop and the onset of hardening the stress stays within the serrations
    for (let i = 0; i <= c.iMax; i++) {
      const e = c.strain[i];
      if (e > reh / E + 0.002 && e < eEnd) expect(Math.abs(c.stressMpa[i] / rel - 1)).toBeLessThanOrEqual(0.004 + 1e-12);
    }
    // hardening branch up to maximum force: σt recovered from the engineering curve equals the law
    let checked = 0;
    for (let i = 0; i <= c.iMax; i++) {
      const e = c.strain[i];
      if (e <= eEnd + 1e-4) continue;
      const sigT = c.stressMpa[i] * (1 + e);
      const epsP = Math.log1p(e) - sigT / E;
      expect(sigT / lawTrueStress(law, epsP)).toBeCloseTo(1, 10);
      checked++;
    }
    expect(checked).toBeGreaterThan(500);
    // the Rm/ReL ratio the ε0 was solved for is met to within the neglected elastic strain
    expect(c.truth.rmMpa / rel).toBeGreaterThan(1.31);
    expect(c.truth.rmMpa / rel).toBeLessThan(1.335);
    // necking: engineering stress falls to the fracture stress at ef = ratio·Agt
    expect(c.stressMpa[c.stressMpa.length - 1]).toBeCloseTo(0.75 * c.truth.rmMpa, 6);
    expect(c.truth.atPct).toBeCloseTo(1.6 * c.truth.agtPct, 6);
  });
});
