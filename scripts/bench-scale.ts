/**
 * Benchmark of the scale-out on the job queue: N generated tests (seed-demo's benchmark set,
 * default 3,000 × 500 points) ingested in parts and reduced in batches by 1 and then 2
 * `fractile worker` processes (each on its own thread, `--threads 0`), each on a fresh database
 * on the server of BENCH_DATABASE_URL or TEST_DATABASE_URL. Prints, per worker count, the wall
 * time and tests/s of the queued ingest and of the queued reduce (from enqueue until the last
 * part is in the ledger), the ratio of 2 to 1 worker, the jobs claimed per second, and the load
 * average (the cores are shared with other work, so wall rates are lower than on a quiet machine).
 *
 *   npm run bench:scale [-- --tests=3000 --points=500 --part-rows=250 --batch=250]
 */
import { loadavg } from 'node:os';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { enqueueIngest, enqueueReduce, watchRequest } from '@fractile/queue';
import { generateBenchmarkSet } from '@fractile/seed-demo';
import { openStore } from '@fractile/store';
import { build, isFresh } from '../packages/cli/build.mjs';
import { createServerDatabase } from '../test/support/databases.ts';
import { startWorkerProcess } from '../test/support/queue-fixture.ts';

const server = process.env.BENCH_DATABASE_URL ?? process.env.TEST_DATABASE_URL;
if (!server) {
  console.log('bench:scale: set BENCH_DATABASE_URL or TEST_DATABASE_URL to a PostgreSQL server (the queue lives on a server only)');
  process.exit(0);
}
if (!isFresh()) await build();
const arg = (name: string, d: number) => Number(process.argv.find((a) => a.startsWith(`--${name}=`))?.split('=')[1] ?? d);
const N = arg('tests', 3000);
const P = arg('points', 500);
const PART_ROWS = arg('part-rows', 250);
const BATCH = arg('batch', 250);

const dir = mkdtempSync(path.join(tmpdir(), 'fractile-bench-scale-'));
const set = generateBenchmarkSet({ outDir: dir, tests: N, points: P, seed: 21 });
const manifest = path.join(set.outDir, set.manifest);
console.log(`bench:scale: ${N} tests × ${P} points; ingest parts of ${PART_ROWS} rows, reduce batches of ${BATCH} tests`);

const rows: { workers: number; ingestS: number; reduceS: number; jobs: number }[] = [];
for (const workers of [1, 2]) {
  const db = await createServerDatabase(server);
  const store = await openStore(db.url);
  const procs = Array.from({ length: workers }, () => startWorkerProcess(db.url));
  try {
    let t = performance.now();
    const ing = await enqueueIngest(store, [manifest], { partRows: PART_ROWS });
    await watchRequest(store, ing.request, () => {}, 100);
    const ingestS = (performance.now() - t) / 1000;
    t = performance.now();
    const red = await enqueueReduce(store, { catalog: null, batchSize: BATCH });
    await watchRequest(store, red.request, () => {}, 100);
    const reduceS = (performance.now() - t) / 1000;
    rows.push({ workers, ingestS, reduceS, jobs: ing.parts + red.parts });
    console.log(
      `  ${workers} worker(s): ingest ${ingestS.toFixed(1)} s (${(N / ingestS).toFixed(0)} tests/s), reduce ${reduceS.toFixed(1)} s (${(N / reduceS).toFixed(0)} tests/s), ` +
        `together ${(N / (ingestS + reduceS)).toFixed(0)} tests/s, ${((ing.parts + red.parts) / (ingestS + reduceS)).toFixed(1)} jobs/s; load ${loadavg()[0].toFixed(1)}`,
    );
  } finally {
    for (const p of procs) p.child.kill('SIGTERM');
    await Promise.all(procs.map((p) => p.exited));
    await store.close();
    await db.drop();
  }
}
const [one, two] = rows;
console.log(`  ratio 2 : 1 worker — ingest ${(one.ingestS / two.ingestS).toFixed(2)}×, reduce ${(one.reduceS / two.reduceS).toFixed(2)}×, together ${((one.ingestS + one.reduceS) / (two.ingestS + two.reduceS)).toFixed(2)}×`);
rmSync(dir, { recursive: true, force: true });
