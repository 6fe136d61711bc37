/**
 * Assembles the report's input from the stored stage results: statistics and curves per group,
 * drift charts, and the data-quality lists (rejections, failed and flagged tests).
 */
import { sql } from 'kysely';
import type { Store } from '@fractile/store';
import {
  groupRows,
  loadProperties,
  NUMERIC_PROPERTIES,
  type AggregateResult,
  type Catalog,
  type CurvesStageResult,
  type DriftResult,
  type GroupField,
  type GroupPlan,
  type PopulationOptions,
  hashOf,
} from '@fractile/pipeline';
import type { ControlSeries, ReportData, ReportGroup, SampleCurve } from '@fractile/report';
import { CODE_VERSION } from './version.ts';

export interface ReportInputs {
  by: GroupField[];
  aggregate: AggregateResult;
  curves: CurvesStageResult;
  drift: DriftResult | null;
  catalog: Catalog | null;
  catalogSource: string | null;
  /** the population options the stages ran with (default: excluded tests and flagged values left out) */
  population?: PopulationOptions;
  reduceHash: string | null;
  generatedAt: string;
  title?: string;
  /** sample-size planning per group and property (pipeline runPlan) */
  planning?: GroupPlan[];
}

/** Flags that say how a value was obtained rather than that something needs a look. */
const INFORMATIONAL_FLAGS = new Set(['given', 'past_max_force_ignored', 'n_window_reduced']);

const keyOf = (g: Record<string, string>) => JSON.stringify(Object.entries(g).sort());

function sampleCurve(grid: number[], t: { test_id: string; stress_mpa: (number | null)[] }): SampleCurve {
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

export async function assembleReport(store: Store, inp: ReportInputs): Promise<ReportData> {
  const db = store.db;
  const all = await loadProperties(db, { includeFailed: true }, { asReduced: true });
  // the histograms show the population the statistics were computed on
  const rows = await loadProperties(db, {}, inp.population ?? {});
  const groups = groupRows(rows, inp.by, NUMERIC_PROPERTIES);
  const valuesByGroup = new Map(groups.map((g) => [keyOf(g.key), g]));
  const curvesByGroup = new Map(inp.curves.curves.map((c) => [keyOf(c.group), c]));
  const samplesByGroup = new Map(inp.curves.samples.map((s) => [keyOf(s.group), s.tests]));
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
      curves: curve && curve.valid_to_plastic_strain !== null ? { ...curve, valid_to_plastic_strain: curve.valid_to_plastic_strain, idealized: (curve.idealized ?? {}) as never, provenance: curve.provenance as never } : null,
      sample_curves: (samplesByGroup.get(k) ?? []).map((t) => sampleCurve(inp.curves.grid, t)),
      properties: stats.map((s) => ({ stats: s as never, values: (vg?.columns[s.property] ?? []).filter((v) => Number.isFinite(v)) })),
    });
  }

  // Series with alerts first, so the charts that matter lead; they get the lower panels.
  const alerted = new Set((inp.drift?.alerts ?? []).map((a) => keyOf(a.group) + a.property));
  const series: ControlSeries[] = (inp.drift?.series ?? []).map((s) => controlSeries(s, alerted.has(keyOf(s.group) + s.property)));
  series.sort((a, b) => Number(alerted.has(keyOf(b.group) + b.property)) - Number(alerted.has(keyOf(a.group) + a.property)));

  const rejections = await db.selectFrom('rejections').select(['file', 'line', 'col', 'code', 'message']).orderBy('id').execute();
  const counts = await sql<{ tests: string; curves: string; summary_only: string }>`
    select count(*) as tests, count(c.test_row_id) as curves, count(*) filter (where c.test_row_id is null) as summary_only
    from tests t left join curves c on c.test_row_id = t.id where t.is_current`.execute(db);
  const failed = all.filter((r) => r.failure);
  const flagged = all.filter((r) => !r.failure && r.flags.some((f) => !INFORMATIONAL_FLAGS.has(f)));
  const c = counts.rows[0];
  return {
    meta: {
      title: inp.title ?? 'fractile — tensile test population report',
      generated_at: inp.generatedAt,
      code_version: CODE_VERSION,
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
        grades: Object.entries(inp.catalog?.grades ?? {}).map(([grade, e]) => ({ grade, family: e.family, yield_definition: e.yield_definition, spec: e.spec as Record<string, number | null> })),
      },
      counts: {
        tests: Number(c.tests),
        curves: Number(c.curves),
        summary_only: Number(c.summary_only),
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
    quality: {
      rejections: rejections.map((r) => ({ file: r.file, line: r.line, column: r.col, code: r.code, message: r.message })),
      failed: failed.map((r) => ({ lab: r.lab, test_id: r.test_id, code: r.failure!.code, message: r.failure!.message })),
      flagged: flagged.map((r) => ({ lab: r.lab, test_id: r.test_id, flags: r.flags.filter((f) => !INFORMATIONAL_FLAGS.has(f)) })),
      exclusions: inp.aggregate.exclusions.map((e) => ({ lab: e.lab, test_id: e.test_id, reason: e.reason, decided_by: e.decided_by, decided_at: e.decided_at })),
    },
  };
}
