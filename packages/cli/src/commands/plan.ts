/** `fractile plan`: how the design value is expected to move with more tests (sample-size planning). */
import type { Command } from 'commander';
import { CliError, globals, type CommandModule } from '../context.ts';
import { csvTable } from '@fractile/pipeline/export-format';
import { DESIGN_VALUE_CAUTION } from '@fractile/report/caution';
import { toTable } from '../output.ts';
import { addFilterOptions, addPopulationOptions, readFilter, readPopulation, readProperties, resolveCatalog, wholeNumber, wholeNumbers, withStore } from '../common-options.ts';
import { CODE_VERSION } from '../version.ts';

export const command: CommandModule = {
  order: 68,
  register(program: Command) {
    addPopulationOptions(addFilterOptions(
      program
        .command('plan')
        .description('sample-size planning: per group and property, the expected design value (and its 5–95 % range) after more tests, the tolerance factor at each n and the spread of the estimate')
        .option('--by <fields>', 'grouping (comma-separated)', 'grade')
        .option('--property <keys...>', 'properties (default: yield_mpa, rm_mpa)')
        .option('--add <counts>', 'numbers of added tests (comma-separated)', '10,20,50')
        .option('--replicates <count>', 'Monte Carlo replicates per row', '2000')
        .option('--seed <n>', 'seed of the Monte Carlo', '1')
        .option('--catalog <file>', 'grade catalog (default: the catalog of the last reduce)'),
    ))
      .addHelpText('after', '\nThe added tests are drawn from the population as fitted (the headline method\'s family); the design value is recomputed\nby its own method on the tests at hand plus the added ones.')
      .action(async (o: Record<string, unknown>, cmd: Command) => {
        const { DEFAULT_PLAN_PROPERTIES, parseGroupBy, runPlan, NUMERIC_PROPERTIES } = await import('@fractile/pipeline');
        const g = globals(cmd);
        const added = wholeNumbers(o.add, '--add', [10, 20, 50]);
        const replicates = wholeNumber(o.replicates, '--replicates', 2000, 2);
        const seed = Number(o.seed);
        if (!Number.isInteger(seed)) throw new CliError('--seed must be a whole number');
        const properties = readProperties(o, NUMERIC_PROPERTIES, DEFAULT_PLAN_PROPERTIES)!;
        await withStore(g, async (store) => {
          const catalog = await resolveCatalog(store.db, o.catalog, g);
          const r = await runPlan(store, { by: parseGroupBy(o.by as string), properties, added, replicates, seed, filter: readFilter(o), population: readPopulation(o), catalog, codeVersion: CODE_VERSION });
          if (g.format === 'json') {
            process.stdout.write(JSON.stringify({ caution: DESIGN_VALUE_CAUTION, code_version: CODE_VERSION, stats_run: r.stats_run, plans: r.plans }, null, 2) + '\n');
            return;
          }
          const rows: Record<string, unknown>[] = r.plans.flatMap((p): Record<string, unknown>[] =>
            p.plan
              ? p.plan.rows.map((row) => ({ ...p.group, property: p.property, method: p.plan!.method, added: row.added, n: row.n, k: row.factors.k ?? null, t: row.factors.t ?? null, r: row.factors.r ?? null, expected: row.expected, p05: row.p05, p95: row.p95, gain: row.gain, sd_fresh: row.sd_fresh, population_fractile: p.plan!.population_fractile }))
              : [{ ...p.group, property: p.property, method: null, added: null, n: null, k: null, t: null, r: null, expected: null, p05: null, p95: null, gain: null, sd_fresh: null, population_fractile: null, note: p.note }],
          );
          if (g.format === 'csv') process.stdout.write(`# ${DESIGN_VALUE_CAUTION}\n# code_version: ${CODE_VERSION}, stats run ${r.stats_run}, seed ${seed}, ${replicates} replicates\n` + csvTable(rows));
          else process.stdout.write(toTable(rows) + `\n${DESIGN_VALUE_CAUTION}\n`);
        });
      });
  },
};
