/**
 * The reduce stage gives the same stored results on worker threads as on the calling thread
 * (channels are moved to the workers, not copied, so this also checks nothing is lost on the way).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { ingestManifests } from '@fractile/ingest';
import { loadCatalog, loadProperties, runReduce } from '@fractile/pipeline';
import { generateDemo } from '@fractile/seed-demo';
import { openStore } from '@fractile/store';

const dir = mkdtempSync(join(tmpdir(), 'fractile-workers-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('reduce on worker threads', () => {
  it('stores exactly what the inline reduction stores', async () => {
    const demo = generateDemo({ outDir: join(dir, 's'), tests: 120, seed: 5, pointsPerCurve: 600 });
    const store = await openStore(join(dir, 'db'));
    try {
      const data = demo.manifests.filter((m) => m.role === 'data');
      await ingestManifests(store, data.map((m) => ({ path: join(dir, 's', m.path), map: m.map ? join(dir, 's', m.map) : null })), {});
      const catalog = loadCatalog(join(dir, 's', demo.catalog));
      const threaded = await runReduce(store, { catalog, codeVersion: 'test', workers: 2, batchSize: 50 });
      expect(threaded.reduced).toBeGreaterThan(64); // enough work for the pool to be used
      const a = await loadProperties(store.db, { includeFailed: true }, { withGrid: true });
      await store.db.deleteFrom('test_results').execute();
      await runReduce(store, { catalog, codeVersion: 'test', workers: 0 });
      const b = await loadProperties(store.db, { includeFailed: true }, { withGrid: true });
      expect(b.length).toBe(a.length);
      expect(b).toEqual(a);
    } finally {
      await store.close();
    }
  });
});
