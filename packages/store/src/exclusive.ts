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

/**
 * Shared holds of a name, for work that may run side by side but must know when nobody runs it:
 * `shared(name, fn)` runs `fn` holding `name` shared (any number at once; it waits while an
 * `ifAlone` holder runs); `ifAlone(name, fn)` runs `fn` only when nobody holds `name` at this
 * moment, holding it exclusively meanwhile, and otherwise returns false at once. A name is used
 * either this way or with `exclusive`, never both.
 */
export interface SharedSections {
  shared<T>(name: string, fn: () => Promise<T>): Promise<T>;
  ifAlone(name: string, fn: () => Promise<void>): Promise<boolean>;
}

/** Shared sections within this process; `remote` adds the same hold across processes (a server). */
export function inProcessShared(remote?: { takeShared(name: string): Promise<() => Promise<void>>; tryAlone(name: string): Promise<(() => Promise<void>) | null> }): SharedSections {
  const holders = new Map<string, number>();
  const alone = new Map<string, Promise<void>>();
  return {
    async shared(name, fn) {
      for (let a = alone.get(name); a; a = alone.get(name)) await a.catch(() => {});
      holders.set(name, (holders.get(name) ?? 0) + 1);
      try {
        const release = remote ? await remote.takeShared(name) : null;
        try {
          return await fn();
        } finally {
          await release?.();
        }
      } finally {
        const n = (holders.get(name) ?? 1) - 1;
        if (n === 0) holders.delete(name);
        else holders.set(name, n);
      }
    },
    async ifAlone(name, fn) {
      if ((holders.get(name) ?? 0) > 0 || alone.has(name)) return false;
      let done = () => {};
      alone.set(name, new Promise<void>((r) => (done = r)));
      try {
        const release = remote ? await remote.tryAlone(name) : async () => {};
        if (!release) return false;
        try {
          await fn();
          return true;
        } finally {
          await release();
        }
      } finally {
        alone.delete(name);
        done();
      }
    },
  };
}

/** The advisory-lock key of a name: a signed 64-bit integer, as text. */
export function lockKey(name: string): string {
  return createHash('sha256').update(name).digest().readBigInt64BE(0).toString();
}

/** Exclusive sections across processes on the server at `url`; `close` ends its connection. */
export function serverExclusive(url: string): { exclusive: Exclusive; sections: SharedSections; close(): Promise<void> } {
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
  /**
   * One try of the session advisory lock of `name` (exclusive, or shared), or polled every
   * 200 ms until granted with `wait`; returns its release, or null when not granted.
   */
  const takeLock = async (name: string, mode: '' | '_shared', wait: boolean): Promise<(() => Promise<void>) | null> => {
    const c = await connect();
    const key = lockKey(name);
    for (;;) {
      const r = await c.query<{ ok: boolean }>(`select pg_try_advisory_lock${mode}($1::int8) as ok`, [key]);
      if (r.rows[0].ok) break;
      if (!wait) return null;
      await new Promise((res) => setTimeout(res, 200));
    }
    return async () => {
      await c.query(`select pg_advisory_unlock${mode}($1::int8)`, [key]).catch(() => {});
    };
  };
  const exclusive: Exclusive = (name, fn) =>
    local(name, async () => {
      const release = (await takeLock(name, '', true))!;
      try {
        return await fn();
      } finally {
        await release();
      }
    });
  // shared holds wait like the exclusive one; "alone" is one try of the exclusive lock, which the
  // server grants only when no session holds the key in any mode
  const sections = inProcessShared({
    takeShared: async (name) => (await takeLock(name, '_shared', true))!,
    tryAlone: (name) => takeLock(name, '', false),
  });
  return {
    exclusive,
    sections,
    async close() {
      if (client) await (await client.catch(() => null))?.end().catch(() => {});
      client = null;
    },
  };
}
