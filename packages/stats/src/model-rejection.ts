/**
 * Whether Anderson–Darling rejects a fitted model at 5 % (Stephens 1974; the p-values of
 * anderson-darling.ts), and the note that says so. Below MIN_N_AD_P values the p-values are not
 * calibrated, so no model is rejected there. A Weibull p reported as the table bound 0.01 means
 * p ≤ 0.01: rejected. Returns false for an absent fit or p.
 */
import { fmt, MIN_N_AD_P } from './characteristic-types.ts';
import type { FitResult } from './fit-types.ts';

export const REJECTION_LEVEL = 0.05;

export function isRejected(fit: FitResult | undefined, n: number): boolean {
  return fit !== undefined && fit.p !== null && n >= MIN_N_AD_P && fit.p < REJECTION_LEVEL;
}

/** "; the <model> model is rejected by Anderson–Darling at 5 % (p = …)" or "". */
export function rejectionNote(fit: FitResult | undefined, n: number): string {
  if (!fit || !isRejected(fit, n)) return '';
  return `; the ${fit.model} model is rejected by Anderson–Darling at 5 % (p ${fit.p_method === 'table-bound' ? '≤' : '='} ${fmt(fit.p!, 2)})`;
}
