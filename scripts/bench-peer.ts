/**
 * fractile against a practitioner's NumPy/SciPy script (scripts/peer-numpy.py) on the same
 * curve files: the seed-demo benchmark set (default 1,000 tests × 2,000 points, kN/mm). Each
 * repetition runs, back to back and in alternating order, the peer (`/usr/bin/python3
 * peer-numpy.py`) and `fractile ingest` + `fractile reduce` (with the four law fits) into a fresh
 * embedded database, each as the user would start it; wall times include start-up. Prints every
 * repetition, the medians, the ratio fractile / peer (median of the per-repetition ratios), the
 * peak RSS of each fractile command, and how far the peer's numbers are from fractile's.
 *
 *   npm run bench:peer [-- --tests=1000 --points=2000 --reps=3]
 *
 * The embedded engine runs with fsync on (durable commits); the fresh database is a copy of the
 * cached template (made once, before the first repetition, if missing).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { generateBenchmarkSet } from '@fractile/seed-demo';

const arg = (name: string, d: number) => Number(process.argv.find((a) => a.startsWith(`--${name}=`))?.split('=')[1] ?? d);
const tests = arg('tests', 1000), points = arg('points', 2000), reps = arg('reps', 3);
const here = (f: string) => fileURLToPath(new URL(f, import.meta.url));
const bin = here('../packages/cli/bin/fractile.js');
const PYTHON = '/usr/bin/python3';
const TIME = '/usr/bin/time';

interface Run { seconds: number; cpuSeconds: number | null; maxRssMb: number | null; stdout: string }

/** Runs a command; wall time, and peak RSS when /usr/bin/time is there to report it. */
function run(cmd: string, args: string[]): Run {
  const timed = existsSync(TIME);
  const t0 = performance.now();
  const r = timed
    ? spawnSync(TIME, ['-f', 'maxrss_kb=%M cpu_s=%U+%S', cmd, ...args], { encoding: 'utf8', maxBuffer: 1 << 28 })
    : spawnSync(cmd, args, { encoding: 'utf8', maxBuffer: 1 << 28 });
  const seconds = (performance.now() - t0) / 1000;
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} exited with ${r.status}: ${r.stderr.slice(-2000)}`);
  const rss = /maxrss_kb=(\d+)/.exec(r.stderr ?? '');
  const cpu = /cpu_s=([\d.]+)\+([\d.]+)/.exec(r.stderr ?? '');
  return { seconds, cpuSeconds: cpu ? Number(cpu[1]) + Number(cpu[2]) : null, maxRssMb: rss ? Number(rss[1]) / 1024 : null, stdout: r.stdout };
}

const median = (xs: number[]) => { const s = [...xs].sort((a, b) => a - b); const m = s.length >> 1; return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2; };
const f = (x: number) => x.toFixed(2).padStart(6);
const mb = (x: number | null) => (x === null ? '   n/a' : x.toFixed(0).padStart(6));

const root = path.resolve('bench-out', `peer-${tests}x${points}`);
if (!existsSync(path.join(root, 'manifest.csv'))) {
  process.stderr.write(`generating the benchmark set (${tests} × ${points}) in ${root} …\n`);
  generateBenchmarkSet({ outDir: root, tests, points, seed: 1 });
}
const manifest = path.join(root, 'manifest.csv');
console.log(`bench:peer — ${tests} curve tests × ${points} points (seed-demo benchmark set), ${reps} repetitions, wall times with start-up`);
console.log('fractile: ingest + reduce (four law fits) into a fresh embedded database (fsync on; a copy of the cached template)');
console.log('peer: /usr/bin/python3 scripts/peer-numpy.py (np.loadtxt per file, NumPy properties, scipy.optimize.curve_fit for the four laws)');
console.log('rep   peer s   ingest s  reduce s  fractile s  fractile/peer  ingest MB  reduce MB');

const rows: { peer: number; ingest: number; reduce: number; ingestMb: number | null; reduceMb: number | null; peerCpu: number | null; fractileCpu: number | null }[] = [];
let lastDb = '';
let peerOut = '';
const work = mkdtempSync(path.join(tmpdir(), 'fractile-bench-peer-'));
try {
  for (let rep = 0; rep < reps; rep++) {
    const dir = path.join(work, `rep${rep}`);
    const db = path.join(dir, 'db');
    peerOut = path.join(work, `peer${rep}.json`);
    const fractile = () => ({
      ingest: run(bin, ['ingest', manifest, '--db', db, '--format', 'json']),
      reduce: run(bin, ['reduce', '--db', db, '--format', 'json']),
    });
    const peer = () => run(PYTHON, [here('peer-numpy.py'), manifest, peerOut]);
    let p: Run, fr: ReturnType<typeof fractile>;
    if (rep % 2 === 0) { p = peer(); fr = fractile(); } else { fr = fractile(); p = peer(); }
    const total = fr.ingest.seconds + fr.reduce.seconds;
    const fractileCpu = fr.ingest.cpuSeconds !== null && fr.reduce.cpuSeconds !== null ? fr.ingest.cpuSeconds + fr.reduce.cpuSeconds : null;
    rows.push({ peer: p.seconds, ingest: fr.ingest.seconds, reduce: fr.reduce.seconds, ingestMb: fr.ingest.maxRssMb, reduceMb: fr.reduce.maxRssMb, peerCpu: p.cpuSeconds, fractileCpu });
    console.log(`${String(rep + 1).padStart(3)}  ${f(p.seconds)}   ${f(fr.ingest.seconds)}   ${f(fr.reduce.seconds)}    ${f(total)}       ${(total / p.seconds).toFixed(2).padStart(6)}×     ${mb(fr.ingest.maxRssMb)}     ${mb(fr.reduce.maxRssMb)}`);
    if (lastDb) rmSync(path.dirname(lastDb), { recursive: true, force: true });
    lastDb = db;
  }
  const total = rows.map((r) => r.ingest + r.reduce);
  console.log(`median ${f(median(rows.map((r) => r.peer)))}   ${f(median(rows.map((r) => r.ingest)))}   ${f(median(rows.map((r) => r.reduce)))}    ${f(median(total))}       ${median(rows.map((r, i) => total[i] / r.peer)).toFixed(2).padStart(6)}×`);
  const cpu = rows.filter((r) => r.peerCpu !== null && r.fractileCpu !== null);
  if (cpu.length) console.log(`CPU (user + system, all threads): peer ${median(cpu.map((r) => r.peerCpu!)).toFixed(2)} s, fractile ${median(cpu.map((r) => r.fractileCpu!)).toFixed(2)} s, fractile/peer ${median(cpu.map((r) => r.fractileCpu! / r.peerCpu!)).toFixed(2)}× (medians)`);
  console.log(`load average ${loadavg().map((x) => x.toFixed(1)).join(' ')}`);
  console.log('goal (issue 11): at most 2× the peer, then at most 1×');

  // how far apart the two are on the same files (last repetition)
  const props = (JSON.parse(run(bin, ['properties', '--db', lastDb, '--format', 'json']).stdout) as { data: Record<string, unknown>[] }).data;
  const theirs = JSON.parse(readFileSync(peerOut, 'utf8')) as Record<string, Record<string, number | null>>;
  const keys = ['modulus_gpa', 'rp02_mpa', 'rt05_mpa', 'rm_mpa', 'ag_pct', 'n_value', 'k_mpa'];
  const diffs = keys.map((k) => {
    const d = props.map((r) => {
      const a = r[k] as number | null, b = theirs[String(r.test_id)]?.[k];
      return typeof a === 'number' && typeof b === 'number' ? Math.abs(a - b) / Math.abs(b) : NaN;
    }).filter(Number.isFinite);
    return `${k} ${(100 * median(d)).toFixed(3)} % (${d.length})`;
  });
  console.log(`peer vs fractile, median relative difference per test: ${diffs.join(', ')}`);
} finally {
  rmSync(work, { recursive: true, force: true });
}
