/**
 * Alerts from chart flags: a contiguous run of flagged points is one episode and raises one
 * alert, so a sustained shift does not flood the list. Every alert says when it would have rung —
 * `detected_on`, the date of the first point at which the rule fires using only the data up to that
 * date — and, where the rule estimates one, `change_date`, the estimated start of the shift
 * (on or before `detected_on`). Rule names:
 *   individuals-below-lcl, individuals-above-ucl, mr-above-ucl, ewma-low, ewma-high,
 *   cusum-low, cusum-high, change-point-down, change-point-up, capability-below-minimum.
 * magnitude_unit is 'property-units' (a shift or a distance in the property's units) or
 * 'fraction' (a share of tests); magnitude_sd states a shift in SDs of one test, so alerts can be
 * ranked on one scale (null where the magnitude is not a shift).
 * Episodes of one rule separated by at most `mergeGap` unflagged points are joined into one
 * (our convention, default 5): a statistic hovering at its limit then raises one alert.
 */

export const DEFAULT_ALERT_MERGE_GAP = 5;

export interface Alert {
  rule: string;
  /** Date of the first point at which the rule fires, from the data up to that date. */
  detected_on: string;
  /** Estimated start of the shift (CUSUM: after the sum last left zero; change point: its location); null where the rule estimates none. */
  change_date: string | null;
  /** Date of the episode's last flagged point. */
  last_date: string;
  /** Signed: negative for a move down. */
  magnitude: number;
  magnitude_unit: 'property-units' | 'fraction';
  magnitude_sd: number | null;
  /** Test ids involved, in time order. */
  tests: string[];
  /** What the magnitude is, in words. */
  detail: string;
}

/**
 * Inclusive [start, end] index ranges of consecutive nonzero flags; ranges separated by at
 * most `mergeGap` unflagged points are joined (0: no joining).
 */
export function flagEpisodes(flags: ArrayLike<number | boolean>, mergeGap = 0): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  let start = -1;
  for (let i = 0; i < flags.length; i++) {
    if (flags[i]) {
      if (start < 0) start = i;
    } else if (start >= 0) {
      out.push([start, i - 1]);
      start = -1;
    }
  }
  if (start >= 0) out.push([start, flags.length - 1]);
  if (mergeGap <= 0 || out.length < 2) return out;
  const merged: Array<[number, number]> = [out[0]];
  for (let j = 1; j < out.length; j++) {
    const prev = merged[merged.length - 1];
    if (out[j][0] - prev[1] - 1 <= mergeGap) prev[1] = out[j][1];
    else merged.push(out[j]);
  }
  return merged;
}

/** Index in [a, b] where score is most extreme in the given direction (−1: smallest, +1: largest). */
export function extremeIndex(score: (i: number) => number, a: number, b: number, direction: 1 | -1): number {
  let best = a;
  for (let i = a + 1; i <= b; i++) if (direction * score(i) > direction * score(best)) best = i;
  return best;
}
