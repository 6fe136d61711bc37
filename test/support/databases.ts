/**
 * The databases every store and ingest test runs on: always an embedded PGlite in a fresh temp
 * folder, plus a fresh database on a PostgreSQL server when TEST_DATABASE_URL is set (created as
 * `fractile_t_<random>` on that server, dropped on close).
 */
import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import { openStore } from '@fractile/store';
import type { Store } from '@fractile/store';

export interface TestDatabase {
  name: string;
  /** opens a fresh, migrated, empty database */
  open(): Promise<Store>;
}

/** A server database created fresh; returns its URL and a function that drops it. */
export async function createServerDatabase(serverUrl: string): Promise<{ url: string; drop(): Promise<void> }> {
  const name = `fractile_t_${randomBytes(6).toString('hex')}`;
  const admin = new pg.Client({ connectionString: serverUrl });
  await admin.connect();
  try {
    await admin.query(`create database ${name}`);
  } finally {
    await admin.end();
  }
  const u = new URL(serverUrl);
  u.pathname = '/' + name;
  return {
    url: u.toString(),
    async drop() {
      const c = new pg.Client({ connectionString: serverUrl });
      await c.connect();
      try {
        await c.query(`drop database if exists ${name} with (force)`);
      } finally {
        await c.end();
      }
    },
  };
}

/** A fresh embedded folder; returns its path and a function that removes it. */
export function createEmbeddedFolder(): { path: string; remove(): void } {
  const dir = mkdtempSync(join(tmpdir(), 'fractile-db-'));
  return { path: join(dir, 'db'), remove: () => rmSync(dir, { recursive: true, force: true }) };
}

/** Opens the store at a target, running `cleanup` after the store is closed. */
async function withCleanup(target: string, cleanup: () => Promise<void> | void): Promise<Store> {
  let store: Store;
  try {
    store = await openStore(target);
  } catch (e) {
    await cleanup();
    throw e;
  }
  const close = store.close.bind(store);
  store.close = async () => {
    await close();
    await cleanup();
  };
  return store;
}

export function testDatabases(): TestDatabase[] {
  const list: TestDatabase[] = [
    {
      name: 'pglite',
      async open() {
        const f = createEmbeddedFolder();
        return withCleanup(f.path, f.remove);
      },
    },
  ];
  const url = process.env.TEST_DATABASE_URL;
  if (url) {
    list.push({
      name: 'postgres',
      async open() {
        const d = await createServerDatabase(url);
        return withCleanup(d.url, d.drop);
      },
    });
  }
  return list;
}

/** Fresh database targets (not opened) for tests that hand the target to a child process. */
export interface TestTarget {
  name: string;
  create(): Promise<{ target: string; dispose(): Promise<void> }>;
}

export function testTargets(): TestTarget[] {
  const list: TestTarget[] = [
    {
      name: 'pglite',
      async create() {
        const f = createEmbeddedFolder();
        return { target: f.path, dispose: async () => f.remove() };
      },
    },
  ];
  const url = process.env.TEST_DATABASE_URL;
  if (url) {
    list.push({
      name: 'postgres',
      async create() {
        const d = await createServerDatabase(url);
        return { target: d.url, dispose: d.drop };
      },
    });
  }
  return list;
}
