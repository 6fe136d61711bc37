/** `fractile report`: the HTML report (and exports) of what is reduced, reusing stored stage results. */
import type { Command } from 'commander';
import { CliError, emit, globals, log, type CommandModule } from '../context.ts';
import { resolveCatalog, withStore } from '../common-options.ts';

export const command: CommandModule = {
  order: 70,
  register(program: Command) {
    program
      .command('report')
      .description('write one self-contained HTML report (curves, histograms, property tables, control charts, data quality) and the CSV/JSON exports')
      .option('--out <dir>', 'output folder', 'fractile-out')
      .option('--by <fields>', 'grouping of the report', 'grade')
      .option('--drift-by <fields>', 'grouping of the drift series', 'supplier,grade')
      .option('--catalog <file>', 'grade catalog for the spec limits (default: the catalog of the last reduce)')
      .action(async (o: { out: string; by: string; driftBy: string; catalog?: string }, cmd: Command) => {
        const { currentReduceHashes, parseGroupBy } = await import('@fractile/pipeline');
        const { runAll } = await import('../run-all.ts');
        const g = globals(cmd);
        await withStore(g, async (store) => {
          if (!(await currentReduceHashes(store.db))) throw new CliError('nothing is reduced yet: run `fractile reduce` (or `fractile run`) first');
          const catalog = await resolveCatalog(store.db, o.catalog);
          const r = await runAll(store, { catalog, catalogSource: o.catalog ?? null, by: parseGroupBy(o.by), driftBy: parseGroupBy(o.driftBy), outDir: o.out, generatedAt: new Date().toISOString(), skipReduce: true });
          log(`report: ${r.report}`);
          emit(g.format, r, [{ report: r.report, exports: r.exports.length, alerts: r.alerts }]);
        });
      });
  },
};
