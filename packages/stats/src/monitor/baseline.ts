/**
 * Which tests of a series the chart's structure is studied on (whether heats differ, how many
 * tests a point holds, the SD of a test): by default the first 100 tests (all if fewer). A fixed
 * count rather than a share of the series, so that once a series has 100 tests its chart no
 * longer changes as tests are added, and a run next week reports the alerts of this week's run
 * under the same ids; 100 tests see some 25 heats of 4, enough to show a between-heat SD of half
 * the within-heat SD most of the time (our choice, measured in the drift benchmark).
 * With `from`/`to` the tests dated inside [from, to] (inclusive); with both a date range and
 * `firstN`, the first `firstN` tests inside the range.
 * Returns inclusive indices [start, end], or null when no test falls in the range.
 */
import type { BaselineSpec, SeriesPoint } from './types.ts';

export const DEFAULT_BASELINE_TESTS = 100;

/** The default baseline of a series of n tests: its first 100 tests, all if fewer. */
export function defaultBaseline(n: number): { firstN: number } {
  return { firstN: Math.min(n, DEFAULT_BASELINE_TESTS) };
}

export function selectBaseline(points: readonly SeriesPoint[], spec: BaselineSpec = defaultBaseline(points.length)): { start: number; end: number } | null {
  const n = points.length;
  if (n === 0) return null;
  let start = 0;
  let end = n - 1;
  if (spec.from !== undefined || spec.to !== undefined) {
    start = -1;
    for (let i = 0; i < n; i++) {
      const d = points[i].date;
      if ((spec.from === undefined || d >= spec.from) && (spec.to === undefined || d <= spec.to)) {
        if (start < 0) start = i;
        end = i;
      }
    }
    if (start < 0) return null;
    if (spec.firstN !== undefined) end = Math.min(end, start + Math.max(1, Math.floor(spec.firstN)) - 1);
  } else {
    const firstN = spec.firstN ?? defaultBaseline(n).firstN;
    end = Math.min(n, Math.max(1, Math.floor(firstN))) - 1;
  }
  return { start, end };
}
