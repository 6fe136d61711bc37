/**
 * Crash safety: the ingest command is killed (SIGKILL) in the middle of a batch; the database
 * then holds only whole tests (every test row with its curve, whole batches), and running the
 * same ingest again yields exactly what one clean run gives: the same tests, content hashes,
 * curve hashes and counts; the killed run, left `running`, is marked `abandoned` by the next.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { sql } from 'kysely';
import { generateBenchmarkSet } from '@fractile/seed-demo';
import { openStore } from '@fractile/store';
import { testTargets } from './support/databases.ts';

const CLI = path.resolve(import.meta.dirname, '../packages/cli/bin/fractile.js');
const TESTS = 60;
const BATCH = 10;

interface Outcome {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

/** Runs the ingest command; with `killAfterFirstBatch`, SIGKILLs it once the first batch is committed. */
function ingest(manifest: string, target: string, killAfterFirstBatch: boolean): Promise<Outcome> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [CLI, 'ingest', manifest, '--db', target, '--batch-size', String(BATCH), '--progress', 'lines', '--format', 'json'], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (b: Buffer) => (stdout += b.toString()));
    child.stderr.on('data', (b: Buffer) => {
      stderr += b.toString();
      const m = /ingest: (\d+)\/(\d+)/.exec(stderr);
      // the child goes straight on with the next batch: kill it while that one is being written
      if (killAfterFirstBatch && m && Number(m[1]) > 0 && child.exitCode === null && !child.killed) child.kill('SIGKILL');
    });
    child.on('error', reject);
    child.on('close', (code, signal) => resolve({ code, signal, stdout, stderr }));
  });
}

async function contents(target: string) {
  const store = await openStore(target);
  try {
    const rows = await sql<{ lab: string; test_id: string; version: number; content_sha256: string; source_sha256: string | null; n_points: number | null; force_sum: number | null }>`
      select t.lab, t.test_id, t.version, t.content_sha256, c.source_sha256, c.n_points,
             (select sum(v) from unnest(curve_channel(c.force_n)) as v) as force_sum
      from tests t left join curves c on c.test_row_id = t.id order by t.lab, t.test_id, t.version`.execute(store.db);
    const counts = await sql<{ tests: number; curves: number; orphans: number; grades: number; suppliers: number; heats: number }>`
      select (select count(*) from tests)::int as tests, (select count(*) from curves)::int as curves,
             (select count(*) from curves c where not exists (select 1 from tests t where t.id = c.test_row_id))::int as orphans,
             (select count(*) from grades)::int as grades, (select count(*) from suppliers)::int as suppliers, (select count(*) from heats)::int as heats`.execute(store.db);
    return { rows: rows.rows, counts: counts.rows[0] };
  } finally {
    await store.close();
  }
}

async function runStatuses(target: string): Promise<string[]> {
  const store = await openStore(target);
  try {
    return (await store.db.selectFrom('ingest_runs').select('status').orderBy('id').execute()).map((r) => r.status);
  } finally {
    await store.close();
  }
}

describe.each(testTargets())('ingest killed mid-batch on $name', (tt) => {
  it('leaves whole tests only, and a re-run matches one clean run', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'fractile-crash-'));
    const b = generateBenchmarkSet({ outDir: dir, tests: TESTS, points: 1000, seed: 7 });
    const manifest = path.join(b.outDir, b.manifest);
    const crashed = await tt.create();
    const clean = await tt.create();
    try {
      const killed = await ingest(manifest, crashed.target, true);
      expect(killed.signal).toBe('SIGKILL');
      const partial = await contents(crashed.target);
      expect(partial.counts.tests).toBeGreaterThan(0);
      expect(partial.counts.tests).toBeLessThan(TESTS);
      expect(partial.counts.tests % BATCH).toBe(0); // whole batches only
      expect(partial.counts.curves).toBe(partial.counts.tests); // no test without its curve
      expect(partial.counts.orphans).toBe(0);
      expect(partial.rows.every((r) => r.n_points === 1000)).toBe(true);

      const resumed = await ingest(manifest, crashed.target, false);
      expect(resumed.code).toBe(0);
      const summary = JSON.parse(resumed.stdout).data as { accepted: number; duplicates: number; rejected: unknown[] };
      expect(summary.duplicates).toBe(partial.counts.tests);
      expect(summary.accepted).toBe(TESTS - partial.counts.tests);
      expect(summary.rejected).toEqual([]);

      // the killed run was left running; the next ingest marked it abandoned
      const runs = await runStatuses(crashed.target);
      expect(runs).toEqual(['abandoned', 'completed']);

      const once = await ingest(manifest, clean.target, false);
      expect(once.code).toBe(0);
      const a = await contents(crashed.target);
      const b = await contents(clean.target);
      expect(a.counts).toEqual(b.counts);
      expect(a.counts.tests).toBe(TESTS);
      expect(a.rows).toEqual(b.rows);
    } finally {
      await crashed.dispose();
      await clean.dispose();
    }
  }, 300_000);
});
