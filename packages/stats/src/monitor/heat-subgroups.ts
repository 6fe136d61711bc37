/**
 * The points a chart is drawn on: every test, or one point per heat — the mean of the heat's
 * tests, a rational subgroup (Montgomery, Introduction to Statistical Quality Control): tests of
 * one heat share its chemistry and rolling. A heat's point is dated by its last test, the day its
 * mean is known, so a chart judging it uses only data up to that date; points are in the order
 * their heats complete. Tests without a heat stay points of their own.
 * Input in time order; output values in the property's units, `ss` the heat's sum of squares
 * about its mean (0 for a single test).
 */
import type { SeriesPoint } from './types.ts';
import type { ChartUnit } from './self-starting.ts';

export interface ChartPointInput {
  value: number;
  /** Tests in the point. */
  size: number;
  ss: number;
  /** Date of the point's last test. */
  date: string;
  /** The test id, or `heat <code>`. */
  label: string;
  /** Indices of the point's tests in the series, ascending. */
  members: number[];
  heat: string | null;
}

export function chartPoints(tests: readonly SeriesPoint[], unit: ChartUnit): ChartPointInput[] {
  if (unit === 'tests') return tests.map((t, i) => ({ value: t.value, size: 1, ss: 0, date: t.date, label: t.testId, members: [i], heat: t.heat ?? null }));
  const byHeat = new Map<string, number[]>();
  const singles: number[][] = [];
  tests.forEach((t, i) => {
    if (!t.heat) singles.push([i]);
    else {
      const m = byHeat.get(t.heat);
      if (m) m.push(i);
      else byHeat.set(t.heat, [i]);
    }
  });
  const groups = [...singles, ...byHeat.values()].sort((a, b) => a[a.length - 1] - b[b.length - 1]);
  return groups.map((members) => {
    let s = 0;
    for (const i of members) s += tests[i].value;
    const mean = s / members.length;
    let ss = 0;
    for (const i of members) ss += (tests[i].value - mean) ** 2;
    const last = tests[members[members.length - 1]];
    return { value: mean, size: members.length, ss, date: last.date, label: last.heat ? `heat ${last.heat}` : last.testId, members, heat: last.heat ?? null };
  });
}
