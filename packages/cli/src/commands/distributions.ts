/** `fractile distributions`: the documented distribution export per group (marginals, correlations, copula, parameter uncertainty). */
import type { Command } from 'commander';
import { CliError, globals, log, type CommandModule } from '../context.ts';
import { csvTable } from '@fractile/pipeline/export-format';
import { DESIGN_VALUE_CAUTION } from '@fractile/report/caution';
import { toTable } from '../output.ts';
import { addFilterOptions, addPopulationOptions, readFilter, readPopulation, readProperties, resolveCatalog, wholeNumber, withStore } from '../common-options.ts';
import { CODE_VERSION } from '../version.ts';

export const command: CommandModule = {
  order: 66,
  register(program: Command) {
    addPopulationOptions(addFilterOptions(
      program
        .command('distributions')
        .description('per group, the fitted distributions of the properties with the range of data, goodness of fit and parameter uncertainty (asymptotic MLE covariance and bootstrap), the rank and normal-score correlations and the copula, as one documented JSON document')
        .option('--by <fields>', 'grouping (comma-separated)', 'grade')
        .option('--property <keys...>', 'properties (default: yield_mpa, rm_mpa, ag_pct, n_value)')
        .option('--bootstrap <count>', 'bootstrap replicates (0: none)', '500')
        .option('--seed <n>', 'seed of the bootstrap', '1')
        .option('--catalog <file>', 'grade catalog (default: the catalog of the last reduce)'),
    ))
      .addHelpText('after', '\n--format json prints the export described in docs/distribution-export.md (schema: docs/distribution-export.schema.json).\n--format csv prints one row per group and property: family, parameters, standard errors.')
      .action(async (o: Record<string, unknown>, cmd: Command) => {
        const { DEFAULT_SAMPLE_PROPERTIES, distributionExport, parseGroupBy, runDistributions, NUMERIC_PROPERTIES } = await import('@fractile/pipeline');
        const g = globals(cmd);
        const seed = Number(o.seed);
        if (!Number.isInteger(seed)) throw new CliError('--seed must be a whole number');
        const bootstrap = wholeNumber(o.bootstrap, '--bootstrap', 500, 0);
        if (bootstrap === 1) throw new CliError('--bootstrap must be 0 or at least 2');
        const properties = readProperties(o, NUMERIC_PROPERTIES, DEFAULT_SAMPLE_PROPERTIES)!;
        await withStore(g, async (store) => {
          const catalog = await resolveCatalog(store.db, o.catalog, g);
          const r = await runDistributions(store, { by: parseGroupBy(o.by as string), properties, bootstrap, seed, filter: readFilter(o), population: readPopulation(o), catalog, codeVersion: CODE_VERSION });
          log(`distributions: sample run ${r.run}${r.reused ? ' (stored model reused)' : ''}, stats run ${r.stats_run}: ${r.models.length} groups`);
          for (const m of r.models) for (const w of m.warnings) log(`distributions ${JSON.stringify(m.group)}: ${w}`);
          const doc = distributionExport(r, CODE_VERSION, new Date().toISOString());
          if (g.format === 'json') {
            process.stdout.write(JSON.stringify(doc, null, 2) + '\n');
            return;
          }
          const rows = doc.groups.flatMap((gr) =>
            gr.marginals.map((m) => {
              const names = Object.keys(m.parameters);
              return {
                ...gr.group,
                property: m.property,
                unit: m.unit,
                n: m.n,
                family: m.family,
                [`param_1`]: `${names[0]}=${m.parameters[names[0]]}`,
                [`param_2`]: `${names[1]}=${m.parameters[names[1]]}`,
                se_asymptotic: m.uncertainty.asymptotic ? m.uncertainty.asymptotic.standard_errors.join(' ') : null,
                se_bootstrap: m.uncertainty.bootstrap ? m.uncertainty.bootstrap.standard_errors.join(' ') : null,
                anderson_darling: m.anderson_darling,
                p_value: m.p_value,
                min: m.data_range.min,
                max: m.data_range.max,
              };
            }),
          );
          if (g.format === 'csv') process.stdout.write(`# ${DESIGN_VALUE_CAUTION}\n# code_version: ${CODE_VERSION}, stats run ${r.stats_run}, sample run ${r.run}\n` + csvTable(rows));
          else process.stdout.write(toTable(rows) + `\n${DESIGN_VALUE_CAUTION}\n`);
        });
      });
  },
};
