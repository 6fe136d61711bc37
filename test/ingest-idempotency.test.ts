/**
 * Re-running an ingest adds nothing; the same identity with other content is a conflict that
 * leaves the stored test untouched, unless --replace, which keeps the old version as history;
 * a repeated identity within one input is judged against the first; a dry run writes nothing.
 * Also the command line: JSON on stdout, rejections on stderr as file:line:column, exit code 3.
 */
import { execFile } from 'node:child_process';
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { sql } from 'kysely';
import { ingestManifests } from '@fractile/ingest';
import { iterateCurrentTests, listTests } from '@fractile/store';
import type { Store } from '@fractile/store';
import { testDatabases, testTargets } from './support/databases.ts';

const run = promisify(execFile);
const CLI = path.resolve(import.meta.dirname, '../packages/cli/bin/fractile.js');

function fixture(files: Record<string, string>): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'fractile-idem-'));
  for (const [rel, content] of Object.entries(files)) {
    mkdirSync(path.dirname(path.join(dir, rel)), { recursive: true });
    writeFileSync(path.join(dir, rel), content);
  }
  return dir;
}

const curve = (scale: number) => 'time[s],force[kN],extension[mm]\n' + Array.from({ length: 25 }, (_, i) => `${i},${scale * i},${0.01 * i}`).join('\n') + '\n';
const HEADER = 'test_id,grade,supplier,tested_on,shape,diameter[mm],gauge_length[mm],tensile[MPa],curve';

async function snapshot(store: Store) {
  const r = await sql<{ lab: string; test_id: string; version: number; is_current: boolean; content_sha256: string; source_sha256: string | null; n_points: number | null }>`
    select t.lab, t.test_id, t.version, t.is_current, t.content_sha256, c.source_sha256, c.n_points
    from tests t left join curves c on c.test_row_id = t.id order by t.lab, t.test_id, t.version`.execute(store.db);
  return r.rows;
}

describe.each(testDatabases())('re-ingest on $name', (tdb) => {
  let store: Store;
  beforeEach(async () => {
    store = await tdb.open();
  });
  afterEach(async () => {
    await store.close();
  });

  it('adds nothing on a second run; every test counts as duplicate', async () => {
    const d = fixture({ 'm.csv': `${HEADER}\nA,G,S,2024-01-01,round,10,50,,c/a.csv\nB,G,S,2024-01-02,,,,480,\n`, 'c/a.csv': curve(1) });
    const first = await ingestManifests(store, [{ path: path.join(d, 'm.csv') }]);
    expect([first.accepted, first.duplicates, first.rejected.length]).toEqual([2, 0, 0]);
    const before = await snapshot(store);
    const second = await ingestManifests(store, [{ path: path.join(d, 'm.csv') }]);
    expect([second.accepted, second.duplicates, second.rejected.length]).toEqual([0, 2, 0]);
    expect(await snapshot(store)).toEqual(before);
    const counts = await sql<{ n: number }>`select (select count(*) from curves) + (select count(*) from summary_records) + (select count(*) from grades) + (select count(*) from suppliers) as n`.execute(store.db);
    expect(Number(counts.rows[0].n)).toBe(1 + 1 + 1 + 1);
  });

  it('rejects changed content as a conflict and keeps the stored test; --replace keeps it as history', async () => {
    const d1 = fixture({ 'm.csv': `${HEADER}\nA,G,S,2024-01-01,round,10,50,,c/a.csv\nB,G,S,2024-01-02,,,,480,\n`, 'c/a.csv': curve(1) });
    // same identities: A has a different curve, B a different tensile value
    const d2 = fixture({ 'm.csv': `${HEADER}\nA,G,S,2024-01-01,round,10,50,,c/a.csv\nB,G,S,2024-01-02,,,,481,\n`, 'c/a.csv': curve(2) });
    await ingestManifests(store, [{ path: path.join(d1, 'm.csv') }]);
    const before = await snapshot(store);
    const conflict = await ingestManifests(store, [{ path: path.join(d2, 'm.csv') }]);
    expect(conflict.accepted).toBe(0);
    expect(conflict.rejected.map((r) => [r.line, r.column, r.code])).toEqual([[2, 0, 'conflict'], [3, 0, 'conflict']]);
    expect(conflict.rejected[0].file).toBe(path.join(d2, 'm.csv'));
    expect(await snapshot(store)).toEqual(before);

    const replaced = await ingestManifests(store, [{ path: path.join(d2, 'm.csv') }], { replace: true });
    expect([replaced.accepted, replaced.replaced, replaced.rejected.length]).toEqual([2, 2, 0]);
    const after = await snapshot(store);
    expect(after.map((r) => [r.test_id, r.version, r.is_current])).toEqual([['A', 1, false], ['A', 2, true], ['B', 1, false], ['B', 2, true]]);
    expect({ ...after[0], is_current: true }).toEqual(before[0]); // the old version is untouched apart from being superseded
    expect(after[0].content_sha256).not.toBe(after[1].content_sha256);
    const current = [];
    for await (const b of iterateCurrentTests(store.db)) current.push(...b);
    expect(current.find((t) => t.testId === 'B')!.summary!.tensileMpa).toBe(481);
    expect(current.find((t) => t.testId === 'A')!.curve!.forceN![3]).toBe(6000);
    // replacing again with the same content is a duplicate
    const again = await ingestManifests(store, [{ path: path.join(d2, 'm.csv') }], { replace: true });
    expect([again.accepted, again.duplicates]).toEqual([0, 2]);
  });

  it('judges a repeated identity in one input against the first occurrence', async () => {
    const d = fixture({ 'm.csv': `${HEADER}\nA,G,S,2024-01-01,,,,480,\nA,G,S,2024-01-01,,,,480,\nA,G,S,2024-01-01,,,,490,\n` });
    const r = await ingestManifests(store, [{ path: path.join(d, 'm.csv') }], { batchSize: 100 });
    expect([r.accepted, r.duplicates]).toEqual([1, 1]);
    expect(r.rejected.map((x) => [x.line, x.code])).toEqual([[4, 'conflict']]);
  });

  it('a dry run classifies and validates but writes nothing', async () => {
    const d = fixture({ 'm.csv': `${HEADER}\nA,G,S,2024-01-01,round,10,50,,c/a.csv\nB,G,S,2024-13-01,,,,480,\n`, 'c/a.csv': curve(1) });
    const r = await ingestManifests(store, [{ path: path.join(d, 'm.csv') }], { dryRun: true });
    expect([r.run, r.accepted, r.dry_run]).toEqual([0, 1, true]);
    expect(r.rejected.map((x) => x.code)).toEqual(['invalid_date']);
    expect(await listTests(store.db)).toEqual([]);
    const runs = await store.db.selectFrom('ingest_runs').selectAll().execute();
    expect(runs).toEqual([]);
  });
});

describe.each(testTargets())('fractile ingest command on $name', (tt) => {
  let target: { target: string; dispose(): Promise<void> };
  beforeEach(async () => {
    target = await tt.create();
  });
  afterEach(async () => {
    await target.dispose();
  });

  it('prints one JSON document, lists rejections on stderr as file:line:column and exits 3', async () => {
    const d = fixture({ 'm.csv': `${HEADER}\nA,G,S,2024-01-01,round,10,50,,c/a.csv\nB,G,S,2024-01-02,round,-1,50,,c/a.csv\n`, 'c/a.csv': curve(1) });
    const manifest = path.join(d, 'm.csv');
    const err = await run(process.execPath, [CLI, 'ingest', manifest, '--db', target.target, '--format', 'json']).then(
      () => null,
      (e: { code: number; stdout: string; stderr: string }) => e,
    );
    expect(err).not.toBeNull();
    expect(err!.code).toBe(3);
    const out = JSON.parse(err!.stdout).data as { run: number; accepted: number; duplicates: number; rejected: { file: string; line: number; column: number; code: string }[] };
    expect(out).toMatchObject({ run: 1, accepted: 1, duplicates: 0 });
    expect(out.rejected.map((r) => [r.file, r.line, r.column, r.code])).toEqual([[manifest, 3, 6, 'nonpositive_dimension']]);
    expect(err!.stderr).toContain(`${manifest}:3:6: nonpositive_dimension:`);

    const ok = fixture({ 'm.csv': `${HEADER}\nC,G,S,2024-01-01,,,,470,\n` });
    const good = await run(process.execPath, [CLI, '--db', target.target, 'ingest', path.join(ok, 'm.csv'), '--format', 'json']);
    expect(JSON.parse(good.stdout).data).toMatchObject({ accepted: 1, rejected: [] });
    const listed = await run(process.execPath, [CLI, 'tests', '--db', target.target, '--format', 'json']);
    const tests = JSON.parse(listed.stdout).data as { test_id: string; has_curve: boolean; area_mm2: number | null }[];
    expect(tests.map((t) => [t.test_id, t.has_curve])).toEqual([['A', true], ['C', false]]);
    expect(tests[0].area_mm2).toBeCloseTo(25 * Math.PI, 12);
  });
});
