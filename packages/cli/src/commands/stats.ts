/** `fractile stats`: population statistics and characteristic values per group (contract JSON). */
import type { Command } from 'commander';
import type { Level } from '@fractile/pipeline';
import { DEFAULT_LEVELS, HEADLINE_LEVEL } from '@fractile/stats/default-levels';
import { CliError, globals, log, type CommandModule } from '../context.ts';
import { addFilterOptions, addPopulationOptions, catalogPath, checkFilterValues, groupBy, probability, readFilter, readPopulation, readProperties, resolveCatalog, withStore } from '../common-options.ts';
import { grouped, print } from '../output.ts';
import { CODE_VERSION } from '../version.ts';

/** What the stats table's columns mean (CSV comment block). */
const STATS_NOTES: Readonly<Record<string, string>> = {
  mean: 'mean in the property\'s unit (the unit is the suffix of its name: _mpa, _pct, _gpa; none: dimensionless)',
  sd: 'sample standard deviation (n − 1)',
  cov: 'coefficient of variation sd/mean as a fraction (0.05 = 5 %)',
  p05: 'empirical 5 % percentile',
  characteristic: 'the headline characteristic (design) value by the rule in basis',
  below_min: 'individual tests below the grade\'s specified minimum',
  left_out: 'values left out (excluded tests, values a flag makes unfit)',
};

export const command: CommandModule = {
  order: 40,
  register(program: Command) {
    addPopulationOptions(addFilterOptions(
      program
        .command('stats')
        .description(
          'per group and property: n, mean, SD, CoV, percentiles, normal/lognormal/Weibull fits with Anderson–Darling, ' +
          'characteristic values with the headline design value and its rule, compliance on individual tests, values ' +
          'left out by reason')
        .option('--by <fields>',
          'grouping: grade, supplier, heat, lab, year, quarter, orientation, temperature_c, shape, yield_definition ' +
          '(comma-separated)', 'grade')
        .option('--property <keys...>', 'properties (default: all numeric keys)')
        .option('--coverage <p>', 'coverage of the headline tolerance limit', String(HEADLINE_LEVEL.coverage))
        .option('--confidence <g>', 'confidence of the headline tolerance limit', String(HEADLINE_LEVEL.confidence))
        .option('--prior-v <cov>',
          'prior coefficient of variation for the EN 1990 "V known" fractile of every selected property (overrides the ' +
          'catalog\'s prior_v; without either the method is not offered)')
        .option('--catalog <file>', 'grade catalog for the spec limits (default: the catalog of the last reduce)')
        .option('--correlations', 'print the Pearson and Spearman matrices per group instead'),
    ))
      .addHelpText('after',
        '\nThe characteristic column is the headline (design) value: by default the lowest of the exact normal, ' +
        'lognormal and Weibull tolerance limits at the headline coverage and confidence (the grade catalog may name ' +
        'the method per property); the method and the rule are in the JSON (headline, headline_rule, headline_basis); ' +
        'the other methods are alternatives.')
      .action(async (o: Record<string, unknown>, cmd: Command) => {
        const { runAggregate, NUMERIC_PROPERTIES } = await import('@fractile/pipeline');
      const g = globals(cmd);
      const by = await groupBy(o.by);
      const properties = readProperties(o, NUMERIC_PROPERTIES);
      const filter = readFilter(o);
      const headline: Level = {
        coverage: probability(o.coverage, '--coverage', HEADLINE_LEVEL.coverage),
        confidence: probability(o.confidence, '--confidence', HEADLINE_LEVEL.confidence),
      };
      // the other default levels, then the default headline when another headline is asked for
      const others: Level[] = [...DEFAULT_LEVELS.slice(1), HEADLINE_LEVEL];
      const levels = [headline, ...others.filter((l) => l.coverage !== headline.coverage || l.confidence !== headline.confidence)];
      const priorV = o.priorV === undefined ? undefined : Number(o.priorV);
      if (priorV !== undefined && !(priorV > 0 && priorV < 1)) throw new CliError('--prior-v must be a number between 0 and 1 (exclusive)');
      await withStore(g, async (store) => {
        await checkFilterValues(store.db, filter);
        const catalog = await resolveCatalog(store.db, o.catalog, g);
        const r = await runAggregate(store, { by, properties, levels, priorV, filter, population: readPopulation(o), catalog, codeVersion: CODE_VERSION });
        log(`stats: run ${r.run}${r.reused ? ' (stored results reused)' : ''}: ${r.stats.length} group × property rows`);
        const provenance = { stats_run: r.run, grouping: by, filter, catalog: catalogPath(o.catalog, g) };
        if (o.correlations) {
          const view = grouped(r.correlations.flatMap((c) => c.properties.flatMap((a, i) => c.properties.map((b, j) => ({ group: c.group, row: { a, b, pearson: c.pearson[i][j], spearman: c.spearman[i][j], n: c.n[i][j] } })))));
          print(g, { kind: 'correlations', data: r.correlations, ...view, title: 'fractile correlations: Pearson and Spearman coefficients per group and pair of properties', provenance });
          return;
        }
        const view = grouped(r.stats.map((s) => ({
          group: s.group,
          row: {
            property: s.property, n: s.n, mean: s.mean, sd: s.sd, cov: s.cov, min: s.min, p05: s.percentiles.p05, median: s.median,
            characteristic: s.headline?.value ?? null, method: s.headline?.method ?? null, basis: s.headline_basis,
            best_fit: s.best_fit, below_min: s.compliance?.n_below ?? null, left_out: s.left_out.n, warnings: s.warnings.join('; '),
          },
        })));
        print(g, {
          kind: 'stats',
          data: r.stats,
          ...view,
          percentColumns: ['cov'],
          title: 'fractile statistics: per group and property, with the headline characteristic value',
          notes: STATS_NOTES,
          provenance,
        });
      });
    });
  },
};
