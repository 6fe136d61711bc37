// Grouping keeps every property column aligned with the group's rows, gaps included (a column
// with a missing value must not shift the values after it onto other tests), so that the
// correlations computed from the columns pair each test's own values.
import { describe, expect, it } from 'vitest';
import { correlationMatrices } from '@fractile/stats';
import type { PropertyRow } from '../properties.ts';
import { groupRows } from './grouping.ts';

const row = (i: number, grade: string, y: number | null, ag: number | null) => ({ test_id: String(i), grade, tested_on: '2025-01-01', yield_mpa: y, ag_pct: ag }) as unknown as PropertyRow;

describe('groupRows', () => {
  it('gives columns as long as the group, NaN where a test has no value, in the order of the rows', () => {
    const rows = [row(0, 'A', 400, 15), row(1, 'B', 500, null), row(2, 'A', 410, null), row(3, 'A', 420, 13), row(4, 'B', 510, 9)];
    const groups = groupRows(rows, ['grade'], ['yield_mpa', 'ag_pct']);
    const a = groups.find((g) => g.key.grade === 'A')!;
    expect(a.rows).toEqual([0, 2, 3]);
    expect(a.columns.yield_mpa).toEqual([400, 410, 420]);
    expect(a.columns.ag_pct).toEqual([15, NaN, 13]);
  });

  it('keeps pairs of a perfectly rank-correlated couple together across gaps (Spearman = −1)', () => {
    const rows = Array.from({ length: 40 }, (_, i) => row(i, 'A', 300 + i, i % 5 === 0 ? null : 30 - i));
    const [g] = groupRows(rows, ['grade'], ['yield_mpa', 'ag_pct']);
    expect(correlationMatrices({ y: g.columns.yield_mpa, a: g.columns.ag_pct }).spearman[0][1]).toBeCloseTo(-1, 12);
  });
});
