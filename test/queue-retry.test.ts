/**
 * A job that throws is retried, and the database ends as one process would leave it (issue 14),
 * on a real PostgreSQL server (TEST_DATABASE_URL; skipped with the reason when none is given).
 *
 * 300 generated tests are enqueued as 3 ingest parts. Before a worker starts, the manifest is
 * changed (a comment line appended), so every part's job throws ("the file changed since it was
 * enqueued": a part reads exactly the bytes that were enqueued); once the first attempt has
 * failed with that message, the manifest gets its enqueued bytes back, and the retries
 * (graphile-worker's backoff, about e^attempts seconds) succeed. Then reduce and the group stages
 * are queued and run. The database must hold the same content, test by test, as one process
 * running ingestManifests and runReduce, each test once, no run left `running`.
 */
import { appendFileSync, readFileSync, writeFileSync } from 'node:fs';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { enqueueIngest, enqueueReduce, QUEUE_SCHEMA, watchRequest } from '@fractile/queue';
import { prepareQueueCheck, type QueueCheck, startWorkerProcess, expectSameAsOneProcess } from './support/queue-fixture.ts';

const SERVER = process.env.TEST_DATABASE_URL;
const TESTS = 300;

if (!SERVER) console.warn('queue-retry: TEST_DATABASE_URL is not set: the job-queue retry check needs a PostgreSQL server and is skipped');

describe.skipIf(!SERVER)('a job that throws', () => {
  let c: QueueCheck;
  beforeAll(async () => {
    c = await prepareQueueCheck(SERVER!, { tests: TESTS, points: 200, seed: 1408 });
  }, 300_000);
  afterAll(async () => c?.close());

  it('is retried, and the database ends as one process leaves it', async () => {
    const original = readFileSync(c.manifest);
    const ingest = await enqueueIngest(c.queued, [c.manifest], { partRows: 100, batchSize: 25 });
    expect(ingest.parts).toBe(3);
    appendFileSync(c.manifest, '# changed after it was enqueued\n');
    const w = startWorkerProcess(c.queuedUrl);
    try {
      const failedOnce = async () =>
        (
          await sql<{ n: number; e: string | null }>`select count(*)::int as n, max(last_error) as e from ${sql.id(QUEUE_SCHEMA)}.jobs where attempts >= 1 and last_error is not null`.execute(c.queued.db)
        ).rows[0];
      let seen = { n: 0, e: null as string | null };
      for (let t = 0; t < 600 && seen.n === 0; t++) {
        await new Promise((r) => setTimeout(r, 100));
        seen = await failedOnce();
      }
      expect(seen.n, w.log()).toBeGreaterThan(0);
      expect(seen.e).toMatch(/changed since it was enqueued/);
      writeFileSync(c.manifest, original);
      const ingested = await watchRequest(c.queued, ingest.request, () => {}, 250);
      expect(ingested).toMatchObject({ done: 3, failed: 0 });
      const reduce = await enqueueReduce(c.queued, { catalog: null, batchSize: 100, thenStages: { by: 'grade', driftBy: 'supplier,grade' } });
      const end = await watchRequest(c.queued, reduce.request, () => {}, 250);
      expect(end).toMatchObject({ done: reduce.parts, failed: 0, stages_done: true });
    } finally {
      writeFileSync(c.manifest, original);
      w.child.kill('SIGTERM');
      await w.exited;
    }
    await expectSameAsOneProcess(c, TESTS);
  }, 400_000);
});
