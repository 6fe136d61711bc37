/**
 * The queue engine's log lines on stderr (stdout is kept for `--format json`): errors and
 * warnings always, its info lines (jobs started and completed) with FRACTILE_QUEUE_LOG=info.
 */
import { Logger } from 'graphile-worker';

export function queueLogger(): Logger {
  const verbose = process.env.FRACTILE_QUEUE_LOG === 'info';
  return new Logger(() => (level, message) => {
    if (level === 'error' || level === 'warning' || (verbose && level === 'info')) process.stderr.write(`queue ${level}: ${message}\n`);
  });
}
