/**
 * Start-up of the command line: `fractile --help`, and the read-only commands `tests`,
 * `properties` and `stats` (with nothing to recompute) on an embedded database of the seed-demo
 * benchmark set (default 1,000 tests × 2,000 points, ingested, reduced and aggregated first),
 * against the embedded engine alone opening the same folder and answering one query, and
 * against `node -e 0`. Each repetition runs every command once, in a rotating order; prints the
 * median wall time and CPU time (user + system) of each and the ratios to the engine alone.
 *
 *   npm run bench:cli [-- --tests=1000 --points=2000 --reps=5]
 *
 * Goals (issue 11): `fractile --help` under 0.3 s; a read-only command at most 1.3× the engine.
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { generateBenchmarkSet } from '@fractile/seed-demo';

const arg = (name: string, d: number) => Number(process.argv.find((a) => a.startsWith(`--${name}=`))?.split('=')[1] ?? d);
const tests = arg('tests', 1000), points = arg('points', 2000), reps = arg('reps', 5);
const bin = fileURLToPath(new URL('../packages/cli/bin/fractile.js', import.meta.url));
const TIME = '/usr/bin/time';

interface Timing { wall: number; cpu: number | null }

function run(cmd: string, args: string[], cwd?: string): Timing {
  const timed = existsSync(TIME);
  const t0 = performance.now();
  const r = timed ? spawnSync(TIME, ['-f', 'cpu_s=%U+%S', cmd, ...args], { encoding: 'utf8', cwd, maxBuffer: 1 << 28 }) : spawnSync(cmd, args, { encoding: 'utf8', cwd, maxBuffer: 1 << 28 });
  const wall = (performance.now() - t0) / 1000;
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} exited with ${r.status}: ${r.stderr.slice(-1500)}`);
  const m = /cpu_s=([\d.]+)\+([\d.]+)/.exec(r.stderr ?? '');
  return { wall, cpu: m ? Number(m[1]) + Number(m[2]) : null };
}

const median = (xs: number[]) => { const s = [...xs].sort((a, b) => a - b); const m = s.length >> 1; return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2; };

const setDir = path.resolve('bench-out', `peer-${tests}x${points}`);
const db = path.resolve('bench-out', `cli-${tests}x${points}`, 'db');
if (!existsSync(path.join(setDir, 'manifest.csv'))) generateBenchmarkSet({ outDir: setDir, tests, points, seed: 1 });
if (!existsSync(db)) {
  process.stderr.write(`preparing ${db}: ingest, reduce, stats …\n`);
  run(bin, ['ingest', path.join(setDir, 'manifest.csv'), '--db', db, '--format', 'json']);
}
// bring results up to date (no-ops when they are), so the measured commands only read
run(bin, ['reduce', '--db', db, '--format', 'json']);
run(bin, ['stats', '--db', db, '--format', 'json']);

// the engine alone: PGlite opens the folder, answers one query, closes
const engine = `import { PGlite } from '@electric-sql/pglite'; const d = await PGlite.create(${JSON.stringify(db)}); await d.query('select count(*) from tests'); await d.close();`;
const cases: [string, string, string[]][] = [
  ['node -e 0', process.execPath, ['-e', '0']],
  ['engine alone (open + 1 query)', process.execPath, ['--input-type=module', '-e', engine]],
  ['fractile --help', bin, ['--help']],
  ['fractile tests', bin, ['tests', '--db', db, '--format', 'json']],
  ['fractile properties', bin, ['properties', '--db', db, '--format', 'json']],
  ['fractile stats', bin, ['stats', '--db', db, '--format', 'json']],
];
const root = fileURLToPath(new URL('..', import.meta.url));
const times = new Map<string, Timing[]>(cases.map(([n]) => [n, []]));
for (let rep = 0; rep < reps; rep++) {
  for (let k = 0; k < cases.length; k++) {
    const [name, cmd, args] = cases[(k + rep) % cases.length];
    times.get(name)!.push(run(cmd, args, root));
  }
}
const eng = times.get('engine alone (open + 1 query)')!;
const engWall = median(eng.map((t) => t.wall));
const engCpu = eng.every((t) => t.cpu !== null) ? median(eng.map((t) => t.cpu!)) : null;
console.log(`bench:cli — ${tests} tests × ${points} points, embedded database, ${reps} repetitions, medians`);
console.log('command                          wall s   CPU s   wall / engine   CPU / engine');
for (const [name] of cases) {
  const t = times.get(name)!;
  const w = median(t.map((x) => x.wall));
  const c = t.every((x) => x.cpu !== null) ? median(t.map((x) => x.cpu!)) : null;
  const rw = name.startsWith('fractile') && name !== 'fractile --help' ? `${(w / engWall).toFixed(2)}×` : '';
  const rc = name.startsWith('fractile') && name !== 'fractile --help' && c !== null && engCpu ? `${(c / engCpu).toFixed(2)}×` : '';
  console.log(`${name.padEnd(32)} ${w.toFixed(2).padStart(6)}  ${c === null ? '   n/a' : c.toFixed(2).padStart(6)}   ${rw.padStart(13)}   ${rc.padStart(12)}`);
}
console.log('goals (issue 11): fractile --help under 0.3 s; a read-only command at most 1.3× the engine alone');
