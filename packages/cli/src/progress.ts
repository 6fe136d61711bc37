/**
 * Progress of a long stage on stderr (stdout stays the command's result):
 *   - on a terminal, a bar (cli-progress) with a steady estimate of the time left (eta.ts), cleared
 *     when the stage ends so that the next line starts clean;
 *   - elsewhere (a log, a pipe, CI), one line every `intervalSeconds` (default 10) and one at the
 *     end: `reduce: 1200/5000 (24 %), about 40 s left`;
 *   - `none`: nothing.
 * Mode `bar` (the default) picks the bar on a terminal and periodic lines elsewhere; `lines`
 * prints a line at every update (ingest: after each batch).
 */
import cliProgress from 'cli-progress';
import { EtaEstimator, formatEta } from './eta.ts';

/** `bar`: a bar on a terminal, periodic lines elsewhere; `lines`: a line at every update (logs); `none`. */
export type ProgressMode = 'bar' | 'lines' | 'none';
export const PROGRESS_MODES: readonly ProgressMode[] = ['bar', 'lines', 'none'];

export interface Progress {
  update(done: number, total: number): void;
  stop(): void;
}

const now = () => performance.now() / 1000;

function bar(label: string): Progress {
  const eta = new EtaEstimator();
  const b = new cliProgress.SingleBar(
    { stream: process.stderr, format: `${label} [{bar}] {percentage}% {value}/{total} {left}`, hideCursor: true, clearOnComplete: true, fps: 5 },
    cliProgress.Presets.shades_classic,
  );
  let started = false;
  return {
    update(done, total) {
      const left = formatEta(eta.update(now(), done, total));
      if (!started) {
        b.start(total, done, { left });
        started = true;
      } else {
        b.setTotal(total);
        b.update(done, { left });
      }
    },
    stop() {
      if (!started) return;
      b.stop();
      // the bar's line is cleared whether or not the stage reached its total
      process.stderr.write('\r\x1b[2K');
    },
  };
}

function lines(label: string, intervalSeconds: number): Progress {
  const eta = new EtaEstimator();
  let last = -Infinity;
  let state: { done: number; total: number; left: number | null } | null = null;
  const say = () => state && process.stderr.write(`${label}: ${state.done}/${state.total} (${state.total ? Math.floor((100 * state.done) / state.total) : 100} %)${state.done < state.total ? `, ${formatEta(state.left)}` : ''}\n`);
  return {
    update(done, total) {
      const t = now();
      state = { done, total, left: eta.update(t, done, total) };
      if (t - last >= intervalSeconds && done < total) {
        last = t;
        say();
      }
    },
    stop() {
      say();
    },
  };
}

export function progressBar(label: string, mode: ProgressMode = 'bar', intervalSeconds = 10): Progress {
  if (mode === 'none') return { update() {}, stop() {} };
  if (mode === 'lines') return lines(label, 0);
  return process.stderr.isTTY ? bar(label) : lines(label, intervalSeconds);
}
