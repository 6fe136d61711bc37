/**
 * Modulus of elasticity by least squares over a stress window of the rising elastic part
 * (ASTM E111, least-squares modulus; ISO 6892-1 Annex on the slope of the elastic part).
 *
 * The window is [lo, hi] as fractions of the first yield stress (ReH when the curve yields
 * discontinuously, else Rp): the first yield is not known before E is, so the fit is iterated —
 * start from the window scaled on the maximum stress, fit, find the first yield with that slope,
 * rescale the window, refit — until the first yield moves less than 0.1 % (at most 8 rounds).
 * Only the loading branch up to the first point at or above hi is used.
 *
 * In: engineering strain (mm/mm), stress (MPa). Out: slope E (MPa), intercept (MPa), R², the
 * window in MPa, the index range of the points used, and the strain origin −intercept/E (the toe
 * shift); null when fewer than 3 points fall in the window or the slope is not positive.
 */
import { fitLine } from './line-fit.ts';

export interface ModulusFit {
  eMpa: number;
  interceptMpa: number;
  r2: number;
  points: number;
  windowMpa: [number, number];
  /** first and last index (inclusive) of the points in the window */
  fromIndex: number;
  toIndex: number;
  /** strain where the elastic line meets zero stress */
  strainOrigin: number;
  iterations: number;
  firstYieldMpa: number | null;
}

export function fitModulusWindow(strain: ArrayLike<number>, stressMpa: ArrayLike<number>, loMpa: number, hiMpa: number, to: number): Omit<ModulusFit, 'iterations' | 'firstYieldMpa'> | null {
  let end = 0;
  while (end < to && stressMpa[end] < hiMpa) end++;
  // include the first point at or above hi only if it is within the window
  const last = end < to && stressMpa[end] <= hiMpa ? end + 1 : end;
  let first = -1, lastIn = -1;
  for (let i = 0; i < last; i++) if (stressMpa[i] >= loMpa) { if (first < 0) first = i; lastIn = i; }
  if (first < 0) return null;
  const fit = fitLine(strain, stressMpa, first, lastIn + 1, (i) => stressMpa[i] >= loMpa && stressMpa[i] <= hiMpa);
  if (!fit || fit.points < 3 || !(fit.slope > 0)) return null;
  return {
    eMpa: fit.slope, interceptMpa: fit.intercept, r2: fit.r2, points: fit.points, windowMpa: [loMpa, hiMpa],
    fromIndex: first, toIndex: lastIn, strainOrigin: -fit.intercept / fit.slope,
  };
}

export function fitModulusIterative(
  strain: ArrayLike<number>, stressMpa: ArrayLike<number>, to: number, maxStressMpa: number,
  window: [number, number], firstYield: (eMpa: number, strainOrigin: number) => number | null,
): ModulusFit | null {
  let ref = maxStressMpa;
  let best: ModulusFit | null = null;
  for (let it = 1; it <= 8; it++) {
    const fit = fitModulusWindow(strain, stressMpa, window[0] * ref, window[1] * ref, to);
    if (!fit) return best;
    const y = firstYield(fit.eMpa, fit.strainOrigin);
    best = { ...fit, iterations: it, firstYieldMpa: y };
    if (y === null || !(y > 0)) return best;
    const moved = Math.abs(y - ref) / ref;
    ref = y;
    if (moved < 1e-3) return best;
  }
  return best;
}
