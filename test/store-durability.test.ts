/**
 * Durability: both databases run with fsync on (PostgreSQL documentation, "WAL Configuration":
 * with fsync off a crash of the machine can lose committed transactions), and on the embedded
 * engine a commit reaches the operating system's fsync — its file layer is given one
 * (packages/store/src/pglite-durability.ts), and the WAL is flushed with fsync() rather than the
 * inert fdatasync(). On a server fsync is its operator's setting; the check stands for a server run
 * the way PostgreSQL ships it (and as `.ci/run` starts one), so a test server with fsync off fails
 * here rather than quietly measuring something else.
 */
import fs from 'node:fs';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { sql } from 'kysely';
import { testDatabases } from './support/databases.ts';

describe.each(testDatabases())('durability on $name', (tdb) => {
  afterEach(() => vi.restoreAllMocks());

  it('runs with fsync on', async () => {
    const store = await tdb.open();
    try {
      const r = await sql<{ fsync: string }>`show fsync`.execute(store.db);
      expect(r.rows[0].fsync).toBe('on');
      if (store.engine === 'pglite') {
        const m = await sql<{ wal_sync_method: string }>`show wal_sync_method`.execute(store.db);
        expect(m.rows[0].wal_sync_method).toBe('fsync');
      }
    } finally {
      await store.close();
    }
  });

  // the embedded engine's own file layer: what the server does with fsync is the server's
  if (tdb.name === 'pglite') it('flushes a commit to the disk through fs.fsyncSync', async () => {
    const store = await tdb.open();
    try {
      const spy = vi.spyOn(fs, 'fsyncSync');
      await store.db.insertInto('grades').values({ code: 'durable' }).execute();
      expect(spy).toHaveBeenCalled();
      const before = spy.mock.calls.length;
      // a read-only statement writes no WAL and flushes nothing
      await store.db.selectFrom('grades').selectAll().execute();
      expect(spy.mock.calls.length).toBe(before);
    } finally {
      await store.close();
    }
  });
});
