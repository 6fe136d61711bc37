/**
 * The same specimen recorded in lbf / in and in kN / mm gives the same properties once the
 * channels are converted with units.ts (factors of NIST SP 811: 1 in = 25.4 mm, 1 lbf =
 * 4.4482216152605 N).
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_REDUCE_SETTINGS, IN_MM, LBF_N, channelToCanonical, reduceCurve, toCanonical, unitFor } from '@fractile/curves';
import { plateauCurve } from '@fractile/curves/testing';
import type { TestProperties } from '@fractile/curves';

function close(a: TestProperties, b: TestProperties): void {
  for (const k of Object.keys(a) as (keyof TestProperties)[]) {
    const x = a[k], y = b[k];
    if (typeof x === 'number' && typeof y === 'number') expect(Math.abs(x - y), k).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(x)));
    else expect(y, k).toEqual(x);
  }
}

describe('unit independence', () => {
  it('lbf/in and kN/mm records of one specimen reduce to the same properties', () => {
    const syn = plateauCurve({ rehMpa: 360, relMpa: 330, ypeStrain: 0.02, undershootMpa: 10, serrationMpa: 3, noiseMpa: 0.8, strainNoise: 1e-6, toeStrain: 0.0005, seed: 4, areaMm2: 129.03, gaugeLengthMm: 50.8 });
    const forceN = syn.input.forceN!, extMm = syn.input.extensionMm!;
    // the two files as a laboratory would write them
    const lbf = forceN.map((f) => f / LBF_N), inch = extMm.map((x) => x / IN_MM);
    const kn = forceN.map((f) => f / 1000);
    const areaIn2 = 129.03 / (IN_MM * IN_MM), gaugeIn = 50.8 / IN_MM;
    // read back through units.ts
    const fromUs = {
      forceN: channelToCanonical(lbf, unitFor('force', 'lbf')!),
      extensionMm: channelToCanonical(inch, unitFor('length', 'in')!),
      areaMm2: toCanonical(areaIn2, unitFor('area', 'in2')!),
      gaugeLengthMm: toCanonical(gaugeIn, unitFor('length', 'in')!),
    };
    const fromSi = { forceN: channelToCanonical(kn, unitFor('force', 'kN')!), extensionMm: channelToCanonical(extMm, unitFor('length', 'mm')!), areaMm2: 129.03, gaugeLengthMm: 50.8 };
    const a = reduceCurve(fromUs, DEFAULT_REDUCE_SETTINGS);
    const b = reduceCurve(fromSi, DEFAULT_REDUCE_SETTINGS);
    expect(a.ok && b.ok).toBe(true);
    if (!a.ok || !b.ok) return;
    close(a.result.properties, b.result.properties);
    expect(a.result.properties.shape_class).toBe('plateau');
    // and the same as the stress/strain form of the record
    const c = reduceCurve({ stressMpa: forceN.map((f) => f / 129.03), strain: extMm.map((x) => x / 50.8) }, DEFAULT_REDUCE_SETTINGS);
    expect(c.ok).toBe(true);
    if (c.ok) close(c.result.properties, b.result.properties);
  });
});
