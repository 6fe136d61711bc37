/** A progress bar on stderr (cli-progress), shown only when stderr is a terminal. */
import cliProgress from 'cli-progress';

export interface Progress {
  update(done: number, total: number): void;
  stop(): void;
}

export function progressBar(label: string): Progress {
  if (!process.stderr.isTTY) return { update() {}, stop() {} };
  const bar = new cliProgress.SingleBar(
    { stream: process.stderr, format: `${label} [{bar}] {percentage}% {value}/{total} {eta_formatted} left`, hideCursor: true, clearOnComplete: true },
    cliProgress.Presets.shades_classic,
  );
  let started = false;
  return {
    update(done, total) {
      if (!started) {
        bar.start(total, done);
        started = true;
      } else {
        bar.setTotal(total);
        bar.update(done);
      }
    },
    stop() {
      if (started) bar.stop();
    },
  };
}
