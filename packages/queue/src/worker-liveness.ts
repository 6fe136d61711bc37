/**
 * Which workers are alive, told by the server: each graphile-worker worker of this process holds
 * a session advisory lock keyed by its worker id on one connection of the process (PostgreSQL
 * documentation, "Advisory Locks": a session lock is released when its session ends, so a
 * process killed with SIGKILL, or cut off from the server, drops them all at once).
 *
 * graphile-worker 0.16 releases the jobs of a worker that died only after four hours
 * (`resetLockedAt`), and unlocks them at once through `force_unlock_workers` for workers known to
 * be gone. `reapDeadWorkers` finds them: a worker id that locks a job (for more than a grace of
 * 3 s, so that a worker just created has taken its lock) and whose advisory lock can be taken is
 * gone; its jobs are unlocked and run again by whoever claims them next. Written here because
 * graphile-worker leaves the choice of who is dead to its user.
 */
import pg from 'pg';
import { lockKey } from '@fractile/store';
import { QUEUE_SCHEMA } from './queue-schema.ts';

const livenessKey = (workerId: string) => lockKey(`fractile queue worker ${workerId}`);

export interface Liveness {
  /** takes the lock of a worker of this process */
  hold(workerId: string): Promise<void>;
  /** unlocks the jobs of workers that are gone; returns their ids */
  reap(): Promise<string[]>;
  close(): Promise<void>;
}

/** `onLost` is called when the connection holding the locks fails: this process's workers then count as gone. */
export async function openLiveness(url: string, onLost: (err: Error) => void): Promise<Liveness> {
  const client = new pg.Client({ connectionString: url });
  client.on('error', onLost);
  await client.connect();
  const own = new Set<string>();
  const schema = `"${QUEUE_SCHEMA}"`;
  return {
    async hold(workerId) {
      own.add(workerId);
      await client.query('select pg_advisory_lock($1::int8)', [livenessKey(workerId)]);
    },
    async reap() {
      const r = await client.query<{ locked_by: string }>(`select distinct locked_by from ${schema}.jobs where locked_by is not null and locked_at < now() - interval '3 seconds'`);
      const dead: string[] = [];
      for (const { locked_by: id } of r.rows) {
        if (own.has(id)) continue;
        const key = livenessKey(id);
        const got = await client.query<{ ok: boolean }>('select pg_try_advisory_lock($1::int8) as ok', [key]);
        if (!got.rows[0].ok) continue;
        await client.query('select pg_advisory_unlock($1::int8)', [key]);
        dead.push(id);
      }
      if (dead.length) await client.query(`select ${schema}.force_unlock_workers($1::text[])`, [dead]);
      return dead;
    },
    async close() {
      client.removeAllListeners('error');
      client.on('error', () => {});
      await client.end().catch(() => {});
    },
  };
}
