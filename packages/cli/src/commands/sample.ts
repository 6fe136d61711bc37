/** `fractile sample`: correlated random property sets per group for reliability analyses. */
import type { Command } from 'commander';
import type { PropertyKey } from '@fractile/pipeline';
import { groupLabel } from '@fractile/report/group-label';
import { CliError, globals, log, type CommandModule } from '../context.ts';
import { addFilterOptions, addPopulationOptions, checkFilterValues, groupBy, readFilter, readPopulation, readProperties, resolveCatalog, withStore } from '../common-options.ts';
import { grouped, print, toTable } from '../output.ts';
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
        const { runAggregate, sampleGroups, NUMERIC_PROPERTIES } = await import('@fractile/pipeline');
      const g = globals(cmd);
      const by = await groupBy(o.by);
      const filter = readFilter(o);
      const n = Number(o.n);
      const seed = Number(o.seed);
      if (!Number.isInteger(n) || n < 1) throw new CliError('--n must be a whole number ≥ 1');
      if (!Number.isInteger(seed)) throw new CliError('--seed must be a whole number');
      const properties = readProperties(o, NUMERIC_PROPERTIES, DEFAULT)!;
      await withStore(g, async (store) => {
        await checkFilterValues(store.db, filter);
        const catalog = await resolveCatalog(store.db, o.catalog, g);
        const agg = await runAggregate(store, { by, filter, population: readPopulation(o), catalog, codeVersion: CODE_VERSION });
        const sets = sampleGroups(agg, properties, n, seed);
        for (const s of sets) for (const w of s.warnings) log(`sample ${JSON.stringify(s.group)}: ${w}`);
        const view = grouped(sets.flatMap((s) => s.rows.map((r, i) => ({ group: s.group, row: { set: i + 1, ...r } }))));
        const summary = toTable(sets.map((s) => ({ group: groupLabel(s.group), sets: s.n, marginals: s.marginals.map((m) => `${m.property}:${m.model}`).join(' '), copula_repair: s.copula_repair ? `nearest correlation, largest change ${s.copula_repair.max_change.toFixed(3)}` : null })));
        print(g, { kind: 'sample', data: { stats_run: agg.run, seed, sets }, ...view, tableText: summary, title: 'fractile random property sets per group (Gaussian copula over the best-fitting marginals)', provenance: { stats_run: agg.run, seed, n, grouping: by, filter } });
      });
    });
  },
};
