/**
 * Reading curve files in worker threads stores exactly what reading them in-process stores
 * (same tests, content hashes and curve values), including a rejection found in a worker.
 */
import { appendFileSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { sql } from 'kysely';
import { ingestManifests } from '@fractile/ingest';
import type { Store } from '@fractile/store';
import { generateBenchmarkSet } from '@fractile/seed-demo';
import { testDatabases } from './support/databases.ts';

async function dump(store: Store) {
  const r = await sql<{ test_id: string; content_sha256: string; source_sha256: string; force_n: number[]; time_s: number[] }>`
    select t.test_id, t.content_sha256, c.source_sha256, c.force_n, c.time_s from tests t join curves c on c.test_row_id = t.id order by t.test_id`.execute(store.db);
  return r.rows;
}

describe.each(testDatabases())('curve workers on $name', (tdb) => {
  it('give the same stored result as in-process reading', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'fractile-workers-'));
    const set = generateBenchmarkSet({ outDir: dir, tests: 70, points: 100, seed: 3 });
    const manifest = path.join(set.outDir, set.manifest);
    // one broken curve: its rejection must come back from the worker with its location
    writeFileSync(path.join(dir, 'curves', 'BROKEN.csv'), 'time[s],force[kN],extension[mm]\n0,1,0\n1,x,0.1\n');
    // the first record's row with the broken curve in its place (columns as the manifest's header)
    const [header, first] = readFileSync(manifest, 'utf8').split('\n');
    const cols = header.split(',');
    const cells = first.split(',');
    cells[cols.indexOf('test_id')] = 'BROKEN';
    cells[cols.indexOf('curve')] = 'curves/BROKEN.csv';
    appendFileSync(manifest, cells.join(',') + '\n');
    const a = await tdb.open();
    const b = await tdb.open();
    try {
      const ra = await ingestManifests(a, [{ path: manifest }], { workers: 2, batchSize: 16 });
      const rb = await ingestManifests(b, [{ path: manifest }], { workers: 0, batchSize: 16 });
      expect(ra.accepted).toBe(70);
      expect(rb.accepted).toBe(70);
      expect(ra.rejected).toEqual(rb.rejected);
      expect(ra.rejected.map((r) => [path.basename(r.file), r.line, r.column, r.code])).toEqual([['BROKEN.csv', 3, 2, 'not_a_number']]);
      const da = await dump(a);
      expect(da).toHaveLength(70);
      expect(da).toEqual(await dump(b));
    } finally {
      await a.close();
      await b.close();
    }
  }, 300_000);
});
