/** `fractile drift`: control charts, change points, capability and supplier comparison (contract JSON). */
import type { Command } from 'commander';
import { CliError, globals, log, type CommandModule } from '../context.ts';
import { addFilterOptions, catalogPath, checkFilterValues, groupBy, readFilter, readProperties, resolveCatalog, withStore } from '../common-options.ts';
import { grouped, print } from '../output.ts';
import { CODE_VERSION } from '../version.ts';

function positive(s: unknown, name: string): number | undefined {
  if (s === undefined) return undefined;
  const x = Number(s);
  if (!(x > 0)) throw new CliError(`${name} must be a positive number, got "${String(s)}"`);
  return x;
}

const UNITS = ['auto', 'tests', 'heat-means'] as const;

export const command: CommandModule = {
  order: 60,
  register(program: Command) {
    addFilterOptions(
      program
        .command('drift')
        .description('supplier drift over time: self-starting CUSUM, Shewhart, EWMA and moving-range charts on tests or heat means, change points, capability of individual tests, supplier comparison, alerts with their state')
        .option('--by <fields>', 'series grouping (comma-separated)', 'supplier,grade')
        .option('--property <keys...>', 'properties (default: yield_mpa, rm_mpa)')
        .option('--baseline <spec>', 'tests the chart structure (heat effect, SD of a test) is studied on: N (first N tests) or FROM..TO dates (default: the first 100 tests)')
        .option('--unit <unit>', 'points charted: auto (heat means where the baseline shows a heat effect), tests or heat-means', 'auto')
        .option('--per-test', 'the same as --unit tests')
        .option('--arl0 <tests>', 'in-control average run length of each one-sided CUSUM, in tests (default 1500)')
        .option('--design-shift <sd>', 'shift the CUSUM is designed for, in SDs of one test (default 1)')
        .option('--cusum-k <k>', 'given CUSUM reference value, in SDs of a charted point (with --cusum-h; default: designed)')
        .option('--cusum-h <h>', 'given CUSUM decision interval, in SDs of a charted point (with --cusum-k)')
        .option('--ewma-lambda <l>', 'EWMA weight λ (default 0.1)')
        .option('--ewma-l <L>', 'EWMA limit width L in SDs (default 2.814, ARL0 ≈ 500 points with λ = 0.1)')
        .option('--capability-window <tests>', 'tests in the rolling capability window (default 50)')
        .option('--catalog <file>', 'grade catalog for the spec limits and max_fraction_below (default: the catalog of the last reduce)')
        .option('--all-rules', 'every chart signal is an alert (default: CUSUM, Shewhart, change-point and capability rules toward a specification limit)'),
    ).action(async (o: Record<string, unknown>, cmd: Command) => {
      const { driftContract, runDrift, NUMERIC_PROPERTIES } = await import('@fractile/pipeline');
      const g = globals(cmd);
      const by = await groupBy(o.by);
      const properties = readProperties(o, NUMERIC_PROPERTIES);
      const filter = readFilter(o);
      let baseline: { firstN?: number; from?: string; to?: string } | undefined;
      if (typeof o.baseline === 'string') {
        const m = /^(\d{4}-\d{2}-\d{2})\.\.(\d{4}-\d{2}-\d{2})$/.exec(o.baseline);
        if (m) baseline = { from: m[1], to: m[2] };
        else if (/^\d+$/.test(o.baseline) && Number(o.baseline) >= 2) baseline = { firstN: Number(o.baseline) };
        else throw new CliError(`--baseline must be a count (e.g. 100) or a date range FROM..TO, got "${o.baseline}"`);
      }
      const unit = o.perTest ? 'tests' : String(o.unit);
      if (!(UNITS as readonly string[]).includes(unit)) throw new CliError(`--unit must be one of ${UNITS.join(', ')}, got "${unit}"`);
      const lambda = positive(o.ewmaLambda, '--ewma-lambda');
      const L = positive(o.ewmaL, '--ewma-l');
      const k = positive(o.cusumK, '--cusum-k');
      const h = positive(o.cusumH, '--cusum-h');
      if ((k === undefined) !== (h === undefined)) throw new CliError('--cusum-k and --cusum-h go together (without them the CUSUM is designed from --arl0 and --design-shift)');
      if (lambda !== undefined && lambda > 1) throw new CliError('--ewma-lambda must be in (0, 1]');
      const arl0 = positive(o.arl0, '--arl0');
      const shift = positive(o.designShift, '--design-shift');
      const window = positive(o.capabilityWindow, '--capability-window');
      if (window !== undefined && !(Number.isInteger(window) && window >= 2)) throw new CliError(`--capability-window must be a whole number of tests, 2 or more, got "${String(o.capabilityWindow)}"`);
      const monitor = {
        ...(baseline ? { baseline } : {}),
        ...(arl0 !== undefined ? { arl0Tests: arl0 } : {}),
        ...(shift !== undefined ? { designShiftSd: shift } : {}),
        ...(k !== undefined && h !== undefined ? { cusum: { k, h } } : {}),
        ...(lambda !== undefined || L !== undefined ? { ewma: { lambda: lambda ?? 0.1, L: L ?? 2.814 } } : {}),
        ...(window !== undefined ? { capabilityWindow: window } : {}),
      };
      await withStore(g, async (store) => {
        await checkFilterValues(store.db, filter);
        const catalog = await resolveCatalog(store.db, o.catalog, g);
        const r = await runDrift(store, { by, properties, monitor, filter, catalog, codeVersion: CODE_VERSION, alertRules: o.allRules ? 'all' : 'toward-limits', unit: unit as (typeof UNITS)[number] });
        const open = r.alerts.filter((a) => a.state === 'open').length;
        log(`drift: run ${r.run}${r.reused ? ' (stored results reused)' : ''}: ${r.series.length} series, ${r.alerts.length} alerts (${r.new_alerts} new since the last run, ${open} open), ${r.change_points.length} change points`);
        const view = grouped(r.alerts.map((a) => ({ group: a.group, row: { id: a.id, state: a.state, new: a.new, property: a.property, rule: a.rule, chart: a.chart, detected_on: a.detected_on, change_date: a.change_date, magnitude: a.magnitude, unit: a.magnitude_unit, tests: a.tests.length } })));
        print(g, {
          kind: 'drift',
          data: driftContract(r),
          ...view,
          title: 'fractile drift alerts: one row per alert of the drift run (the JSON holds series, change points and comparisons)',
          notes: { detected_on: 'date of the test on which the rule signalled', change_date: 'estimated date the process changed', magnitude: 'estimated shift, in the unit column', tests: 'tests in the alert' },
          provenance: { drift_run: r.run, grouping: by, filter, catalog: catalogPath(o.catalog, g), alert_rules: o.allRules ? 'all' : 'toward-limits', unit },
        });
      });
    });
  },
};
