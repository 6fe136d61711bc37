/**
 * EN 1990 Annex D (D7.2, Table D1) characteristic value with V unknown: X_k = m_X − k_n s_X,
 * k_n = t_{n−1; 0.95} √(1 + 1/n) (en1990-fractile.ts), normal model, 5 % fractile — the prediction
 * bound of a normal sample, so on a normal population the expected fraction below it is 5 %.
 * Units: the data's. Degenerate input: n < 3 (Table D1 starts there) → value null with a note.
 */
import { fmt, MIN_N_EN1990_UNKNOWN, type CharacteristicValue, type Sample } from './characteristic-types.ts';
import { en1990Kn } from './en1990-fractile.ts';

export function en1990VUnknown(s: Sample, suffix = ''): CharacteristicValue {
  const ok = s.n >= MIN_N_EN1990_UNKNOWN && s.mean !== null && s.sd !== null;
  const kn = ok ? en1990Kn(s.n, false) : NaN;
  return {
    method: 'en1990-v-unknown',
    coverage: 0.95,
    confidence: null,
    value: ok ? s.mean! - kn * s.sd! : null,
    note: ok
      ? `EN 1990 Annex D 5 % fractile, normal model, V unknown (sample V = ${fmt(s.cov ?? NaN)}), k_n = ${fmt(kn, 4)}${suffix}`
      : `EN 1990 Table D1 gives no k_n for V unknown below n = ${MIN_N_EN1990_UNKNOWN} (n = ${s.n})`,
    factor: ok ? kn : null,
    min_n: MIN_N_EN1990_UNKNOWN,
  };
}
