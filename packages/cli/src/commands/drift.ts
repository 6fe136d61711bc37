/** `fractile drift`: control charts, change points and supplier comparison (contract JSON). */
import type { Command } from 'commander';
import { CliError, emit, globals, log, type CommandModule } from '../context.ts';
import { addFilterOptions, readFilter, readProperties, resolveCatalog, withStore } from '../common-options.ts';
import { CODE_VERSION } from '../version.ts';

function positive(s: unknown, name: string): number | undefined {
  if (s === undefined) return undefined;
  const x = Number(s);
  if (!(x > 0)) throw new CliError(`${name} must be a positive number, got "${String(s)}"`);
  return x;
}

export const command: CommandModule = {
  order: 60,
  register(program: Command) {
    addFilterOptions(
      program
        .command('drift')
        .description('supplier drift over time: individuals/moving-range, EWMA and CUSUM charts, change points, rolling capability, supplier comparison, alerts')
        .option('--by <fields>', 'series grouping (comma-separated)', 'supplier,grade')
        .option('--property <keys...>', 'properties (default: yield_mpa, rm_mpa)')
        .option('--baseline <spec>', 'baseline: N (first N points) or FROM..TO dates (default: the first third of each series, at least 30 points)')
        .option('--ewma-lambda <l>', 'EWMA weight λ (default 0.1)')
        .option('--ewma-l <L>', 'EWMA limit width L in SDs (default 2.814, ARL0 ≈ 500 with λ = 0.1)')
        .option('--cusum-k <k>', 'CUSUM reference value k in SDs (default 0.5)')
        .option('--cusum-h <h>', 'CUSUM decision interval h in SDs (default 5)')
        .option('--catalog <file>', 'grade catalog for the spec minima (default: the catalog of the last reduce)')
        .option('--all-rules', 'every chart signal is an alert (default: only signals toward a specification limit of the property)')
        .option('--per-test', 'chart every test (default: one point per heat, the mean of its tests)'),
    ).action(async (o: Record<string, unknown>, cmd: Command) => {
        const { driftContract, parseGroupBy, runDrift, NUMERIC_PROPERTIES } = await import('@fractile/pipeline');
      const g = globals(cmd);
      let baseline: { firstN?: number; from?: string; to?: string } | undefined;
      if (typeof o.baseline === 'string') {
        const m = /^(\d{4}-\d{2}-\d{2})\.\.(\d{4}-\d{2}-\d{2})$/.exec(o.baseline);
        if (m) baseline = { from: m[1], to: m[2] };
        else if (/^\d+$/.test(o.baseline) && Number(o.baseline) >= 2) baseline = { firstN: Number(o.baseline) };
        else throw new CliError(`--baseline must be a count (e.g. 30) or a date range FROM..TO, got "${o.baseline}"`);
      }
      const lambda = positive(o.ewmaLambda, '--ewma-lambda');
      const L = positive(o.ewmaL, '--ewma-l');
      const k = positive(o.cusumK, '--cusum-k');
      const h = positive(o.cusumH, '--cusum-h');
      if (lambda !== undefined && lambda > 1) throw new CliError('--ewma-lambda must be in (0, 1]');
      const monitor = {
        ...(baseline ? { baseline } : {}),
        ...(lambda !== undefined || L !== undefined ? { ewma: { lambda: lambda ?? 0.1, L: L ?? 2.814 } } : {}),
        ...(k !== undefined || h !== undefined ? { cusum: { k: k ?? 0.5, h: h ?? 5 } } : {}),
      };
      await withStore(g, async (store) => {
        const catalog = await resolveCatalog(store.db, o.catalog);
        const r = await runDrift(store, { by: parseGroupBy(o.by as string), properties: readProperties(o, NUMERIC_PROPERTIES), monitor, filter: readFilter(o), catalog, codeVersion: CODE_VERSION, alertRules: o.allRules ? 'all' : 'toward-limits', unit: o.perTest ? 'test' : 'heat' });
        log(`drift: run ${r.run}${r.reused ? ' (stored results reused)' : ''}: ${r.series.length} series, ${r.alerts.length} alerts, ${r.change_points.length} change points`);
        const flat = r.alerts.map((a) => ({ group: Object.values(a.group).join(' / '), property: a.property, rule: a.rule, first_date: a.first_date, magnitude: a.magnitude, unit: a.magnitude_unit, tests: a.tests.length }));
        emit(g.format, driftContract(r), flat);
      });
    });
  },
};
