/**
 * Benchmark of the reduce stage: N tests × P points (default 10,000 × 2,000) of synthetic plateau
 * and continuous steel curves with noise. Prints tests/s for the reduction alone on one and on two
 * worker threads — properties and n (no law fits) and, as a separate figure, with the four law
 * fits — at 1,000 and at N tests to show the cost grows linearly, and peak RSS. Beside the wall
 * rate, the rate per CPU second of the process (all threads), which is what a machine whose cores
 * are not shared with other work gives per core. Target (issue 11): at least 2,000 tests/s on two
 * cores with the four law fits. The workers run the compiled reduce worker, as `fractile reduce`
 * does (built first when the sources changed).
 *
 *   npm run bench:reduce [-- --tests=10000 --points=2000]
 */
import { availableParallelism, loadavg } from 'node:os';
import { Piscina } from 'piscina';
import { DEFAULT_REDUCE_SETTINGS, type ReduceSettings } from '@fractile/curves';
import { hollomonCurve, plateauCurve } from '@fractile/curves/testing';
import { channelBuffers, type ReduceTask } from '@fractile/pipeline';
import { peakRssMb } from './bench-util.ts';
import { build, DIST, isFresh } from '../packages/cli/build.mjs';

if (!isFresh()) await build();
const WORKER = new URL(`file://${DIST}/reduce-worker.mjs`).href;

const arg = (name: string, d: number) => Number(process.argv.find((a) => a.startsWith(`--${name}=`))?.split('=')[1] ?? d);
const N = arg('tests', 10_000);
const P = arg('points', 2_000);

function makeTasks(n: number, fitLaws: boolean): ReduceTask[] {
  const settings: ReduceSettings = { ...DEFAULT_REDUCE_SETTINGS, fitLaws };
  const base = [
    plateauCurve({ points: P, noiseMpa: 1.5, toeStrain: 0.0004, seed: 3, rehMpa: 420, relMpa: 395, ypeStrain: 0.018 }),
    hollomonCurve({ points: P, noiseMpa: 1.5, toeStrain: 0.0003, seed: 4, kMpa: 800, n: 0.18 }),
  ];
  // distinct typed arrays per task, so nothing is shared between tests
  return Array.from({ length: n }, (_, i) => {
    const c = base[i % 2].input;
    return {
      testPk: i + 1,
      settingsHash: 'bench',
      settings,
      curve: { ...c, forceN: c.forceN ? c.forceN.slice() : null, extensionMm: c.extensionMm ? c.extensionMm.slice() : null },
      summary: null,
    };
  });
}

async function throughput(n: number, workers: number, fitLaws: boolean): Promise<{ wall: number; perCpu: number }> {
  const tasks = makeTasks(n, fitLaws);
  const pool = new Piscina({ filename: WORKER, minThreads: workers, maxThreads: workers });
  // warm-up: load the workers and JIT the reduction
  const warm = makeTasks(100 * workers, fitLaws);
  await Promise.all(Array.from({ length: workers }, (_, w) => pool.run(warm.slice(100 * w, 100 * w + 100))));
  const t0 = performance.now();
  const c0 = process.cpuUsage();
  const chunk = 64;
  const parts: Promise<unknown>[] = [];
  for (let i = 0; i < tasks.length; i += chunk) {
    const part = tasks.slice(i, i + chunk);
    parts.push(pool.run(part, { transferList: channelBuffers(part) }));
  }
  await Promise.all(parts);
  const s = (performance.now() - t0) / 1000;
  const c = process.cpuUsage(c0);
  await pool.destroy();
  return { wall: n / s, perCpu: n / ((c.user + c.system) / 1e6) };
}

console.log(`bench:reduce — synthetic steel curves, ${P} points each`);
for (const fitLaws of [false, true]) {
  for (const n of [1000, N]) {
    for (const workers of [1, 2]) {
      const m = fitLaws && n === N ? Math.min(n, 2000) : n;
      const t = await throughput(m, workers, fitLaws);
      console.log(`${fitLaws ? 'with law fits   ' : 'properties + n  '} ${String(m).padStart(6)} tests  ${workers} worker${workers > 1 ? 's' : ' '}  ${t.wall.toFixed(0).padStart(6)} tests/s  (${t.perCpu.toFixed(0).padStart(5)} per CPU second)`);
    }
  }
}
console.log(`peak RSS ${peakRssMb().toFixed(0)} MB (main thread and workers share the process)`);
console.log(`load average ${loadavg().map((x) => x.toFixed(1)).join(' ')} on ${availableParallelism()} cores`);
console.log('target: ≥ 2,000 tests/s with 2 workers and the four law fits');
