/**
 * The reduce stage run by the ingest: each test is reduced as it is stored, by the worker that
 * parsed its curve (the ingest's curve-task.ts runs reduce-one.ts, the same pure reduction as
 * the stage's workers), and its row is written in the batch's transaction under a reduce run of
 * its own. The settings are what `fractile reduce` would use: each grade's from the catalog
 * given (or that of the last reduce), with the stage's defaults.
 *
 * `finish()` closes that run with its counts and the settings body of every grade then stored,
 * and runs the reduce stage for whatever is still without a result for those settings (tests
 * stored before without a reduction, grades whose settings the catalog changed); normally
 * nothing, at the cost of two queries. So after an ingest the database is reduced, as after
 * `ingest` then `reduce`, with the same rows (test/ingest-reduce.test.ts).
 */
import type { ReduceSettings } from '@fractile/curves';
import type { Store } from '@fractile/store';
import type { Catalog } from '../catalog.ts';
import { finishRun, startRun } from '../runs.ts';
import { gradeSettings, saveReduceBody, settingsOfGrade, writeReduceRows } from './run-body.ts';
import type { ReduceOverrides } from './settings.ts';
import { runReduce, type ReduceStageSummary } from './stage.ts';
import type { ReduceRow } from './task.ts';

export interface IngestReductionOptions {
  catalog: Catalog | null;
  overrides?: ReduceOverrides;
  codeVersion: string;
}

export interface IngestReduction {
  /** what the ingest takes as its `reducer` */
  reducer: {
    settingsFor(grade: string): { hash: string; settings: ReduceSettings };
    write(store: Store, rows: ReduceRow[]): Promise<void>;
  };
  /** the run's id */
  run: number;
  /** closes the run and reduces what is left (see above); returns the counts of both */
  finish(opts?: { workers?: number; onProgress?: (done: number, total: number) => void }): Promise<{ atIngest: { reduced: number; failed: number; given: number }; rest: ReduceStageSummary }>;
  /** marks the run failed (the ingest failed) */
  fail(): Promise<void>;
}

export async function startIngestReduction(store: Store, opts: IngestReductionOptions): Promise<IngestReduction> {
  const settings = new Map<string, { hash: string; settings: ReduceSettings }>();
  const settingsFor = (grade: string) => {
    let s = settings.get(grade);
    if (!s) settings.set(grade, (s = settingsOfGrade(opts.catalog, grade, opts.overrides)));
    return s;
  };
  const startHash = await saveReduceBody(store.db, await gradeSettings(store.db, opts.catalog, opts.overrides), opts.catalog);
  const run = await startRun(store.db, 'reduce', startHash, null, opts.codeVersion);
  const counts = { reduced: 0, failed: 0, given: 0 };
  return {
    run,
    reducer: {
      settingsFor,
      async write(s, rows) {
        await writeReduceRows(s, run, rows);
        for (const r of rows) {
          if (!r.ok) counts.failed++;
          else if (r.given) counts.given++;
          else counts.reduced++;
        }
      },
    },
    async finish(o = {}) {
      const hash = await saveReduceBody(store.db, await gradeSettings(store.db, opts.catalog, opts.overrides), opts.catalog);
      await store.db.updateTable('stage_runs').set({ settings_hash: hash }).where('id', '=', run).execute();
      await finishRun(store.db, run, { ...counts, at_ingest: 1 });
      const rest = await runReduce(store, { catalog: opts.catalog, overrides: opts.overrides, codeVersion: opts.codeVersion, workers: o.workers, onProgress: o.onProgress });
      return { atIngest: { ...counts }, rest };
    },
    async fail() {
      await finishRun(store.db, run, { ...counts, at_ingest: 1 }, 'failed');
    },
  };
}
