/**
 * EN 1990 (basis of structural design), Annex D, D7.2 and Table D1: the factor k_n for the 5 %
 * characteristic value X_k = m_X (1 − k_n V_X) (normal model; on ln X for the lognormal).
 *
 *   V known:   k_n = u_{0.95} · √(1 + 1/n)
 *   V unknown: k_n = t_{n−1; 0.95} · √(1 + 1/n)
 *
 * (the Bayesian prediction fractile with vague prior, as the Annex derives it). Table D1 rounds
 * these to two decimals; the formulas are used here. Dimensionless.
 * Degenerate input: n < 1 (V known) or n < 2 (V unknown), or non-integer n → NaN. n = ∞ → 1.645.
 */
import { normalQuantile } from './special/normal.ts';
import { studentTQuantile } from './special/student-t.ts';

export function en1990Kn(n: number, vKnown: boolean): number {
  if (n === Infinity) return normalQuantile(0.95);
  if (!Number.isInteger(n) || n < (vKnown ? 1 : 2)) return NaN;
  const f = Math.sqrt(1 + 1 / n);
  return (vKnown ? normalQuantile(0.95) : studentTQuantile(0.95, n - 1)) * f;
}
