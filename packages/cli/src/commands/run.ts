/** `fractile run`: every stage, incrementally, then the report and exports. */
import type { Command } from 'commander';
import { globals, log, type CommandModule } from '../context.ts';
import { catalogPath, groupBy, resolveCatalog, withStore } from '../common-options.ts';
import { print } from '../output.ts';
import { addExportOptions, readExportOptions, runAllOutput, runCallbacks, workersOption } from '../run-options.ts';
import { CODE_VERSION } from '../version.ts';

export const command: CommandModule = {
  order: 80,
  register(program: Command) {
    addExportOptions(
      program
        .command('run')
        .description('run every stage incrementally (reduce, stats, curves, drift, curve versus certificate), then write the report and the CSV/JSON exports')
        .option('--catalog <file>', 'grade catalog (JSON); default: ./fractile.json\'s, else the catalog of the last reduce')
        .option('--by <fields>', 'grouping of statistics, curves and report (each group is also shown split by supplier)', 'grade')
        .option('--drift-by <fields>', 'grouping of the drift series', 'supplier,grade')
        .option('--workers <n>', 'worker threads for reduce (default: all cores)'),
    ).action(async (o: Record<string, unknown>, cmd: Command) => {
      const g = globals(cmd);
      const by = await groupBy(o.by);
      const driftBy = await groupBy(o.driftBy, '--drift-by');
      const ex = readExportOptions(o, g);
      const workers = workersOption(o.workers);
      const { runAll } = await import('@fractile/pipeline');
      await withStore(g, async (store) => {
        const catalog = await resolveCatalog(store.db, o.catalog, g);
        log('fractile run:');
        const r = await runAll(store, {
          catalog, catalogSource: catalogPath(o.catalog, g), by, driftBy, outDir: ex.out, workers, generatedAt: g.startedAt, codeVersion: CODE_VERSION,
          comments: g.comments, feUnit: ex.feUnit,
          ...runCallbacks(),
        });
        log(`report: ${r.report}`);
        print(g, runAllOutput(r));
      });
    });
  },
};
