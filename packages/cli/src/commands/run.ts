/** `fractile run`: every stage, incrementally, then the report and exports. */
import type { Command } from 'commander';
import { emit, globals, log, type CommandModule } from '../context.ts';
import { resolveCatalog, withStore } from '../common-options.ts';

export const command: CommandModule = {
  order: 80,
  register(program: Command) {
    program
      .command('run')
      .description('run every stage incrementally (reduce, stats, curves, drift), then write the report and the CSV/JSON exports')
      .option('--catalog <file>', 'grade catalog (JSON); default: the catalog of the last reduce')
      .option('--by <fields>', 'grouping of statistics, curves and report', 'grade')
      .option('--drift-by <fields>', 'grouping of the drift series', 'supplier,grade')
      .option('--out <dir>', 'folder for report.html and the exports', 'fractile-out')
      .option('--workers <n>', 'worker threads for reduce (default: all cores)')
      .action(async (o: { catalog?: string; by: string; driftBy: string; out: string; workers?: string }, cmd: Command) => {
        const { parseGroupBy } = await import('@fractile/pipeline');
        const { runAll } = await import('../run-all.ts');
        const g = globals(cmd);
        await withStore(g, async (store) => {
          const catalog = await resolveCatalog(store.db, o.catalog);
          log('fractile run:');
          const r = await runAll(store, {
            catalog,
            catalogSource: o.catalog ?? null,
            by: parseGroupBy(o.by),
            driftBy: parseGroupBy(o.driftBy),
            outDir: o.out,
            workers: o.workers === undefined ? undefined : Number(o.workers),
            generatedAt: new Date().toISOString(),
          });
          log(`report: ${r.report}`);
          emit(g.format, r, [{ report: r.report, exports: r.exports.length, alerts: r.alerts }]);
        });
      });
  },
};
