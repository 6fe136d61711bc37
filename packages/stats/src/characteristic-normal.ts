/**
 * One-sided normal tolerance limit x̄ − k·s as a characteristic value, k the exact noncentral-t
 * factor (ISO 16269-6; tolerance-factor.ts). Units: the data's. Degenerate input: n < 5 or no
 * spread → value null with a note.
 */
import { fmt, levelText, MIN_N_TOLERANCE, type CharacteristicValue, type Sample, type SummaryLevel } from './characteristic-types.ts';
import { normalToleranceFactor } from './tolerance-factor.ts';

export function normalCharacteristic(s: Sample, level: SummaryLevel, suffix = ''): CharacteristicValue {
  const ok = s.n >= MIN_N_TOLERANCE && s.mean !== null && s.sd !== null && s.sd > 0;
  const k = ok ? normalToleranceFactor(s.n, level.coverage, level.confidence) : NaN;
  return {
    method: 'tolerance-normal',
    ...level,
    value: ok ? s.mean! - k * s.sd! : null,
    note: ok
      ? `one-sided normal tolerance limit x̄ − k·s, exact noncentral t (ISO 16269-6), k = ${fmt(k, 5)}, ${levelText(level)}${suffix}`
      : `needs n ≥ ${MIN_N_TOLERANCE} and spread (n = ${s.n})`,
    factor: ok ? k : null,
    min_n: MIN_N_TOLERANCE,
  };
}
