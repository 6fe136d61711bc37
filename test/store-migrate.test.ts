/**
 * Migrations: the table lists every file of the migrations folder; a new database gets every step
 * in name order; an up-to-date one is checked with a single query and gets nothing.
 */
import { readdirSync } from 'node:fs';
import { sql, type KyselyPlugin } from 'kysely';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { MIGRATION_FOLDER, migrateToLatest, openStore, type Store } from '@fractile/store';
import { testDatabases } from './support/databases.ts';

/** Counts the statements a Kysely instance sends. */
function counter(): KyselyPlugin & { count: number } {
  return { count: 0, transformQuery(a) { this.count++; return a.node; }, async transformResult(a) { return a.result; } };
}

const files = readdirSync(MIGRATION_FOLDER).filter((f) => /^\d{4}-.*\.(ts|js|mjs)$/.test(f) && !/\.test\./.test(f)).map((f) => f.replace(/\.[^.]+$/, '')).sort();

describe('migrations', () => {
  it('a new database gets every file of the folder, in name order, and nothing the second time', async () => {
    const store = await openStore('memory://', { migrate: false });
    try {
      expect(files.length).toBeGreaterThan(0);
      expect(await migrateToLatest(store.db)).toEqual(files);
      expect(await migrateToLatest(store.db)).toEqual([]);
    } finally {
      await store.close();
    }
  });
});

describe.each(testDatabases())('migration check on $name', (tdb) => {
  let store: Store;
  beforeEach(async () => { store = await tdb.open(); });
  afterEach(async () => { await store.close(); });

  it('costs one query when nothing is pending', async () => {
    const c = counter();
    expect(await migrateToLatest(store.db.withPlugin(c))).toEqual([]);
    expect(c.count).toBe(1);
    const names = await sql<{ name: string }>`select name from kysely_migration order by name`.execute(store.db);
    expect(names.rows.map((r) => r.name)).toEqual(files);
  });
});
