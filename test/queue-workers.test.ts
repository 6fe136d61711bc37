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
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'kysely';
import { ingestManifests } from '@fractile/ingest';
import { runReduce } from '@fractile/pipeline';
import { enqueueIngest, enqueueReduce, watchRequest } from '@fractile/queue';
import { generateBenchmarkSet } from '@fractile/seed-demo';
import { openStore, type Store } from '@fractile/store';
import { createEmbeddedFolder, createServerDatabase } from './support/databases.ts';
import { contentFingerprint, fingerprintDifferences, FRACTILE_BIN, integrityCounts, startWorkerProcess } from './support/queue-fixture.ts';

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
  let dir: string;
  let manifest: string;
  const dbs: { url: string; drop(): Promise<void> }[] = [];
  let reference: Store;
  let queued: Store;

  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'fractile-queue-'));
    const set = generateBenchmarkSet({ outDir: dir, tests: TESTS, points: 200, seed: 14 });
    manifest = path.join(set.outDir, set.manifest);
    for (let i = 0; i < 2; i++) dbs.push(await createServerDatabase(SERVER!));
    reference = await openStore(dbs[0].url);
    queued = await openStore(dbs[1].url);
    await ingestManifests(reference, [{ path: manifest }], { workers: 0, codeVersion: 'queue-check' });
    await runReduce(reference, { catalog: null, workers: 0, codeVersion: 'queue-check' });
  });

  afterAll(async () => {
    await reference?.close();
    await queued?.close();
    for (const d of dbs) await d.drop();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('ends with the same tests and results, each once, and every run consistent', async () => {
    const workers = [0, 1, 2].map(() => startWorkerProcess(dbs[1].url));
    try {
      const ingest = await enqueueIngest(queued, [manifest], { partRows: 400 });
      expect(ingest.parts).toBe(Math.ceil(TESTS / 400));
      const ingested = await watchRequest(queued, ingest.request, () => {}, 250);
      expect(ingested.failed).toBe(0);
      const reduce = await enqueueReduce(queued, { catalog: null, batchSize: 250, thenStages: { by: 'grade', driftBy: 'supplier,grade' } });
      expect(reduce.parts).toBe(TESTS / 250);
      const reduced = await watchRequest(queued, reduce.request, () => {}, 250);
      expect(reduced).toMatchObject({ done: reduce.parts, failed: 0, stages_done: true });
    } finally {
      for (const w of workers) w.child.kill('SIGTERM');
    }
    const exits = await Promise.all(workers.map((w) => w.exited));
    expect(exits.map((e) => e.code), workers.map((w) => w.log()).join('\n')).toEqual([0, 0, 0]);

    const want = await contentFingerprint(reference);
    const got = await contentFingerprint(queued);
    expect(want.size).toBe(TESTS);
    expect(fingerprintDifferences(want, got)).toEqual([]);
    expect(await integrityCounts(queued)).toEqual(await integrityCounts(reference));

    // every part once in the ledger, the stages once; the work was spread over the workers
    const parts = await sql<{ kind: string; n: number }>`select kind, count(*)::int as n from queue_parts group by kind order by kind`.execute(queued.db);
    expect(parts.rows).toEqual([
      { kind: 'ingest', n: Math.ceil(TESTS / 400) },
      { kind: 'reduce', n: TESTS / 250 },
      { kind: 'stages', n: 1 },
    ]);
    const stages = await sql<{ stage: string; status: string; n: number }>`select stage, status, count(*)::int as n from stage_runs where stage <> 'reduce' group by stage, status order by stage`.execute(queued.db);
    expect(stages.rows.map((r) => `${r.stage} ${r.status} ${r.n}`)).toEqual(['aggregate done 1', 'design done 1', 'monitor done 1']);
    const runs = await sql<{ n: number }>`select count(distinct queue_job)::int as n from stage_runs where stage = 'reduce' and status = 'done'`.execute(queued.db);
    expect(runs.rows[0].n).toBe(TESTS / 250);
  });
});
