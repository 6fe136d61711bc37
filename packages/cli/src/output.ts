/**
 * The one module every command prints a result through (README "Output formats"; the shapes are
 * pipeline exports/export-format.ts, the same as in the exported files):
 *
 *   - `--format json`: the envelope `{ "kind", "caution", "provenance", "data" }` on stdout and
 *     nothing else there; `data` is the command's contract shape, at full precision;
 *   - `--format csv`: the documented comment block, then the header and rows (group keys as
 *     columns of their own, numbers to 6 significant digits); `--no-comments` prints the plain
 *     table and writes the block's content to `--sidecar FILE` (without one, the caution goes to
 *     stderr);
 *   - `--format table`: aligned columns, numbers to 4 significant digits, groups labelled
 *     "grade G355 · supplier Northmill", CoV in percent with its header saying so; the caution
 *     below the table of a result.
 *
 * CoV is a fraction in JSON and CSV (the comment block says so) and percent in tables.
 */
import { writeFileSync } from 'node:fs';
import { DESIGN_VALUE_CAUTION } from '@fractile/report/caution';
import { csvCommentBlock, csvSidecar, csvTable, jsonEnvelope, significant, type Row } from '@fractile/pipeline/export-format';
import { groupLabel } from '@fractile/report/group-label';
import type { GlobalOptions } from './context.ts';
import { CODE_VERSION } from './version.ts';

export type { Row };

export interface Output {
  /** what the document is: `stats`, `curves`, `drift`, `properties`, `ingest`, … */
  kind: string;
  /** the JSON payload (the command's contract shape) */
  data: unknown;
  /** the flat view for table and CSV */
  rows: readonly Row[];
  /** CSV columns (default: the keys of the first row) */
  columns?: readonly string[];
  /** table columns (default: `columns`) */
  tableColumns?: readonly string[];
  /** table headers by column where the column name is not what a reader should see */
  headers?: Readonly<Record<string, string>>;
  /** columns holding a fraction that tables show in percent (CoV) */
  percentColumns?: readonly string[];
  /** what the table is, one line (the CSV's first comment line) */
  title: string;
  /** what a column means where its name does not say it all (CSV comment block) */
  notes?: Readonly<Record<string, string>>;
  /** what produced it, beyond the command, code version, time and database */
  provenance?: Record<string, unknown>;
  /** a text of its own instead of the aligned table (curves, sample summaries) */
  tableText?: string;
  /** a statistical result: tables end with the caution (default true) */
  result?: boolean;
}

/** The provenance every output carries. */
export function baseProvenance(g: GlobalOptions, extra: Record<string, unknown> = {}): Record<string, unknown> {
  return { command: `fractile ${g.command}`, code_version: CODE_VERSION, generated_at: g.startedAt, ...(g.database ? { database: g.database } : {}), ...extra };
}

function tableCell(v: unknown, percent: boolean): string {
  if (v === null || v === undefined || v === '') return '—';
  if (typeof v === 'number') return percent ? significant(v * 100, 3) : significant(v, 4);
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  if (Array.isArray(v)) return v.join(' ');
  if (typeof v === 'object') return Object.entries(v as Record<string, unknown>).map(([k, x]) => `${k} ${String(x)}`).join(' · ');
  return String(v);
}

/** A plain aligned text table. */
export function toTable(rows: readonly Row[], columns?: readonly string[], headers: Readonly<Record<string, string>> = {}, percent: readonly string[] = []): string {
  const cols = columns ?? (rows[0] ? Object.keys(rows[0]) : []);
  if (rows.length === 0) return '(none)\n';
  const names = cols.map((c) => headers[c] ?? (percent.includes(c) ? `${c} [%]` : c));
  const cells = rows.map((r) => cols.map((c) => tableCell(r[c], percent.includes(c))));
  const width = names.map((c, i) => Math.max(c.length, ...cells.map((row) => row[i].length)));
  const fmt = (row: string[]) => row.map((s, i) => s.padEnd(width[i])).join('  ').trimEnd();
  return [fmt(names), fmt(width.map((w) => '-'.repeat(w))), ...cells.map(fmt)].join('\n') + '\n';
}

/** Prints `out` in the format of `g`. */
export function print(g: GlobalOptions, out: Output): void {
  const provenance = baseProvenance(g, out.provenance);
  if (g.format === 'json') {
    process.stdout.write(jsonEnvelope(out.kind, provenance, out.data));
    return;
  }
  if (g.format === 'csv') {
    const body = csvTable(out.rows, out.columns);
    if (g.comments) {
      process.stdout.write(csvCommentBlock(out.title, provenance, out.notes) + body);
      return;
    }
    process.stdout.write(body);
    if (g.sidecar) writeFileSync(g.sidecar, csvSidecar(out.kind, out.title, provenance, out.notes));
    else if (out.result !== false) process.stderr.write(`fractile: ${DESIGN_VALUE_CAUTION} (plain CSV: --sidecar FILE writes the provenance)\n`);
    return;
  }
  process.stdout.write(out.tableText ?? toTable(out.rows, out.tableColumns ?? out.columns, out.headers, out.percentColumns));
  if (out.result !== false) process.stdout.write(`\n${DESIGN_VALUE_CAUTION}\n`);
}

/**
 * Rows of a grouped result: the group as one label in tables ("grade G355 · supplier Northmill",
 * report group-label.ts — the one label style) and its fields as columns of their own in CSV.
 */
export function grouped(items: readonly { group: Readonly<Record<string, string>>; row: Row }[]): { rows: Row[]; columns: string[]; tableColumns: string[] } {
  const keys = [...new Set(items.flatMap((i) => Object.keys(i.group)))];
  const rest = [...new Set(items.flatMap((i) => Object.keys(i.row)))].filter((k) => !keys.includes(k));
  return { rows: items.map((i) => ({ group: groupLabel(i.group), ...i.group, ...i.row })), columns: [...keys, ...rest], tableColumns: ['group', ...rest] };
}
