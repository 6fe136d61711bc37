/**
 * Forward migrations with kysely's Migrator over the table of ./migrations/index.ts (one file per
 * step, listed in that table; raw tables are 00xx, results tables 01xx). Unordered
 * migrations are allowed so that a raw-table step added after a results step has run still
 * applies.
 *
 * Opening an up-to-date database costs one query: the names kysely has recorded are compared
 * with the table, and the Migrator (which creates its tables, takes its lock and reads the same
 * list again, several statements) runs only when a name is missing or unknown. A static table
 * rather than a folder scan: the compiled CLI imports no file at run time and needs no loader
 * for TypeScript; migrate.test.ts checks that the table lists every file of the folder.
 */
import { fileURLToPath } from 'node:url';
import { Migrator, sql } from 'kysely';
import type { Kysely, Migration, MigrationProvider } from 'kysely';
import { MIGRATIONS } from './migrations/index.ts';
import type { Database } from './schema.ts';

/** The folder of the migration files (the table must list each of them). */
export const MIGRATION_FOLDER = fileURLToPath(new URL('./migrations', import.meta.url));

/** kysely's default bookkeeping table */
const MIGRATION_TABLE = 'kysely_migration';

export class MigrationError extends Error {
  readonly code = 'migration_failed';
  constructor(
    readonly migration: string,
    cause: unknown,
  ) {
    super(`migration ${migration} failed: ${cause instanceof Error ? cause.message : String(cause)}`, { cause });
  }
}

/** The migrations of the table, keyed by name. */
class TableMigrationProvider implements MigrationProvider {
  async getMigrations(): Promise<Record<string, Migration>> {
    return { ...MIGRATIONS };
  }
}

/** True when the database has recorded exactly the migrations of the table (one query). */
async function upToDate(db: Kysely<Database>): Promise<boolean> {
  let applied: string[];
  try {
    applied = (await sql<{ name: string }>`select name from ${sql.table(MIGRATION_TABLE)}`.execute(db)).rows.map((r) => r.name);
  } catch {
    return false; // no bookkeeping table yet: a new database
  }
  const known = Object.keys(MIGRATIONS);
  const done = new Set(applied);
  return applied.length === known.length && known.every((n) => done.has(n));
}

/** True when fractile's schema has been created in this database (its migration table exists). */
export async function isInitialized(db: Kysely<Database>): Promise<boolean> {
  const r = await sql<{ t: string | null }>`select to_regclass(${MIGRATION_TABLE})::text as t`.execute(db);
  return r.rows[0]?.t != null;
}

/** Applies every pending migration; returns the names applied. Throws MigrationError on failure. */
export async function migrateToLatest(db: Kysely<Database>): Promise<string[]> {
  if (await upToDate(db)) return [];
  const migrator = new Migrator({ db, provider: new TableMigrationProvider(), allowUnorderedMigrations: true, migrationTableName: MIGRATION_TABLE });
  const { error, results } = await migrator.migrateToLatest();
  if (error) {
    const failed = results?.find((r) => r.status === 'Error');
    throw new MigrationError(failed?.migrationName ?? '(unknown)', error);
  }
  return (results ?? []).filter((r) => r.status === 'Success').map((r) => r.migrationName);
}
