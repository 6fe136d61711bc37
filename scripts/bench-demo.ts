/**
 * Benchmark of the main job: `fractile demo` end to end (2,000 invented tests on embedded PGlite,
 * fresh database), with the time of each stage. Target: under 60 s on a two-core machine.
 *
 *   npm run bench:demo [-- --tests=2000]
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const tests = process.argv.find((a) => a.startsWith('--tests='))?.split('=')[1] ?? '2000';
const out = mkdtempSync(join(tmpdir(), 'fractile-bench-demo-'));
const bin = fileURLToPath(new URL('../packages/cli/bin/fractile.js', import.meta.url));
console.log(`bench:demo — fractile demo --tests ${tests} on embedded PGlite (output in ${out})`);
const t0 = performance.now();
const r = spawnSync(process.execPath, ['--max-semi-space-size=2', bin, 'demo', '--fresh', '--out', out, '--tests', tests, '--format', 'json'], { encoding: 'utf8', maxBuffer: 1 << 28 });
const wall = (performance.now() - t0) / 1000;
if (r.status !== 0) {
  console.error(r.stderr);
  process.exit(1);
}
const res = (JSON.parse(r.stdout) as { data: { timings: Record<string, number>; ingest: { accepted: number; rejected: unknown[] } } }).data;
for (const [k, v] of Object.entries(res.timings)) console.log(`  ${k.padEnd(10)} ${v.toFixed(2)} s`);
console.log(`accepted ${res.ingest.accepted}, rejected ${res.ingest.rejected.length}`);
console.log(`wall time ${wall.toFixed(1)} s including start-up (target < 60 s)`);
rmSync(out, { recursive: true, force: true });
