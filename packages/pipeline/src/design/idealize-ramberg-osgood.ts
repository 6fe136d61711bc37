/**
 * Ramberg–Osgood parameter set, ε = σ/E + 0.002·(σ/σ0)^m (Ramberg & Osgood 1943, NACA TN 902, in
 * the 0.2 % offset form, which has Rp0.2 = σ0 exactly). The plastic part gives
 * ln σ = ln σ0 + (1/m)·ln(ε_p/0.002), fitted by ordinary least squares in log stress over the
 * points with ε_p > 0 and σ > 0 (error measured in stress, as a design curve is read). With σ0
 * given (the curve's own stress at ε_p = 0.002, so that the set reproduces its Rp0.2), only the
 * slope 1/m is fitted, through that point; otherwise both.
 *
 * With E taken as the group's modulus, only the plastic part is fitted, which is linear least
 * squares in log space; `@fractile/curves` fits all three parameters to an engineering curve.
 *
 * Units: MPa, mm/mm. Returns `null` with fewer than two usable points of distinct strain, or when
 * the fitted slope is not positive (no hardening).
 */
export interface RambergOsgoodFit {
  sigma0Mpa: number;
  m: number;
  /** Root-mean-square stress error of the fit over the points used (MPa). */
  rmseMpa: number;
}

export const RO_OFFSET = 0.002;

export function fitRambergOsgoodPlastic(plasticStrain: readonly number[], stressMpa: readonly number[], sigma0Mpa?: number): RambergOsgoodFit | null {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < plasticStrain.length; i++) {
    if (plasticStrain[i] > 0 && stressMpa[i] > 0) {
      xs.push(Math.log(plasticStrain[i] / RO_OFFSET));
      ys.push(Math.log(stressMpa[i]));
    }
  }
  const n = xs.length;
  if (n < 2) return null;
  let u: number;
  let a: number;
  if (sigma0Mpa !== undefined) {
    if (!(sigma0Mpa > 0)) return null;
    a = Math.log(sigma0Mpa);
    let sxy = 0;
    let sxx = 0;
    for (let i = 0; i < n; i++) {
      sxy += xs[i] * (ys[i] - a);
      sxx += xs[i] * xs[i];
    }
    if (!(sxx > 0)) return null;
    u = sxy / sxx;
  } else {
    const mx = xs.reduce((p, q) => p + q, 0) / n;
    const my = ys.reduce((p, q) => p + q, 0) / n;
    let sxy = 0;
    let sxx = 0;
    for (let i = 0; i < n; i++) {
      sxy += (xs[i] - mx) * (ys[i] - my);
      sxx += (xs[i] - mx) ** 2;
    }
    if (!(sxx > 0)) return null;
    u = sxy / sxx;
    a = my - u * mx;
  }
  if (!(u > 0)) return null;
  let sse = 0;
  for (let i = 0; i < n; i++) sse += (Math.exp(a + u * xs[i]) - Math.exp(ys[i])) ** 2;
  return { sigma0Mpa: Math.exp(a), m: 1 / u, rmseMpa: Math.sqrt(sse / n) };
}

/** Plastic strain of the Ramberg–Osgood set at a stress: 0.002·(σ/σ0)^m. */
export function rambergOsgoodPlasticStrain(stressMpa: number, sigma0Mpa: number, m: number): number {
  return RO_OFFSET * Math.pow(stressMpa / sigma0Mpa, m);
}

/** Stress of the Ramberg–Osgood set at a plastic strain: σ0·(ε_p/0.002)^(1/m). */
export function rambergOsgoodStressAtPlastic(plasticStrain: number, sigma0Mpa: number, m: number): number {
  return sigma0Mpa * Math.pow(plasticStrain / RO_OFFSET, 1 / m);
}

/** Linear interpolation of y at x0 on increasing xs, or `null` outside [xs[0], xs[last]]. */
export function interpolateAt(xs: readonly number[], ys: readonly number[], x0: number): number | null {
  if (xs.length === 0 || x0 < xs[0] || x0 > xs[xs.length - 1]) return null;
  let j = 0;
  while (j < xs.length - 1 && xs[j + 1] < x0) j++;
  if (j === xs.length - 1 || xs[j] === x0) return ys[j];
  const t = (x0 - xs[j]) / (xs[j + 1] - xs[j]);
  return ys[j] + t * (ys[j + 1] - ys[j]);
}
