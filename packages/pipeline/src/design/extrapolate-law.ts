/**
 * Extrapolation of a curve past its valid range by a hardening law fitted to the valid part:
 * Swift σ = K(ε0 + εp)^n, Voce σ = σ0 + Q(1 − e^(−b·εp)) — both in true plastic strain — or
 * Hollomon σ = K·ε^n in true total strain ε = εp + σ/E (ISO 10275 form; in plastic strain where E
 * is not known). The fits are those of `@fractile/curves`. To keep the curve continuous, the law
 * is joined at the last valid point: σ(εp) = σ_last + law(εp) − law(εp_last).
 *
 * The fit window is the valid range without its first quarter (`fitWindowStart`); the points
 * past the valid range continue the grid, then its last step, up to the target
 * (`extrapolationPoints`).
 *
 * Units: MPa, mm/mm. Returns `null` where the law cannot be fitted (too few points, no
 * convergence).
 */
import { evalHollomon, evalSwift, evalVoce, fitHollomon, fitSwift, fitVoce } from '@fractile/curves';
import type { ExtrapolationLaw } from './types.ts';

export interface FittedLaw {
  law: ExtrapolationLaw;
  params: Record<string, number>;
  rmseMpa: number;
  /** True stress of the fitted law at a true plastic strain (MPa). */
  stressAt(plasticStrain: number): number;
}

/** Stress of Hollomon in total strain at a plastic strain: solves σ = K(εp + σ/E)^n by fixed point. */
function hollomonAtPlastic(params: Parameters<typeof evalHollomon>[0], plasticStrain: number, eMpa: number | null): number {
  if (eMpa === null) return evalHollomon(params, plasticStrain);
  let s = evalHollomon(params, Math.max(plasticStrain, 1e-6));
  for (let i = 0; i < 100; i++) {
    const next = evalHollomon(params, plasticStrain + s / eMpa);
    if (Math.abs(next - s) <= 1e-10 * Math.abs(next)) return next;
    s = next;
  }
  return s;
}

function asRecord(p: object): Record<string, number> {
  const out: Record<string, number> = {};
  for (const [k, v] of Object.entries(p)) if (typeof v === 'number') out[k] = v;
  return out;
}

export function fitLaw(law: ExtrapolationLaw, plasticStrain: readonly number[], stressMpa: readonly number[], eMpa: number | null): FittedLaw | null {
  const x = [...plasticStrain];
  const y = [...stressMpa];
  if (law === 'swift') {
    const fit = fitSwift(x, y);
    if (!fit) return null;
    return { law, params: asRecord(fit.params), rmseMpa: fit.rmseMpa, stressAt: (e) => evalSwift(fit.params, e) };
  }
  if (law === 'voce') {
    const fit = fitVoce(x, y);
    if (!fit) return null;
    return { law, params: asRecord(fit.params), rmseMpa: fit.rmseMpa, stressAt: (e) => evalVoce(fit.params, e) };
  }
  // Hollomon: total true strain where E is known; plastic strain (> 0 only) otherwise
  const useE = eMpa !== null && eMpa > 0 ? eMpa : null;
  const hx: number[] = [];
  const hy: number[] = [];
  for (let i = 0; i < x.length; i++) {
    const strain = useE !== null ? x[i] + y[i] / useE : x[i];
    if (strain > 0 && y[i] > 0) {
      hx.push(strain);
      hy.push(y[i]);
    }
  }
  const fit = fitHollomon(hx, hy);
  if (!fit) return null;
  return { law, params: asRecord(fit.params), rmseMpa: fit.rmseMpa, stressAt: (e) => hollomonAtPlastic(fit.params, e, useE) };
}

/**
 * Values of the fitted law at `at`, joined to the curve at (xLast, yLast) and made non-decreasing
 * (each value at least the one before).
 */
export function extrapolateJoined(fit: FittedLaw, xLast: number, yLast: number, at: readonly number[]): number[] {
  const base = fit.stressAt(xLast);
  const out: number[] = [];
  let prev = yLast;
  for (const e of at) {
    const v = yLast + fit.stressAt(e) - base;
    prev = Number.isFinite(v) ? Math.max(prev, v) : prev;
    out.push(prev);
  }
  return out;
}

/** Share of the valid range, from its start, left out of the law fit for an extrapolation. */
const FIT_SKIP_FRACTION = 0.25;
/** Fewest points a law fit for an extrapolation gets (the window widens to reach it). */
const FIT_MIN_POINTS = 8;

/**
 * First index of the window a law is fitted on for an extrapolation: the valid range without its
 * first quarter, so that a yield plateau or the elastic–plastic knee does not bend the tail the
 * extrapolation continues; widened to at least FIT_MIN_POINTS points.
 */
export function fitWindowStart(x: readonly number[]): number {
  const last = x.length - 1;
  const from = x[0] + FIT_SKIP_FRACTION * (x[last] - x[0]);
  let i = 0;
  while (i < last && x[i] < from) i++;
  return Math.max(0, Math.min(i, last + 1 - FIT_MIN_POINTS));
}

/** Points past the valid range up to `target`: the grid's own, then continued with its last step. */
export function extrapolationPoints(grid: readonly number[], lastValid: number, target: number): number[] {
  const out: number[] = [];
  for (let i = lastValid + 1; i < grid.length && grid[i] <= target * (1 + 1e-12); i++) out.push(grid[i]);
  const last = grid[grid.length - 1];
  if (target > last * (1 + 1e-12) && grid.length >= 2) {
    const step = grid[grid.length - 1] - grid[grid.length - 2];
    let k = 1;
    while (last + k * step < target * (1 - 1e-12)) {
      out.push(last + k * step);
      k++;
    }
    out.push(target);
  }
  return out;
}
