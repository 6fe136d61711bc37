/**
 * `fractile worker`: a long-running process that claims queued jobs (ingest parts, reduce
 * batches, group stages) from the job queue on the server and runs them; start any number, on
 * any machine that reaches the server and sees the manifests at the same paths. SIGTERM or
 * SIGINT stops it cleanly: running jobs finish, nothing new is claimed.
 */
import type { Command } from 'commander';
import { globals, log, type CommandModule } from '../context.ts';
import { withStore } from '../common-options.ts';
import { requireServer, wholeNumber } from '../queue-target.ts';
import { CODE_VERSION } from '../version.ts';

export const command: CommandModule = {
  order: 95,
  register(program: Command) {
    program
      .command('worker')
      .description('run queued jobs (from `ingest --queue`, `reduce --queue`) until stopped; PostgreSQL server only')
      .option('--concurrency <n>', 'jobs at a time in this process', '1')
      .option('--threads <n>', 'worker threads each job may use for curve reading and reduction (0: the job\'s own thread; one worker process per core scales best)', '0')
      .addHelpText('after', '\nStops cleanly on SIGTERM or SIGINT (running jobs finish). Jobs of a worker that died (kill -9, lost machine) are retried by the others within seconds. Exit 1 when the connection to the server is lost.')
      .action(async (o: { concurrency: string; threads: string }, cmd: Command) => {
        const g = globals(cmd);
        await requireServer(g, '`fractile worker`');
        const concurrency = wholeNumber(o.concurrency, '--concurrency', 1);
        const threads = wholeNumber(o.threads, '--threads', 0);
        // the queue engine's log keeps the stacks of failed jobs only when asked
        if (g.debug && !process.env.FRACTILE_QUEUE_LOG) process.env.FRACTILE_QUEUE_LOG = 'debug';
        // graphile-worker also prints a failed worker loop's stack with console.trace (besides its
        // log line, which says the same): kept for --debug only
        if (!g.debug) console.trace = () => {};
        // An error nobody awaits, thrown by the queue engine's background work while its
        // connections are being ended (seen: its notify listener releasing a client twice after
        // the server ended the session), stops this worker like a lost connection does.
        const engineFault = (err: unknown) => {
          const text = err instanceof Error ? err.message : String(err);
          log(`fractile: the job queue engine failed in the background (${text}), as it does when the server ends its connections; this worker stops, its jobs will be retried by other workers`);
          if (g.debug && err instanceof Error && err.stack) log(err.stack);
          process.exit(1);
        };
        process.removeAllListeners('unhandledRejection');
        process.removeAllListeners('uncaughtException');
        process.on('unhandledRejection', engineFault);
        process.on('uncaughtException', engineFault);
        const { startWorker } = await import('@fractile/queue');
        await withStore(g, async (store) => {
          const w = await startWorker(store, { concurrency, threads, codeVersion: CODE_VERSION, onEvent: (m) => log(`worker: ${m}`) });
          const onSignal = (sig: string) => {
            log(`worker: ${sig}: finishing running jobs, then stopping`);
            void w.stop();
          };
          process.once('SIGTERM', onSignal);
          process.once('SIGINT', onSignal);
          log(`worker ${process.pid}: running (${concurrency} at a time)`);
          try {
            await w.done;
          } finally {
            process.off('SIGTERM', onSignal);
            process.off('SIGINT', onSignal);
          }
          log(`worker ${process.pid}: stopped`);
        });
      });
  },
};
