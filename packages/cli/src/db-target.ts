/**
 * Which database a command uses, and whether it may be created: `--db`, else `$DATABASE_URL`,
 * else the project file's `database` (project.ts), else the embedded folder `./.fractile/db`.
 * Decided before anything is opened:
 *   - a target that looks like a server address but is not a `postgres://` URL
 *     (`localhost:5432/fractile`, `user@host/db`, `postgres:/x`, `mysql://…`) is a usage error,
 *     never a folder name;
 *   - only `ingest` and `demo` create an embedded database; every other command refuses a folder
 *     that does not hold one (exit 2), saying where it looked and how to make one — and where a
 *     demo database sits, if there is one below the working folder.
 */
import { existsSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { CliError } from './cli-error.ts';
import type { GlobalOptions } from './context.ts';
import { PROJECT_FILE, type Project } from './project.ts';

export type DbSource = '--db' | '$DATABASE_URL' | typeof PROJECT_FILE | 'default';

export interface DbChoice {
  target: string;
  source: DbSource;
  server: boolean;
}

export const DEFAULT_DB = '.fractile/db';

const SERVER_URL = /^postgres(ql)?:\/\/[^/]/i;
const MEMORY = /^memory:\/\//;

/** Why `target` is neither a postgres:// URL nor a folder path, or null when it is fine. */
export function targetProblem(target: string): string | null {
  if (!target.trim()) return 'is empty';
  if (SERVER_URL.test(target) || MEMORY.test(target)) return null;
  if (/^postgres(ql)?:/i.test(target)) return 'is not a server URL: write postgres://user@host:port/database';
  const scheme = /^([a-z][a-z0-9+.-]*):\/\//i.exec(target);
  if (scheme) return `names a "${scheme[1]}" address: fractile speaks to PostgreSQL (postgres://user@host:port/database) or to an embedded folder`;
  if (/^[^/\\]*@/.test(target)) return 'looks like a server address (user@host): write it as postgres://user@host:port/database';
  if (/^[A-Za-z0-9.-]+:\d+(\/|$)/.test(target)) return 'looks like a server address (host:port): write it as postgres://user@host:port/database';
  return null;
}

export function chooseDb(g: GlobalOptions, project: Project | null): DbChoice {
  const env = process.env.DATABASE_URL;
  const [target, source]: [string, DbSource] =
    g.db !== undefined ? [g.db, '--db'] : env ? [env, '$DATABASE_URL'] : project?.database ? [project.database, PROJECT_FILE] : [DEFAULT_DB, 'default'];
  const problem = targetProblem(target);
  if (problem) throw new CliError(`the database ${source === 'default' ? '' : `given by ${source} `}"${target}" ${problem}`);
  return { target, source, server: SERVER_URL.test(target) };
}

const said = (c: DbChoice) => (c.source === 'default' ? 'the default: no --db, $DATABASE_URL or fractile.json here' : `from ${c.source}`);

/** Demo or project databases below the working folder, for the hint. */
function databasesNearby(): string[] {
  const found: string[] = [];
  for (const dir of ['fractile-out', '.']) {
    const db = resolve(dir, 'db');
    if (existsSync(join(db, 'PG_VERSION'))) found.push(relative(process.cwd(), db) || db);
  }
  return found;
}

/**
 * Refuses an embedded folder that holds no database (exit 2). A server's database is checked
 * once connected (common-options.ts `withStore`).
 */
export function requireEmbeddedDatabase(c: DbChoice): void {
  if (c.server || MEMORY.test(c.target)) return;
  if (existsSync(join(c.target, 'PG_VERSION'))) return;
  const where = existsSync(c.target) ? `${c.target} holds no database` : `there is no database at ${c.target}`;
  const nearby = databasesNearby().filter((d) => resolve(d) !== resolve(c.target));
  const hint = nearby.length ? `\n  a database exists at ${nearby.join(', ')}: pass --db ${nearby[0]}, or run the commands in its project folder (its fractile.json names it)` : '';
  throw new CliError(
    `${where} (${said(c)}).\n  Create one with \`fractile ingest MANIFEST.csv\` (README "Your own data"), or try \`fractile demo\`.${hint}`,
  );
}
