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
import { channelFromBytes, type BinaryType, type DecodedValue, type Store } from '@fractile/store';
import type { ReduceSettings } from '@fractile/curves';
import type { Catalog } from '../catalog.ts';
import { ALGORITHM_VERSION, exclusiveStage, finishRun, startRun } from '../runs.ts';
import { reduceOne } from './reduce-one.ts';
import { gradeSettings, saveReduceBody, writeReduceRows, type GradeSettings } from './run-body.ts';
import type { ReduceOverrides } from './settings.ts';
import { channelBuffers, type ReduceRow, type ReduceTask } from './task.ts';

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
const f64 = (x: DecodedValue): Float64Array | null => (x instanceof Uint8Array ? channelFromBytes(x) : null);

/** The columns loadTasks reads, and their binary COPY types. */
const TASK_COLUMNS: [string, BinaryType][] = [
  ['t.id', 'int8'], ['g.code', 'text'], ['t.area_mm2', 'float8'], ['t.gauge_length_mm', 'float8'],
  ['c.n_points', 'int4'], ['c.time_s', 'bytea'], ['c.force_n', 'bytea'], ['c.extension_mm', 'bytea'], ['c.crosshead_mm', 'bytea'], ['c.stress_mpa', 'bytea'], ['c.strain', 'bytea'],
  ['s.yield_mpa', 'float8'], ['s.yield_definition', 'text'], ['s.tensile_mpa', 'float8'], ['s.uniform_elongation_pct', 'float8'], ['s.elongation_pct', 'float8'], ['(s.test_row_id is not null)', 'bool'],
];

/**
 * The tests of a batch with their channels, read by binary `COPY … TO` (the channels as bytes,
 * migration 0040: 0.5 s of CPU for 1,000 curves against 2.8 s as float8[] text). The ids are
 * integers written into the statement (COPY takes no parameters).
 */
async function loadTasks(store: Store, items: WorkItem[], settingsByGrade: GradeSettings): Promise<ReduceTask[]> {
  const ids = items.map((i) => Math.trunc(i.id));
  const rows = await store.copyOutBinary(
    `select ${TASK_COLUMNS.map(([c]) => c).join(', ')}
     from tests t
     join grades g on g.id = t.grade_id
     left join curves c on c.test_row_id = t.id
     left join summary_records s on s.test_row_id = t.id
     where t.id = any('{${ids.join(',')}}'::int8[])
     order by t.id`,
    TASK_COLUMNS.map(([, t]) => t),
  );
  return rows.map((r) => {
    const [id, grade, area, gauge, nPoints, time, force, extension, crosshead, stress, strain, yieldMpa, yieldDefinition, tensile, uniform, elongation, hasSummary] = r;
    const s = settingsByGrade.get(String(grade))!;
    return {
      testPk: Number(id),
      settingsHash: s.hash,
      settings: s.settings,
      curve:
        nPoints !== null
          ? { timeS: f64(time), forceN: f64(force), extensionMm: f64(extension), crossheadMm: f64(crosshead), stressMpa: f64(stress), strain: f64(strain), areaMm2: num(area), gaugeLengthMm: num(gauge) }
          : null,
      summary: hasSummary
        ? {
            yieldMpa: num(yieldMpa),
            yieldDefinition: (yieldDefinition as ReduceSettings['yieldDefinition'] | null) ?? null,
            tensileMpa: num(tensile),
            uniformElongationPct: num(uniform),
            elongationPct: num(elongation),
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
  const settingsByGrade = await gradeSettings(db, opts.catalog, opts.overrides);
  const grades = [...settingsByGrade.keys()];
  const runSettingsHash = await saveReduceBody(db, settingsByGrade, opts.catalog);
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
      await writeReduceRows(store, run, rows);
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
