/**
 * Forward migrations with kysely's Migrator over the files in ./migrations (one file per step;
 * raw tables are 00xx, results tables 01xx). Files are imported dynamically, which works for .ts
 * under tsx and vitest. Unordered migrations are allowed so that a raw-table step added after a
 * results step has run still applies.
 *
 * The provider is ours rather than kysely's FileMigrationProvider: that one calls `import()` from
 * inside node_modules, where vitest does not transform TypeScript, so .ts migrations would not
 * load in tests. Ours does the same listing and imports from this file.
 */
import { promises as fs } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { pathToFileURL } from 'node:url';
import { Migrator } from 'kysely';
import type { Kysely, Migration, MigrationProvider } from 'kysely';
import type { Database } from './schema.ts';

export const MIGRATION_FOLDER = fileURLToPath(new URL('./migrations', import.meta.url));

export class MigrationError extends Error {
  readonly code = 'migration_failed';
  constructor(
    readonly migration: string,
    cause: unknown,
  ) {
    super(`migration ${migration} failed: ${cause instanceof Error ? cause.message : String(cause)}`, { cause });
  }
}

/** Every `NNNN-name.ts` (or .js) file of the folder, keyed by its name without extension. */
export class FolderMigrationProvider implements MigrationProvider {
  constructor(private readonly folder: string) {}
  async getMigrations(): Promise<Record<string, Migration>> {
    const out: Record<string, Migration> = {};
    const files = (await fs.readdir(this.folder)).filter((f) => /\.(ts|js|mjs)$/.test(f) && !/\.d\.ts$/.test(f) && !/\.test\./.test(f)).sort();
    for (const f of files) {
      const mod = (await import(pathToFileURL(path.join(this.folder, f)).href)) as Partial<Migration> & { default?: Migration };
      const m = mod.default && typeof mod.default.up === 'function' ? mod.default : mod;
      if (typeof m.up === 'function') out[f.replace(/\.[^.]+$/, '')] = m as Migration;
    }
    return out;
  }
}

/** Applies every pending migration; returns the names applied. Throws MigrationError on failure. */
export async function migrateToLatest(db: Kysely<Database>): Promise<string[]> {
  const migrator = new Migrator({
    db,
    provider: new FolderMigrationProvider(MIGRATION_FOLDER),
    allowUnorderedMigrations: true,
  });
  const { error, results } = await migrator.migrateToLatest();
  if (error) {
    const failed = results?.find((r) => r.status === 'Error');
    throw new MigrationError(failed?.migrationName ?? '(unknown)', error);
  }
  return (results ?? []).filter((r) => r.status === 'Success').map((r) => r.migrationName);
}
