/**
 * The monitor stage: per group (default supplier × grade) and property, the series in time order
 * (test date, then heat) goes through control charts, change-point detection and rolling
 * capability against the grade minimum; suppliers of each grade are compared. Output follows the
 * drift contract: {alerts, change_points, comparisons}, plus the chart data for the report.
 */
import type { Store } from '@fractile/store';
import { compareGroups, monitorSeries, type GroupComparison, type MonitorOptions, type SeriesMonitor } from '@fractile/stats';
import { gradeSettings, type Catalog } from '../catalog.ts';
import { groupRows, type GroupField } from '../aggregate/grouping.ts';
import { limitsFor } from '../aggregate/limits.ts';
import { hashOf } from '../hash.ts';
import { loadProperties, type PropertyFilter, type PropertyKey, type PropertyRow } from '../properties.ts';
import { exclusiveStage, findDoneRun, finishRun, saveSettings, STAGE_VERSIONS, startRun } from '../runs.ts';

export interface DriftOptions {
  by: GroupField[];
  properties?: PropertyKey[];
  monitor?: Omit<MonitorOptions, 'lowerSpec'>;
  filter?: PropertyFilter;
  catalog: Catalog | null;
  codeVersion: string;
  /**
   * Which chart signals become alerts. 'toward-limits' (default): only signals in the direction of
   * a specification limit the property has (downward rules where there is a minimum, upward ones
   * where there is a maximum; both where it has none), and never a single moving range — the
   * charts still show every signal. 'all': every rule.
   */
  alertRules?: 'toward-limits' | 'all';
  /** chart unit: 'heat' (default; the mean of each heat's tests) or 'test' (every test) */
  unit?: 'heat' | 'test';
}

const DOWNWARD_RULES = new Set(['individuals-below-lcl', 'ewma-low', 'cusum-low', 'change-point-down', 'capability-margin']);
const UPWARD_RULES = new Set(['individuals-above-ucl', 'ewma-high', 'cusum-high', 'change-point-up']);

/** Whether a signal of `rule` is an alert for a property with these limits (see alertRules). */
export function alertMatters(rule: string, limits: { lower: number | null; upper: number | null }, mode: 'toward-limits' | 'all' = 'toward-limits'): boolean {
  if (mode === 'all') return true;
  if (limits.lower === null && limits.upper === null) return DOWNWARD_RULES.has(rule) || UPWARD_RULES.has(rule);
  if (DOWNWARD_RULES.has(rule)) return limits.lower !== null;
  if (UPWARD_RULES.has(rule)) return limits.upper !== null;
  return false;
}

/**
 * Rolling Cpk against the minimum below which the capability rule fires: 2/3, a rolling window
 * whose normal model puts about 2.3 % of the product below the minimum (mean less than 2 SD above
 * it). Mill populations commonly sit 2–3 SD above the minimum, so the manufacturing target of 1.33
 * would raise a standing alarm rather than a drift alarm.
 */
export const DRIFT_MIN_CPK = 2 / 3;

// Charts are standardized by the baseline's sample SD (not the moving range): consecutive tests
// often share a heat, so the moving range sees only the within-heat scatter and a chart on it would
// alarm at every change of heat.

/**
 * Default baseline of a series: its first third, at least 30 tests (all if fewer). Tests of one
 * heat come one after another, so a short baseline sees few heats and underrates the spread
 * between them; a third of three years of supply is the first year.
 */
export function defaultBaseline(n: number): { firstN: number } {
  return { firstN: Math.min(n, Math.max(30, Math.floor(n / 3))) };
}

/** A change point is an alert when it is the series' last (the current level) and moves ≥ 1 SD. */
const CHANGE_ALERT_MIN_SD = 1;

export const DEFAULT_DRIFT_PROPERTIES: PropertyKey[] = ['yield_mpa', 'rm_mpa'];

type TestPoint = { value: number; date: string; testId: string; heat: string | null };

/**
 * One point per heat: the mean of the heat's tests, dated by its first test, in time order (tests
 * without a heat stay points of their own). Tests of a heat share its chemistry and rolling, so
 * they are a rational subgroup (Montgomery): charting single tests would mistake the change from
 * one heat to the next for drift.
 */
export function heatMeans(points: TestPoint[]): { points: TestPoint[]; members: Map<string, string[]> } {
  const byHeat = new Map<string, { sum: number; n: number; date: string; ids: string[]; order: number }>();
  const out: (TestPoint & { order: number })[] = [];
  points.forEach((pt, order) => {
    if (!pt.heat) {
      out.push({ ...pt, order });
      return;
    }
    const h = byHeat.get(pt.heat);
    if (h) {
      h.sum += pt.value;
      h.n++;
      h.ids.push(pt.testId);
    } else byHeat.set(pt.heat, { sum: pt.value, n: 1, date: pt.date, ids: [pt.testId], order });
  });
  const members = new Map<string, string[]>();
  for (const [heat, h] of byHeat) {
    const id = `heat ${heat}`;
    members.set(id, h.ids);
    out.push({ value: h.sum / h.n, date: h.date, testId: id, heat, order: h.order });
  }
  out.sort((a, b) => a.order - b.order);
  return { points: out.map(({ order: _o, ...pt }) => pt), members };
}

export interface DriftAlert {
  group: Record<string, string>;
  property: PropertyKey;
  rule: string;
  first_date: string;
  magnitude: number;
  magnitude_unit: string;
  tests: string[];
}

export interface DriftChangePoint {
  group: Record<string, string>;
  property: PropertyKey;
  date: string;
  shift: number;
  ci: [number, number];
}

export interface DriftComparison extends GroupComparison {
  grade: string;
  property: PropertyKey;
  groups: Record<string, number>;
}

export interface DriftSeries {
  group: Record<string, string>;
  property: PropertyKey;
  lower_spec: number | null;
  monitor: SeriesMonitor;
}

export interface DriftResult {
  run: number;
  reused: boolean;
  alerts: DriftAlert[];
  change_points: DriftChangePoint[];
  comparisons: DriftComparison[];
  series: DriftSeries[];
  seconds: number;
}

const MIN_SERIES = 8;

function grading(key: Record<string, string>, rows: PropertyRow[], idx: number[]): string | null {
  if (key.grade !== undefined) return key.grade;
  const g = new Set(idx.map((i) => rows[i].grade));
  return g.size === 1 ? [...g][0] : null;
}

/** Pure part: drift analysis of loaded rows (already in time order: date, then heat). */
export function analyzeDrift(rows: PropertyRow[], opts: Omit<DriftOptions, 'codeVersion'>): Omit<DriftResult, 'run' | 'reused' | 'seconds'> {
  const properties = opts.properties ?? DEFAULT_DRIFT_PROPERTIES;
  const groups = groupRows(rows, opts.by, properties);
  const alerts: DriftAlert[] = [];
  const change_points: DriftChangePoint[] = [];
  const series: DriftSeries[] = [];
  for (const g of groups) {
    const grade = grading(g.key, rows, g.rows);
    const spec = grade === null ? null : gradeSettings(opts.catalog, grade).spec;
    for (const p of properties) {
      const perTest = g.rows
        .map((ri, j) => ({ value: g.columns[p][j], date: rows[ri].tested_on, testId: `${rows[ri].lab}/${rows[ri].test_id}`, heat: rows[ri].heat }))
        .filter((x) => Number.isFinite(x.value));
      const { points: pts, members } = (opts.unit ?? 'heat') === 'heat' ? heatMeans(perTest) : { points: perTest, members: null };
      if (pts.length < MIN_SERIES) continue;
      const expand = (ids: string[]) => (members ? ids.flatMap((id) => members.get(id) ?? [id]) : ids);
      const limits = limitsFor(p, spec);
      const lowerSpec = limits.lower;
      const m = monitorSeries(pts, { minCpk: DRIFT_MIN_CPK, sigma: 'sample-sd', baseline: defaultBaseline(pts.length), ...opts.monitor, lowerSpec });
      series.push({ group: g.key, property: p, lower_spec: lowerSpec, monitor: m });
      const lastChange = Math.max(-1, ...m.alerts.filter((a) => a.rule.startsWith('change-point')).map((a) => a.first_index));
      const current = (a: (typeof m.alerts)[number]) => !a.rule.startsWith('change-point') || opts.alertRules === 'all' || (a.first_index === lastChange && Math.abs(a.magnitude_sd) >= CHANGE_ALERT_MIN_SD);
      for (const a of m.alerts) if (alertMatters(a.rule, limits, opts.alertRules) && current(a)) alerts.push({ group: g.key, property: p, rule: a.rule, first_date: a.first_date, magnitude: a.magnitude, magnitude_unit: a.magnitude_unit, tests: expand(a.tests) });
      for (const c of m.changePoints) change_points.push({ group: g.key, property: p, date: c.date, shift: c.shift, ci: c.ci });
    }
  }
  // Suppliers compared within each grade.
  const comparisons: DriftComparison[] = [];
  const byGrade = groupRows(rows, ['grade'], properties);
  for (const gg of byGrade) {
    for (const p of properties) {
      const bySupplier: Record<string, number[]> = {};
      gg.rows.forEach((ri, j) => {
        const v = gg.columns[p][j];
        if (Number.isFinite(v)) (bySupplier[rows[ri].supplier] ??= []).push(v);
      });
      const usable = Object.fromEntries(Object.entries(bySupplier).filter(([, v]) => v.length >= 3));
      if (Object.keys(usable).length < 2) continue;
      for (const c of compareGroups(usable)) {
        comparisons.push({ grade: gg.key.grade, property: p, groups: Object.fromEntries(Object.entries(usable).map(([k, v]) => [k, v.length])), ...c });
      }
    }
  }
  return { alerts, change_points, comparisons, series };
}

/** Runs the stage alone on the database (see `exclusiveStage`). */
export function runDrift(store: Store, opts: DriftOptions): Promise<DriftResult> {
  return exclusiveStage(store, 'monitor', () => driftAlone(store, opts));
}

async function driftAlone(store: Store, opts: DriftOptions): Promise<DriftResult> {
  const t0 = performance.now();
  const db = store.db;
  const rows = await loadProperties(db, opts.filter);
  const settings = {
    algorithm_version: STAGE_VERSIONS.monitor, by: opts.by,
    properties: opts.properties ?? DEFAULT_DRIFT_PROPERTIES,
    monitor: opts.monitor ?? {},
    alert_rules: opts.alertRules ?? 'toward-limits',
    unit: opts.unit ?? 'heat',
    filter: opts.filter ?? {},
    spec: opts.catalog ? Object.fromEntries(Object.entries(opts.catalog.grades).map(([g, e]) => [g, e.spec])) : null,
  };
  const settingsHash = await saveSettings(db, 'monitor', settings);
  const inputHash = hashOf(rows.map((r) => `${r.test_pk}:${r.settings_hash}`));
  const done = await findDoneRun(db, 'monitor', settingsHash, inputHash);
  if (done) {
    const stored = await loadDrift(store, done.id);
    if (stored) return { run: done.id, reused: true, ...stored, seconds: (performance.now() - t0) / 1000 };
  }
  const run = await startRun(db, 'monitor', settingsHash, inputHash, opts.codeVersion);
  const result = analyzeDrift(rows, opts);
  await store.copyRows('group_results', ['run_id', 'stage', 'group_key', 'property', 'body'], [[run, 'monitor', JSON.stringify({}), '', JSON.stringify(result)]]);
  await finishRun(db, run, { tests: rows.length, series: result.series.length, alerts: result.alerts.length, change_points: result.change_points.length });
  return { run, reused: false, ...result, seconds: (performance.now() - t0) / 1000 };
}

export async function loadDrift(store: Store, run: number): Promise<Omit<DriftResult, 'run' | 'reused' | 'seconds'> | null> {
  const row = await store.db.selectFrom('group_results').select(['body']).where('run_id', '=', run).where('stage', '=', 'monitor').executeTakeFirst();
  if (!row) return null;
  return (typeof row.body === 'string' ? JSON.parse(row.body) : row.body) as Omit<DriftResult, 'run' | 'reused' | 'seconds'>;
}

/** The contract JSON of `fractile drift`. */
export function driftContract(r: Pick<DriftResult, 'alerts' | 'change_points' | 'comparisons'>): { alerts: DriftAlert[]; change_points: DriftChangePoint[]; comparisons: DriftComparison[] } {
  return { alerts: r.alerts, change_points: r.change_points, comparisons: r.comparisons };
}
