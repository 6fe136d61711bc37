/**
 * Modulus of elasticity by least squares over a stress window of the rising elastic part
 * (ASTM E111, least-squares modulus; ISO 6892-1 Annex on the slope of the elastic part).
 *
 * The window is [lo, hi] as fractions of the first yield stress (ReH when the curve yields
 * discontinuously, else Rp): the first yield is not known before E is, so the fit is iterated —
 * start from the window scaled on the maximum stress, fit, find the first yield with that slope,
 * rescale the window, refit — until the first yield moves less than 0.1 % (at most 8 rounds).
 * Only the loading branch up to the first point at or above hi is used. When the points of the
 * window are visibly curved (t statistic of a quadratic term above 5: a toe reaching into the
 * window, or plastic flow starting inside it) the window is narrowed in steps of 5 % of the first
 * yield — its lower end up to 25 % at most, keeping a width of 15 % — (our rule); the window
 * used is returned.
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
  /** the window used, as fractions of the first yield (differs from the setting when narrowed) */
  windowFractions: [number, number];
}

export function fitModulusWindow(strain: ArrayLike<number>, stressMpa: ArrayLike<number>, loMpa: number, hiMpa: number, to: number): Omit<ModulusFit, 'iterations' | 'firstYieldMpa' | 'windowFractions'> | null {
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

/**
 * Curvature of the points in a stress window: the t statistic of c in y = a + b·x + c·x²
 * (by the residuals of y and of x² on the line in x). Positive: the slope rises through the
 * window (a toe reaching into it); negative: it falls (plastic flow reaching into it).
 */
export function curvatureT(strain: ArrayLike<number>, stressMpa: ArrayLike<number>, from: number, to: number, loMpa: number, hiMpa: number): number {
  let n = 0, mx = 0, my = 0;
  for (let i = from; i <= to; i++) { const y = stressMpa[i]; if (y < loMpa || y > hiMpa) continue; n++; mx += strain[i]; my += y; }
  if (n < 8) return 0;
  mx /= n; my /= n;
  let sxx = 0, sxy = 0, sxq = 0, sqq = 0, sqy = 0, syy = 0;
  for (let i = from; i <= to; i++) {
    const y0 = stressMpa[i]; if (y0 < loMpa || y0 > hiMpa) continue;
    const x = strain[i] - mx, y = y0 - my, q = x * x;
    sxx += x * x; sxy += x * y; sxq += x * q; sqq += q * q; sqy += q * y; syy += y * y;
  }
  if (!(sxx > 0)) return 0;
  // q̄ = sxx/n; centred q: Σ(q − q̄)² = sqq − sxx²/n, Σ(q − q̄)y = sqy, Σ(q − q̄)x = sxq
  const qq = sqq - (sxx * sxx) / n;
  const zz = qq - (sxq * sxq) / sxx;          // Σ z², z = residual of q on x
  const zy = sqy - (sxq * sxy) / sxx;         // Σ z y
  if (!(zz > 0)) return 0;
  const c = zy / zz;
  const sse = syy - (sxy * sxy) / sxx - c * zy;
  const s2 = Math.max(sse, 0) / (n - 3);
  if (!(s2 > 0)) return c === 0 ? 0 : Math.sign(c) * Infinity;
  return c / Math.sqrt(s2 / zz);
}

/** Steps of the window adjustment (fraction of the first yield) and its limits. */
const STEP = 0.05, LO_MAX = 0.25, MIN_WIDTH = 0.15, T_CURVED = 5;

export function fitModulusIterative(
  strain: ArrayLike<number>, stressMpa: ArrayLike<number>, to: number, maxStressMpa: number,
  window: [number, number], firstYield: (eMpa: number, strainOrigin: number) => number | null,
): ModulusFit | null {
  let ref = maxStressMpa;
  let best: ModulusFit | null = null;
  let lo = window[0], hi = window[1];
  for (let it = 1; it <= 8; it++) {
    let fit = fitModulusWindow(strain, stressMpa, lo * ref, hi * ref, to);
    if (!fit && it === 1) {
      // a coarsely sampled record can have fewer than 3 points in the window: widen it once to
      // 5–80 % (our rule; the fit then has few points and is flagged as a poor fit)
      lo = Math.min(lo, 0.05);
      hi = Math.max(hi, 0.8);
      fit = fitModulusWindow(strain, stressMpa, lo * ref, hi * ref, to);
    }
    if (!fit) return best;
    // a window that is visibly curved is narrowed: its lower end raised past a toe, or its upper
    // end lowered below the start of plastic flow (our rule; t of the quadratic term above 5)
    for (let k = 0; k < 6; k++) {
      const t = curvatureT(strain, stressMpa, fit.fromIndex, fit.toIndex, lo * ref, hi * ref);
      if (t > T_CURVED && lo + STEP <= LO_MAX && hi - lo - STEP >= MIN_WIDTH) lo += STEP;
      else if (t < -T_CURVED && hi - lo - STEP >= MIN_WIDTH) hi -= STEP;
      else break;
      const next = fitModulusWindow(strain, stressMpa, lo * ref, hi * ref, to);
      if (!next) break;
      fit = next;
    }
    const y = firstYield(fit.eMpa, fit.strainOrigin);
    best = { ...fit, iterations: it, firstYieldMpa: y, windowFractions: [lo, hi] };
    if (y === null || !(y > 0)) return best;
    const moved = Math.abs(y - ref) / ref;
    ref = y;
    if (moved < 1e-3) return best;
  }
  return best;
}
