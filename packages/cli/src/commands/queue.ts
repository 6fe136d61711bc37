/**
 * `fractile queue`: what the job queue holds per job kind (pending, running, retrying, failed,
 * done), the failed jobs with their last error, and retry / cancel. PostgreSQL server only.
 */
import type { Command } from 'commander';
import { CliError, globals, log, type CommandModule } from '../context.ts';
import { print } from '../output.ts';
import { withStore } from '../common-options.ts';
import { requireServer } from '../queue-target.ts';

const KINDS = ['ingest', 'reduce', 'stages'] as const;
type Kind = (typeof KINDS)[number];

function kindOf(s: string | undefined): Kind | undefined {
  if (s === undefined) return undefined;
  if (!(KINDS as readonly string[]).includes(s)) throw new CliError(`--kind must be one of ${KINDS.join(', ')}, got "${s}"`);
  return s as Kind;
}

export const command: CommandModule = {
  order: 96,
  register(program: Command) {
    const queue = program.command('queue').description('the job queue: pending, running, failed and done jobs per kind; retry and cancel (PostgreSQL server only)');
    queue
      .command('status', { isDefault: true })
      .description('jobs per kind: pending (retrying among them), running, failed, done')
      .action(async (_o: unknown, cmd: Command) => {
        const g = globals(cmd);
        await requireServer(g, '`fractile queue`');
        const { queueStatus } = await import('@fractile/queue');
        await withStore(g, async (store) => {
          const rows = await queueStatus(store);
          print(g, { kind: 'queue', data: { kinds: rows }, rows: rows as unknown as Record<string, unknown>[], title: 'fractile queue: jobs per kind', result: false });
        });
      });
    queue
      .command('failed')
      .description('jobs out of attempts, with their last error')
      .option('--kind <kind>', `only this kind (${KINDS.join(', ')})`)
      .action(async (o: { kind?: string }, cmd: Command) => {
        const g = globals(cmd);
        await requireServer(g, '`fractile queue`');
        const kind = kindOf(o.kind);
        const { failedJobs } = await import('@fractile/queue');
        await withStore(g, async (store) => {
          const rows = await failedJobs(store, kind);
          print(g, { kind: 'queue failed', data: { failed: rows }, rows: rows as unknown as Record<string, unknown>[], columns: ['id', 'kind', 'key', 'attempts', 'last_error'], title: 'fractile queue: failed jobs', result: false });
        });
      });
    queue
      .command('retry')
      .description('put failed jobs back in the queue (attempts reset)')
      .option('--kind <kind>', `only this kind (${KINDS.join(', ')})`)
      .action(async (o: { kind?: string }, cmd: Command) => {
        const g = globals(cmd);
        await requireServer(g, '`fractile queue`');
        const kind = kindOf(o.kind);
        const { retryFailed } = await import('@fractile/queue');
        await withStore(g, async (store) => {
          const n = await retryFailed(store, kind);
          log(`queue: ${n} failed job(s) put back`);
          print(g, { kind: 'queue retry', data: { retried: n }, rows: [{ retried: n }], title: 'fractile queue: jobs retried', result: false });
        });
      });
    queue
      .command('cancel')
      .description('cancel a queued request: its jobs no worker holds are removed, a running one finishes')
      .argument('<request>', 'request number (printed by `ingest --queue` / `reduce --queue`)')
      .action(async (request: string, _o: unknown, cmd: Command) => {
        const g = globals(cmd);
        await requireServer(g, '`fractile queue`');
        const id = Number(request);
        if (!Number.isInteger(id) || id < 1) throw new CliError(`the request must be a whole number ≥ 1, got "${request}"`);
        const { cancelRequest } = await import('@fractile/queue');
        await withStore(g, async (store) => {
          const r = await cancelRequest(store, id);
          if (!r.found) throw new CliError(`no queued request ${id}`);
          log(`queue: request ${id} cancelled, ${r.removed} job(s) removed`);
          print(g, { kind: 'queue cancel', data: { request: id, removed: r.removed }, rows: [{ request: id, removed: r.removed }], title: 'fractile queue: request cancelled', result: false });
        });
      });
  },
};
