/**
 * Command line of the demo generator:
 *   node --import tsx seed-demo/src/cli.ts --out DIR [--tests N] [--seed S] [--points P] [--benchmark]
 * Writes the scenario (or, with --benchmark, the plain ingest benchmark set), prints a summary
 * on stderr and the path of demo-manifest.json (or of the benchmark manifest) on stdout.
 */
import { join } from 'node:path';
import { Command, InvalidArgumentError } from 'commander';
import { generateDemo } from './generate-demo.ts';
import { generateBenchmarkSet } from './benchmark-set.ts';

const positiveInt = (name: string) => (v: string): number => {
  const n = Number(v);
  if (!Number.isInteger(n) || n <= 0) throw new InvalidArgumentError(`${name} must be a positive integer`);
  return n;
};

const program = new Command()
  .name('seed-demo')
  .description('writes the invented demo scenario of fractile')
  .requiredOption('--out <dir>', 'output folder')
  .option('--tests <n>', 'number of test records', positiveInt('--tests'), 2000)
  .option('--seed <s>', 'random seed (unsigned 32-bit integer)', (v) => {
    const n = Number(v);
    if (!Number.isInteger(n) || n < 0 || n > 0xffffffff) throw new InvalidArgumentError('--seed must be an integer 0..4294967295');
    return n;
  })
  .option('--points <p>', 'points per curve', positiveInt('--points'))
  .option('--benchmark', 'write the plain kN/mm ingest benchmark set instead of the scenario')
  .parse();

const o = program.opts<{ out: string; tests: number; seed?: number; points?: number; benchmark?: boolean }>();
const t0 = performance.now();
try {
  if (o.benchmark) {
    const b = generateBenchmarkSet({ outDir: o.out, tests: o.tests, points: o.points, seed: o.seed });
    process.stderr.write(`benchmark set: ${b.tests} tests × ${b.points} points in ${((performance.now() - t0) / 1000).toFixed(1)} s\n`);
    process.stdout.write(join(b.outDir, b.manifest) + '\n');
  } else {
    const m = generateDemo({ outDir: o.out, tests: o.tests, seed: o.seed, pointsPerCurve: o.points });
    const c = m.counts;
    const lines = [
      `demo scenario (invented): ${m.fabricator}, ${c.tests} tests ${m.window.from} .. ${m.window.to}, seed ${m.seed}`,
      `  curves ${c.curveTests} (${m.pointsPerCurve} points), summary-only ${c.summaryOnly}`,
      `  by supplier: ${Object.entries(c.bySupplier).map(([k, v]) => `${k} ${v}`).join(', ')}`,
      `  by grade: ${Object.entries(c.byGrade).map(([k, v]) => `${k} ${v}`).join(', ')}`,
      `  layouts: ${Object.entries(c.byLayout).map(([k, v]) => `${k} ${v}`).join(', ')}; unload-reload ${c.unloadReload}`,
      `  drifting: ${m.driftingSupplier} / ${m.driftingGrade} from ${m.driftFrom} (${c.drifting} tests)`,
      `  manifests ${c.manifests}; problem rows ${c.problemRows}, expected rejections ${c.expectedRejections}`,
      `  written in ${((performance.now() - t0) / 1000).toFixed(1)} s`,
    ];
    process.stderr.write(lines.join('\n') + '\n');
    process.stdout.write(join(m.outDir, 'demo-manifest.json') + '\n');
  }
} catch (e) {
  const err = e as Error & { code?: string };
  process.stderr.write(`seed-demo: ${err.code ?? 'error'}: ${err.message}\n`);
  process.exit(1);
}
