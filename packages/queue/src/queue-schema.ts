/**
 * Where the job queue lives: graphile-worker's tables and functions in a schema of their own
 * (`fractile_queue`) on the same PostgreSQL server and database as the data, so that a part's
 * follow-up can be enqueued in the same transaction as the ledger row that claims it. The queue's
 * schema is installed and upgraded by graphile-worker's own migrations (`prepareQueue`), run by
 * every process that enqueues or works, before it touches the queue.
 */
import { runMigrations, type SharedOptions } from 'graphile-worker';
import { queueLogger } from './queue-logger.ts';

export const QUEUE_SCHEMA = 'fractile_queue';

/** Options every graphile-worker call of ours shares. */
export function queueOptions(url: string): SharedOptions {
  return { connectionString: url, schema: QUEUE_SCHEMA, logger: queueLogger() };
}

/** Installs or upgrades the queue's schema on the server at `url`. */
export async function prepareQueue(url: string): Promise<void> {
  await runMigrations({ ...queueOptions(url), maxPoolSize: 1 });
}
