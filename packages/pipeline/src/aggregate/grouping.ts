/**
 * Grouping keys for population statistics: any metadata field of a test, plus the test year and
 * quarter derived from its date. Groups are formed with arquero (groupby + array_agg), which keeps
 * each group's rows in their original (time) order, so property arrays stay aligned row by row.
 */
import * as aq from 'arquero';
import type { PropertyRow } from '../properties.ts';

export const GROUP_FIELDS = ['grade', 'supplier', 'heat', 'lab', 'year', 'quarter', 'orientation', 'temperature_c', 'shape', 'yield_definition'] as const;
export type GroupField = (typeof GROUP_FIELDS)[number];

export class GroupingError extends Error {
  readonly code = 'bad_grouping';
}

export function parseGroupBy(spec: string | string[] | undefined): GroupField[] {
  const parts = (Array.isArray(spec) ? spec : (spec ?? 'grade').split(',')).map((s) => s.trim()).filter(Boolean);
  for (const p of parts) {
    if (!(GROUP_FIELDS as readonly string[]).includes(p)) throw new GroupingError(`unknown grouping field "${p}" (known: ${GROUP_FIELDS.join(', ')})`);
  }
  return parts as GroupField[];
}

function fieldValue(r: PropertyRow, f: GroupField): string {
  switch (f) {
    case 'year':
      return r.tested_on.slice(0, 4);
    case 'quarter':
      return `${r.tested_on.slice(0, 4)}-Q${Math.floor((Number(r.tested_on.slice(5, 7)) - 1) / 3) + 1}`;
    case 'temperature_c':
      return r.temperature_c === null ? '' : String(r.temperature_c);
    default: {
      const v = r[f];
      return v === null || v === undefined ? '' : String(v);
    }
  }
}

export interface Group<K extends string> {
  key: Record<string, string>;
  /** row indices into the input, in input order */
  rows: number[];
  columns: Record<K, number[]>;
}

/**
 * Splits rows into groups. Returns, per group, its key and for each requested column the aligned
 * values (NaN where a row has no value), in input order. The columns are read from the group's
 * row indices, not aggregated by arquero: its array_agg skips missing values, which would shorten
 * a column with gaps and pair its values with the wrong tests.
 */
export function groupRows<K extends keyof PropertyRow & string>(rows: PropertyRow[], by: GroupField[], columns: readonly K[]): Group<K>[] {
  const data: Record<string, unknown[]> = { __i: rows.map((_, i) => i) };
  for (const f of by) data[f] = rows.map((r) => fieldValue(r, f));
  let t = aq.table(data);
  const roll: Record<string, unknown> = { __i: aq.op.array_agg('__i') };
  t = by.length ? t.groupby(...by).rollup(roll as never) : t.rollup(roll as never);
  const out: Group<K>[] = [];
  for (const o of t.objects() as Record<string, unknown>[]) {
    const key: Record<string, string> = {};
    for (const f of by) key[f] = String(o[f]);
    const idx = o.__i as number[];
    const cols = {} as Record<K, number[]>;
    for (const c of columns) cols[c] = idx.map((i) => (typeof rows[i][c] === 'number' ? (rows[i][c] as number) : NaN));
    out.push({ key, rows: idx, columns: cols });
  }
  out.sort((a, b) => JSON.stringify(a.key).localeCompare(JSON.stringify(b.key)));
  return out;
}
