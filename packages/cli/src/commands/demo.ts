/**
 * `fractile demo`: the invented scenario end to end on the embedded database — generate it,
 * ingest it (its deliberately bad files are rejected and listed), run every stage, and write the
 * report and exports under ./fractile-out/.
 */
import { existsSync, rmSync } from 'node:fs';
import { join, resolve } from 'node:path';
import type { Command } from 'commander';
import { CliError, emit, globals, log, type CommandModule } from '../context.ts';
import { progressBar } from '../progress.ts';
import { CODE_VERSION } from '../version.ts';

export const command: CommandModule = {
  order: 90,
  register(program: Command) {
    program
      .command('demo')
      .description('generate the invented demo scenario, ingest it, run every stage on the embedded database and write the report and exports')
      .option('--out <dir>', 'output folder (scenario files, database, report, exports)', 'fractile-out')
      .option('--tests <n>', 'number of tests in the scenario', '2000')
      .option('--seed <n>', 'seed of the scenario generator', '1')
      .option('--points <n>', 'points per curve', '1500')
      .option('--fresh', 'delete the demo database first')
      .option('--workers <n>', 'worker threads for reduce (default: all cores)')
      .addHelpText('after', '\nThe scenario is invented: its fabricator, mills, grades and dates are not real. The demo database is\n<out>/db unless --db is given.')
      .action(async (o: { out: string; tests: string; seed: string; points: string; fresh?: boolean; workers?: string }, cmd: Command) => {
        const { formatRejection, ingestManifests } = await import('@fractile/ingest');
        const { loadCatalog, parseGroupBy } = await import('@fractile/pipeline');
        const { openStore } = await import('@fractile/store');
        const { generateDemo } = await import('@fractile/seed-demo');
        const { runAll } = await import('../run-all.ts');
        const g = globals(cmd);
        const tests = Number(o.tests);
        const seed = Number(o.seed);
        const points = Number(o.points);
        if (!Number.isInteger(tests) || tests < 20) throw new CliError('--tests must be a whole number ≥ 20');
        if (!Number.isInteger(seed)) throw new CliError('--seed must be a whole number');
        if (!Number.isInteger(points) || points < 100) throw new CliError('--points must be a whole number ≥ 100');
        const out = resolve(o.out);
        const dataDir = join(out, 'scenario');
        const dbTarget = g.db ?? join(out, 'db');
        if (o.fresh && !g.db && existsSync(dbTarget)) rmSync(dbTarget, { recursive: true, force: true });
        const t0 = performance.now();
        log(`demo: generating ${tests} invented tests (seed ${seed}) under ${dataDir}`);
        const demo = generateDemo({ outDir: dataDir, tests, seed, pointsPerCurve: points });
        const tGen = (performance.now() - t0) / 1000;
        log(`  generate   ${tGen.toFixed(2)} s`);
        const store = await openStore(dbTarget);
        try {
          const t1 = performance.now();
          const bar = progressBar('ingest');
          const manifests = demo.manifests.map((m) => ({ path: join(dataDir, m.path), map: m.map ? join(dataDir, m.map) : null }));
          const ingest = await ingestManifests(store, manifests, { codeVersion: CODE_VERSION, onProgress: (d, t) => bar.update(d, t) });
          bar.stop();
          const tIngest = (performance.now() - t1) / 1000;
          log(`  ingest     ${tIngest.toFixed(2)} s: ${ingest.accepted} accepted, ${ingest.duplicates} already stored, ${ingest.rejected.length} rejected`);
          for (const r of ingest.rejected) log(`    ${formatRejection(r)}`);
          const catalogPath = join(dataDir, demo.catalog);
          const r = await runAll(store, {
            catalog: loadCatalog(catalogPath),
            catalogSource: catalogPath,
            by: parseGroupBy('grade'),
            driftBy: parseGroupBy('supplier,grade'),
            outDir: out,
            workers: o.workers === undefined ? undefined : Number(o.workers),
            generatedAt: new Date().toISOString(),
          });
          const total = (performance.now() - t0) / 1000;
          log(`demo: done in ${total.toFixed(1)} s`);
          log(`  report:   ${r.report}`);
          log(`  exports:  ${join(out, 'properties.csv')}, stats.json, drift.json, curves/ (${r.exports.length} files)`);
          log(`  database: ${dbTarget}`);
          log(`  ${r.alerts} drift alerts; the scenario's drifting mill is ${demo.driftingSupplier} (${demo.driftingGrade})`);
          emit(g.format, { report: r.report, exports: r.exports, database: dbTarget, ingest, timings: { generate: tGen, ingest: tIngest, ...r.timings, total } }, [
            { report: r.report, exports: r.exports.length, accepted: ingest.accepted, rejected: ingest.rejected.length, alerts: r.alerts, seconds: total },
          ]);
        } finally {
          await store.close();
        }
      });
  },
};
