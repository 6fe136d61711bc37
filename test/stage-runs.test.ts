/**
 * The life of a stage run (runStage, packages/pipeline/src/runs.ts), the one place every group
 * stage records its work: a run row per computation, `done` with its counts, reused for the same
 * settings and inputs, a new run for new inputs, and `failed` — never left `running` — when the
 * computation throws. The rule is the project's own (stage_runs in the README's data flow).
 */
import { describe, expect, it } from 'vitest';
import { runStage } from '@fractile/pipeline';
import { testDatabases } from './support/databases.ts';

describe.each(testDatabases())('stage runs on $name', (tdb) => {
  it('records, reuses, and marks a throwing computation failed', async () => {
    const store = await tdb.open();
    try {
      let computed = 0;
      const work = (inputHash: string, fail = false) => ({
        stage: 'aggregate' as const, settings: { probe: 1 }, inputHash, codeVersion: 'test',
        reuse: async (id: number) => ({ value: `stored ${id}` }),
        compute: async (id: number) => {
          computed++;
          if (fail) throw new Error('probe failure');
          return { result: { value: `computed ${id}` }, counts: { items: 3 } };
        },
      });
      const first = await runStage(store.db, work('a'));
      expect(first).toMatchObject({ reused: false, result: { value: `computed ${first.run}` } });
      const again = await runStage(store.db, work('a'));
      expect(again).toMatchObject({ run: first.run, reused: true, result: { value: `stored ${first.run}` } });
      const other = await runStage(store.db, work('b'));
      expect(other.reused).toBe(false);
      expect(other.run).not.toBe(first.run);
      await expect(runStage(store.db, work('c', true))).rejects.toThrow('probe failure');
      expect(computed).toBe(3);
      const rows = await store.db.selectFrom('stage_runs').select(['id', 'status', 'counts', 'input_hash']).where('stage', '=', 'aggregate').orderBy('id').execute();
      expect(rows.map((r) => [r.input_hash, r.status])).toEqual([['a', 'done'], ['b', 'done'], ['c', 'failed']]);
      const counts = typeof rows[0].counts === 'string' ? JSON.parse(rows[0].counts) : rows[0].counts;
      expect(counts).toEqual({ items: 3 });
    } finally {
      await store.close();
    }
  });
});
