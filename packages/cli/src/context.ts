/**
 * What every command shares: the database target, the output format, and printing of results.
 * `--format json` prints exactly one JSON document on stdout; logs and progress go to stderr.
 */
import type { Command } from 'commander';

export interface CommandModule {
  /** position in `--help` */
  order: number;
  register(program: Command): void;
}

export type OutputFormat = 'table' | 'json' | 'csv';

export interface GlobalOptions {
  db?: string;
  format: OutputFormat;
}

export class CliError extends Error {
  constructor(
    message: string,
    readonly exitCode = 2,
  ) {
    super(message);
  }
}

/** Reads the global options from any (sub)command. */
export function globals(cmd: Command): GlobalOptions {
  const o = cmd.optsWithGlobals() as { db?: string; format?: string };
  const format = (o.format ?? 'table') as OutputFormat;
  if (!['table', 'json', 'csv'].includes(format)) throw new CliError(`--format must be table, json or csv, got "${o.format}"`);
  return { db: o.db, format };
}

/** The database target: --db, else $DATABASE_URL, else the embedded folder ./.fractile/db. */
export function dbTarget(g: GlobalOptions): string {
  return g.db ?? process.env.DATABASE_URL ?? '.fractile/db';
}

export function log(message: string): void {
  process.stderr.write(message + '\n');
}

function csvCell(v: unknown): string {
  if (v === null || v === undefined) return '';
  const s = typeof v === 'object' ? JSON.stringify(v) : String(v);
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** CSV text of rows with the given columns (all keys of the first row by default). */
export function toCsv(rows: readonly Record<string, unknown>[], columns?: readonly string[]): string {
  const cols = columns ?? (rows[0] ? Object.keys(rows[0]) : []);
  const lines = [cols.join(',')];
  for (const r of rows) lines.push(cols.map((c) => csvCell(r[c])).join(','));
  return lines.join('\n') + '\n';
}

function tableCell(v: unknown): string {
  if (v === null || v === undefined) return '—';
  if (typeof v === 'number') return Number.isInteger(v) ? String(v) : v.toPrecision(5).replace(/\.?0+$/, '');
  if (Array.isArray(v)) return v.join(' ');
  if (typeof v === 'object') return JSON.stringify(v);
  return String(v);
}

/** A plain aligned text table. */
export function toTable(rows: readonly Record<string, unknown>[], columns?: readonly string[]): string {
  const cols = columns ?? (rows[0] ? Object.keys(rows[0]) : []);
  if (rows.length === 0) return '(none)\n';
  const cells = rows.map((r) => cols.map((c) => tableCell(r[c])));
  const width = cols.map((c, i) => Math.max(c.length, ...cells.map((row) => row[i].length)));
  const fmt = (row: string[]) => row.map((s, i) => s.padEnd(width[i])).join('  ').trimEnd();
  return [fmt([...cols]), fmt(width.map((w) => '-'.repeat(w))), ...cells.map(fmt)].join('\n') + '\n';
}

/**
 * Prints `data` in the chosen format. `rows`/`columns` give the flat view used by table and csv;
 * json prints `data` itself.
 */
export function emit(format: OutputFormat, data: unknown, rows: readonly Record<string, unknown>[], columns?: readonly string[]): void {
  if (format === 'json') process.stdout.write(JSON.stringify(data, null, 2) + '\n');
  else if (format === 'csv') process.stdout.write(toCsv(rows, columns));
  else process.stdout.write(toTable(rows, columns));
}

/** Prints an error to stderr and returns the exit code to use. */
export function reportFailure(err: unknown): number {
  if (err instanceof CliError) {
    log(`fractile: ${err.message}`);
    return err.exitCode;
  }
  const e = err as { code?: string; message?: string; file?: string; line?: number; column?: number };
  if (e && typeof e === 'object' && e.code && e.file) {
    log(`fractile: ${e.file}:${e.line ?? 0}:${e.column ?? 0}: ${e.code}: ${e.message}`);
    return 2;
  }
  log(`fractile: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`);
  return 1;
}
