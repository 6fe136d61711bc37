/**
 * Bias of Rm, Ag and Y/T on noisy records with known truth. Source: exact results of the laws
 * (REFERENCES.md) — a Hollomon curve σt = K·εt^n reaches maximum force at εt = n (Considère), so
 * Rm = K·nⁿ·e⁻ⁿ and Agt = eⁿ − 1 exactly, Ag = Agt − Rm/E (ISO 6892-1). After maximum force the
 * generated record falls by the law times a cubic necking term, 1 − 0.2·((e − e_u)/w)³, to 80 %
 * of Rm over the engineering strain w: w = 0.01 is a steep neck (the top is one-sided: a slow
 * rise, a sudden fall), w = 0.15 a shallow one. Seeded normal noise of 0.3, 1 and 3 MPa on the
 * stress; many records per case; the mean error over them is the bias, printed and asserted.
 *
 * For contrast the largest recorded stress (the estimator before) is measured on the same records:
 * it lies 2.4–3 noise SDs high (the issue's +2.7 MPa at 1 MPa, +8.7 MPa at 3 MPa).
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_REDUCE_SETTINGS, reduceCurve } from '@fractile/curves';
import { hollomonCurve } from '@fractile/curves/testing';

const SETTINGS = { ...DEFAULT_REDUCE_SETTINGS, fitLaws: false };
const E_MPA = 205_000; // the generator's modulus
const RECORDS = 40;
const NOISES = [0.3, 1, 3] as const;
const NECKS = [0.01, 0.05, 0.15] as const;
const LAWS = [{ k: 800, n: 0.2 }, { k: 900, n: 0.25 }] as const;

interface Bias { rmSd: number; rawSd: number; agPt: number; ytRatio: number; ytFromRm: number }

/**
 * Mean errors over seeded records of one case. Y/T: against the noise-free record's Y/T, and the
 * part Rm contributes, mean of Rp0.2/Rm − Rp0.2/Rm_exact.
 */
function measure(k: number, n: number, neck: number, noise: number): Bias {
  const rm = k * Math.pow(n, n) * Math.exp(-n);
  const ag = 100 * (Math.expm1(n) - rm / E_MPA);
  const exact = reduceCurve(hollomonCurve({ kMpa: k, n, neckStrain: neck }).input, SETTINGS);
  if (!exact.ok) throw new Error(exact.message);
  const yt = exact.result.properties.yt_ratio!;
  let dRm = 0, dRaw = 0, dAg = 0, dYt = 0, dYtRm = 0;
  for (let s = 0; s < RECORDS; s++) {
    const syn = hollomonCurve({ kMpa: k, n, neckStrain: neck, noiseMpa: noise, seed: 7919 * (s + 1) + Math.round(1000 * neck) });
    const r = reduceCurve(syn.input, SETTINGS);
    if (!r.ok) throw new Error(`${r.code}: ${r.message}`);
    const p = r.result.properties;
    dRm += p.rm_mpa! - rm;
    dAg += p.ag_pct! - ag;
    dYt += p.yt_ratio! - yt;
    expect(p.yt_ratio).toBe(p.yield_mpa! / p.rm_mpa!);
    dYtRm += p.yt_ratio! - p.yield_mpa! / rm;
    const force = syn.input.forceN!;
    let top = -Infinity;
    for (let i = 0; i < force.length; i++) top = Math.max(top, force[i] / syn.input.areaMm2!);
    dRaw += top - rm;
  }
  return { rmSd: dRm / RECORDS / noise, rawSd: dRaw / RECORDS / noise, agPt: dAg / RECORDS, ytRatio: dYt / RECORDS, ytFromRm: dYtRm / RECORDS };
}

describe('Rm, Ag and Y/T without noise bias (Hollomon with steep and shallow necks)', () => {
  for (const neck of NECKS) {
    it(`neck over ${neck} strain: Rm within 0.5 noise SD, Ag within 0.35 point, at 0.3 / 1 / 3 MPa`, () => {
      const lines: string[] = [];
      for (const { k, n } of LAWS) {
        for (const noise of NOISES) {
          const b = measure(k, n, neck, noise);
          lines.push(
            `K ${k} n ${n} noise ${noise} MPa: Rm ${b.rmSd >= 0 ? '+' : ''}${b.rmSd.toFixed(2)} SD (largest point ${b.rawSd.toFixed(2)} SD), ` +
              `Ag ${b.agPt >= 0 ? '+' : ''}${b.agPt.toFixed(3)} pt, Y/T ${b.ytRatio >= 0 ? '+' : ''}${b.ytRatio.toExponential(1)} (from Rm ${b.ytFromRm.toExponential(1)})`,
          );
          // the contract of the issue: Rm bias under 0.5 noise SD at 0.3, 1 and 3 MPa
          expect(Math.abs(b.rmSd)).toBeLessThan(0.5);
          // what it replaced was biased 2.4–3 SD high on these records (so the check can tell)
          expect(b.rawSd).toBeGreaterThan(2);
          // Ag: the previous estimator (one parabola's vertex) was 0.0–1.2 points low on these records
          expect(Math.abs(b.agPt)).toBeLessThan(0.35);
          // Y/T follows Rm: what Rm adds to its bias is below 0.0005 (the largest point added
          // 0.004–0.013); the rest is Rp0.2's own noise bias, not Rm's
          expect(Math.abs(b.ytFromRm)).toBeLessThan(0.0005);
        }
      }
      console.log(`maximum-force bias, neck ${neck} (${RECORDS} records per line):\n  ${lines.join('\n  ')}`);
    });
  }
});
