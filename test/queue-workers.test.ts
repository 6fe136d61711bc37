/**
 * Scale-out on the job queue (issue 14), on a real PostgreSQL server (TEST_DATABASE_URL; CI
 * always gives one — without it the server checks are skipped and say why):
 *   - 5,000 generated tests (seed-demo's benchmark set, 200-point curves to keep it bounded),
 *     ingested in parts and reduced in batches by 3 worker processes, end with the same database,
 *     test by test (identity, raw row, curve, every result column), as one process running
 *     ingestManifests and runReduce; every part is in the ledger once, no run is left running,
 *     the group stages ran once after the last batch, and the workers stop cleanly on SIGTERM.
 *   - `--queue` on an embedded folder is refused with exit 2 and a message that says why.
 * The reference is the project's own in-process pipeline: the check is that distributing the
 * work changes nothing ("exactly once": no test lost, none duplicated, no result recomputed
 * differently).
 */
import { spawnSync } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'kysely';
import { enqueueIngest, enqueueReduce, watchRequest } from '@fractile/queue';
import { createEmbeddedFolder } from './support/databases.ts';
import { contentFingerprint, prepareQueueCheck, type QueueCheck, fingerprintDifferences, FRACTILE_BIN, integrityCounts, startWorkerProcess } from './support/queue-fixture.ts';

const SERVER = process.env.TEST_DATABASE_URL;
const TESTS = 5000;

describe('--queue on an embedded folder', () => {
  it('is refused with exit 2, naming the folder and what to do', () => {
    const folder = createEmbeddedFolder();
    try {
      for (const args of [['ingest', 'm.csv', '--queue'], ['reduce', '--queue'], ['worker'], ['queue']]) {
        const r = spawnSync(process.execPath, [FRACTILE_BIN, ...args, '--db', folder.path], { encoding: 'utf8', env: { ...process.env, DATABASE_URL: '' } });
        expect(r.status, args.join(' ')).toBe(2);
        expect(r.stderr).toContain('needs a PostgreSQL server');
        expect(r.stderr).toContain(folder.path);
      }
    } finally {
      folder.remove();
    }
  });
});

if (!SERVER) console.warn('queue-workers: TEST_DATABASE_URL is not set: the job-queue checks need a PostgreSQL server and are skipped');

describe.skipIf(!SERVER)('3 worker processes against one process (5,000 tests)', () => {
  let c: QueueCheck;
  beforeAll(async () => {
    c = await prepareQueueCheck(SERVER!, { tests: TESTS, points: 200, seed: 14 });
  }, 300_000);
  afterAll(async () => c?.close());

  it('ends with the same tests and results, each once, and every run consistent', async () => {
    const workers = [0, 1, 2].map(() => startWorkerProcess(c.queuedUrl));
    try {
      const ingest = await enqueueIngest(c.queued, [c.manifest], { partRows: 400 });
      expect(ingest.parts).toBe(Math.ceil(TESTS / 400));
      const ingested = await watchRequest(c.queued, ingest.request, () => {}, 250);
      expect(ingested.failed).toBe(0);
      const reduce = await enqueueReduce(c.queued, { catalog: null, batchSize: 250, thenStages: { by: 'grade', driftBy: 'supplier,grade' } });
      expect(reduce.parts).toBe(TESTS / 250);
      const reduced = await watchRequest(c.queued, reduce.request, () => {}, 250);
      expect(reduced).toMatchObject({ done: reduce.parts, failed: 0, stages_done: true });
    } finally {
      for (const w of workers) w.child.kill('SIGTERM');
    }
    const exits = await Promise.all(workers.map((w) => w.exited));
    expect(exits.map((e) => e.code), workers.map((w) => w.log()).join('\n')).toEqual([0, 0, 0]);

    const want = await contentFingerprint(c.reference);
    const got = await contentFingerprint(c.queued);
    expect(want.size).toBe(TESTS);
    expect(fingerprintDifferences(want, got)).toEqual([]);
    expect(await integrityCounts(c.queued)).toEqual(await integrityCounts(c.reference));

    // every part once in the ledger, the stages once; the work was spread over the workers
    const parts = await sql<{ kind: string; n: number }>`select kind, count(*)::int as n from queue_parts group by kind order by kind`.execute(c.queued.db);
    expect(parts.rows).toEqual([
      { kind: 'ingest', n: Math.ceil(TESTS / 400) },
      { kind: 'reduce', n: TESTS / 250 },
      { kind: 'stages', n: 1 },
    ]);
    const stages = await sql<{ stage: string; status: string; n: number }>`select stage, status, count(*)::int as n from stage_runs where stage <> 'reduce' group by stage, status order by stage`.execute(c.queued.db);
    expect(stages.rows.map((r) => `${r.stage} ${r.status} ${r.n}`)).toEqual(['aggregate done 1', 'design done 1', 'monitor done 1']);
    const runs = await sql<{ n: number }>`select count(distinct queue_job)::int as n from stage_runs where stage = 'reduce' and status = 'done'`.execute(c.queued.db);
    expect(runs.rows[0].n).toBe(TESTS / 250);
  }, 300_000);
});
