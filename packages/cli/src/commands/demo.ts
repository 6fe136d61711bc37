/**
 * `fractile demo`: the invented scenario end to end on the embedded database — generate it,
 * ingest it (its deliberately bad files are rejected and listed), run every stage, and write the
 * report and exports under ./fractile-out/, with a fractile.json there (project.ts) so that every
 * command run in that folder uses the demo's database and catalog without options.
 */
import { existsSync, rmSync, writeFileSync } from 'node:fs';
import { join, relative, resolve, sep } from 'node:path';
import type { Command } from 'commander';
import { CliError, globals, log, type CommandModule } from '../context.ts';
import { groupBy } from '../common-options.ts';
import { chooseDb } from '../db-target.ts';
import { print } from '../output.ts';
import { progressBar } from '../progress.ts';
import { PROJECT_FILE } from '../project.ts';
import { addExportOptions, readExportOptions, runAllOutput, runCallbacks, workersOption } from '../run-options.ts';
import { CODE_VERSION } from '../version.ts';

const posix = (p: string) => p.split(sep).join('/');

export const command: CommandModule = {
  order: 90,
  register(program: Command) {
    addExportOptions(
      program
        .command('demo')
        .description('generate the invented demo scenario, ingest it, run every stage on the embedded database and write the report and exports')
        .option('--tests <n>', 'number of tests in the scenario', '2000')
        .option('--seed <n>', 'seed of the scenario generator', '1')
        .option('--points <n>', 'points per curve', '1500')
        .option('--fresh', 'delete the demo database first')
        .option('--workers <n>', 'worker threads for reduce (default: all cores)'),
    )
      .addHelpText('after', `\nThe scenario is invented: its fabricator, mills, grades and dates are not real. The demo database is\n<out>/db unless --db is given; <out>/${PROJECT_FILE} names it, so commands run in <out> find it.`)
      .action(async (o: Record<string, unknown>, cmd: Command) => {
        const g = globals(cmd);
        const tests = Number(o.tests);
        const seed = Number(o.seed);
        const points = Number(o.points);
        if (!Number.isInteger(tests) || tests < 20) throw new CliError('--tests must be a whole number ≥ 20');
        if (!Number.isInteger(seed)) throw new CliError('--seed must be a whole number');
        if (!Number.isInteger(points) || points < 100) throw new CliError('--points must be a whole number ≥ 100');
        const workers = workersOption(o.workers);
        const ex = readExportOptions({ ...o, out: o.out ?? 'fractile-out' }, g);
        const by = await groupBy('grade');
        const driftBy = await groupBy('supplier,grade');
        const out = resolve(ex.out);
        const dataDir = join(out, 'scenario');
        const dbTarget = g.db !== undefined ? chooseDb(g, null).target : join(out, 'db');
        const { formatRejection, ingestManifests } = await import('@fractile/ingest');
        const { loadCatalog, runAll } = await import('@fractile/pipeline');
        const { openStore } = await import('@fractile/store');
        const { generateDemo } = await import('@fractile/seed-demo');
        if (o.fresh && g.db === undefined && existsSync(dbTarget)) rmSync(dbTarget, { recursive: true, force: true });
        const t0 = performance.now();
        log(`demo: generating ${tests} invented tests (seed ${seed}) under ${dataDir}`);
        const demo = generateDemo({ outDir: dataDir, tests, seed, pointsPerCurve: points });
        const tGen = (performance.now() - t0) / 1000;
        log(`  generate           ${tGen.toFixed(2)} s`);
        const store = await openStore(dbTarget);
        try {
          const t1 = performance.now();
          const bar = progressBar('ingest');
          const manifests = demo.manifests.map((m) => ({ path: join(dataDir, m.path), map: m.map ? join(dataDir, m.map) : null }));
          const ingest = await ingestManifests(store, manifests, { codeVersion: CODE_VERSION, onProgress: (d, t) => bar.update(d, t) });
          bar.stop();
          const tIngest = (performance.now() - t1) / 1000;
          log(`  ingest             ${tIngest.toFixed(2)} s: ${ingest.accepted} accepted, ${ingest.duplicates} already stored, ${ingest.rejected.length} rejected (on purpose: the scenario holds bad files)`);
          for (const r of ingest.rejected) log(`    ${formatRejection(r)}`);
          const catalogPath = join(dataDir, demo.catalog);
          const r = await runAll(store, {
            catalog: loadCatalog(catalogPath), catalogSource: catalogPath, by, driftBy, outDir: out, workers, generatedAt: g.startedAt, codeVersion: CODE_VERSION,
            comments: g.comments, feUnit: ex.feUnit,
            ...runCallbacks(),
          });
          const project = {
            $comment: 'fractile project file written by `fractile demo`: commands run in this folder use this database and catalog',
            database: g.db !== undefined ? dbTarget : 'db',
            catalog: posix(relative(out, catalogPath)),
            manifests: manifests.map((m) => (m.map ? { path: posix(relative(out, m.path)), map: posix(relative(out, m.map)) } : posix(relative(out, m.path)))),
            out: '.',
          };
          writeFileSync(join(out, PROJECT_FILE), JSON.stringify(project, null, 2) + '\n');
          const total = (performance.now() - t0) / 1000;
          const curveDir = join(out, 'curves');
          const curveFiles = r.exports.filter((f) => f.startsWith(curveDir + sep)).length;
          const here = relative(process.cwd(), out) || '.';
          log(`demo: done in ${total.toFixed(1)} s — ${ingest.accepted} tests stored, ${r.alerts} drift alerts, ${r.crosschecked} tests with curve and certificate compared.`);
          log('');
          log('What to open first:');
          log(`  1. ${relative(process.cwd(), r.report)} in a browser: per grade the characteristic value (the design value: a lower`);
          log('     tolerance limit — 95 % of tests above it with 75 % confidence), the curves, and the same split by supplier;');
          log('     then the drift charts (the scenario\'s drifting mill is ' + `${demo.driftingSupplier}, ${demo.driftingGrade}), curve vs certificate, and data quality.`);
          log(`  2. ${posix(join(here, 'stats.json'))} and ${posix(join(here, 'properties.csv'))}: the same numbers for your own tools;`);
          log(`     ${posix(join(here, 'curves'))}/ (${curveFiles} files): characteristic curves, FE tables *.true-stress-plastic-strain.csv.`);
          log(`  3. cd ${here} && fractile stats: ${PROJECT_FILE} there names the database (${g.db !== undefined ? dbTarget : posix(join(here, 'db'))}) and the catalog.`);
          print(g, runAllOutput(r, 'demo', { database: dbTarget, project_file: join(out, PROJECT_FILE), ingest, timings: { generate: tGen, ingest: tIngest, ...r.timings, total } }));
        } finally {
          await store.close();
        }
      });
  },
};
