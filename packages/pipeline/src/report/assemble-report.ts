/**
 * Assembles the report's input (report package `ReportData`) from the stored stage results:
 * statistics and curves per group with the grade × supplier breakdown, drift charts, the
 * curve-versus-certificate cross-check, and the data-quality lists (rejections, failed and flagged
 * tests, exclusions). Typed against the report's types: the stage outputs are those shapes.
 */
import { listRejections, testInventory, type Store } from '@fractile/store';
import type { ControlSeries, ReportBreakdown, ReportData, ReportGroup, SampleCurve } from '@fractile/report';
import type { AggregateResult } from '../aggregate/stage.ts';
import { groupRows, type GroupField } from '../aggregate/grouping.ts';
import type { Catalog } from '../catalog.ts';
import type { CrossCheckResult } from '../crosscheck/crosscheck-stage.ts';
import type { CurvesStageResult } from '../design/stage.ts';
import { hashOf } from '../hash.ts';
import type { DriftResult } from '../monitor/stage.ts';
import type { PopulationOptions } from '../population.ts';
import type { GroupPlan } from '../planning/plan-groups.ts';
import { loadProperties, NUMERIC_PROPERTIES } from '../properties.ts';

export interface ReportInputs {
  by: GroupField[];
  aggregate: AggregateResult;
  /** the statistics of each group split by supplier (absent: no breakdown) */
  breakdown?: AggregateResult | null;
  curves: CurvesStageResult;
  drift: DriftResult | null;
  crosscheck?: CrossCheckResult | null;
  catalog: Catalog | null;
  catalogSource: string | null;
  /** the population options the stages ran with (default: excluded tests and flagged values left out) */
  population?: PopulationOptions;
  reduceHash: string | null;
  codeVersion: string;
  generatedAt: string;
  title?: string;
  /** the complete lists written beside the report, relative to it */
  lists?: ReportData['lists'];
  /** sample-size planning per group and property (pipeline runPlan) */
  planning?: GroupPlan[];
}

/** Flags that say how a value was obtained rather than that something needs a look. */
export const INFORMATIONAL_FLAGS: ReadonlySet<string> = new Set(['given', 'past_max_force_ignored', 'n_window_reduced']);

const keyOf = (g: Readonly<Record<string, string>>) => JSON.stringify(Object.entries(g).sort());

function sampleCurve(grid: readonly number[], t: { test_id: string; stress_mpa: (number | null)[] }): SampleCurve {
  const x: number[] = [];
  const y: number[] = [];
  t.stress_mpa.forEach((v, i) => {
    if (v !== null && Number.isFinite(v)) {
      x.push(grid[i]);
      y.push(v);
    }
  });
  return { test_id: t.test_id, plastic_strain: x, stress_mpa: y };
}

/** One drift series as the report draws it: running limits per point, the lower panels where alerts speak of it. */
function controlSeries(s: DriftResult['series'][number], alerted: boolean): ControlSeries {
  const m = s.monitor;
  const heat = m.structure?.unit === 'heat-means';
  return {
    group: s.group,
    property: s.property,
    points: m.points.map((p) => ({
      date: p.date, value: p.value, test_id: p.label, center: p.centre, lcl: p.lcl, ucl: p.ucl,
      ewma: p.ewma, ewma_lcl: p.ewmaLcl, ewma_ucl: p.ewmaUcl, cusum_high: p.cusumHigh, cusum_low: p.cusumLow, mr: p.mr, mr_ucl: p.mrUcl,
    })),
    spec_min: s.lower_spec,
    spec_max: s.upper_spec,
    point_label: heat ? 'heat means' : 'tests',
    structure_note: m.structure?.reason,
    cusum: m.design ? { k: m.design.k, h: m.design.h } : null,
    ewma: m.design ? { lambda: m.design.ewma.lambda, L: m.design.ewma.L } : null,
    panels: alerted,
  };
}

/** The supplier rows of each group of `inp.by`, from the finer statistics. */
function breakdowns(inp: ReportInputs): Map<string, ReportBreakdown> {
  type Row = { key: Readonly<Record<string, string>>; stats: AggregateResult['stats'] };
  const out = new Map<string, { by: string[]; rows: Row[] }>();
  if (!inp.breakdown) return out;
  const extra = Object.keys(inp.breakdown.stats[0]?.group ?? {}).filter((k) => !(inp.by as string[]).includes(k));
  const rows = new Map<string, Row>();
  for (const s of inp.breakdown.stats) {
    const parent = Object.fromEntries(inp.by.map((k) => [k, s.group[k]]));
    const pk = keyOf(parent);
    if (!out.has(pk)) out.set(pk, { by: extra, rows: [] });
    const rk = keyOf(s.group);
    let row = rows.get(rk);
    if (!row) {
      row = { key: Object.fromEntries(extra.map((k) => [k, s.group[k]])), stats: [] };
      rows.set(rk, row);
      out.get(pk)!.rows.push(row);
    }
    row.stats.push(s);
  }
  return out;
}

export async function assembleReport(store: Store, inp: ReportInputs): Promise<ReportData> {
  const db = store.db;
  const all = await loadProperties(db, { includeFailed: true }, { asReduced: true });
  // the histograms show the population the statistics were computed on
  const rows = await loadProperties(db, {}, inp.population ?? {});
  const groups = groupRows(rows, inp.by, NUMERIC_PROPERTIES);
  const valuesByGroup = new Map(groups.map((g) => [keyOf(g.key), g]));
  const curvesByGroup = new Map(inp.curves.curves.map((c) => [keyOf(c.group), c]));
  const samplesByGroup = new Map(inp.curves.samples.map((s) => [keyOf(s.group), s.tests]));
  const split = breakdowns(inp);
  const statsByGroup = new Map<string, AggregateResult['stats']>();
  for (const s of inp.aggregate.stats) {
    const k = keyOf(s.group);
    if (!statsByGroup.has(k)) statsByGroup.set(k, []);
    statsByGroup.get(k)!.push(s);
  }
  const reportGroups: ReportGroup[] = [];
  for (const [k, stats] of statsByGroup) {
    const vg = valuesByGroup.get(k);
    const curve = curvesByGroup.get(k) ?? null;
    reportGroups.push({
      key: stats[0].group,
      curves: curve && curve.valid_to_plastic_strain !== null ? curve : null,
      sample_curves: (samplesByGroup.get(k) ?? []).map((t) => sampleCurve(inp.curves.grid, t)),
      properties: stats.map((s) => ({ stats: s, values: (vg?.columns[s.property] ?? []).filter((v) => Number.isFinite(v)) })),
      breakdown: split.get(k) ?? null,
    });
  }

  // Series with alerts first, so the charts that matter lead; they get the lower panels.
  const alerted = new Set((inp.drift?.alerts ?? []).map((a) => keyOf(a.group) + a.property));
  const series: ControlSeries[] = (inp.drift?.series ?? []).map((s) => controlSeries(s, alerted.has(keyOf(s.group) + s.property)));
  series.sort((a, b) => Number(alerted.has(keyOf(b.group) + b.property)) - Number(alerted.has(keyOf(a.group) + a.property)));

  const rejections = await listRejections(db);
  const inventory = await testInventory(db);
  const failed = all.filter((r) => r.failure);
  const flagged = all.filter((r) => !r.failure && r.flags.some((f) => !INFORMATIONAL_FLAGS.has(f)));
  return {
    meta: {
      title: inp.title ?? 'fractile — tensile test population report',
      generated_at: inp.generatedAt,
      code_version: inp.codeVersion,
      database: { engine: store.engine, target: store.engine === 'postgres' ? store.target.replace(/\/\/[^@/]*@/, '//…@') : store.target },
      settings_hashes: {
        ...(inp.reduceHash ? { reduce: inp.reduceHash } : {}),
        stats_run: String(inp.aggregate.run),
        curves_run: String(inp.curves.run),
        ...(inp.drift ? { drift_run: String(inp.drift.run) } : {}),
      },
      catalog: {
        source: inp.catalogSource,
        hash: inp.catalog ? hashOf(inp.catalog) : null,
        grades: Object.entries(inp.catalog?.grades ?? {}).map(([grade, e]) => ({ grade, family: e.family, yield_definition: e.yield_definition, spec: { ...e.spec } })),
      },
      counts: {
        ...inventory,
        rejected: rejections.length,
        failed: failed.length,
        flagged: flagged.length,
        excluded: inp.aggregate.exclusions.length,
        values_left_out: inp.aggregate.stats.reduce((a, s) => a + (s.left_out?.n ?? 0), 0),
      },
    },
    groups: reportGroups,
    planning: inp.planning,
    drift: inp.drift ? { result: { alerts: inp.drift.alerts, change_points: inp.drift.change_points, comparisons: inp.drift.comparisons }, series, new_alerts: inp.drift.new_alerts } : null,
    crosscheck: inp.crosscheck ?? null,
    quality: {
      rejections,
      failed: failed.map((r) => ({ lab: r.lab, test_id: r.test_id, code: r.failure!.code, message: r.failure!.message })),
      flagged: flagged.map((r) => ({ lab: r.lab, test_id: r.test_id, flags: r.flags.filter((f) => !INFORMATIONAL_FLAGS.has(f)) })),
      exclusions: inp.aggregate.exclusions.map((e) => ({ lab: e.lab, test_id: e.test_id, reason: e.reason, decided_by: e.decided_by, decided_at: e.decided_at })),
    },
    ...(inp.lists ? { lists: inp.lists } : {}),
  };
}
