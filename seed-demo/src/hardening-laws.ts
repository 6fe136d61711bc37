/**
 * The true-stress hardening laws the demo curves are generated from (the "source" a consistency
 * check compares against). Stresses in MPa, strains in mm/mm, modulus in MPa.
 *
 * - `plateau-swift` (mild steel with a yield plateau): elastic to the upper yield point ReH, a
 *   drop to the lower yield plateau ReL (engineering stress, with small serrations) over the
 *   Lüders (yield-point) extension, then the Swift law shifted to the end of the plateau,
 *   σt = K·(ε0 + εp − εpL)^n for εp ≥ εpL, with K·ε0^n equal to the true stress at the end of
 *   the plateau (Swift, J. Mech. Phys. Solids 1:1–18, 1952).
 * - `ramberg-osgood` (continuous high-strength steel): εt = σt/E + 0.002·(σt/σ0)^m, so that the
 *   0.2 % proof stress of the true curve is σ0 exactly (Ramberg & Osgood, NACA TN 902, 1943).
 * - `voce` (aluminium alloy): elastic to σ0, then σt = σ0 + Q·(1 − exp(−b·εp))
 *   (Voce, J. Inst. Metals 74:537–562, 1948).
 *
 * The functions return NaN for a plastic strain below the law's range (never thrown); callers
 * only evaluate them inside it.
 */

export interface PlateauSwiftLaw {
  kind: 'plateau-swift';
  modulusMpa: number;
  /** upper yield point (engineering), MPa */
  rehMpa: number;
  /** lower yield plateau level (engineering), MPa */
  relMpa: number;
  /** engineering extension of the plateau, from ReH to the onset of hardening, mm/mm */
  ludersStrain: number;
  /** relative amplitude of the plateau serrations */
  serrationAmplitude: number;
  kMpa: number;
  n: number;
  eps0: number;
  /** true plastic strain at the end of the plateau (derived), mm/mm */
  epsPlateauEnd: number;
}

export interface RambergOsgoodLaw {
  kind: 'ramberg-osgood';
  modulusMpa: number;
  sigma0Mpa: number;
  m: number;
}

export interface VoceLaw {
  kind: 'voce';
  modulusMpa: number;
  sigma0Mpa: number;
  qMpa: number;
  b: number;
}

export type HardeningLaw = PlateauSwiftLaw | RambergOsgoodLaw | VoceLaw;

/**
 * True stress (MPa) of the hardening branch at true plastic strain εp. For `plateau-swift` only
 * valid for εp ≥ εpL (the end of the plateau); for `ramberg-osgood` the inverse of its plastic
 * term; for `voce` valid for εp ≥ 0.
 */
export function lawTrueStress(law: HardeningLaw, epsPlastic: number): number {
  switch (law.kind) {
    case 'plateau-swift': {
      const x = law.eps0 + epsPlastic - law.epsPlateauEnd;
      return x >= law.eps0 ? law.kMpa * Math.pow(x, law.n) : NaN;
    }
    case 'ramberg-osgood':
      return epsPlastic >= 0 ? law.sigma0Mpa * Math.pow(epsPlastic / 0.002, 1 / law.m) : NaN;
    case 'voce':
      return epsPlastic >= 0 ? law.sigma0Mpa + law.qMpa * (1 - Math.exp(-law.b * epsPlastic)) : NaN;
  }
}

/**
 * The Swift ε0 that makes the shifted law give the engineering tensile strength ratio
 * rm/rel. With K·ε0^n = ReL·(1 + eL) (true stress at the plateau end, eL its engineering
 * strain), Considère's condition dσt/dεt = σt gives εp,u = n − ε0 + εpL and
 * Rm ≈ K·n^n·exp(−εp,u); so this solves (n/ε0)^n · exp(−(n − ε0 + εpL)) = (rm/rel)/(1 + eL) by
 * bisection on (0, n) (the left side decreases there). The elastic part of the strain at
 * maximum force is neglected; the generated curve's Rm is measured on the curve itself.
 * Returns null when no ε0 in (0, n) fits (ratio too low).
 */
export function swiftEps0ForRatio(n: number, rmOverRel: number, plateauEndStrain: number, epsPlateauEnd: number): number | null {
  const target = rmOverRel / (1 + plateauEndStrain);
  const f = (e0: number): number => Math.pow(n / e0, n) * Math.exp(-(n - e0 + epsPlateauEnd)) - target;
  let lo = 1e-6;
  let hi = n * 0.999;
  if (f(lo) < 0 || f(hi) > 0) return null;
  for (let i = 0; i < 80; i++) {
    const mid = 0.5 * (lo + hi);
    if (f(mid) > 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}
