/**
 * Shared by the job-queue checks and the scale benchmark: worker processes of the compiled CLI,
 * and a fingerprint of a database's per-test content (one MD5 per test, keyed by identity and
 * version) that leaves out only what depends on the order of the work — row ids, run ids and
 * timestamps — and names grades, suppliers and heats by their codes (their ids are given out in
 * the order the parts commit).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { expect } from 'vitest';
import { sql } from 'kysely';
import { ingestManifests } from '@fractile/ingest';
import { runReduce } from '@fractile/pipeline';
import { generateBenchmarkSet } from '@fractile/seed-demo';
import { openStore, type Store } from '@fractile/store';
import { createServerDatabase } from './databases.ts';

export { FRACTILE_BIN } from './cli.ts';
import { FRACTILE_BIN } from './cli.ts';

export interface WorkerProcess {
  child: ChildProcess;
  /** stderr so far */
  log(): string;
  /** resolves with the exit code (null when killed by a signal) and the signal */
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
}

/** Starts `fractile worker` on the database at `url`. */
export function startWorkerProcess(url: string, ...args: string[]): WorkerProcess {
  const child = spawn(process.execPath, [FRACTILE_BIN, 'worker', '--db', url, ...args], { stdio: ['ignore', 'ignore', 'pipe'], env: { ...process.env, DATABASE_URL: '' } });
  let err = '';
  child.stderr!.on('data', (b: Buffer) => (err += b.toString()));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.on('exit', (code, signal) => resolve({ code, signal })));
  return { child, log: () => err, exited };
}

/** identity/version → MD5 of the test's row, its curve, its summary record and its results. */
export async function contentFingerprint(store: Store): Promise<Map<string, string>> {
  const r = await sql<{ k: string; h: string }>`
    select t.lab || '/' || t.test_id || '/' || t.version as k,
           md5(concat_ws('|',
             (to_jsonb(t) - 'id' - 'run_id' - 'created_at' - 'superseded_at' - 'grade_id' - 'supplier_id' - 'heat_id')::text,
             g.code, s.name, h.code,
             (select (to_jsonb(c) - 'test_row_id')::text from curves c where c.test_row_id = t.id),
             (select (to_jsonb(m) - 'test_row_id')::text from summary_records m where m.test_row_id = t.id),
             (select string_agg((to_jsonb(x) - 'test_pk' - 'run_id' - 'created_at')::text, '|' order by x.settings_hash, x.algorithm_version)
                from test_results x where x.test_pk = t.id))) as h
    from tests t join grades g on g.id = t.grade_id join suppliers s on s.id = t.supplier_id left join heats h on h.id = t.heat_id`.execute(store.db);
  return new Map(r.rows.map((x) => [x.k, x.h]));
}

/** Identities whose fingerprints differ, or that one side lacks (at most `limit`). */
export function fingerprintDifferences(a: Map<string, string>, b: Map<string, string>, limit = 10): string[] {
  const out: string[] = [];
  for (const [k, h] of a) if (b.get(k) !== h) out.push(`${k}: ${b.has(k) ? 'differs' : 'missing'}`);
  for (const k of b.keys()) if (!a.has(k)) out.push(`${k}: extra`);
  return out.slice(0, limit);
}

/** Counts that show lost or repeated work: tests per identity, results per key, runs left running. */
export async function integrityCounts(store: Store): Promise<{ tests: number; identities: number; results: number; resultKeys: number; runningStageRuns: number; runningIngestRuns: number }> {
  const r = await sql<{ tests: number; identities: number; results: number; resultKeys: number; runningStageRuns: number; runningIngestRuns: number }>`
    select (select count(*) from tests)::int as tests,
           (select count(distinct (lab, test_id, version)) from tests)::int as identities,
           (select count(*) from test_results)::int as results,
           (select count(distinct (test_pk, settings_hash, algorithm_version)) from test_results)::int as "resultKeys",
           (select count(*) from stage_runs where status = 'running')::int as "runningStageRuns",
           (select count(*) from ingest_runs where status = 'running')::int as "runningIngestRuns"`.execute(store.db);
  return r.rows[0];
}

/**
 * Asserts that the queued database holds what the one-process reference holds: `tests` tests, each
 * test's content identical (contentFingerprint), the same counts of tests and result keys, and no
 * stage or ingest run left `running`.
 */
export async function expectSameAsOneProcess(c: QueueCheck, tests: number): Promise<void> {
  const want = await contentFingerprint(c.reference);
  expect(want.size).toBe(tests);
  expect(fingerprintDifferences(want, await contentFingerprint(c.queued))).toEqual([]);
  const counts = await integrityCounts(c.queued);
  expect(counts).toEqual(await integrityCounts(c.reference));
  expect(counts).toMatchObject({ tests, identities: tests, runningStageRuns: 0, runningIngestRuns: 0 });
}

export interface QueueCheck {
  manifest: string;
  /** the in-process reference: ingestManifests then runReduce, one process */
  reference: Store;
  /** an empty database for the queued run, and its URL */
  queued: Store;
  queuedUrl: string;
  close(): Promise<void>;
}

/**
 * A generated benchmark set (seed-demo, `points`-point curves), a reference database filled by
 * one process, and an empty database for the queue, both fresh on the server at `serverUrl`.
 */
export async function prepareQueueCheck(serverUrl: string, o: { tests: number; points: number; seed: number }): Promise<QueueCheck> {
  const dir = mkdtempSync(path.join(tmpdir(), 'fractile-queue-'));
  const set = generateBenchmarkSet({ outDir: dir, tests: o.tests, points: o.points, seed: o.seed });
  const manifest = path.join(set.outDir, set.manifest);
  const dbs = [await createServerDatabase(serverUrl), await createServerDatabase(serverUrl)];
  const reference = await openStore(dbs[0].url);
  const queued = await openStore(dbs[1].url);
  await ingestManifests(reference, [{ path: manifest }], { workers: 0, codeVersion: 'queue-check' });
  await runReduce(reference, { catalog: null, workers: 0, codeVersion: 'queue-check' });
  return {
    manifest,
    reference,
    queued,
    queuedUrl: dbs[1].url,
    async close() {
      await reference.close();
      await queued.close();
      for (const d of dbs) await d.drop();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
