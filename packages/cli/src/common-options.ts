/**
 * Options several commands share (heavy packages are loaded only when a command runs, so that
 * `--help` stays quick): the grade catalog, grouping and the filters on date range,
 * grade, supplier, orientation and temperature.
 */
import type { Command } from 'commander';
import type { Kysely } from 'kysely';
import type { Database, Store } from '@fractile/store';
import type { Catalog, PropertyFilter, PropertyKey } from '@fractile/pipeline';
import { CliError, dbTarget, log, type GlobalOptions } from './context.ts';

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

/** --catalog FILE, else the catalog the latest reduce run used, else none. */
export async function resolveCatalog(db: Kysely<Database>, file: unknown): Promise<Catalog | null> {
  const { currentCatalog, loadCatalog } = await import('@fractile/pipeline');
  if (typeof file === 'string') return loadCatalog(file);
  return currentCatalog(db);
}

/**
 * Commands whose writes (cached stage results) need not be kept: on a read-only embedded folder
 * they work on a temporary copy (store embedded-folder.ts).
 */
const READING_COMMANDS = new Set(['tests', 'properties', 'stats', 'curves', 'drift', 'sample', 'report']);

export async function withStore<T>(g: GlobalOptions, fn: (store: Store) => Promise<T>): Promise<T> {
  const { openStore } = await import('@fractile/store');
  const store = await openStore(dbTarget(g), { waitMs: g.waitSeconds * 1000, readOnly: READING_COMMANDS.has(g.command) });
  if (store.readOnlyCopy) log(`fractile: the database folder ${dbTarget(g)} is read-only: reading a temporary copy (results computed now are not kept)`);
  try {
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
