/** `fractile reduce`: per-test properties, true curves and hardening fits from the raw records. */
import type { Command } from 'commander';
import { globals, log, type CommandModule } from '../context.ts';
import { print } from '../output.ts';
import { progressBar } from '../progress.ts';
import { resolveCatalog, withStore } from '../common-options.ts';
import { CODE_VERSION } from '../version.ts';
import { queueReduce, wholeNumber } from '../queue-target.ts';

export const command: CommandModule = {
  order: 20,
  register(program: Command) {
    program
      .command('reduce')
      .description('reduce every stored test not yet reduced with its grade\'s settings: modulus, Rp/Rt/ReH/ReL, Rm, Ag, Agt, A, n and K, true curves, law fits')
      .option('--catalog <file>', 'grade catalog (JSON): yield definitions, offsets, family, spec limits; default: the catalog of the last reduce')
      .option('--workers <n>', 'worker threads (default: all cores; 0 = none)')
      .option('--no-fits', 'skip the Hollomon, Swift, Voce and Ramberg–Osgood fits')
      .option('--queue', 'PostgreSQL server: enqueue the tests in batches for `fractile worker` processes instead of reducing here')
      .option('--batch-size <n>', 'with --queue: tests per job', '250')
      .option('--then-stages', 'with --queue: after the last batch, one job runs stats, curves and drift')
      .option('--by <fields>', 'with --then-stages: grouping of statistics and curves', 'grade')
      .option('--drift-by <fields>', 'with --then-stages: grouping of the drift series', 'supplier,grade')
      .option('--watch', 'with --queue: show the progress until every batch is done (exit 1 if a job failed)')
      .option('--progress <mode>', 'with --watch: bar (a terminal only), lines or none', 'lines')
      .addHelpText('after', '\nA second run with the same catalog computes nothing. A curve that cannot be reduced is stored as a failure with its reason (see `fractile properties --failed`).')
      .action(async (o: { catalog?: string; workers?: string; fits: boolean; queue?: boolean; batchSize: string; thenStages?: boolean; by: string; driftBy: string; watch?: boolean; progress: string }, cmd: Command) => {
        const g = globals(cmd);
        if (o.queue) {
          return queueReduce(g, { catalog: o.catalog, fits: o.fits, batchSize: wholeNumber(o.batchSize, '--batch-size', 1), thenStages: Boolean(o.thenStages), by: o.by, driftBy: o.driftBy, watch: Boolean(o.watch), progress: o.progress });
        }
        const { runReduce } = await import('@fractile/pipeline');
        await withStore(g, async (store) => {
          const catalog = await resolveCatalog(store.db, o.catalog, g);
          const bar = progressBar('reduce');
          const s = await runReduce(store, {
            catalog,
            codeVersion: CODE_VERSION,
            workers: o.workers === undefined ? undefined : Number(o.workers),
            overrides: o.fits ? {} : { fitLaws: false },
            onProgress: (d, t) => bar.update(d, t),
          });
          bar.stop();
          log(`reduce: run ${s.run}: ${s.reduced} reduced, ${s.given} summary-only, ${s.failed} failed, ${s.unchanged} unchanged (${s.seconds.toFixed(1)} s)`);
          const { timings, ...counts } = s;
          print(g, { kind: 'reduce', data: s, rows: [{ ...counts, ...Object.fromEntries(Object.entries(timings).map(([k, v]) => [`${k}_s`, v])) }], title: 'fractile reduce run: tests reduced, summary-only, failed, unchanged', provenance: { reduce_run: s.run }, result: false });
        });
      });
  },
};
