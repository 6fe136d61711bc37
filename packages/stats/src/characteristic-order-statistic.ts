/**
 * Distribution-free lower tolerance bound as a characteristic value (ISO 16269-6; Wilks 1941): the
 * largest order statistic x_(r) that is still a bound with the stated confidence
 * (order-statistic-bound.ts). Units: the data's. Degenerate input: n too small for the level →
 * value null, the note and `min_n` give the smallest n that has a bound.
 */
import { fmt, levelText, type CharacteristicValue, type Sample, type SummaryLevel } from './characteristic-types.ts';
import { orderStatisticConfidence, orderStatisticMinN, orderStatisticRank } from './order-statistic-bound.ts';

export function orderStatisticCharacteristic(s: Sample, level: SummaryLevel): CharacteristicValue {
  const minN = orderStatisticMinN(level.coverage, level.confidence);
  const r = s.n >= 1 ? orderStatisticRank(s.n, level.coverage, level.confidence) : null;
  return {
    method: 'order-statistic',
    ...level,
    value: r === null ? null : s.sorted[r - 1],
    note:
      r === null
        ? `distribution-free bound needs n ≥ ${minN} for ${levelText(level)} (n = ${s.n})`
        : `distribution-free bound (ISO 16269-6): order statistic x_(${r}) of ${s.n}, attained confidence ${fmt(orderStatisticConfidence(s.n, r, level.coverage), 4)}, ${levelText(level)}`,
    factor: r,
    min_n: Number.isFinite(minN) ? minN : null,
  };
}
