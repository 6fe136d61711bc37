/** `fractile sample`: correlated random property sets per group for reliability analyses. */
import type { Command } from 'commander';
import type { PropertyKey } from '@fractile/pipeline';
import { CliError, globals, log, toCsv, toTable, type CommandModule } from '../context.ts';
import { addFilterOptions, addPopulationOptions, readFilter, readPopulation, readProperties, resolveCatalog, withStore } from '../common-options.ts';
import { CODE_VERSION } from '../version.ts';

const DEFAULT: PropertyKey[] = ['yield_mpa', 'rm_mpa', 'ag_pct', 'n_value'];

export const command: CommandModule = {
  order: 65,
  register(program: Command) {
    addPopulationOptions(addFilterOptions(
      program
        .command('sample')
        .description('correlated random property sets per group: each property by its best-fitting distribution, joined by the group\'s rank correlations (Gaussian copula)')
        .option('--by <fields>', 'grouping (comma-separated)', 'grade')
        .option('--property <keys...>', `properties (default: ${DEFAULT.join(', ')})`)
        .option('--n <count>', 'sets per group', '1000')
        .option('--seed <n>', 'seed; the same seed gives the same sets', '1')
        .option('--catalog <file>', 'grade catalog (default: the catalog of the last reduce)'),
    )).action(async (o: Record<string, unknown>, cmd: Command) => {
        const { DESIGN_CAUTION, parseGroupBy, runAggregate, sampleGroups, NUMERIC_PROPERTIES } = await import('@fractile/pipeline');
      const g = globals(cmd);
      const n = Number(o.n);
      const seed = Number(o.seed);
      if (!Number.isInteger(n) || n < 1) throw new CliError('--n must be a whole number ≥ 1');
      if (!Number.isInteger(seed)) throw new CliError('--seed must be a whole number');
      const properties = readProperties(o, NUMERIC_PROPERTIES, DEFAULT)!;
      await withStore(g, async (store) => {
        const catalog = await resolveCatalog(store.db, o.catalog);
        const agg = await runAggregate(store, { by: parseGroupBy(o.by as string), filter: readFilter(o), population: readPopulation(o), catalog, codeVersion: CODE_VERSION });
        const sets = sampleGroups(agg, properties, n, seed);
        for (const s of sets) for (const w of s.warnings) log(`sample ${JSON.stringify(s.group)}: ${w}`);
        if (g.format === 'json') {
          process.stdout.write(JSON.stringify({ caution: DESIGN_CAUTION, code_version: CODE_VERSION, stats_run: agg.run, sets }, null, 2) + '\n');
          return;
        }
        const rows = sets.flatMap((s) => s.rows.map((r, i) => ({ ...s.group, set: i + 1, ...r })));
        if (g.format === 'csv') process.stdout.write(`# ${DESIGN_CAUTION}\n# code_version: ${CODE_VERSION}, stats run ${agg.run}, seed ${seed}\n` + toCsv(rows));
        else {
          process.stdout.write(toTable(sets.map((s) => ({ group: Object.values(s.group).join(' / '), sets: s.n, marginals: s.marginals.map((m) => `${m.property}:${m.model}`).join(' '), copula_repair: s.copula_repair ? `nearest correlation, largest change ${s.copula_repair.max_change.toFixed(3)}` : null }))));
          process.stdout.write(`\n${DESIGN_CAUTION}\n`);
        }
      });
    });
  },
};
