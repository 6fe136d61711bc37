/**
 * Concurrent command-line processes on one database: exact final counts and one clear outcome per
 * process.
 *   - Embedded: a second writer on a folder in use fails at once (exit 4) naming the holder, or
 *     with --wait waits and then succeeds; the folder ends with exactly the union of the tests.
 *     The first writer is paused (SIGSTOP) while the second starts, so the two overlap whatever
 *     the machine's speed.
 *   - Server: three ingests of overlapping manifests at once, then two reduces at once: every
 *     process exits 0; the accepted counts add up to the union, the duplicates to the overlaps;
 *     every test is reduced exactly once.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'kysely';
import { openStore } from '@fractile/store';
import { generateBenchmarkSet } from '@fractile/seed-demo';
import { createEmbeddedFolder, createServerDatabase } from './support/databases.ts';

const bin = fileURLToPath(new URL('../packages/cli/bin/fractile.js', import.meta.url));
const TESTS = 60;
let dir: string;
/** manifests over rows [0, 30), [20, 50), [40, 60) of one data set: overlaps of 10 and 10 */
let parts: string[];

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), 'fractile-conc-'));
  const b = generateBenchmarkSet({ outDir: dir, tests: TESTS, points: 400, seed: 5 });
  const all = path.join(b.outDir, b.manifest);
  const [header, ...rows] = readFileSync(all, 'utf8').trimEnd().split('\n');
  parts = [[0, 30], [20, 50], [40, 60]].map(([a, b], i) => {
    const p = path.join(dir, `part${i}.csv`);
    writeFileSync(p, [header, ...rows.slice(a, b)].join('\n') + '\n');
    return p;
  });
});

interface Run {
  code: number | null;
  stdout: string;
  stderr: string;
  pid: number;
}

/** Starts a fractile process; `onStderr` sees its stderr as it comes. */
function start(args: string[], onStderr?: (text: string, pid: number) => void): { pid: number; done: Promise<Run> } {
  const child = spawn(process.execPath, [bin, ...args], { stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, DATABASE_URL: '' } });
  let stdout = '';
  let stderr = '';
  child.stdout.on('data', (b: Buffer) => (stdout += b.toString()));
  child.stderr.on('data', (b: Buffer) => {
    stderr += b.toString();
    onStderr?.(stderr, child.pid!);
  });
  const done = new Promise<Run>((resolve, reject) => {
    child.on('error', reject);
    child.on('close', (code) => resolve({ code, stdout, stderr, pid: child.pid! }));
  });
  return { pid: child.pid!, done };
}

const ingestArgs = (manifest: string, db: string, ...more: string[]) => ['ingest', manifest, '--db', db, '--format', 'json', '--progress', 'lines', '--batch-size', '5', '--workers', '0', ...more];

async function testCount(target: string): Promise<{ tests: number; current: number; results: number }> {
  const store = await openStore(target);
  try {
    const r = await sql<{ tests: number; current: number; results: number }>`
      select (select count(*) from tests)::int as tests, (select count(*) from tests where is_current)::int as current,
             (select count(*) from test_results)::int as results`.execute(store.db);
    return r.rows[0];
  } finally {
    await store.close();
  }
}

/** Starts a writer and pauses it (SIGSTOP) once its first batch is committed, holding the folder. */
async function pausedWriter(manifest: string, db: string) {
  let pausedResolve: () => void;
  const paused = new Promise<void>((r) => (pausedResolve = r));
  let stopped = false;
  const w = start(ingestArgs(manifest, db), (text, pid) => {
    if (!stopped && /ingest: [1-9]\d*\//.test(text)) {
      stopped = true;
      process.kill(pid, 'SIGSTOP');
      pausedResolve();
    }
  });
  await paused;
  return { ...w, resume: () => process.kill(w.pid, 'SIGCONT') };
}

describe('two writers on one embedded folder', () => {
  it('the second fails at once naming the first (exit 4), and the folder holds exactly the first one’s tests', async () => {
    const f = createEmbeddedFolder();
    try {
      const first = await pausedWriter(parts[0], f.path);
      const second = await start(ingestArgs(parts[1], f.path)).done;
      first.resume();
      const a = await first.done;
      expect(a.code, a.stderr).toBe(0);
      expect(JSON.parse(a.stdout).data).toMatchObject({ accepted: 30, duplicates: 0, rejected: [] });
      expect(second.code).toBe(4);
      expect(second.stdout).toBe('');
      expect(second.stderr).toContain(`is in use by process ${first.pid} (fractile.js ingest`);
      expect((await testCount(f.path)).tests).toBe(30);
    } finally {
      f.remove();
    }
  }, 300_000);

  it('with --wait the second waits for the first, then stores the rest; the folder holds the union', async () => {
    const f = createEmbeddedFolder();
    try {
      const first = await pausedWriter(parts[0], f.path);
      const second = start(ingestArgs(parts[1], f.path, '--wait', '600'));
      // the second is started while the first holds the folder; let it reach its wait
      await new Promise((r) => setTimeout(r, 3000));
      first.resume();
      const [a, b] = await Promise.all([first.done, second.done]);
      expect(a.code, a.stderr).toBe(0);
      expect(b.code, b.stderr).toBe(0);
      const ja = JSON.parse(a.stdout).data;
      const jb = JSON.parse(b.stdout).data;
      expect(ja).toMatchObject({ accepted: 30, duplicates: 0 });
      expect(jb).toMatchObject({ accepted: 20, duplicates: 10 });
      expect(jb.run).toBeGreaterThan(ja.run);
      expect((await testCount(f.path)).tests).toBe(50);
    } finally {
      f.remove();
    }
  }, 300_000);
});

const server = process.env.TEST_DATABASE_URL;
if (server) {
  describe('concurrent processes on a server', () => {
    it('three ingests and then two reduces at once: exact counts, every process succeeds', async () => {
      const d = await createServerDatabase(server);
      try {
        // the schema first, so that the three do not race to create it
        await (await openStore(d.url)).close();
        // stored only (--no-reduce), so that the two reduces below have the work to share
        const ingests = await Promise.all(parts.map((p) => start(['ingest', p, '--db', d.url, '--format', 'json', '--progress', 'none', '--batch-size', '5', '--no-reduce']).done));
        for (const r of ingests) expect(r.code, r.stderr).toBe(0);
        const sums = ingests.map((r) => JSON.parse(r.stdout).data as { run: number; accepted: number; duplicates: number; rejected: unknown[] });
        expect(sums.reduce((s, x) => s + x.accepted, 0)).toBe(TESTS);
        expect(sums.reduce((s, x) => s + x.duplicates, 0)).toBe(20);
        expect(sums.every((x) => x.rejected.length === 0)).toBe(true);
        expect(new Set(sums.map((x) => x.run)).size).toBe(3);
        expect(await testCount(d.url)).toMatchObject({ tests: TESTS, current: TESTS });

        const reduces = await Promise.all([0, 1].map(() => start(['reduce', '--db', d.url, '--format', 'json', '--workers', '0']).done));
        for (const r of reduces) expect(r.code, r.stderr).toBe(0);
        const rs = reduces.map((r) => JSON.parse(r.stdout).data as { reduced: number; failed: number; given: number; unchanged: number });
        // one of them reduced everything, the other waited and found it done
        expect(rs.map((x) => x.reduced + x.failed + x.given).sort((a, b) => a - b)).toEqual([0, TESTS]);
        expect(rs.map((x) => x.unchanged).sort((a, b) => a - b)).toEqual([0, TESTS]);
        expect((await testCount(d.url)).results).toBe(TESTS);
      } finally {
        await d.drop();
      }
    }, 600_000);
  });
}
