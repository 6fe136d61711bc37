/**
 * Workers whose server sessions all end at once — what a worker sees of a PostgreSQL server
 * restart (issue 14) — lose and repeat nothing, on a real server (TEST_DATABASE_URL; skipped with
 * the reason when none is given).
 *
 * 600 generated tests (200-point curves) are enqueued as 12 ingest parts, then as 12 reduce
 * batches with the group stages after them. Two workers run, their connections tagged with an
 * application name; while a job is held, the server ends every session of that name
 * (`pg_terminate_backend`, PostgreSQL documentation "Server Signaling Functions": the same as a
 * restart for a client — its transaction rolled back, its session locks gone). Each worker must
 * stop by itself with a message that says why (never hang on a dead connection, never exit 0);
 * two new workers then finish the request. This happens three times during ingest and three
 * times during reduce. The database must end with the same content, test by test, as one process
 * running ingestManifests and runReduce, each test and result key once and no run left `running`.
 * What is not exercised here: the server process itself stopping and starting (CI's server belongs
 * to the CI script), whose effect on committed data is PostgreSQL's own durability.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'kysely';
import { enqueueIngest, enqueueReduce, QUEUE_SCHEMA, requestProgress, settled, watchRequest } from '@fractile/queue';
import { prepareQueueCheck, type QueueCheck, startWorkerProcess, type WorkerProcess, expectSameAsOneProcess } from './support/queue-fixture.ts';

const SERVER = process.env.TEST_DATABASE_URL;
const TESTS = 600;
const CUTS = 3;
const APP = 'fractile-restart-check';

if (!SERVER) console.warn('queue-restart: TEST_DATABASE_URL is not set: the server-restart check needs a PostgreSQL server and is skipped');

const withApp = (url: string, i: number) => `${url}${url.includes('?') ? '&' : '?'}application_name=${APP}-${i}`;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe.skipIf(!SERVER)('every worker session ended by the server, as in a restart', () => {
  let c: QueueCheck;
  beforeAll(async () => {
    c = await prepareQueueCheck(SERVER!, { tests: TESTS, points: 200, seed: 1407 });
  }, 300_000);
  afterAll(async () => c?.close());

  it('stops the workers plainly, and new workers finish with nothing lost or repeated', async () => {
    let cutSessions = 0;
    let midJob = 0;
    const exits: string[] = [];
    /** the workers (by application name) that have a session open */
    const connected = async () =>
      (await sql<{ n: number }>`select count(distinct application_name)::int as n from pg_stat_activity where application_name like ${`${APP}-%`}`.execute(c.queued.db)).rows[0].n;
    const held = async () => (await sql<{ n: number }>`select count(*)::int as n from ${sql.id(QUEUE_SCHEMA)}.jobs where locked_at is not null`.execute(c.queued.db)).rows[0].n;
    const cut = async () =>
      (
        await sql<{ n: number }>`select count(*)::int as n from (select pg_terminate_backend(pid) from pg_stat_activity where application_name like ${`${APP}-%`}) x`.execute(
          c.queued.db,
        )
      ).rows[0].n;
    /** `CUTS` times: two workers, a cut while a job is held, both must stop by themselves */
    const cutLoop = async (request: number) => {
      for (let i = 0; i < CUTS; i++) {
        const p = await requestProgress(c.queued, request);
        if (!p || settled(p)) return;
        const workers: WorkerProcess[] = [0, 1].map((k) => startWorkerProcess(withApp(c.queuedUrl, k)));
        // both workers connected and a job held (or 20 s)
        for (let t = 0; t < 400 && ((await connected()) < 2 || (await held()) === 0); t++) await sleep(50);
        if ((await held()) > 0) midJob++;
        await sleep(150);
        cutSessions += await cut();
        for (const w of workers) {
          const timer = setTimeout(() => w.child.kill('SIGKILL'), 30_000);
          const e = await w.exited;
          clearTimeout(timer);
          // stopped by itself (not by the 30 s SIGKILL above), with an error status and a reason
          expect(e.signal, w.log()).toBeNull();
          expect(e.code, w.log()).not.toBe(0);
          expect(w.log()).toMatch(/lost (a|the) connection|terminating connection/);
          expect(w.log()).not.toMatch(/\n\s+at /); // a reason, not a stack trace
          expect(w.log()).not.toContain('internal error');
          exits.push(w.log().trim().split('\n').pop() ?? '');
        }
      }
    };
    const finish = async (request: number) => {
      const workers = [0, 1].map((k) => startWorkerProcess(withApp(c.queuedUrl, k)));
      const end = await watchRequest(c.queued, request, () => {}, 250);
      for (const w of workers) w.child.kill('SIGTERM');
      for (const w of workers) expect((await w.exited).code, w.log()).toBe(0);
      return end;
    };

    const ingest = await enqueueIngest(c.queued, [c.manifest], { partRows: 50, batchSize: 25 });
    await cutLoop(ingest.request);
    expect((await finish(ingest.request)).failed).toBe(0);

    const reduce = await enqueueReduce(c.queued, { catalog: null, batchSize: 50, thenStages: { by: 'grade', driftBy: 'supplier,grade' } });
    await cutLoop(reduce.request);
    const end = await finish(reduce.request);
    console.info(`queue-restart: ${exits.length} worker stops after ${cutSessions} sessions were ended (${midJob} of ${2 * CUTS} cuts while a job was held); last words: ${exits[0]}`);
    expect(exits.length).toBeGreaterThanOrEqual(2 * CUTS);
    expect(end).toMatchObject({ done: reduce.parts, failed: 0, stages_done: true });

    await expectSameAsOneProcess(c, TESTS);
  }, 400_000);
});
