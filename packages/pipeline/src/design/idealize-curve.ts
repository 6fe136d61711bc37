/**
 * The idealizations of a characteristic curve: elastic–perfectly plastic at the yield, bilinear
 * (linear hardening through the first point, `idealize-bilinear.ts`), multilinear breakpoints of
 * the whole output (`idealize-multilinear.ts`, extrapolation flags kept) and a Ramberg–Osgood set
 * (`idealize-ramberg-osgood.ts`, σ0 at 0.2 % plastic strain of the valid part). The bilinear and
 * Ramberg–Osgood fits use the valid part only.
 *
 * Units: MPa, mm/mm. The Ramberg–Osgood set is `null` (with a warning) where it cannot be fitted.
 */
import { fitBilinearHardening } from './idealize-bilinear.ts';
import { multilinearBreakpoints } from './idealize-multilinear.ts';
import { fitRambergOsgoodPlastic, interpolateAt, RO_OFFSET } from './idealize-ramberg-osgood.ts';
import type { IdealizedCurves } from './types.ts';

export function idealizeCurve(
  valid: { plastic: readonly number[]; characteristic: readonly number[] },
  whole: { plastic: readonly number[]; characteristic: readonly number[]; extrapolated: readonly boolean[] },
  yieldMpa: number, eMpa: number | null, multilinearPoints: number,
): { idealized: IdealizedCurves; warnings: string[] } {
  const x = [...valid.plastic], chr = [...valid.characteristic];
  const bil = fitBilinearHardening(x, chr, yieldMpa, eMpa);
  const ml = multilinearBreakpoints([...whole.plastic], [...whole.characteristic], multilinearPoints);
  const rp02 = interpolateAt(x, chr, RO_OFFSET);
  const ro = fitRambergOsgoodPlastic(x, chr, rp02 ?? undefined);
  const warnings = ro ? [] : ['no_ramberg_osgood: the Ramberg–Osgood set could not be fitted (too few points or no hardening)'];
  return {
    idealized: {
      elastic_perfectly_plastic: { e_mpa: eMpa, yield_mpa: yieldMpa },
      bilinear: { e_mpa: eMpa, yield_mpa: yieldMpa, hardening_modulus_mpa: bil.hardeningModulusMpa, tangent_modulus_mpa: bil.tangentModulusMpa, rmse_mpa: bil.rmseMpa },
      multilinear: {
        plastic_strain: ml.indices.map((i) => whole.plastic[i]),
        stress_mpa: ml.indices.map((i) => whole.characteristic[i]),
        extrapolated: ml.indices.map((i) => whole.extrapolated[i]),
      },
      ramberg_osgood: ro ? { e_mpa: eMpa, sigma0_mpa: ro.sigma0Mpa, m: ro.m, rmse_mpa: ro.rmseMpa } : null,
    },
    warnings,
  };
}
