/**
 * EN 1990 Annex D (D7.2, Table D1) characteristic value with the coefficient of variation known
 * from prior knowledge: X_k = m_X (1 − k_n V), k_n = u_0.95 √(1 + 1/n) (en1990-fractile.ts), normal
 * model, 5 % fractile.
 *
 * The prior V must come from outside the sample (the grade catalog, per property). Without one the
 * method is not offered (value null, the note says why). The prior is checked against the sample:
 * under a normal population with V = V_prior, (n − 1) s² / (V_prior · x̄)² follows χ²_{n−1} (treating
 * x̄ as the mean), so a sample V above V_prior · √(χ²_{n−1; ℓ} / (n − 1)) — the upper χ² bound at the
 * check level ℓ (default 0.95) — says the prior understates the spread: the value is withheld and
 * `warning` says so. χ² quantile from @stdlib (Boost's algorithm).
 *
 * Units: the data's. Degenerate input: no values, a prior outside (0, 1) → value null with a note.
 */
import chisquareQuantile from '@stdlib/stats-base-dists-chisquare-quantile';
import { fmt, MIN_N_EN1990_KNOWN, type CharacteristicValue, type Sample } from './characteristic-types.ts';
import { en1990Kn } from './en1990-fractile.ts';

export const DEFAULT_PRIOR_V_CHECK_LEVEL = 0.95;

export interface VKnownResult {
  value: CharacteristicValue;
  /** set when the prior is contradicted by the sample (the value is then withheld) */
  warning: string | null;
}

/** The largest sample V consistent with the prior at the check level (χ² upper bound). */
export function priorVUpperBound(priorV: number, n: number, level: number): number {
  return priorV * Math.sqrt(chisquareQuantile(level, n - 1) / (n - 1));
}

export function en1990VKnown(s: Sample, priorV: number | null, checkLevel = DEFAULT_PRIOR_V_CHECK_LEVEL, suffix = ''): VKnownResult {
  const base = { method: 'en1990-v-known' as const, coverage: 0.95, confidence: null, min_n: MIN_N_EN1990_KNOWN };
  const none = (note: string, warning: string | null = null): VKnownResult => ({ value: { ...base, value: null, note, factor: null }, warning });
  if (priorV === null) return none('not offered: no prior V for this property in the grade catalog (EN 1990 D7.2 needs V known from prior knowledge, not from this sample)');
  if (!(priorV > 0 && priorV < 1)) return none(`the prior V must lie in (0, 1), got ${priorV}`);
  if (s.n < MIN_N_EN1990_KNOWN || s.mean === null) return none('no values');
  if (s.n >= 2 && s.cov !== null) {
    const bound = priorVUpperBound(priorV, s.n, checkLevel);
    if (s.cov > bound) {
      const msg = `EN 1990 "V known" withheld: the sample V = ${fmt(s.cov)} exceeds the prior V = ${priorV} beyond its sampling error (χ² upper bound ${fmt(bound)} at ${checkLevel}, n = ${s.n})`;
      return none(msg, msg);
    }
  }
  const kn = en1990Kn(s.n, true);
  const check = s.n >= 2 && s.cov !== null ? `, sample V = ${fmt(s.cov)} within the χ² bound ${fmt(priorVUpperBound(priorV, s.n, checkLevel))} at ${checkLevel}` : ', no sample V to check the prior against';
  return {
    value: { ...base, value: s.mean * (1 - kn * priorV), note: `EN 1990 Annex D 5 % fractile, normal model, V known = ${priorV} (grade catalog)${check}, k_n = ${fmt(kn, 4)}${suffix}`, factor: kn },
    warning: null,
  };
}
