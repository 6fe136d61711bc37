/**
 * The monitor stage: per group (default supplier × grade) and property, the series of tests in
 * time order (test date, then heat) goes through the self-starting charts, the change-point
 * analysis and the rolling capability of `monitorSeries` (stats); suppliers of each grade are
 * compared. Output follows the drift contract: {alerts, change_points, comparisons}, plus the
 * chart data for the report. Every alert says when it would have rung (`detected_on`; the
 * contract's `first_date` is the same date) and carries its state (open, acknowledged, closed)
 * and whether it is new since the last run (alert-state.ts).
 */
import type { Store } from '@fractile/store';
import { compareGroups, monitorSeries, type ChartUnit, type GroupComparison, type MonitorOptions, type SeriesMonitor } from '@fractile/stats';
import { gradeSettings, type Catalog } from '../catalog.ts';
import { groupRows, type GroupField } from '../aggregate/grouping.ts';
import { limitsFor, type PropertyLimits } from '../aggregate/limits.ts';
import { hashOf } from '../hash.ts';
import { loadProperties, type PropertyFilter, type PropertyKey, type PropertyRow } from '../properties.ts';
import { exclusiveStage, latestRun, runStage, STAGE_VERSIONS } from '../runs.ts';
import { alertId, alertStatuses, registerAlerts, type AlertState } from './alert-state.ts';

export interface DriftOptions {
  by: GroupField[];
  properties?: PropertyKey[];
  monitor?: Omit<MonitorOptions, 'lowerSpec' | 'maxFractionBelow' | 'unit'>;
  filter?: PropertyFilter;
  catalog: Catalog | null;
  codeVersion: string;
  /**
   * Which signals become alerts. 'toward-limits' (default): the CUSUM, Shewhart, change-point and
   * capability rules in the direction of a specification limit the property has (downward where
   * there is a minimum, upward where there is a maximum; both where it has none). The EWMA and the
   * moving range are drawn but raise no alert: the EWMA answers the CUSUM's question with nearly
   * the same run lengths (Lucas & Saccucci 1990), so a shift would be reported twice, and a
   * single wide moving range is no drift. 'all': every rule.
   */
  alertRules?: 'toward-limits' | 'all';
  /** Points charted: 'auto' (default; heat means where the baseline shows a heat effect), 'tests', 'heat-means'. */
  unit?: 'auto' | ChartUnit;
}

const DOWNWARD_RULES = new Set(['individuals-below-lcl', 'cusum-low', 'change-point-down', 'capability-below-minimum']);
const UPWARD_RULES = new Set(['individuals-above-ucl', 'cusum-high', 'change-point-up']);

/** Whether a signal of `rule` is an alert for a property with these limits (see alertRules). */
export function alertMatters(rule: string, limits: PropertyLimits, mode: 'toward-limits' | 'all' = 'toward-limits'): boolean {
  if (mode === 'all') return true;
  if (limits.lower === null && limits.upper === null) return DOWNWARD_RULES.has(rule) || UPWARD_RULES.has(rule);
  if (DOWNWARD_RULES.has(rule)) return limits.lower !== null;
  if (UPWARD_RULES.has(rule)) return limits.upper !== null;
  return false;
}

export const DEFAULT_DRIFT_PROPERTIES: PropertyKey[] = ['yield_mpa', 'rm_mpa'];

/** An alert as the monitor stage computes it (its state is added when it is reported). */
export interface DriftAlertCore {
  id: string;
  group: Record<string, string>;
  property: PropertyKey;
  rule: string;
  /** Kept for the contract: the same date as `detected_on`. */
  first_date: string;
  /** Date of the first test at which the rule fires using only the data up to that date. */
  detected_on: string;
  /** Estimated start of the shift, where the rule estimates one. */
  change_date: string | null;
  last_date: string;
  magnitude: number;
  magnitude_unit: string;
  magnitude_sd: number | null;
  /** What the chart's points are. */
  chart: ChartUnit;
  tests: string[];
  detail: string;
}

export interface DriftAlert extends DriftAlertCore {
  state: AlertState;
  /** Reported by this run for the first time. */
  new: boolean;
  /** Who took the latest action, its note and time (null while untouched). */
  state_by: string | null;
  state_note: string | null;
  state_at: string | null;
}

export interface DriftChangePoint {
  group: Record<string, string>;
  property: PropertyKey;
  /** Estimated location: date of the first point after the change. */
  date: string;
  /** When it would have been found (null: its interval covers zero, or it never reaches the alarm penalty). */
  detected_on: string | null;
  shift: number;
  ci: [number, number];
  chart: ChartUnit;
}

export interface DriftComparison extends GroupComparison {
  grade: string;
  property: PropertyKey;
  /** Tests per supplier. */
  groups: Record<string, number>;
}

export interface DriftSeries {
  group: Record<string, string>;
  property: PropertyKey;
  lower_spec: number | null;
  upper_spec: number | null;
  monitor: SeriesMonitor;
}

export interface DriftAnalysis {
  alerts: DriftAlertCore[];
  change_points: DriftChangePoint[];
  comparisons: DriftComparison[];
  series: DriftSeries[];
}

export interface DriftResult extends Omit<DriftAnalysis, 'alerts'> {
  run: number;
  reused: boolean;
  alerts: DriftAlert[];
  /** Alerts reported for the first time by this call. */
  new_alerts: number;
  seconds: number;
}

const MIN_SERIES = 8;

function grading(key: Record<string, string>, rows: PropertyRow[], idx: number[]): string | null {
  if (key.grade !== undefined) return key.grade;
  const g = new Set(idx.map((i) => rows[i].grade));
  return g.size === 1 ? [...g][0] : null;
}

/** Suppliers compared within each grade, on individual tests (at least 3 per supplier). */
function compareSuppliers(rows: PropertyRow[], properties: readonly PropertyKey[]): DriftComparison[] {
  const comparisons: DriftComparison[] = [];
  for (const gg of groupRows(rows, ['grade'], properties)) {
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
  return comparisons;
}

/** Pure part: drift analysis of loaded rows (already in time order: date, then heat). */
export function analyzeDrift(rows: PropertyRow[], opts: Omit<DriftOptions, 'codeVersion'>): DriftAnalysis {
  const properties = opts.properties ?? DEFAULT_DRIFT_PROPERTIES;
  const alerts: DriftAlertCore[] = [];
  const change_points: DriftChangePoint[] = [];
  const series: DriftSeries[] = [];
  for (const g of groupRows(rows, opts.by, properties)) {
    const grade = grading(g.key, rows, g.rows);
    const entry = grade === null ? null : gradeSettings(opts.catalog, grade);
    for (const p of properties) {
      const tests = g.rows
        .map((ri, j) => ({ value: g.columns[p][j], date: rows[ri].tested_on, testId: `${rows[ri].lab}/${rows[ri].test_id}`, heat: rows[ri].heat }))
        .filter((x) => Number.isFinite(x.value));
      if (tests.length < MIN_SERIES) continue;
      const limits = limitsFor(p, entry?.spec ?? null);
      const m = monitorSeries(tests, { ...opts.monitor, unit: opts.unit ?? 'auto', lowerSpec: limits.lower, maxFractionBelow: entry?.max_fraction_below });
      series.push({ group: g.key, property: p, lower_spec: limits.lower, upper_spec: limits.upper, monitor: m });
      const chart = m.structure?.unit ?? 'tests';
      for (const a of m.alerts) {
        if (!alertMatters(a.rule, limits, opts.alertRules)) continue;
        const identity = { group: g.key, property: p, rule: a.rule, detected_on: a.detected_on };
        alerts.push({ id: alertId(identity), ...identity, first_date: a.detected_on, change_date: a.change_date, last_date: a.last_date, magnitude: a.magnitude, magnitude_unit: a.magnitude_unit, magnitude_sd: a.magnitude_sd, chart, tests: a.tests, detail: a.detail });
      }
      for (const c of m.changePoints) change_points.push({ group: g.key, property: p, date: c.date, detected_on: c.detected_on, shift: c.shift, ci: c.ci, chart });
    }
  }
  return { alerts, change_points, comparisons: compareSuppliers(rows, properties), series };
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
    unit: opts.unit ?? 'auto',
    filter: opts.filter ?? {},
    spec: opts.catalog ? Object.fromEntries(Object.entries(opts.catalog.grades).map(([g, e]) => [g, { ...e.spec, max_fraction_below: e.max_fraction_below }])) : null,
  };
  const { run, reused, result: analysis } = await runStage(db, {
    stage: 'monitor', settings, inputHash: hashOf(rows.map((r) => `${r.test_pk}:${r.settings_hash}`)), codeVersion: opts.codeVersion,
    reuse: (id) => loadDrift(store, id),
    compute: async (id) => {
      const analysis = analyzeDrift(rows, opts);
      await store.copyRows('group_results', ['run_id', 'stage', 'group_key', 'property', 'body'], [[id, 'monitor', JSON.stringify({}), '', JSON.stringify(analysis)]]);
      return { result: analysis, counts: { tests: rows.length, series: analysis.series.length, alerts: analysis.alerts.length, change_points: analysis.change_points.length } };
    },
  });
  const fresh = await registerAlerts(db, run, analysis.alerts);
  const alerts = await withState(store, analysis.alerts, fresh);
  return { run, reused, ...analysis, alerts, new_alerts: fresh.size, seconds: (performance.now() - t0) / 1000 };
}

/** Alerts with their current state; `fresh` holds the ids new in this call. */
export async function withState(store: Store, alerts: readonly DriftAlertCore[], fresh: ReadonlySet<string> = new Set()): Promise<DriftAlert[]> {
  const status = await alertStatuses(store.db, alerts.map((a) => a.id));
  return alerts.map((a) => {
    const s = status.get(a.id);
    return { ...a, state: s?.state ?? 'open', new: fresh.has(a.id), state_by: s?.by ?? null, state_note: s?.note ?? null, state_at: s?.at ?? null };
  });
}

export async function loadDrift(store: Store, run: number): Promise<DriftAnalysis | null> {
  const row = await store.db.selectFrom('group_results').select(['body']).where('run_id', '=', run).where('stage', '=', 'monitor').executeTakeFirst();
  if (!row) return null;
  return (typeof row.body === 'string' ? JSON.parse(row.body) : row.body) as DriftAnalysis;
}

/** The contract JSON of `fractile drift`. */
export function driftContract(r: Pick<DriftResult, 'alerts' | 'change_points' | 'comparisons'>): { alerts: DriftAlert[]; change_points: DriftChangePoint[]; comparisons: DriftComparison[] } {
  return { alerts: r.alerts, change_points: r.change_points, comparisons: r.comparisons };
}

/** The alerts of the newest finished drift run with their current state (null when drift never ran). */
export async function latestDriftAlerts(store: Store): Promise<{ run: number; alerts: DriftAlert[] } | null> {
  const last = await latestRun(store.db, 'monitor');
  if (!last) return null;
  const analysis = await loadDrift(store, last.id);
  if (!analysis) return null;
  return { run: last.id, alerts: await withState(store, analysis.alerts) };
}
