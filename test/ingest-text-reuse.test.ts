/**
 * Cells already in canonical units go to the database as written; the stored float8 must equal
 * Number() of the cell (both are correctly rounded decimal input), including values that
 * underflow, subnormals, signed zero and long decimals (kept inside the plausible range of a
 * strain, ±100, so that none is rejected).
 */
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ingestManifests } from '@fractile/ingest';
import { iterateCurrentTests } from '@fractile/store';
import { testDatabases } from './support/databases.ts';

const CELLS = ['0', '-0.0', '+1.5', '.25', '3.', '1e-400', '4.9e-324', '0.1000000000000000055511151231257827', '12.3456789123456789012', '2.2250738585072014e-308', '1E+1', '007.5'];

describe.each(testDatabases())('canonical cells on $name', (tdb) => {
  it('are stored as the same double as Number() reads', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'fractile-text-'));
    mkdirSync(path.join(dir, 'c'));
    const rows = Array.from({ length: 24 }, (_, i) => `${i},${CELLS[i % CELLS.length]},${CELLS[(i + 5) % CELLS.length]}`);
    writeFileSync(path.join(dir, 'c', 'x.csv'), 'time[s],stress[MPa],strain[mm/mm]\n' + rows.join('\n') + '\n');
    writeFileSync(path.join(dir, 'm.csv'), 'test_id,grade,supplier,tested_on,curve\nX,G,S,2024-01-01,c/x.csv\n');
    const store = await tdb.open();
    try {
      const r = await ingestManifests(store, [{ path: path.join(dir, 'm.csv') }]);
      expect(r.rejected).toEqual([]);
      const [t] = (await iterateCurrentTests(store.db).next()).value!;
      for (let i = 0; i < 24; i++) {
        expect(Object.is(t.curve!.stressMpa![i], Number(CELLS[i % CELLS.length]))).toBe(true);
        expect(Object.is(t.curve!.strain![i], Number(CELLS[(i + 5) % CELLS.length]))).toBe(true);
      }
    } finally {
      await store.close();
    }
  });
});
