/**
 * Strain-hardening exponent n and strength coefficient K (ISO 10275; ASTM E646): least squares
 * of ln σt on ln εt over the points whose engineering strain lies in the window,
 * n = slope, K = exp(intercept).
 *
 * Window (engineering strain, percent): the setting (default 10 %–20 %), its upper end capped at
 * Ag and its lower end raised to the end of any yield-point extension. When that leaves less
 * than 2 percentage points, a reduced window [max(Ae end, upper/2), upper] is used and marked
 * `reduced` (our rule for low uniform elongation).
 *
 * In: engineering strain (mm/mm), true strain and true stress (MPa) up to maximum force, the
 * window, Ag (%) and the yield-point plateau end (engineering strain, mm/mm; 0 if none).
 * Out: n, K, R², the number of points and the window used; n and K null below 5 points.
 */
export interface HardeningExponent {
  n: number | null;
  kMpa: number | null;
  r2: number | null;
  points: number;
  windowPct: [number, number];
  reduced: boolean;
}

export function hardeningWindow(windowPct: [number, number], agPct: number, ypeEndPct: number): { windowPct: [number, number]; reduced: boolean } {
  const hi = Math.min(windowPct[1], agPct);
  const lo = Math.max(windowPct[0], ypeEndPct);
  if (hi - lo >= 2) return { windowPct: [lo, hi], reduced: false };
  return { windowPct: [Math.max(ypeEndPct, hi / 2), hi], reduced: true };
}

export function hardeningExponent(
  engStrain: ArrayLike<number>, trueStrain: ArrayLike<number>, trueStressMpa: ArrayLike<number>,
  windowPct: [number, number], agPct: number, ypeEndStrain: number,
): HardeningExponent {
  const w = hardeningWindow(windowPct, agPct, ypeEndStrain * 100);
  const lo = w.windowPct[0] / 100, hi = w.windowPct[1] / 100;
  let n = 0, sx = 0, sy = 0, sxx = 0, sxy = 0, syy = 0;
  const len = trueStrain.length;
  for (let i = 0; i < len; i++) {
    const e = engStrain[i];
    if (e < lo || e > hi || !(trueStrain[i] > 0) || !(trueStressMpa[i] > 0)) continue;
    const x = Math.log(trueStrain[i]), y = Math.log(trueStressMpa[i]);
    n++; sx += x; sy += y; sxx += x * x; sxy += x * y; syy += y * y;
  }
  const base = { points: n, windowPct: w.windowPct, reduced: w.reduced };
  if (n < 5 || !(hi > lo)) return { n: null, kMpa: null, r2: null, ...base };
  const vxx = sxx - (sx * sx) / n, vxy = sxy - (sx * sy) / n, vyy = syy - (sy * sy) / n;
  if (!(vxx > 0)) return { n: null, kMpa: null, r2: null, ...base };
  const slope = vxy / vxx;
  const intercept = (sy - slope * sx) / n;
  const r2 = vyy > 0 ? (vxy * vxy) / (vxx * vyy) : 1;
  return { n: slope, kMpa: Math.exp(intercept), r2, ...base };
}
