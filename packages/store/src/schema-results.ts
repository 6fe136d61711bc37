/**
 * Tables written by the pipeline stages (reduce, aggregate, design, monitor). Each result row is
 * keyed by (test or group, settings hash, algorithm version) so old and new results stand side by
 * side. Created by migrations/0100-results.ts (drift_alerts by 0120-drift-alerts.ts).
 */
import type { TestProperties } from '@fractile/curves';
import type { ColumnType, Generated, JSONColumnType } from 'kysely';

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>;
type Json<T extends object | null = object> = JSONColumnType<T, string, string>;

export type StageName = 'reduce' | 'aggregate' | 'design' | 'monitor' | 'sample' | 'report';

export interface StageSettingsTable {
  hash: string;
  stage: StageName;
  body: Json;
  created_at: Generated<Timestamp>;
}

export interface StageRunsTable {
  id: Generated<number>;
  stage: StageName;
  settings_hash: string;
  input_hash: string | null;
  code_version: string;
  started_at: Generated<Timestamp>;
  finished_at: Timestamp | null;
  status: Generated<'running' | 'done' | 'failed' | 'abandoned'>;
  counts: Json<Record<string, number>>;
  /** the queued job that started the run (migration 0180), null for a run in the calling process */
  queue_job: Generated<string | null>;
}

/** One test's result row: the per-test properties of the contract (TestProperties) plus keys and extras. */
export interface TestResultsTable extends Omit<TestProperties, 'flags'> {
  test_pk: number;
  settings_hash: string;
  algorithm_version: string;
  run_id: number;
  ok: boolean;
  given: Generated<boolean>;
  failure_code: string | null;
  failure_message: string | null;
  flags: Generated<string[]>;
  uniform_plastic_strain: number | null;
  grid_stress_mpa: (number | null)[] | null;
  fits: Json | null;
  details: Json | null;
  created_at: Generated<Timestamp>;
}

export interface GroupResultsTable {
  run_id: number;
  stage: 'aggregate' | 'design' | 'monitor' | 'sample';
  group_key: Json<Record<string, string>>;
  property: Generated<string>;
  body: Json;
}

/** Every drift alert ever reported, with the monitor run that first reported it (insert only). */
export interface DriftAlertsTable {
  alert_id: string;
  group_key: Json<Record<string, string>>;
  property: string;
  rule: string;
  detected_on: string;
  first_run: number;
  first_seen_at: Generated<Timestamp>;
}

export interface ResultTables {
  stage_settings: StageSettingsTable;
  stage_runs: StageRunsTable;
  test_results: TestResultsTable;
  group_results: GroupResultsTable;
  drift_alerts: DriftAlertsTable;
}
