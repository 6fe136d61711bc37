/** The command line as the checks run it: the real entry point, in a child process, with no DATABASE_URL. */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

export const FRACTILE_BIN = fileURLToPath(new URL('../../packages/cli/bin/fractile.js', import.meta.url));

/** Runs `fractile ARGS…` in the folder `cwd`; returns its exit status and output. */
export function runFractile(cwd: string, ...args: string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [FRACTILE_BIN, ...args], { encoding: 'utf8', cwd, env: { ...process.env, DATABASE_URL: '' } });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}
