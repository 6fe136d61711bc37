/**
 * Every benchmark in turn, each printing its own figures: ingest (server figures need
 * BENCH_DATABASE_URL or TEST_DATABASE_URL), reduce, stats, the sample stage and planning, drift, the demo end to end, the report's rendering, and
 * fractile against a NumPy peer script on the same curve files, and the command line's start-up.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const here = (f: string) => fileURLToPath(new URL(f, import.meta.url));
for (const b of ['bench-ingest.ts', 'bench-ingest-large.ts', 'bench-reduce.ts', 'bench-stats.ts', 'bench-sample.ts', 'bench-drift.ts', 'bench-demo.ts', 'bench-report.ts', 'bench-peer.ts', 'bench-cli.ts']) {
  console.log(`\n=== ${b}`);
  const r = spawnSync(process.execPath, ['--import', 'tsx', here(b), ...process.argv.slice(2)], { stdio: 'inherit' });
  if (r.status !== 0) console.log(`(${b} exited with ${r.status})`);
}
