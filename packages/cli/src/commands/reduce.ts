/** `fractile reduce`: per-test properties, true curves and hardening fits from the raw records. */
import type { Command } from 'commander';
import { globals, log, type CommandModule } from '../context.ts';
import { print } from '../output.ts';
import { progressBar } from '../progress.ts';
import { resolveCatalog, withStore } from '../common-options.ts';
import { CODE_VERSION } from '../version.ts';

export const command: CommandModule = {
  order: 20,
  register(program: Command) {
    program
      .command('reduce')
      .description('reduce every stored test not yet reduced with its grade\'s settings: modulus, Rp/Rt/ReH/ReL, Rm, Ag, Agt, A, n and K, true curves, law fits')
      .option('--catalog <file>', 'grade catalog (JSON): yield definitions, offsets, family, spec limits; default: the catalog of the last reduce')
      .option('--workers <n>', 'worker threads (default: all cores; 0 = none)')
      .option('--no-fits', 'skip the Hollomon, Swift, Voce and Ramberg–Osgood fits')
      .addHelpText('after', '\nA second run with the same catalog computes nothing. A curve that cannot be reduced is stored as a failure with its reason (see `fractile properties --failed`).')
      .action(async (o: { catalog?: string; workers?: string; fits: boolean }, cmd: Command) => {
        const { runReduce } = await import('@fractile/pipeline');
        const g = globals(cmd);
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
