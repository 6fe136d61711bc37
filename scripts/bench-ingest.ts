/**
 * Ingest benchmark (not a timed test). Generates N tests × P points in our curve format (invented
 * curves: the plain benchmark set of seed-demo/src/benchmark-set.ts), then measures, each in a fresh child process
 * so that peak RSS belongs to one phase:
 *   - server: `ingestManifests` into a fresh database on a PostgreSQL server (COPY);
 *   - floor:  `psql \copy` of the same curve rows (already in canonical COPY text) into a table
 *             like `curves` — the least any loader can take for these points on this server;
 *   - pglite: `ingestManifests` into a fresh embedded database.
 * Prints tests/s, points/s, peak RSS (process.resourceUsage().maxRSS) and the ratio to the floor.
 *
 *   npm run bench:ingest -- [--tests 10000] [--points 2000] [--batch-size 200] [--workers N] [--skip-pglite] [--skip-server]
 *
 * The server is $BENCH_DATABASE_URL, else $TEST_DATABASE_URL (its database is used only to create
 * and drop `fractile_bench_*` databases).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { createWriteStream, existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import pg from 'pg';
import { sql } from 'kysely';
import { ingestManifests, readCurveFile, readManifest } from '@fractile/ingest';
import { copyLine, openStore } from '@fractile/store';
import { generateBenchmarkSet } from '@fractile/seed-demo';

const { values: args } = parseArgs({
  options: {
    tests: { type: 'string', default: '10000' },
    points: { type: 'string', default: '2000' },
    'batch-size': { type: 'string', default: '200' },
    workers: { type: 'string' },
    'skip-pglite': { type: 'boolean', default: false },
    'skip-server': { type: 'boolean', default: false },
    phase: { type: 'string' },
    data: { type: 'string' },
    target: { type: 'string' },
  },
});
const tests = Number(args.tests);
const points = Number(args.points);
const batchSize = Number(args['batch-size']);
const workers = args.workers === undefined ? undefined : Number(args.workers);
const here = fileURLToPath(import.meta.url);

interface PhaseResult {
  phase: string;
  seconds: number;
  maxRssMb: number;
  /** RSS once the database is open, before any row is read (the engine's own footprint) */
  openRssMb?: number;
  /** CPU time of this process (user + system) */
  cpuSeconds?: number;
  accepted?: number;
}

const rssMb = () => process.resourceUsage().maxRSS / 1024;

async function createDatabase(serverUrl: string): Promise<{ url: string; drop(): Promise<void> }> {
  const name = `fractile_bench_${randomBytes(4).toString('hex')}`;
  const admin = new pg.Client({ connectionString: serverUrl });
  await admin.connect();
  await admin.query(`create database ${name}`);
  await admin.end();
  const u = new URL(serverUrl);
  u.pathname = '/' + name;
  return {
    url: u.toString(),
    async drop() {
      const c = new pg.Client({ connectionString: serverUrl });
      await c.connect();
      await c.query(`drop database if exists ${name} with (force)`);
      await c.end();
    },
  };
}

/** Child phases: one measurement each, result as JSON on stdout. */
async function runPhase(phase: string): Promise<PhaseResult> {
  const manifest = path.join(args.data!, 'manifest.csv');
  if (phase === 'create') {
    const store = await openStore(args.target!);
    await store.close();
    return { phase, seconds: 0, maxRssMb: rssMb() };
  }
  if (phase === 'ingest') {
    const store = await openStore(args.target!);
    const openRssMb = process.memoryUsage().rss / 1e6;
    const cpu0 = process.cpuUsage();
    const t0 = performance.now();
    const r = await ingestManifests(store, [{ path: manifest }], { batchSize, workers });
    const seconds = (performance.now() - t0) / 1000;
    const cpu = process.cpuUsage(cpu0);
    const maxRssMb = rssMb();
    const mu = process.memoryUsage();
    process.stderr.write(`  memory at the end: rss ${(mu.rss / 1e6).toFixed(0)} MB, JS heap ${(mu.heapTotal / 1e6).toFixed(0)} MB, external ${(mu.external / 1e6).toFixed(0)} MB (array buffers ${(mu.arrayBuffers / 1e6).toFixed(0)} MB)\n`);
    await store.close();
    if (r.rejected.length) throw new Error(`benchmark data rejected: ${JSON.stringify(r.rejected.slice(0, 3))}`);
    return { phase, seconds, maxRssMb, openRssMb, cpuSeconds: (cpu.user + cpu.system) / 1e6, accepted: r.accepted };
  }
  if (phase === 'floor') {
    // schema only (migrated store), then a table like curves, filled by psql \copy
    const store = await openStore(args.target!);
    await sql.raw('create table floor_curves (like curves including all)').execute(store.db);
    await store.close();
    const copyFile = path.join(args.data!, 'curves.copy');
    const t0 = performance.now();
    execFileSync('psql', [args.target!, '-v', 'ON_ERROR_STOP=1', '-q', '-c', `\\copy floor_curves (test_row_id, n_points, time_s, force_n, extension_mm, crosshead_mm, stress_mpa, strain, source_sha256, source_path) from '${copyFile}'`], { stdio: ['ignore', 'ignore', 'inherit'] });
    return { phase, seconds: (performance.now() - t0) / 1000, maxRssMb: rssMb() };
  }
  throw new Error(`unknown phase ${phase}`);
}

/** Writes the curve rows of the data set as COPY text (same canonical values as ingest writes). */
async function writeCopyFile(dir: string): Promise<void> {
  const file = path.join(dir, 'curves.copy');
  if (existsSync(file)) return;
  const out = createWriteStream(file + '.part');
  let id = 0;
  for await (const item of readManifest(path.join(dir, 'manifest.csv'))) {
    if (item.kind !== 'record' || !item.record.curve) continue;
    const r = await readCurveFile(item.record.curve.absPath, item.record.curve.displayPath, null);
    if (!r.ok) throw new Error(r.rejection.message);
    const c = r.channels;
    if (!out.write(copyLine([++id, c.nPoints, c.time, c.force, c.extension, c.crosshead, c.stress, c.strain, r.sha256, item.record.curve.relPath]))) await new Promise<void>((res) => out.once('drain', () => res()));
  }
  await new Promise<void>((res, rej) => out.end((e?: Error | null) => (e ? rej(e) : res())));
  execFileSync('mv', [file + '.part', file]);
}

function child(phase: string, data: string, target: string): PhaseResult {
  const r = spawnSync(process.execPath, ['--max-semi-space-size=2', '--import', 'tsx', here, '--phase', phase, '--data', data, '--target', target, '--batch-size', String(batchSize), ...(workers === undefined ? [] : ['--workers', String(workers)])], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'inherit'], maxBuffer: 1 << 20 });
  if (r.status !== 0) throw new Error(`phase ${phase} failed (exit ${r.status})`);
  return JSON.parse(r.stdout.trim().split('\n').pop()!) as PhaseResult;
}

function line(label: string, r: PhaseResult, floor?: PhaseResult): string {
  const tps = tests / r.seconds;
  const pps = (tests * points) / r.seconds;
  const ratio = floor ? `  ${(r.seconds / floor.seconds).toFixed(2)}× floor` : '';
  const open = r.openRssMb !== undefined ? ` (${r.openRssMb.toFixed(0)} MB once open)` : '';
  const cpu = r.cpuSeconds !== undefined ? `  client CPU ${r.cpuSeconds.toFixed(1)} s` : '';
  return `${label.padEnd(28)} ${r.seconds.toFixed(1).padStart(7)} s  ${tps.toFixed(0).padStart(6)} tests/s  ${(pps / 1e6).toFixed(2).padStart(6)} M points/s  peak RSS ${r.maxRssMb.toFixed(0).padStart(4)} MB${open}${cpu}${ratio}`;
}

async function main(): Promise<void> {
  if (args.phase) {
    const r = await runPhase(args.phase);
    process.stdout.write(JSON.stringify(r) + '\n');
    return;
  }
  const root = path.resolve('bench-out', `ingest-${tests}x${points}`);
  if (!existsSync(path.join(root, 'manifest.csv'))) {
    process.stderr.write(`generating ${tests} tests × ${points} points in ${root} …\n`);
    mkdirSync(root, { recursive: true });
    generateBenchmarkSet({ outDir: root, tests, points, seed: 11 });
  }
  writeFileSync(path.join(root, 'README.txt'), 'Generated by scripts/bench-ingest.ts (invented curves); safe to delete.\n');
  const server = process.env.BENCH_DATABASE_URL ?? process.env.TEST_DATABASE_URL;
  process.stdout.write(`ingest benchmark: ${tests} tests × ${points} points (time, force, extension), batch size ${batchSize}, curve workers ${workers ?? 'default'}, ${availableParallelism()} cores\n`);
  if (!args['skip-server']) {
    if (!server) process.stdout.write('server: skipped (set BENCH_DATABASE_URL or TEST_DATABASE_URL)\n');
    else {
      process.stderr.write('writing the COPY text for the floor …\n');
      await writeCopyFile(root);
      const a = await createDatabase(server);
      const b = await createDatabase(server);
      try {
        const floor = child('floor', root, a.url);
        const ingest = child('ingest', root, b.url);
        process.stdout.write(line('server: psql \\copy (floor)', floor) + '\n');
        process.stdout.write(line('server: fractile ingest', ingest, floor) + '\n');
      } finally {
        await a.drop();
        await b.drop();
      }
    }
  }
  if (!args['skip-pglite']) {
    const dir = mkdtempSync(path.join(tmpdir(), 'fractile-bench-'));
    try {
      // created first in its own process: creating an embedded database runs a second engine
      // instance (initdb), whose memory would otherwise count as the ingest's
      child('create', root, path.join(dir, 'db'));
      const r = child('ingest', root, path.join(dir, 'db'));
      process.stdout.write(line('embedded: fractile ingest', r) + '\n');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }
}

await main();
