/**
 * What every command shares: the database target, the output format, and printing of results.
 * `--format json` prints exactly one JSON document on stdout; logs and progress go to stderr.
 */
import type { Command } from 'commander';
import { csvLine } from '@fractile/pipeline/csv-cell';
import { CliError } from './cli-error.ts';
import { chooseDb } from './db-target.ts';
import { toTable } from './output.ts';
import { loadProject, type Project } from './project.ts';

export { CliError };
export { toTable };

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
  /** print the stack of an unexpected error (--debug) */
  debug: boolean;
  /** the project file of the working folder, if there is one (project.ts) */
  project: Project | null;
  /** CSV with the comment block (default; `--no-comments`: plain) */
  comments: boolean;
  /** file for the provenance of a plain CSV (`--sidecar`) */
  sidecar?: string;
  /** ISO 8601 time the command started (provenance) */
  startedAt: string;
  /** the database used, once opened (provenance; a server URL without its password) */
  database?: { engine: string; target: string };
}

/** Reads the global options from any (sub)command. */
/** The global options; `project: false` leaves ./fractile.json unread (for `init`, which writes one). */
export function globals(cmd: Command, opts: { project?: boolean } = {}): GlobalOptions {
  const o = cmd.optsWithGlobals() as { db?: string; format?: string; wait?: string; debug?: boolean; comments?: boolean; sidecar?: string };
  const format = (o.format ?? 'table') as OutputFormat;
  if (!['table', 'json', 'csv'].includes(format)) throw new CliError(`--format must be table, json or csv, got "${o.format}"`);
  const waitSeconds = o.wait === undefined ? 0 : Number(o.wait);
  if (!(waitSeconds >= 0 && waitSeconds <= 86400)) throw new CliError(`--wait must be a number of seconds from 0 to 86400, got "${o.wait}"`);
  if (o.sidecar !== undefined && format !== 'csv') throw new CliError('--sidecar goes with --format csv --no-comments');
  return { db: o.db, format, waitSeconds, command: commandName(cmd), debug: Boolean(o.debug), project: opts.project === false ? null : loadProject(), comments: o.comments !== false, sidecar: o.sidecar, startedAt: new Date().toISOString() };
}

/** "stats", or "alerts ack" for a subcommand. */
function commandName(cmd: Command): string {
  const names: string[] = [];
  for (let c: Command | null = cmd; c?.parent; c = c.parent) names.unshift(c.name());
  return names.join(' ') || cmd.name();
}

export function log(message: string): void {
  process.stderr.write(message + '\n');
}

/** The database target as chosen by db-target.ts (--db, $DATABASE_URL, the project file, the default). */
export function dbTarget(g: GlobalOptions): string {
  return chooseDb(g, g.project).target;
}

/** CSV text of rows with the given columns (all keys of the first row by default); cells formula-safe (pipeline csv-cell.ts). */
export function toCsv(rows: readonly Record<string, unknown>[], columns?: readonly string[]): string {
  const cols = columns ?? (rows[0] ? Object.keys(rows[0]) : []);
  const lines = [csvLine(cols)];
  for (const r of rows) lines.push(csvLine(cols.map((c) => r[c])));
  return `${lines.join('\n')}\n`;
}

/**
 * Prints `data` in the chosen format without the envelope: used by `queue`, `distributions` and
 * `plan`, which have not moved to output.ts `print` yet.
 */
export function emit(format: OutputFormat, data: unknown, rows: readonly Record<string, unknown>[], columns?: readonly string[]): void {
  if (format === 'json') process.stdout.write(`${JSON.stringify(data, null, 2)}\n`);
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

/** Network and server faults a user fixes by changing --db or starting the server: exit 2. */
const CONNECTION_CODES: Record<string, string> = {
  ECONNREFUSED: 'connection refused: is the server running, on that host and port?',
  ENOTFOUND: 'no such host',
  EAI_AGAIN: 'the host name could not be resolved',
  ETIMEDOUT: 'the connection timed out',
  EHOSTUNREACH: 'the host cannot be reached',
  ECONNRESET: 'the server closed the connection',
  '3D000': 'the server has no database of that name: create it (createdb NAME), then `fractile ingest` into it',
  '28P01': 'the server refused the password',
  '28000': 'the server refused the user',
};

/** node-postgres's messages for a connection that ended under a client (a server restart, a cut network). */
const LOST_CONNECTION = /^(Connection terminated|Client has encountered a connection error)/;

/** The first connection fault in an error and its causes (pg wraps them; kysely's migrator too). */
function connectionFault(err: unknown): { code: string; message: string } | null {
  for (let e = err as { code?: unknown; cause?: unknown; errors?: unknown[]; message?: string } | undefined, depth = 0; e && depth < 5; depth++) {
    if (typeof e.code === 'string' && CONNECTION_CODES[e.code]) return { code: e.code, message: e.message ?? '' };
    const inner = Array.isArray(e.errors) && e.errors.length ? e.errors[0] : e.cause;
    e = inner as typeof e;
  }
  return null;
}

/**
 * Prints an error to stderr and returns the exit code to use: 2 for bad usage and for bad input
 * (with its file, line and column) and for a server that cannot be reached or has no such
 * database; 4 when the embedded folder is held by another process; 1 for the rest — errors of
 * the database engine, the store and the system as a plain message. No stack is printed unless
 * `debug` (`--debug`): an unexpected error (a defect) says how to get it.
 */
export function reportFailure(err: unknown, debug = false): number {
  if (err instanceof CliError) {
    log(`fractile: ${err.message}`);
    return err.exitCode;
  }
  const at = userLocation(err);
  if (at) {
    log(`fractile: ${at.file}:${at.line}:${at.column}: ${at.code}: ${at.message}`);
    return 2;
  }
  const conn = connectionFault(err);
  if (conn) {
    log(`fractile: cannot use the database server: ${CONNECTION_CODES[conn.code]} (${conn.code}: ${conn.message}); check --db or $DATABASE_URL`);
    if (debug && err instanceof Error) log(err.stack ?? '');
    return 2;
  }
  const e = (err ?? {}) as { name?: string; code?: unknown; message?: string; severity?: unknown; syscall?: unknown; stack?: string };
  const plain = (text: string, code: number) => {
    log(`fractile: ${text}`);
    if (debug && err instanceof Error && err.stack) log(err.stack);
    return code;
  };
  if (typeof e.message === 'string' && LOST_CONNECTION.test(e.message))
    return plain(`the connection to the database server was lost (${e.message}); the server rolls back what was not committed: run the command again`, 1);
  if (e.name === 'StoreError') return plain(String(e.message), e.code === 'database_busy' ? EXIT_BUSY : 1);
  if (e.severity !== undefined) return plain(`the database reported an error: ${e.message}${typeof e.code === 'string' ? ` (SQLSTATE ${e.code})` : ''}`, 1);
  if (e.syscall !== undefined || e.name === 'MigrationError' || e.code === 'migration_failed') return plain(String(e.message), 1);
  if (debug) {
    log(`fractile: ${err instanceof Error ? (err.stack ?? err.message) : err !== null && typeof err === 'object' ? JSON.stringify(err) : String(err)}`);
    return 1;
  }
  const text = err instanceof Error ? err.message : err !== null && typeof err === 'object' ? JSON.stringify(err) : String(err);
  log(`fractile: internal error: ${text}\n  (a defect of fractile; run the command again with --debug to print where it happened)`);
  return 1;
}
