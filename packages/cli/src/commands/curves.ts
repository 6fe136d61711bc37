/**
 * `fractile curves`: median and characteristic true stress–plastic strain curves per group
 * (contract JSON); the characteristic curve a pointwise bound or, with `--band simultaneous`, a
 * simultaneous band.
 */
import type { Command } from 'commander';
import type { DesignOptions } from '@fractile/pipeline';
import { groupLabel } from '@fractile/report/group-label';
import { HEADLINE_LEVEL } from '@fractile/stats/default-levels';
import { CliError, globals, log, type CommandModule } from '../context.ts';
import { addFilterOptions, addPopulationOptions, catalogPath, checkFilterValues, groupBy, probability, readFilter, readPopulation, resolveCatalog, withStore } from '../common-options.ts';
import { grouped, print } from '../output.ts';
import { checkOutFolder } from '../run-options.ts';
import { CODE_VERSION } from '../version.ts';

const LAWS = ['swift', 'voce', 'hollomon'] as const;

export const command: CommandModule = {
  order: 50,
  register(program: Command) {
    addPopulationOptions(addFilterOptions(
      program
        .command('curves')
        .description(
          'median and characteristic true stress – plastic strain curves per group, with idealizations ' +
          '(elastic–perfectly plastic, bilinear, multilinear, Ramberg–Osgood)')
        .option('--by <fields>', 'grouping (comma-separated)', 'grade')
        .option('--coverage <p>', 'coverage of the lower tolerance bound at each strain', String(HEADLINE_LEVEL.coverage))
        .option('--confidence <g>', 'confidence of the lower tolerance bound', String(HEADLINE_LEVEL.confidence))
        .option('--model <m>', 'tolerance model at each strain: normal or lognormal', 'normal')
        .option('--extrapolate <law>', 'extend past the valid range by a law fitted to the characteristic curve: swift, voce or hollomon')
        .option('--extrapolate-to <strain>', 'plastic strain the extrapolation reaches (default: end of the grid)')
        .option('--multilinear-points <n>', 'points of the multilinear idealization', '6')
        .option('--catalog <file>', 'grade catalog for the headline settings of the characteristic yield (default: the catalog of the last reduce)')
        .option('--band <kind>',
          'characteristic curve as a pointwise lower tolerance bound (each strain separately) or a simultaneous band ' +
          '(the whole curve at once, critical value by simulation)', 'pointwise')
        .option('--band-simulations <n>', 'Monte Carlo replicates for the simultaneous band’s critical value', '2000')
        .option('--out <dir>', 'also write per-group CSV and JSON exports into this folder, with the FE tables')
        .option('--fe-unit <unit>', 'stress unit of the FE tables written with --out: MPa or ksi', 'MPa'),
    ))
      .addHelpText('after',
        '\nCSV on stdout is a long table (the group fields, plastic_strain, median_mpa, characteristic_mpa, ' +
        'extrapolated) after # comment lines with the caution, the provenance and the band kind (--no-comments: ' +
        'none).\nWith --out, per group <group>.true-stress-plastic-strain.csv is the FE table: true stress against ' +
        'true plastic strain from 0, two columns, no comment lines, its provenance in <file>.provenance.json.')
      .action(async (o: Record<string, unknown>, cmd: Command) => {
        const { bandStatement, runCurves, writeCurveFiles, STRESS_UNITS } = await import('@fractile/pipeline');
        const g = globals(cmd);
        const by = await groupBy(o.by);
        const filter = readFilter(o);
        const feUnit = String(o.feUnit) as (typeof STRESS_UNITS)[number];
        if (!STRESS_UNITS.includes(feUnit)) throw new CliError(`--fe-unit must be ${STRESS_UNITS.join(' or ')}, got "${String(o.feUnit)}"`);
        if (typeof o.out === 'string') checkOutFolder(o.out);
        const model = o.model as string;
        if (model !== 'normal' && model !== 'lognormal') throw new CliError('--model must be normal or lognormal');
        const law = o.extrapolate as string | undefined;
        if (law !== undefined && !(LAWS as readonly string[]).includes(law)) throw new CliError(`--extrapolate must be one of ${LAWS.join(', ')}`);
        const points = Number(o.multilinearPoints);
        if (!Number.isInteger(points) || points < 2) throw new CliError('--multilinear-points must be an integer ≥ 2');
        const band = o.band as string;
        if (band !== 'pointwise' && band !== 'simultaneous') throw new CliError('--band must be pointwise or simultaneous');
        const simulations = Number(o.bandSimulations);
        if (!Number.isInteger(simulations) || simulations < 100) throw new CliError('--band-simulations must be an integer ≥ 100');
        const coverage = probability(o.coverage, '--coverage', HEADLINE_LEVEL.coverage);
        const confidence = probability(o.confidence, '--confidence', HEADLINE_LEVEL.confidence);
        const design: Partial<DesignOptions> = {
          coverage,
          confidence,
          model,
          extrapolate: (law as DesignOptions['extrapolate']) ?? null,
          multilinearPoints: points,
          band,
          ...(band === 'simultaneous' ? { bandSimulations: simulations } : {}),
          ...(o.extrapolateTo !== undefined ? { extrapolateTo: Number(o.extrapolateTo) } : {}),
        };
        await withStore(g, async (store) => {
          await checkFilterValues(store.db, filter);
          const catalog = await resolveCatalog(store.db, o.catalog, g);
          const r = await runCurves(store, { by, design, filter, catalog, population: readPopulation(o), codeVersion: CODE_VERSION, generatedAt: g.startedAt });
          log(`curves: run ${r.run}${r.reused ? ' (stored results reused)' : ''}: ${r.curves.length} groups${r.skipped.length ? `, ${r.skipped.length} left out` : ''}`);
          for (const s of r.skipped) log(`  left out ${groupLabel(s.group)}: ${s.reason}`);
          if (typeof o.out === 'string') log(`curves: wrote ${writeCurveFiles(o.out, r.curves, { feUnit }).length} files under ${o.out}`);
          const view = grouped(
            r.curves.flatMap((c) => c.plastic_strain.map((x, i) => ({ group: c.group, row: { plastic_strain: x, median_mpa: c.median_mpa[i], characteristic_mpa: c.characteristic_mpa[i], extrapolated: c.extrapolated[i] } }))),
          );
          const text = r.curves
            .map(
              (c) =>
                `${groupLabel(c.group)}: ${c.n} tests, ${c.band} band, characteristic yield ${c.characteristic_yield_mpa?.toFixed(1) ?? '—'} MPa, valid to true plastic strain ${c.valid_to_plastic_strain ?? '—'}${c.extrapolated_from !== null ? `, extrapolated (${c.extrapolation?.law}) from ${c.extrapolated_from}` : ''}\n`,
            )
            .join('');
          print(g, {
            kind: 'curves',
            data: r.curves,
            ...view,
            tableText: text || '(none)\n',
            title: 'fractile design curves: median and characteristic true stress [MPa] against true plastic strain [–] per group',
            notes: { median_mpa: 'median true stress [MPa]', characteristic_mpa: 'characteristic true stress [MPa] (the band line says which bound)', extrapolated: 'true where the point lies past the valid range (fitted law)' },
            provenance: { curves_run: r.run, band: bandStatement(band, coverage, confidence), grouping: by, filter, catalog: catalogPath(o.catalog, g) },
          });
        });
      });
  },
};
