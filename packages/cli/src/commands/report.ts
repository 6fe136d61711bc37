/** `fractile report`: the HTML report (and exports) of what is reduced, reusing stored stage results. */
import type { Command } from 'commander';
import { CliError, globals, log, type CommandModule } from '../context.ts';
import { catalogPath, groupBy, resolveCatalog, withStore } from '../common-options.ts';
import { addExportOptions, readExportOptions, runAllOutput } from '../run-options.ts';
import { print } from '../output.ts';
import { CODE_VERSION } from '../version.ts';

export const command: CommandModule = {
  order: 70,
  register(program: Command) {
    addExportOptions(
      program
        .command('report')
        .description('write one self-contained HTML report (curves, histograms, property tables per grade and per grade × supplier, control charts, curve versus certificate, data quality) and the CSV/JSON exports')
        .option('--by <fields>', 'grouping of the report (each group is also shown split by supplier)', 'grade')
        .option('--drift-by <fields>', 'grouping of the drift series', 'supplier,grade')
        .option('--catalog <file>', 'grade catalog for the spec limits (default: ./fractile.json\'s, else the catalog of the last reduce)'),
    ).action(async (o: Record<string, unknown>, cmd: Command) => {
      const g = globals(cmd);
      const by = await groupBy(o.by);
      const driftBy = await groupBy(o.driftBy, '--drift-by');
      const ex = readExportOptions(o, g);
      const { currentReduceHashes, runAll } = await import('@fractile/pipeline');
      await withStore(g, async (store) => {
        if (!(await currentReduceHashes(store.db))) throw new CliError('nothing is reduced yet: run `fractile reduce` (or `fractile run`) first');
        const catalog = await resolveCatalog(store.db, o.catalog, g);
        const r = await runAll(store, {
          catalog, catalogSource: catalogPath(o.catalog, g), by, driftBy, outDir: ex.out, generatedAt: g.startedAt, codeVersion: CODE_VERSION, skipReduce: true,
          comments: g.comments, feUnit: ex.feUnit, onStage: (name, s) => log(`  ${name.padEnd(18)} ${s.toFixed(2)} s`),
        });
        log(`report: ${r.report}`);
        print(g, runAllOutput(r));
      });
    });
  },
};
