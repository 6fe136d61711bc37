/**
 * Small HTML table builder: every cell is escaped text unless marked as trusted markup built
 * by this package; numeric cells are right-aligned. Long tables are cut after `maxRows` rows
 * with a note giving the number left out.
 */
import { escapeHtml } from './html-escape.ts';

export interface Cell {
  text?: string;
  /** Markup produced by this package (already escaped); never data. */
  html?: string;
  numeric?: boolean;
  className?: string;
}

export type CellInput = string | Cell;

export interface Column {
  header: string;
  /** Second header line, e.g. a unit or the coverage of a method. */
  note?: string;
  numeric?: boolean;
}

function cellHtml(cell: CellInput, column: Column | undefined, tag: 'td' | 'th'): string {
  const c: Cell = typeof cell === 'string' ? { text: cell } : cell;
  const numeric = c.numeric ?? column?.numeric ?? false;
  const classes = [numeric ? 'num' : '', c.className ?? ''].filter(Boolean).join(' ');
  const body = c.html ?? escapeHtml(c.text ?? '');
  return `<${tag}${classes ? ` class="${classes}"` : ''}>${body}</${tag}>`;
}

export interface TableOptions {
  caption?: string;
  className?: string;
  maxRows?: number;
  /** Said where rows are left out, after the count. */
  truncationNote?: string;
  /** Shown instead of an empty table. */
  emptyText?: string;
}

export const EXPORT_NOTE = 'the full list is in the CSV/JSON exports';

export function htmlTable(columns: readonly Column[], rows: readonly (readonly CellInput[])[], options: TableOptions = {}): string {
  if (rows.length === 0) return `<p class="empty">${escapeHtml(options.emptyText ?? 'None.')}</p>`;
  const max = options.maxRows ?? Infinity;
  const shown = rows.slice(0, max);
  const head = columns
    .map((c) => `<th scope="col"${c.numeric ? ' class="num"' : ''}>${escapeHtml(c.header)}${c.note ? `<span class="th-note">${escapeHtml(c.note)}</span>` : ''}</th>`)
    .join('');
  const body = shown.map((row) => `<tr>${row.map((cell, i) => cellHtml(cell, columns[i], 'td')).join('')}</tr>`).join('\n');
  const caption = options.caption ? `<caption>${escapeHtml(options.caption)}</caption>` : '';
  const hidden = rows.length - shown.length;
  const note =
    hidden > 0
      ? `<p class="truncated">Showing ${shown.length} of ${rows.length} rows; ${hidden} more not shown — ${escapeHtml(options.truncationNote ?? EXPORT_NOTE)}.</p>`
      : '';
  return `<div class="table-wrap"><table class="${escapeHtml(options.className ?? 'data')}">${caption}<thead><tr>${head}</tr></thead><tbody>\n${body}\n</tbody></table></div>${note}`;
}
