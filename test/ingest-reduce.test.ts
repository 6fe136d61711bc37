/**
 * Reduction at ingest: a database ingested with the reduction in the curve workers must hold the
 * same per-test rows as one ingested without it and reduced afterwards by the reduce stage, on
 * worker threads and in-process (the same pure reduction, reduce-one.ts; the oracle is the
 * separate `reduce` itself). A `reduce` with the same catalog after a reducing ingest computes
 * nothing.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { ingestManifests } from '@fractile/ingest';
import { loadCatalog, loadProperties, runReduce, startIngestReduction } from '@fractile/pipeline';
import { generateDemo } from '@fractile/seed-demo';
import { openStore } from '@fractile/store';

const dir = mkdtempSync(join(tmpdir(), 'fractile-ingest-reduce-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('reduce in the ingest', () => {
  it('gives the rows a separate reduce gives', async () => {
    const demo = generateDemo({ outDir: join(dir, 's'), tests: 100, seed: 7, pointsPerCurve: 500 });
    const inputs = demo.manifests.filter((m) => m.role === 'data').map((m) => ({ path: join(dir, 's', m.path), map: m.map ? join(dir, 's', m.map) : null }));
    const catalog = loadCatalog(join(dir, 's', demo.catalog));
    const load = async (workers: number, atIngest: boolean) => {
      const store = await openStore(join(dir, `db-${workers}-${atIngest}`));
      try {
        if (atIngest) {
          const reduction = await startIngestReduction(store, { catalog, codeVersion: 'test' });
          await ingestManifests(store, inputs, { workers, reducer: reduction.reducer });
          const r = await reduction.finish({ workers: 0 });
          expect(r.atIngest.reduced).toBeGreaterThan(64);
          // nothing left for the reduce stage: every test was reduced with these settings
          expect(r.rest.reduced + r.rest.given + r.rest.failed).toBe(0);
        } else {
          await ingestManifests(store, inputs, { workers: 0 });
          await runReduce(store, { catalog, codeVersion: 'test', workers: 0 });
        }
        const again = await runReduce(store, { catalog, codeVersion: 'test', workers: 0 });
        expect(again.reduced + again.given + again.failed).toBe(0);
        return await loadProperties(store.db, { includeFailed: true }, { withGrid: true });
      } finally {
        await store.close();
      }
    };
    const separate = await load(0, false);
    expect(separate.length).toBeGreaterThan(64);
    expect(await load(2, true)).toEqual(separate);
    expect(await load(0, true)).toEqual(separate);
  }, 600_000);
});
