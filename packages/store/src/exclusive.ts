/**
 * Named exclusive sections across every process on one database: `exclusive(name, fn)` runs `fn`
 * while no other holder of `name` runs, waiting for one that does. Stages use it so that two runs
 * of the same stage never write the same results at once: the second waits, then finds the
 * first one's results and reuses them (or computes only what is left).
 *
 * On a server: a session-level advisory lock (PostgreSQL documentation, "Advisory Locks"), keyed
 * by the first 8 bytes of the name's SHA-256, taken with `pg_try_advisory_lock` polled every
 * 200 ms on a connection of its own (so waiting never occupies a pooled connection, and a process
 * that dies releases its locks with its connection). Embedded: the folder is held by one process
 * (folder-lock.ts), so an in-process queue per name is enough.
 */
import { createHash } from 'node:crypto';
import pg from 'pg';

export type Exclusive = <T>(name: string, fn: () => Promise<T>) => Promise<T>;

/** Exclusive sections within this process: one promise chain per name. */
export function inProcessExclusive(): Exclusive {
  const tails = new Map<string, Promise<unknown>>();
  return async <T>(name: string, fn: () => Promise<T>): Promise<T> => {
    const before = tails.get(name) ?? Promise.resolve();
    const run = before.then(fn, fn);
    const tail = run.catch(() => {});
    tails.set(name, tail);
    try {
      return await run;
    } finally {
      if (tails.get(name) === tail) tails.delete(name);
    }
  };
}

/** The advisory-lock key of a name: a signed 64-bit integer, as text. */
export function lockKey(name: string): string {
  return createHash('sha256').update(name).digest().readBigInt64BE(0).toString();
}

/** Exclusive sections across processes on the server at `url`; `close` ends its connection. */
export function serverExclusive(url: string): { exclusive: Exclusive; close(): Promise<void> } {
  let client: Promise<pg.Client> | null = null;
  const local = inProcessExclusive();
  const connect = () => {
    if (client) return client;
    const made = (async () => {
      const c = new pg.Client({ connectionString: url });
      // a connection the server ended: its locks are gone with it; the next section connects anew
      c.on('error', () => {
        if (client === made) client = null;
      });
      await c.connect();
      return c;
    })();
    client = made;
    made.catch(() => {
      if (client === made) client = null;
    });
    return made;
  };
  const exclusive: Exclusive = (name, fn) =>
    local(name, async () => {
      const c = await connect();
      const key = lockKey(name);
      for (;;) {
        const r = await c.query<{ ok: boolean }>('select pg_try_advisory_lock($1::int8) as ok', [key]);
        if (r.rows[0].ok) break;
        await new Promise((res) => setTimeout(res, 200));
      }
      try {
        return await fn();
      } finally {
        await c.query('select pg_advisory_unlock($1::int8)', [key]).catch(() => {});
      }
    });
  return {
    exclusive,
    async close() {
      if (client) await (await client.catch(() => null))?.end().catch(() => {});
      client = null;
    },
  };
}
