/**
 * The exports written beside the report (README "Exports"), every one in the shared shape
 * (export-format.ts: JSON envelope; CSV with the comment block, or plain with a sidecar):
 * properties.csv/.json (the per-test contract keys), stats.json, correlations.json, drift.json,
 * distributions.json (its own documented shape, sample/distribution-export.ts), planning.json,
 * crosscheck.csv/.json (curve versus certificate), the complete data-quality lists
 * (flagged.csv, failed.csv, rejections.csv) and curves/ (curve-files.ts, FE tables included).
 * Returns the paths written, and the list files the report links to.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Store } from '@fractile/store';
import { listRejections } from '@fractile/store';
import type { AggregateResult } from '../aggregate/stage.ts';
import type { CrossCheckResult } from '../crosscheck/crosscheck-stage.ts';
import type { CurvesStageResult } from '../design/stage.ts';
import type { StressUnit } from '../design/fe-table.ts';
import { driftContract, type DriftResult } from '../monitor/stage.ts';
import { contractView, loadProperties, PROPERTY_ROW_KEYS } from '../properties.ts';
import type { GroupPlan } from '../planning/plan-groups.ts';
import { INFORMATIONAL_FLAGS } from '../report/assemble-report.ts';
import { distributionExport } from '../sample/distribution-export.ts';
import type { DistributionStageResult } from '../sample/stage.ts';
import { writeCsvFile } from './csv-file.ts';
import { writeCurveFiles } from './curve-files.ts';
import { jsonEnvelope } from './export-format.ts';

export interface ExportInputs {
  aggregate: AggregateResult;
  curves: CurvesStageResult;
  drift: DriftResult;
  crosscheck: CrossCheckResult;
  distributions: DistributionStageResult;
  planning: { stats_run: number; plans: GroupPlan[] };
  codeVersion: string;
  generatedAt: string;
  /** code version, time, database, grouping, reduce settings hash */
  provenance: Record<string, unknown>;
  driftBy: readonly string[];
  /** CSV with the comment block (default) or plain with sidecars */
  comments?: boolean;
  feUnit?: StressUnit;
}

export interface WrittenExports {
  files: string[];
  /** the complete lists, relative to the folder (the report links to them) */
  lists: { flagged: string; failed: string; rejections: string; crosscheck: string };
}

/** Notes of the properties table's columns (also the `properties` command's CSV). */
export const PROPERTY_NOTES: Readonly<Record<string, string>> = {
  modulus_gpa: 'E [GPa]',
  ype_pct: 'yield-point extension [%]',
  ag_pct: 'Ag, percentage plastic extension at maximum force [%]',
  agt_pct: 'Agt, percentage total extension at maximum force [%]',
  a_pct: 'A, percentage elongation after fracture [%]',
  yt_ratio: 'Y/T, yield over tensile strength [–]',
  n_value: 'strain-hardening exponent n (ISO 10275) [–]',
  k_mpa: 'strength coefficient K [MPa]',
  yield_mpa: 'yield by the grade’s yield_definition [MPa]',
  flags: 'reduction flags, space-separated',
  given: 'true: certificate values of a summary-only record, not computed from a curve',
  failure: 'why the reduction failed (code: message), empty when it did not',
};

/** Flat CSV rows of the per-test table. */
export function propertyCsvRows(view: readonly Record<string, unknown>[]): Record<string, unknown>[] {
  return view.map((r) => {
    const f = r.failure as { code: string; message: string } | null;
    return { ...r, flags: (r.flags as string[]).join(' '), failure: f ? `${f.code}: ${f.message}` : null };
  });
}

export const PROPERTY_CSV_COLUMNS: readonly string[] = [...PROPERTY_ROW_KEYS, 'given', 'failure'];

export async function writeExports(store: Store, out: string, inp: ExportInputs): Promise<WrittenExports> {
  mkdirSync(out, { recursive: true });
  const files: string[] = [];
  const json = (name: string, kind: string, data: unknown, extra: Record<string, unknown> = {}) => {
    const p = join(out, name);
    writeFileSync(p, jsonEnvelope(kind, { ...inp.provenance, ...extra }, data));
    files.push(p);
  };
  const csv = (name: string, spec: Omit<Parameters<typeof writeCsvFile>[1], 'provenance' | 'comments'> & { provenance?: Record<string, unknown> }) =>
    files.push(...writeCsvFile(join(out, name), { ...spec, provenance: { ...inp.provenance, ...spec.provenance }, comments: inp.comments }));

  const all = await loadProperties(store.db, { includeFailed: true }, { asReduced: true });
  const props = all.map(contractView);
  json('properties.json', 'properties', props);
  csv('properties.csv', { kind: 'properties', title: 'fractile per-test properties (ISO 6892-1 quantities), one row per test', rows: propertyCsvRows(props), columns: PROPERTY_CSV_COLUMNS, notes: PROPERTY_NOTES });
  json('stats.json', 'stats', inp.aggregate.stats, { stats_run: inp.aggregate.run });
  json('correlations.json', 'correlations', inp.aggregate.correlations, { stats_run: inp.aggregate.run });
  json('drift.json', 'drift', driftContract(inp.drift), { drift_run: inp.drift.run, drift_grouping: inp.driftBy });
  files.push(join(out, 'distributions.json'));
  writeFileSync(files[files.length - 1], `${JSON.stringify(distributionExport(inp.distributions, inp.codeVersion, inp.generatedAt), null, 2)}\n`);
  json('planning.json', 'planning', inp.planning.plans, { stats_run: inp.planning.stats_run });
  json('crosscheck.json', 'crosscheck', { tests: inp.crosscheck.tests, rows: inp.crosscheck.rows });
  csv('crosscheck.csv', {
    kind: 'crosscheck',
    title: 'fractile curve versus certificate: paired differences certificate − curve per supplier and property',
    rows: inp.crosscheck.rows.map((r) => ({
      supplier: r.supplier, property: r.property, curve_key: r.curve_key, unit: r.unit, n: r.n, mean_difference: r.mean_difference, sd_difference: r.sd_difference,
      ci_low: r.ci?.[0] ?? null, ci_high: r.ci?.[1] ?? null, loa_low: r.limits_of_agreement?.[0] ?? null, loa_high: r.limits_of_agreement?.[1] ?? null,
      mean_relative_pct: r.mean_relative_pct, max_abs_difference: r.max_abs_difference, systematic: r.systematic,
    })),
    notes: {
      mean_difference: 'mean of certificate − curve, in the unit column',
      ci_low: 'ci_low, ci_high: 95 % Student t interval of the mean difference',
      loa_low: 'loa_low, loa_high: 95 % limits of agreement, mean ± 1.96 SD (Bland & Altman 1986)',
      systematic: 'true where the interval excludes zero',
    },
  });
  const flagged = all.filter((r) => !r.failure && r.flags.some((f) => !INFORMATIONAL_FLAGS.has(f)));
  const lists = { flagged: 'flagged.csv', failed: 'failed.csv', rejections: 'rejections.csv', crosscheck: 'crosscheck.csv' };
  csv(lists.flagged, {
    kind: 'flagged',
    title: 'fractile flagged tests: every test whose reduction raised a flag that needs a look',
    rows: flagged.map((r) => ({ lab: r.lab, test_id: r.test_id, grade: r.grade, supplier: r.supplier, tested_on: r.tested_on, flags: r.flags.filter((f) => !INFORMATIONAL_FLAGS.has(f)).join(' ') })),
    columns: ['lab', 'test_id', 'grade', 'supplier', 'tested_on', 'flags'],
  });
  csv(lists.failed, {
    kind: 'failed',
    title: 'fractile failed tests: curves that could not be reduced, with the reason',
    rows: all.filter((r) => r.failure).map((r) => ({ lab: r.lab, test_id: r.test_id, grade: r.grade, supplier: r.supplier, code: r.failure!.code, message: r.failure!.message })),
    columns: ['lab', 'test_id', 'grade', 'supplier', 'code', 'message'],
  });
  csv(lists.rejections, {
    kind: 'rejections',
    title: 'fractile rejected input: file, line and column (1-based; 0 = the whole file) with the reason',
    rows: (await listRejections(store.db)).map((r) => ({ ...r })),
    columns: ['file', 'line', 'column', 'code', 'message'],
  });
  files.push(...writeCurveFiles(join(out, 'curves'), inp.curves.curves, { feUnit: inp.feUnit }));
  return { files, lists };
}
