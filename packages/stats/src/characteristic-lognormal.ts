/**
 * One-sided lognormal tolerance limit exp(mean(ln x) − k·sd(ln x)) as a characteristic value: the
 * exact normal limit on ln x (ISO 16269-6 applied to the logs), k as for the normal model.
 * Units: the data's. Degenerate input: a value ≤ 0, n < 5 or no spread → value null with a note.
 */
import { fmt, levelText, MIN_N_TOLERANCE, type CharacteristicValue, type Sample, type SummaryLevel } from './characteristic-types.ts';
import { normalToleranceFactor } from './tolerance-factor.ts';

export function lognormalCharacteristic(s: Sample, level: SummaryLevel, suffix = ''): CharacteristicValue {
  const fit = s.fits.find((f) => f.model === 'lognormal');
  const ok = s.n >= MIN_N_TOLERANCE && fit !== undefined;
  const k = ok ? normalToleranceFactor(s.n, level.coverage, level.confidence) : NaN;
  // sample SD of ln x (divisor n − 1) from the MLE σ̂ (divisor n)
  const sdLog = fit ? fit.params.sigma * Math.sqrt(s.n / (s.n - 1)) : NaN;
  return {
    method: 'tolerance-lognormal',
    ...level,
    value: ok ? Math.exp(fit.params.mu - k * sdLog) : null,
    note: ok
      ? `one-sided lognormal tolerance limit exp(mean(ln x) − k·sd(ln x)), exact (ISO 16269-6 on ln x), k = ${fmt(k, 5)}, ${levelText(level)}${suffix}`
      : s.logs === null && s.n > 0
        ? 'needs all values > 0'
        : `needs n ≥ ${MIN_N_TOLERANCE} and spread (n = ${s.n})`,
    factor: ok ? k : null,
    min_n: MIN_N_TOLERANCE,
  };
}
