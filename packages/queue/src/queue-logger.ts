/**
 * The queue engine's log lines on stderr (stdout is kept for `--format json`): errors and
 * warnings always, its info lines (jobs started and completed) with FRACTILE_QUEUE_LOG=info.
 * A failed job's error is logged without its stack (`worker --debug` or FRACTILE_QUEUE_LOG=debug
 * keeps it): the message says what failed, and the job is retried.
 */
import { Logger } from 'graphile-worker';

export function queueLogger(): Logger {
  const mode = process.env.FRACTILE_QUEUE_LOG;
  const verbose = mode === 'info' || mode === 'debug';
  const stacks = mode === 'debug';
  return new Logger(() => (level, message) => {
    if (level === 'error' || level === 'warning' || (verbose && level === 'info')) {
      const text = stacks ? message : message.split('\n').filter((l) => !/^\s+at /.test(l)).join('\n');
      process.stderr.write(`queue ${level}: ${text}\n`);
    }
  });
}
