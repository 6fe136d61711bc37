/**
 * The reduce stage: every current test without a result for its grade's settings and the current
 * algorithm version is reduced (in worker threads) and its row stored. A second run with the same
 * catalog computes nothing; editing one grade's settings recomputes that grade's tests only. Every
 * call records a run row whose settings body maps each grade to its settings hash — that map is
 * what "current results" means to the later stages.
 */
import { availableParallelism } from 'node:os';
import { sql } from 'kysely';
import { Piscina } from 'piscina';
import type { Store } from '@fractile/store';
import type { ReduceSettings } from '@fractile/curves';
import type { Catalog } from '../catalog.ts';
import { ALGORITHM_VERSION, exclusiveStage, finishRun, saveSettings, startRun } from '../runs.ts';
import { reduceOne } from './reduce-one.ts';
import { reduceSettingsFor, reduceSettingsHash, type ReduceOverrides } from './settings.ts';
import { channelBuffers, REDUCE_ROW_COLUMNS, type ReduceRow, type ReduceTask } from './task.ts';

export interface ReduceStageOptions {
  catalog: Catalog | null;
  overrides?: ReduceOverrides;
  /** worker threads; 0 reduces on the calling thread (default: all cores) */
  workers?: number;
  /** tests read from the database per batch */
  batchSize?: number;
  codeVersion: string;
  onProgress?: (done: number, total: number) => void;
  /** only these test row ids (a queued batch, queue package; default: every current test) */
  testIds?: readonly number[];
  /** the queued job running this batch, recorded in its run row */
  queueJob?: string;
}

export interface ReduceStageSummary {
  run: number;
  reduced: number;
  failed: number;
  given: number;
  unchanged: number;
  seconds: number;
  /** wall time waiting for the database reads, the computation and the writes (s) */
  timings: { read: number; compute: number; write: number };
}

interface WorkItem {
  id: number;
  grade: string;
}

/** Set by the CLI build (packages/cli/build.mjs) to the compiled worker; undefined when run from the sources. */
declare const FRACTILE_REDUCE_WORKER: string | undefined;
const WORKER_URL = typeof FRACTILE_REDUCE_WORKER === 'string' ? FRACTILE_REDUCE_WORKER : new URL('./worker.mjs', import.meta.url).href;

const num = (x: unknown): number | null => (x === null || x === undefined ? null : Number(x));
const f64 = (x: unknown): Float64Array | null => (Array.isArray(x) ? Float64Array.from(x as number[]) : null);

async function loadTasks(store: Store, items: WorkItem[], settingsByGrade: Map<string, { hash: string; settings: ReduceSettings }>): Promise<ReduceTask[]> {
  const ids = items.map((i) => i.id);
  const res = await sql<Record<string, unknown>>`
    select t.id, g.code as grade, t.area_mm2, t.gauge_length_mm,
           c.n_points, c.time_s, c.force_n, c.extension_mm, c.crosshead_mm, c.stress_mpa, c.strain,
           s.yield_mpa, s.yield_definition, s.tensile_mpa, s.uniform_elongation_pct, s.elongation_pct, (s.test_row_id is not null) as has_summary
    from tests t
    join grades g on g.id = t.grade_id
    left join curves c on c.test_row_id = t.id
    left join summary_records s on s.test_row_id = t.id
    where t.id = any(${sql.val(ids)}::bigint[])
    order by t.id`.execute(store.db);
  return res.rows.map((r) => {
    const grade = String(r.grade);
    const s = settingsByGrade.get(grade)!;
    const hasCurve = r.n_points !== null && r.n_points !== undefined;
    return {
      testPk: Number(r.id),
      settingsHash: s.hash,
      settings: s.settings,
      curve: hasCurve
        ? {
            timeS: f64(r.time_s),
            forceN: f64(r.force_n),
            extensionMm: f64(r.extension_mm),
            crossheadMm: f64(r.crosshead_mm),
            stressMpa: f64(r.stress_mpa),
            strain: f64(r.strain),
            areaMm2: num(r.area_mm2),
            gaugeLengthMm: num(r.gauge_length_mm),
          }
        : null,
      summary: r.has_summary
        ? {
            yieldMpa: num(r.yield_mpa),
            yieldDefinition: (r.yield_definition as ReduceSettings['yieldDefinition'] | null) ?? null,
            tensileMpa: num(r.tensile_mpa),
            uniformElongationPct: num(r.uniform_elongation_pct),
            elongationPct: num(r.elongation_pct),
          }
        : null,
    };
  });
}

function chunk<T>(xs: T[], size: number): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < xs.length; i += size) out.push(xs.slice(i, i + size));
  return out;
}

/** Runs the stage alone on the database (see `exclusiveStage`). */
export function runReduce(store: Store, opts: ReduceStageOptions): Promise<ReduceStageSummary> {
  return exclusiveStage(store, 'reduce', () => reduceAlone(store, opts));
}

/**
 * Reduces one batch of test row ids (`opts.testIds`) beside other batches: disjoint batches
 * write disjoint result keys, so they need not take turns; a batch run twice (a retried job)
 * finds the rows committed before and computes the rest. Its run row is left `running` by a
 * killed worker and marked by the queue when the job is handed out again.
 */
export function runReduceBatch(store: Store, opts: ReduceStageOptions & { testIds: readonly number[] }): Promise<ReduceStageSummary> {
  return reduceAlone(store, opts);
}

async function reduceAlone(store: Store, opts: ReduceStageOptions): Promise<ReduceStageSummary> {
  const t0 = performance.now();
  const db = store.db;
  const gradeRows = await db.selectFrom('grades').select(['code']).orderBy('code').execute();
  const settingsByGrade = new Map<string, { hash: string; settings: ReduceSettings }>();
  for (const { code } of gradeRows) {
    const settings = reduceSettingsFor(opts.catalog, code, opts.overrides);
    settingsByGrade.set(code, { hash: reduceSettingsHash(settings), settings });
  }
  const grades = [...settingsByGrade.keys()];
  const body = {
    algorithm_version: ALGORITHM_VERSION,
    grades: Object.fromEntries(grades.map((g) => [g, settingsByGrade.get(g)!])),
    catalog: opts.catalog,
  };
  const runSettingsHash = await saveSettings(db, 'reduce', body);
  const run = await startRun(db, 'reduce', runSettingsHash, null, opts.codeVersion, opts.queueJob ?? null);
  const subset = opts.testIds ? sql`and t.id = any(${sql.val([...opts.testIds])}::bigint[])` : sql``;

  const todo = grades.length
    ? (
        await sql<{ id: unknown; grade: string }>`
          with m as (select * from unnest(${sql.val(grades)}::text[], ${sql.val(grades.map((g) => settingsByGrade.get(g)!.hash))}::text[]) as m(grade, hash))
          select t.id, g.code as grade
          from tests t join grades g on g.id = t.grade_id join m on m.grade = g.code
          where t.is_current ${subset} and not exists (
            select 1 from test_results r where r.test_pk = t.id and r.settings_hash = m.hash and r.algorithm_version = ${ALGORITHM_VERSION})
          order by t.id`.execute(db)
      ).rows.map((r) => ({ id: Number(r.id), grade: r.grade }))
    : [];
  let currentQuery = db.selectFrom('tests').select((eb) => eb.fn.countAll<string>().as('n')).where('is_current', '=', true);
  if (opts.testIds) currentQuery = currentQuery.where('id', 'in', opts.testIds.length ? [...opts.testIds] : [-1]);
  const current = await currentQuery.executeTakeFirstOrThrow();
  const unchanged = Number(current.n) - todo.length;

  const workers = Math.max(0, opts.workers ?? availableParallelism());
  const pool = workers > 0 && todo.length >= 64 ? new Piscina({ filename: WORKER_URL, minThreads: workers, maxThreads: workers }) : null;
  const counts = { reduced: 0, failed: 0, given: 0 };
  const timings = { read: 0, compute: 0, write: 0 };
  const batchSize = opts.batchSize ?? 256;
  const batches = chunk(todo, batchSize);
  try {
    let next = batches.length ? loadTasks(store, batches[0], settingsByGrade) : null;
    for (let b = 0; b < batches.length; b++) {
      let t = performance.now();
      const tasks = await next!;
      timings.read += performance.now() - t;
      next = b + 1 < batches.length ? loadTasks(store, batches[b + 1], settingsByGrade) : null;
      t = performance.now();
      let rows: ReduceRow[];
      if (pool) {
        const parts = chunk(tasks, Math.ceil(tasks.length / (workers * 2)));
        rows = (await Promise.all(parts.map((p) => pool.run(p, { transferList: channelBuffers(p) }) as Promise<ReduceRow[]>))).flat();
      } else rows = tasks.map(reduceOne);
      timings.compute += performance.now() - t;
      t = performance.now();
      for (const r of rows) {
        if (!r.ok) counts.failed++;
        else if (r.given) counts.given++;
        else counts.reduced++;
      }
      const columns = [...REDUCE_ROW_COLUMNS, 'run_id', 'algorithm_version'];
      await store.copyRows('test_results', columns, rows.map((r) => [...REDUCE_ROW_COLUMNS.map((c) => r[c]), run, ALGORITHM_VERSION]));
      timings.write += performance.now() - t;
      opts.onProgress?.(Math.min(todo.length, (b + 1) * batchSize), todo.length);
    }
  } catch (e) {
    await finishRun(db, run, { ...counts, unchanged }, 'failed');
    throw e;
  } finally {
    await pool?.destroy();
  }
  await finishRun(db, run, { ...counts, unchanged });
  const sec = (ms: number) => ms / 1000;
  return { run, ...counts, unchanged, seconds: sec(performance.now() - t0), timings: { read: sec(timings.read), compute: sec(timings.compute), write: sec(timings.write) } };
}
