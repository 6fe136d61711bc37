/**
 * Shared sections of the store (exclusive.ts): work held `shared` under a name runs side by side,
 * and `ifAlone` work runs only when none of it is held — in one process and, on a server, across
 * processes (PostgreSQL documentation, "Advisory Locks": a shared advisory lock conflicts only
 * with an exclusive one on the same key). Ingests rely on it: they write side by side, and only
 * an ingest that finds none running marks runs of killed processes as abandoned.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openStore, type Store } from '@fractile/store';
import { createServerDatabase, testDatabases } from './support/databases.ts';

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** a promise and the function that resolves it */
function gate(): { open(): void; opened: Promise<void> } {
  let open = () => {};
  const opened = new Promise<void>((r) => (open = r));
  return { open, opened };
}

for (const d of testDatabases()) {
  describe(`sections in one process (${d.name})`, () => {
    let store: Store;
    beforeAll(async () => {
      store = await d.open();
    });
    afterAll(async () => store?.close());

    it('runs shared holders side by side, and ifAlone only when none is held', async () => {
      const g = gate();
      let inside = 0;
      let most = 0;
      const holder = () =>
        store.sections.shared('s1', async () => {
          inside++;
          most = Math.max(most, inside);
          await g.opened;
          inside--;
        });
      const both = Promise.all([holder(), holder()]);
      // both inside at once (a server's first hold opens a connection: up to 20 s on a busy machine)
      for (let t = 0; t < 400 && most < 2; t++) await sleep(50);
      expect(most).toBe(2);
      let ran = false;
      expect(await store.sections.ifAlone('s1', async () => void (ran = true))).toBe(false);
      expect(ran).toBe(false);
      g.open();
      await both;
      expect(await store.sections.ifAlone('s1', async () => void (ran = true))).toBe(true);
      expect(ran).toBe(true);
    });

    it('makes a shared holder wait while ifAlone work runs', async () => {
      const g = gate();
      const order: string[] = [];
      const alone = store.sections.ifAlone('s2', async () => {
        order.push('alone start');
        await g.opened;
        order.push('alone end');
      });
      await sleep(20);
      const shared = store.sections.shared('s2', async () => void order.push('shared'));
      await sleep(50);
      g.open();
      await Promise.all([alone, shared]);
      expect(order).toEqual(['alone start', 'alone end', 'shared']);
    });

    it('releases a hold whose work throws', async () => {
      await expect(store.sections.shared('s3', async () => Promise.reject(new Error('boom')))).rejects.toThrow('boom');
      expect(await store.sections.ifAlone('s3', async () => {})).toBe(true);
    });
  });
}

const SERVER = process.env.TEST_DATABASE_URL;
describe.skipIf(!SERVER)('sections across processes on a server', () => {
  let db: { url: string; drop(): Promise<void> };
  let a: Store;
  let b: Store;
  beforeAll(async () => {
    db = await createServerDatabase(SERVER!);
    a = await openStore(db.url);
    b = await openStore(db.url);
  });
  afterAll(async () => {
    await a?.close();
    await b?.close();
    await db?.drop();
  });

  it('refuses ifAlone in one while the other holds the name shared, and grants it after', async () => {
    const g = gate();
    const held = gate();
    const holding = a.sections.shared('x', async () => {
      held.open();
      await g.opened;
    });
    await held.opened;
    // another session holding it shared too is fine; alone is not
    expect(await b.sections.shared('x', async () => 'also')).toBe('also');
    expect(await b.sections.ifAlone('x', async () => {})).toBe(false);
    g.open();
    await holding;
    expect(await b.sections.ifAlone('x', async () => {})).toBe(true);
  });

  it('makes a shared holder in one process wait for ifAlone work in the other', async () => {
    const g = gate();
    const started = gate();
    const order: string[] = [];
    const alone = a.sections.ifAlone('y', async () => {
      started.open();
      await g.opened;
      order.push('alone');
    });
    await started.opened;
    const shared = b.sections.shared('y', async () => void order.push('shared'));
    await sleep(500);
    expect(order).toEqual([]);
    g.open();
    await Promise.all([alone, shared]);
    expect(order).toEqual(['alone', 'shared']);
  });
});
