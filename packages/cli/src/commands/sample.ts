/**
 * `fractile sample`: correlated random property sets per group for reliability analyses, optionally
 * with parameter uncertainty; with --curves, random whole true stress–plastic strain curves.
 */
import type { Command } from 'commander';
import type { ParameterUncertainty } from '@fractile/stats';
import { groupLabel } from '@fractile/report/group-label';
import { CliError, globals, log, type CommandModule } from '../context.ts';
import { addFilterOptions, addPopulationOptions, checkFilterValues, readFilter, readPopulation, readProperties, resolveCatalog, wholeNumber, withStore } from '../common-options.ts';
import { grouped, print, toTable } from '../output.ts';
import { CODE_VERSION } from '../version.ts';

const MODES = ['none', 'asymptotic', 'bootstrap'] as const;

export const command: CommandModule = {
  order: 65,
  register(program: Command) {
    addPopulationOptions(addFilterOptions(
      program
        .command('sample')
        .description('correlated random property sets per group: each property by its best-fitting distribution, joined by the group\'s rank correlations (Gaussian copula)')
        .option('--by <fields>', 'grouping (comma-separated)', 'grade')
        .option('--property <keys...>', 'properties (default: yield_mpa, rm_mpa, ag_pct, n_value)')
        .option('--n <count>', 'sets per group', '1000')
        .option('--seed <n>', 'seed; the same seed gives the same sets', '1')
        .option('--parameter-uncertainty <mode>', 'none; asymptotic (marginal parameters from the normal law of the MLEs); bootstrap (marginals and correlations of bootstrap replicates)', 'none')
        .option('--parameter-draws <count>', 'model draws with parameter uncertainty: the sets are split into this many blocks, one model each (default: one per set)')
        .option('--bootstrap <count>', 'bootstrap replicates of the distribution model', '500')
        .option('--catalog <file>', 'grade catalog (default: the catalog of the last reduce)')
        .option('--curves', 'random true stress – plastic strain curves instead (functional principal components of the curves with the uniform strain, Gaussian copula); each ends at its own uniform strain')
        .option('--variance <fraction>', 'with --curves: share of the curves\' variance the kept components explain', '0.999')
        .option('--keep-decreasing', 'with --curves: leave the drawn curves as drawn (default: made non-decreasing by isotonic regression)')
        .option('--out <dir>', 'with --curves: also write <group>.random-curves.csv and .json per group into this folder'),
    ))
      .addHelpText('after', `
With parameter uncertainty, each set carries \`parameter_draw\`: the sets of one draw share one model.
With --curves, CSV is a long table (group fields, sample, plastic_strain, true_stress_mpa) after # lines with the
caution and the provenance; the last row of each sample is its uniform plastic strain. JSON: docs/random-curves.md.`)
      .action(async (o: Record<string, unknown>, cmd: Command) => {
        const { DEFAULT_SAMPLE_PROPERTIES, parseGroupBy, runDistributions, sampleGroups, NUMERIC_PROPERTIES } = await import('@fractile/pipeline');
        const g = globals(cmd);
        const n = wholeNumber(o.n, '--n', 1000);
        const seed = Number(o.seed);
        if (!Number.isInteger(seed)) throw new CliError('--seed must be a whole number');
        const mode = String(o.parameterUncertainty);
        if (!(MODES as readonly string[]).includes(mode)) throw new CliError(`--parameter-uncertainty must be one of ${MODES.join(', ')}`);
        const draws = wholeNumber(o.parameterDraws, '--parameter-draws', n);
        if (draws > n) throw new CliError(`--parameter-draws must not exceed --n (${n})`);
        const bootstrap = wholeNumber(o.bootstrap, '--bootstrap', 500, mode === 'bootstrap' ? 2 : 0);
        const properties = readProperties(o, NUMERIC_PROPERTIES, DEFAULT_SAMPLE_PROPERTIES)!;
        if (o.curves) {
          const fraction = Number(o.variance);
          if (!(fraction > 0 && fraction <= 1)) throw new CliError(`--variance must be a number in (0, 1], got "${String(o.variance)}"`);
          const { randomCurves, randomCurvesExport, runCurveModels } = await import('@fractile/pipeline');
          const { printRandomCurves } = await import('../random-curves-output.ts');
          await withStore(g, async (store) => {
            await checkFilterValues(store.db, readFilter(o));
            const stage = await runCurveModels(store, { by: parseGroupBy(o.by as string), model: { varianceFraction: fraction }, filter: readFilter(o), population: readPopulation(o), codeVersion: CODE_VERSION });
            log(`sample --curves: sample run ${stage.run}${stage.reused ? ' (stored model reused)' : ''}: ${stage.models.length} groups`);
            const sets = randomCurves(stage.models, n, seed, !o.keepDecreasing);
            for (const s of sets) for (const w of s.warnings) log(`sample ${JSON.stringify(s.group)}: ${w}`);
            await printRandomCurves(randomCurvesExport(stage, sets, CODE_VERSION, new Date().toISOString()), g.format, typeof o.out === 'string' ? o.out : null);
          });
          return;
        }
        await withStore(g, async (store) => {
          const filter = readFilter(o);
          await checkFilterValues(store.db, filter);
          const catalog = await resolveCatalog(store.db, o.catalog, g);
          const models = await runDistributions(store, { by: parseGroupBy(o.by as string), properties, bootstrap, seed, filter, population: readPopulation(o), catalog, codeVersion: CODE_VERSION });
          const uncertainty = mode === 'none' ? null : { mode: mode as ParameterUncertainty, draws };
          const sets = sampleGroups(models.models, n, seed, uncertainty);
          for (const s of sets) for (const w of s.warnings) log(`sample ${JSON.stringify(s.group)}: ${w}`);
          const view = grouped(sets.flatMap((s) => s.rows.map((r, i) => ({ group: s.group, row: { set: i + 1, ...r } }))));
          const summary = toTable(sets.map((s) => ({
            group: groupLabel(s.group), sets: s.n, marginals: s.marginals.map((m) => `${m.property}:${m.model}`).join(' '),
            parameter_uncertainty: s.parameter_uncertainty ? `${s.parameter_uncertainty.mode}, ${s.parameter_uncertainty.draws} draws` : 'none',
            copula_repair: s.copula_repair ? `nearest correlation, largest change ${s.copula_repair.max_change.toFixed(3)}` : 'none',
          })));
          const how = uncertainty ? { parameter_uncertainty: mode, parameter_draws: draws } : {};
          print(g, {
            kind: 'sample', data: { stats_run: models.stats_run, sample_run: models.run, seed, sets }, ...view, tableText: summary,
            title: 'fractile random property sets per group (Gaussian copula over the best-fitting marginals)',
            provenance: { stats_run: models.stats_run, sample_run: models.run, seed, ...how },
          });
        });
      });
  },
};
