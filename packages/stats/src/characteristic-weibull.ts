/**
 * One-sided Weibull tolerance limit λ̂·exp(−t/k̂) as a characteristic value, t the exact pivotal
 * factor of Thoman, Bain & Antle on the smallest-extreme-value MLEs of ln x (Lawless 2003, §5.2.2;
 * weibull-tolerance-factor.ts: tabulated, interpolated or simulated on demand, seeded).
 * Units: the data's. Degenerate input: a value ≤ 0, n < 5 or no spread → value null with a note.
 */
import { fmt, levelText, MIN_N_WEIBULL_TOLERANCE, type CharacteristicValue, type Sample, type SummaryLevel } from './characteristic-types.ts';
import { weibullToleranceFactor } from './weibull-tolerance-factor.ts';

export function weibullCharacteristic(s: Sample, level: SummaryLevel, suffix = ''): CharacteristicValue {
  const fit = s.fits.find((f) => f.model === 'weibull');
  const f = fit && s.n >= MIN_N_WEIBULL_TOLERANCE ? weibullToleranceFactor(s.n, level.coverage, level.confidence) : null;
  const ok = fit !== undefined && f !== null;
  const how = f ? (f.source === 'simulated' ? `simulated on demand from ${f.samples} seeded pivots` : `${f.source} from the shipped table of ${f.samples} seeded pivots per n`) : '';
  return {
    method: 'tolerance-weibull',
    ...level,
    value: ok ? fit.params.scale * Math.exp(-f.t / fit.params.shape) : null,
    note: ok
      ? `one-sided Weibull tolerance limit λ̂·exp(−t/k̂), exact pivotal factor on the extreme-value MLEs (Thoman, Bain & Antle; Lawless 2003), t = ${fmt(f.t, 5)} ${how}, ${levelText(level)}${suffix}`
      : s.logs === null && s.n > 0
        ? 'needs all values > 0'
        : `needs n ≥ ${MIN_N_WEIBULL_TOLERANCE} and spread (n = ${s.n})`,
    factor: ok ? f.t : null,
    min_n: MIN_N_WEIBULL_TOLERANCE,
  };
}
