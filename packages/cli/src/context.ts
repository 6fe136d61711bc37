/**
 * What every command shares: the database target, the output format, and printing of results.
 * `--format json` prints exactly one JSON document on stdout; logs and progress go to stderr.
 */
import type { Command } from 'commander';
import { csvLine } from '@fractile/pipeline/csv-cell';

export interface CommandModule {
  /** position in `--help` */
  order: number;
  register(program: Command): void;
}

export type OutputFormat = 'table' | 'json' | 'csv';

export interface GlobalOptions {
  db?: string;
  format: OutputFormat;
  /** seconds to wait for another process holding an embedded database folder (default 0: fail at once) */
  waitSeconds: number;
  /** the command's name */
  command: string;
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
  const o = cmd.optsWithGlobals() as { db?: string; format?: string; wait?: string };
  const format = (o.format ?? 'table') as OutputFormat;
  if (!['table', 'json', 'csv'].includes(format)) throw new CliError(`--format must be table, json or csv, got "${o.format}"`);
  const waitSeconds = o.wait === undefined ? 0 : Number(o.wait);
  if (!(waitSeconds >= 0 && waitSeconds <= 86400)) throw new CliError(`--wait must be a number of seconds from 0 to 86400, got "${o.wait}"`);
  return { db: o.db, format, waitSeconds, command: cmd.name() };
}

/** The database target: --db, else $DATABASE_URL, else the embedded folder ./.fractile/db. */
export function dbTarget(g: GlobalOptions): string {
  return g.db ?? process.env.DATABASE_URL ?? '.fractile/db';
}

export function log(message: string): void {
  process.stderr.write(message + '\n');
}

/** CSV text of rows with the given columns (all keys of the first row by default); cells formula-safe (pipeline csv-cell.ts). */
export function toCsv(rows: readonly Record<string, unknown>[], columns?: readonly string[]): string {
  const cols = columns ?? (rows[0] ? Object.keys(rows[0]) : []);
  const lines = [csvLine(cols)];
  for (const r of rows) lines.push(csvLine(cols.map((c) => r[c])));
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

/** Exit status when another process holds the embedded database folder (try again later). */
export const EXIT_BUSY = 4;

interface Located {
  file: string;
  line: number;
  column: number;
  code: string;
  message: string;
}

/**
 * The location in the user's input an error names, if it is one of ours that does: a rejection
 * (`RejectionError`, with `.rejection`) or an input error with a file and numeric line and column
 * (a catalog). A database error also carries `file` and `line` — the engine's own source file
 * (`nbtinsert.c`, line "664") — and is never taken for one: it has a `severity`, its line is text.
 */
function userLocation(err: unknown): Located | null {
  if (!err || typeof err !== 'object') return null;
  const e = ('rejection' in err ? (err as { rejection: unknown }).rejection : err) as Partial<Located> & { severity?: unknown };
  if (e.severity !== undefined || typeof e.file !== 'string' || typeof e.line !== 'number' || typeof e.code !== 'string') return null;
  return { file: e.file, line: e.line, column: typeof e.column === 'number' ? e.column : 0, code: e.code, message: String(e.message ?? '') };
}

/**
 * Prints an error to stderr and returns the exit code to use: 2 for bad usage and for bad input
 * (with its file, line and column); 4 when the embedded folder is held by another process; 1 for
 * the rest — errors of the database engine, the store and the system as a plain message, only an
 * unexpected error (a defect) with its stack.
 */
export function reportFailure(err: unknown): number {
  if (err instanceof CliError) {
    log(`fractile: ${err.message}`);
    return err.exitCode;
  }
  const at = userLocation(err);
  if (at) {
    log(`fractile: ${at.file}:${at.line}:${at.column}: ${at.code}: ${at.message}`);
    return 2;
  }
  const e = (err ?? {}) as { name?: string; code?: unknown; message?: string; severity?: unknown; syscall?: unknown; stack?: string };
  if (e.name === 'StoreError') {
    log(`fractile: ${e.message}`);
    return e.code === 'database_busy' ? EXIT_BUSY : 1;
  }
  if (e.severity !== undefined) {
    log(`fractile: the database reported an error: ${e.message}${typeof e.code === 'string' ? ` (SQLSTATE ${e.code})` : ''}`);
    return 1;
  }
  if (e.syscall !== undefined || e.name === 'MigrationError' || e.code === 'migration_failed') {
    log(`fractile: ${e.message}`);
    return 1;
  }
  log(`fractile: ${err instanceof Error ? (err.stack ?? err.message) : err !== null && typeof err === 'object' ? JSON.stringify(err) : String(err)}`);
  return 1;
}
