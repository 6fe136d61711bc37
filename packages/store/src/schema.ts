/**
 * Typed schema of the raw tables (written by ingest, read by every later stage) and the full
 * `Database` interface that kysely checks queries against. The results tables are declared in
 * `schema-results.ts`. Column units are in the names; curves are stored in canonical units
 * (N, mm, s, MPa, mm/mm).
 *
 * Dates (`date` columns) are read as 'YYYY-MM-DD' strings and int8 ids as numbers on both
 * engines (see open-store.ts).
 */
import type { YieldDefinition } from '@fractile/curves';
import type { ColumnType, Generated, Insertable, Selectable } from 'kysely';
import type { ResultTables } from './schema-results.ts';

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>;
/** jsonb: written as a JSON string or value, read back as a parsed value. */
type Json = ColumnType<unknown, string, string>;
/** A curve channel: little-endian float8 bytes (channel-bytes.ts); read as a Uint8Array (a Buffer on a server). */
type ChannelBytes = ColumnType<Uint8Array | null, Uint8Array | null, Uint8Array | null>;

export type SpecimenShapeCode = 'round' | 'flat' | 'area';
export type RunStatus = 'running' | 'completed' | 'failed' | 'abandoned';

/** One row per distinct file content (manifests, curve files, column maps), keyed by SHA-256. */
export interface SourceFilesTable {
  id: Generated<number>;
  sha256: string;
  /** path as given on the first ingest that saw this content */
  name: string;
  size_bytes: number;
  received_at: Generated<Date>;
}

export interface IngestRunsTable {
  id: Generated<number>;
  started_at: Generated<Date>;
  finished_at: Timestamp | null;
  settings: Json;
  code_version: string;
  status: ColumnType<RunStatus, RunStatus | undefined, RunStatus>;
  accepted: ColumnType<number, number | undefined, number>;
  duplicates: ColumnType<number, number | undefined, number>;
  replaced: ColumnType<number, number | undefined, number>;
  rejected: ColumnType<number, number | undefined, number>;
}

export interface GradesTable {
  id: Generated<number>;
  code: string;
}

export interface SuppliersTable {
  id: Generated<number>;
  name: string;
}

export interface HeatsTable {
  id: Generated<number>;
  supplier_id: number;
  code: string;
}

/**
 * One row per stored version of a test. Identity is (lab, test_id); exactly one version per
 * identity is current (`is_current`), older versions stay as history after a replace.
 */
export interface TestsTable {
  id: Generated<number>;
  lab: string;
  test_id: string;
  version: number;
  is_current: boolean;
  superseded_at: Timestamp | null;
  grade_id: number;
  supplier_id: number;
  heat_id: number | null;
  tested_on: ColumnType<string, string, string>;
  shape: SpecimenShapeCode | null;
  diameter_mm: number | null;
  thickness_mm: number | null;
  width_mm: number | null;
  /** S0, from the shape or given */
  area_mm2: number | null;
  gauge_length_mm: number | null;
  orientation: string | null;
  temperature_c: number | null;
  /** SHA-256 of the canonical record plus the curve file's SHA-256 */
  content_sha256: string;
  manifest_sha256: string;
  manifest_line: number;
  run_id: number;
  created_at: Generated<Date>;
}

/**
 * One row per test version that has a curve; channels absent from the file are NULL. Each channel
 * is bytea, 8 little-endian bytes a point (migration 0040; `curve_channel(bytea)` and the view
 * `curve_arrays` give float8[] in SQL).
 */
export interface CurvesTable {
  test_row_id: number;
  n_points: number;
  time_s: ChannelBytes;
  force_n: ChannelBytes;
  extension_mm: ChannelBytes;
  crosshead_mm: ChannelBytes;
  stress_mpa: ChannelBytes;
  strain: ChannelBytes;
  source_sha256: string;
  /** curve file path relative to its manifest */
  source_path: string;
}

/** Summary values as given (certificates, or beside a curve). */
export interface SummaryRecordsTable {
  test_row_id: number;
  yield_mpa: number | null;
  yield_definition: YieldDefinition | null;
  tensile_mpa: number | null;
  uniform_elongation_pct: number | null;
  elongation_pct: number | null;
}

/** A rejected input with its location; `line`/`col` are 1-based, 0 for the whole file. */
export interface RejectionsTable {
  id: Generated<number>;
  run_id: number;
  file: string;
  line: number;
  col: number;
  code: string;
  message: string;
  created_at: Generated<Date>;
}

/**
 * An exclusion decision (or its undo): append-only; a test's state is its latest row
 * (migrations/0010-exclusions.ts).
 */
export interface ExclusionsTable {
  id: Generated<number>;
  lab: string;
  test_id: string;
  test_row_id: number | null;
  action: 'exclude' | 'include';
  reason: string;
  decided_by: string;
  decided_at: Generated<Date>;
}

/** A user's acknowledgement, closing or reopening of a drift alert (appended, never changed). */
export interface AlertActionsTable {
  id: Generated<number>;
  alert_id: string;
  action: 'acknowledge' | 'close' | 'reopen';
  actor: string;
  note: string | null;
  acted_at: Generated<Date>;
}

/** Work handed to the job queue, one row per request (migration 0060, queue package). */
export interface QueueRequestsTable {
  id: Generated<number>;
  kind: 'ingest' | 'reduce';
  created_at: Generated<Date>;
  parts: number;
  settings: Json;
  then_stages: Generated<boolean>;
  followup_at: Date | null;
  cancelled_at: Date | null;
}

/** A part of a queued request whose work is committed (part -1: the follow-up stages). */
export interface QueuePartsTable {
  request_id: number;
  part: number;
  kind: 'ingest' | 'reduce' | 'stages';
  finished_at: Generated<Date>;
  counts: Json;
}

export interface RawTables {
  source_files: SourceFilesTable;
  ingest_runs: IngestRunsTable;
  grades: GradesTable;
  suppliers: SuppliersTable;
  heats: HeatsTable;
  tests: TestsTable;
  curves: CurvesTable;
  summary_records: SummaryRecordsTable;
  rejections: RejectionsTable;
  exclusions: ExclusionsTable;
  alert_actions: AlertActionsTable;
  queue_requests: QueueRequestsTable;
  queue_parts: QueuePartsTable;
}

export interface Database extends RawTables, ResultTables {}

export type TestRow = Selectable<TestsTable>;
export type NewTest = Insertable<TestsTable>;
export type CurveRow = Selectable<CurvesTable>;
export type SummaryRow = Selectable<SummaryRecordsTable>;
export type RejectionRow = Selectable<RejectionsTable>;
