/** `fractile stats`: population statistics and characteristic values per group (contract JSON). */
import type { Command } from 'commander';
import type { Level } from '@fractile/pipeline';
import { CliError, emit, globals, log, type CommandModule } from '../context.ts';
import { addFilterOptions, addPopulationOptions, probability, readFilter, readPopulation, readProperties, resolveCatalog, withStore } from '../common-options.ts';
import { CODE_VERSION } from '../version.ts';

export const command: CommandModule = {
  order: 40,
  register(program: Command) {
    addPopulationOptions(addFilterOptions(
      program
        .command('stats')
        .description('per group and property: n, mean, SD, CoV, percentiles, normal/lognormal/Weibull fits with Anderson–Darling, characteristic values with the headline design value and its rule, compliance on individual tests, values left out by reason')
        .option('--by <fields>', 'grouping: grade, supplier, heat, lab, year, quarter, orientation, temperature_c, shape, yield_definition (comma-separated)', 'grade')
        .option('--property <keys...>', 'properties (default: all numeric keys)')
        .option('--coverage <p>', 'coverage of the headline tolerance limit', '0.95')
        .option('--confidence <g>', 'confidence of the headline tolerance limit', '0.75')
        .option('--prior-v <cov>', 'prior coefficient of variation for the EN 1990 "V known" fractile of every selected property (overrides the catalog\'s prior_v; without either the method is not offered)')
        .option('--catalog <file>', 'grade catalog for the spec limits (default: the catalog of the last reduce)')
        .option('--correlations', 'print the Pearson and Spearman matrices per group instead'),
    ))
      .addHelpText('after', '\nThe characteristic column is the headline (design) value: by default the lowest of the exact normal, lognormal and Weibull tolerance limits at the headline coverage and confidence (the grade catalog may name the method per property); the method and the rule are in the JSON (headline, headline_rule, headline_basis); the other methods are alternatives.')
      .action(async (o: Record<string, unknown>, cmd: Command) => {
        const { parseGroupBy, runAggregate, NUMERIC_PROPERTIES } = await import('@fractile/pipeline');
      const g = globals(cmd);
      const headline: Level = { coverage: probability(o.coverage, '--coverage', 0.95), confidence: probability(o.confidence, '--confidence', 0.75) };
      const others: Level[] = [{ coverage: 0.99, confidence: 0.95 }, { coverage: 0.9, confidence: 0.95 }, { coverage: 0.95, confidence: 0.75 }];
      const levels = [headline, ...others.filter((l) => l.coverage !== headline.coverage || l.confidence !== headline.confidence)];
      const priorV = o.priorV === undefined ? undefined : Number(o.priorV);
      if (priorV !== undefined && !(priorV > 0 && priorV < 1)) throw new CliError('--prior-v must be a number between 0 and 1 (exclusive)');
      await withStore(g, async (store) => {
        const catalog = await resolveCatalog(store.db, o.catalog);
        const r = await runAggregate(store, { by: parseGroupBy(o.by as string), properties: readProperties(o, NUMERIC_PROPERTIES), levels, priorV, filter: readFilter(o), population: readPopulation(o), catalog, codeVersion: CODE_VERSION });
        log(`stats: run ${r.run}${r.reused ? ' (stored results reused)' : ''}: ${r.stats.length} group × property rows`);
        if (o.correlations) {
          const flat = r.correlations.flatMap((c) => c.properties.flatMap((a, i) => c.properties.map((b, j) => ({ group: Object.values(c.group).join(' / '), a, b, pearson: c.pearson[i][j], spearman: c.spearman[i][j], n: c.n[i][j] }))));
          emit(g.format, r.correlations, flat);
          return;
        }
        const flat = r.stats.map((s) => ({
          group: Object.values(s.group).join(' / '), property: s.property, n: s.n, mean: s.mean, sd: s.sd, cov: s.cov, min: s.min, p05: s.percentiles.p05, median: s.median,
          characteristic: s.headline?.value ?? null, method: s.headline?.method ?? null, basis: s.headline_basis,
          best_fit: s.best_fit, below_min: s.compliance?.n_below ?? null, left_out: s.left_out.n, warnings: s.warnings.join('; '),
        }));
        emit(g.format, r.stats, flat);
      });
    });
  },
};
