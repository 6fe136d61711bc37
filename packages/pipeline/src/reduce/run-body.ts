/**
 * What a reduce run records and writes, shared by the reduce stage (stage.ts) and the reduction
 * at ingest (at-ingest.ts): the settings of every grade in the database (the catalog's entry for
 * it, settings.ts) with their hashes; the run's settings body — that map, the algorithm
 * version and the catalog — whose grade → hash map is what "current results" means to the later
 * stages (properties.ts); and the per-test rows written by COPY with the run id and algorithm
 * version.
 */
import type { Kysely } from 'kysely';
import type { ReduceSettings } from '@fractile/curves';
import type { Database, Store } from '@fractile/store';
import type { Catalog } from '../catalog.ts';
import { ALGORITHM_VERSION, saveSettings } from '../runs.ts';
import { reduceSettingsFor, reduceSettingsHash, type ReduceOverrides } from './settings.ts';
import { REDUCE_ROW_COLUMNS, type ReduceRow } from './task.ts';

export type GradeSettings = Map<string, { hash: string; settings: ReduceSettings }>;

/** The settings of one grade (and their hash). */
export function settingsOfGrade(catalog: Catalog | null, grade: string, overrides?: ReduceOverrides): { hash: string; settings: ReduceSettings } {
  const settings = reduceSettingsFor(catalog, grade, overrides);
  return { hash: reduceSettingsHash(settings), settings };
}

/** The settings of every grade in the database, in code order. */
export async function gradeSettings(db: Kysely<Database>, catalog: Catalog | null, overrides?: ReduceOverrides): Promise<GradeSettings> {
  const rows = await db.selectFrom('grades').select(['code']).orderBy('code').execute();
  return new Map(rows.map(({ code }) => [code, settingsOfGrade(catalog, code, overrides)]));
}

/** Saves the run's settings body; returns its hash. */
export function saveReduceBody(db: Kysely<Database>, byGrade: GradeSettings, catalog: Catalog | null): Promise<string> {
  const grades = [...byGrade.keys()];
  return saveSettings(db, 'reduce', { algorithm_version: ALGORITHM_VERSION, grades: Object.fromEntries(grades.map((g) => [g, byGrade.get(g)!])), catalog });
}

const COLUMNS = [...REDUCE_ROW_COLUMNS, 'run_id', 'algorithm_version'];

/** Writes per-test rows of run `run` (on the current transaction, if any). */
export async function writeReduceRows(store: Store, run: number, rows: readonly ReduceRow[]): Promise<void> {
  if (rows.length) await store.copyRows('test_results', COLUMNS, rows.map((r) => [...REDUCE_ROW_COLUMNS.map((c) => r[c]), run, ALGORITHM_VERSION]));
}
