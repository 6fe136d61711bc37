/**
 * Options several commands share (heavy packages are loaded only when a command runs, so that
 * `--help` stays quick): the grade catalog, grouping and the filters on date range,
 * grade, supplier, orientation and temperature.
 */
import type { Command } from 'commander';
import type { Kysely } from 'kysely';
import type { Database, Store } from '@fractile/store';
import type { Catalog, GroupField, PropertyFilter, PropertyKey } from '@fractile/pipeline';
import { CliError, log, type GlobalOptions } from './context.ts';
import { chooseDb, requireEmbeddedDatabase } from './db-target.ts';

export function addFilterOptions(cmd: Command): Command {
  return cmd
    .option('--grade <labels>', 'only these grades (comma-separated)')
    .option('--supplier <names>', 'only these suppliers (comma-separated)')
    .option('--from <date>', 'only tests on or after this date (YYYY-MM-DD)')
    .option('--to <date>', 'only tests on or before this date (YYYY-MM-DD)')
    .option('--orientation <codes>', 'only these specimen orientations (comma-separated)')
    .option('--temperature-min <C>', 'only tests at or above this temperature [°C]')
    .option('--temperature-max <C>', 'only tests at or below this temperature [°C]');
}

const list = (s: unknown): string[] | undefined => (typeof s === 'string' && s.trim() ? s.split(',').map((x) => x.trim()).filter(Boolean) : undefined);

function isoDate(s: unknown, name: string): string | undefined {
  if (s === undefined) return undefined;
  if (typeof s !== 'string' || !/^\d{4}-\d{2}-\d{2}$/.test(s) || Number.isNaN(Date.parse(s))) throw new CliError(`${name} must be a date YYYY-MM-DD, got "${String(s)}"`);
  return s;
}

function number(s: unknown, name: string): number | undefined {
  if (s === undefined) return undefined;
  const x = Number(s);
  if (!Number.isFinite(x)) throw new CliError(`${name} must be a number, got "${String(s)}"`);
  return x;
}

export function readFilter(o: Record<string, unknown>): PropertyFilter {
  return {
    grade: list(o.grade),
    supplier: list(o.supplier),
    from: isoDate(o.from, '--from'),
    to: isoDate(o.to, '--to'),
    orientation: list(o.orientation),
    temperatureMinC: number(o.temperatureMin, '--temperature-min'),
    temperatureMaxC: number(o.temperatureMax, '--temperature-max'),
  };
}

/** --include-flagged / --include-excluded: bring back what the population rules leave out. */
export function addPopulationOptions(cmd: Command): Command {
  return cmd
    .option('--include-flagged', 'keep values that a reduction flag makes unfit (default: left out and counted per flag)')
    .option('--include-excluded', 'keep tests excluded with `fractile exclude` (default: left out and counted)');
}

export function readPopulation(o: Record<string, unknown>): { includeFlagged: boolean; includeExcluded: boolean } {
  return { includeFlagged: Boolean(o.includeFlagged), includeExcluded: Boolean(o.includeExcluded) };
}

/** --property values checked against the known keys (NUMERIC_PROPERTIES of the pipeline). */
export function readProperties(o: Record<string, unknown>, known: readonly string[], dflt?: PropertyKey[]): PropertyKey[] | undefined {
  const raw = o.property;
  const names = (Array.isArray(raw) ? raw : typeof raw === 'string' ? [raw] : []).flatMap((s: string) => s.split(',')).map((s) => s.trim()).filter(Boolean);
  if (names.length === 0) return dflt;
  for (const n of names) if (!known.includes(n)) throw new CliError(`unknown property "${n}" (known: ${known.join(', ')})`);
  return names as PropertyKey[];
}

export function probability(s: unknown, name: string, dflt: number): number {
  if (s === undefined) return dflt;
  const x = Number(s);
  if (!(x > 0 && x < 1)) throw new CliError(`${name} must be a number between 0 and 1 (exclusive), got "${String(s)}"`);
  return x;
}

/** A grouping option (--by, --drift-by) checked before any database is opened: an unknown field is exit 2. */
export async function groupBy(spec: unknown, name = '--by'): Promise<GroupField[]> {
  const { parseGroupBy, GroupingError } = await import('@fractile/pipeline');
  try {
    return parseGroupBy(typeof spec === 'string' ? spec : undefined);
  } catch (e) {
    if (e instanceof GroupingError) throw new CliError(`${name}: ${e.message}`);
    throw e;
  }
}

/**
 * The filter's grades, suppliers and orientations checked against what is stored: a value that
 * names nothing is a usage error (exit 2) listing the values that exist, so that a typo is told
 * apart from an empty result.
 */
export async function checkFilterValues(db: Kysely<Database>, filter: { grade?: string[]; supplier?: string[]; orientation?: string[]; lab?: string[] }): Promise<void> {
  const { distinctTestValues } = await import('@fractile/store');
  for (const [column, option] of [['grade', '--grade'], ['supplier', '--supplier'], ['orientation', '--orientation'], ['lab', '--lab']] as const) {
    const asked = filter[column];
    if (!asked?.length) continue;
    const known = await distinctTestValues(db, column);
    const missing = asked.filter((v) => !known.includes(v));
    if (missing.length === 0) continue;
    const squash = (v: string) => v.toLowerCase().replace(/[^\p{L}\p{N}]/gu, '');
    const near = missing.map((m) => known.find((k) => squash(k) === squash(m))).filter(Boolean);
    throw new CliError(
      `${option}: no stored test has ${column} ${missing.map((m) => `"${m}"`).join(', ')}${near.length ? ` (did you mean ${near.map((n) => `"${n}"`).join(', ')}?)` : ''}; ` +
        (known.length ? `the ${column} values stored: ${known.join(', ')}` : 'the database holds no tests yet'),
    );
  }
}

/** --catalog FILE, else the project file's catalog, else the catalog the latest reduce run used, else none. */
export async function resolveCatalog(db: Kysely<Database>, file: unknown, g?: GlobalOptions): Promise<Catalog | null> {
  const { currentCatalog, loadCatalog } = await import('@fractile/pipeline');
  const path = catalogPath(file, g);
  if (path) return loadCatalog(path);
  return currentCatalog(db);
}

/** The catalog file a command uses: --catalog, else the project file's, else none. */
export function catalogPath(file: unknown, g?: GlobalOptions): string | null {
  if (typeof file === 'string') return file;
  return g?.project?.catalog ?? null;
}

/**
 * Commands whose writes (cached stage results) need not be kept: on a read-only embedded folder
 * they work on a temporary copy (store embedded-folder.ts).
 */
const READING_COMMANDS = new Set(['tests', 'properties', 'stats', 'curves', 'drift', 'sample', 'report', 'alerts list', 'exclusions', 'crosscheck']);
/** The commands that may create a database; every other refuses one that does not exist (db-target.ts). */
const CREATING_COMMANDS = new Set(['ingest', 'demo']);

/**
 * Opens the database the command names (db-target.ts), runs `fn`, closes it. Only `ingest` and
 * `demo` create a database: for the others a missing embedded folder, or a server database
 * without fractile's tables, is a usage error (exit 2) before anything is written.
 */
export async function withStore<T>(g: GlobalOptions, fn: (store: Store) => Promise<T>): Promise<T> {
  const choice = chooseDb(g, g.project);
  const creates = CREATING_COMMANDS.has(g.command);
  if (!creates) requireEmbeddedDatabase(choice);
  const { isInitialized, migrateToLatest, openStore } = await import('@fractile/store');
  const checkServer = choice.server && !creates;
  const store = await openStore(choice.target, { waitMs: g.waitSeconds * 1000, readOnly: READING_COMMANDS.has(g.command), migrate: !checkServer });
  try {
    if (checkServer) {
      if (!(await isInitialized(store.db))) throw new CliError(`the server database ${choice.target.replace(/\/\/[^@/]*@/, '//…@')} holds no fractile data (${choice.source}): \`fractile ingest MANIFEST.csv --db …\` creates the tables`);
      await migrateToLatest(store.db);
    }
    g.database = { engine: store.engine, target: store.engine === 'postgres' ? store.target.replace(/\/\/[^@/]*@/, '//…@') : store.target };
    if (store.readOnlyCopy) log(`fractile: the database folder ${choice.target} is read-only: reading a temporary copy (results computed now are not kept)`);
    return await fn(store);
  } finally {
    await store.close();
  }
}

/** A whole number ≥ `min` from an option, or the default when the option is absent. */
export function wholeNumber(s: unknown, name: string, dflt: number, min = 1): number {
  if (s === undefined) return dflt;
  const x = Number(s);
  if (!Number.isInteger(x) || x < min) throw new CliError(`${name} must be a whole number ≥ ${min}, got "${String(s)}"`);
  return x;
}

/** A comma-separated list of whole numbers ≥ `min` (e.g. `--add 10,20,50`). */
export function wholeNumbers(s: unknown, name: string, dflt: number[], min = 1): number[] {
  if (s === undefined) return dflt;
  const parts = String(s).split(',').map((x) => x.trim()).filter(Boolean);
  if (parts.length === 0) throw new CliError(`${name} needs at least one number`);
  return parts.map((p) => wholeNumber(p, name, 0, min));
}
