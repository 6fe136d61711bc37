/**
 * Every kind of bad input gets its stable code and its location (file, 1-based line and column;
 * 0 for a whole file or an absent column), is recorded as a rejection, and the good rows of the
 * same batch still load. Fixtures are written here, in temp folders.
 */
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ingestManifests } from '@fractile/ingest';
import type { IngestSummary, Rejection } from '@fractile/ingest';
import { listTests } from '@fractile/store';
import type { Store } from '@fractile/store';
import { testDatabases } from './support/databases.ts';

/** Writes files (relative path → content) under a fresh folder; returns the folder. */
function fixture(files: Record<string, string | Buffer>): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'fractile-ingest-'));
  for (const [rel, content] of Object.entries(files)) {
    mkdirSync(path.dirname(path.join(dir, rel)), { recursive: true });
    writeFileSync(path.join(dir, rel), content);
  }
  return dir;
}

/** A plain force–extension curve: header on line 1, point i on line i + 2. */
function curve(points = 30, edit?: (i: number, cells: string[]) => void, header = 'time[s],force[kN],extension[mm]'): string {
  const lines = [header];
  for (let i = 0; i < points; i++) {
    const cells = [(0.1 * i).toFixed(1), (0.5 * i).toFixed(2), (0.01 * i).toFixed(3)];
    edit?.(i, cells);
    lines.push(cells.join(','));
  }
  return lines.join('\n') + '\n';
}

const HEADER = 'test_id,grade,supplier,tested_on,shape,diameter[mm],gauge_length[mm],curve';
const good = (id: string, c = `curves/${id}.csv`) => `${id},G1,Acme Steel,2024-05-02,round,10,50,${c}`;

// Rows of the mixed manifest, in order (manifest line = index + 2), with the expected rejection.
const ROWS: { row: string; expect?: Omit<Rejection, 'file' | 'message'> & { file?: string } }[] = [
  { row: good('OK1') },
  { row: 'BAD-GRADE,,Acme Steel,2024-05-02,round,10,50,curves/OK1.csv', expect: { line: 3, column: 2, code: 'missing_value' } },
  { row: 'BAD-NUM,G1,Acme Steel,2024-05-02,round,ten,50,curves/OK1.csv', expect: { line: 4, column: 6, code: 'not_a_number' } },
  { row: 'BAD-NAN,G1,Acme Steel,2024-05-02,round,NaN,50,curves/OK1.csv', expect: { line: 5, column: 6, code: 'not_finite' } },
  { row: 'BAD-INF,G1,Acme Steel,2024-05-02,round,10,-Infinity,curves/OK1.csv', expect: { line: 6, column: 7, code: 'not_finite' } },
  { row: 'BAD-ZERO,G1,Acme Steel,2024-05-02,round,0,50,curves/OK1.csv', expect: { line: 7, column: 6, code: 'nonpositive_dimension' } },
  { row: 'BAD-NEG,G1,Acme Steel,2024-05-02,round,10,-50,curves/OK1.csv', expect: { line: 8, column: 7, code: 'nonpositive_dimension' } },
  { row: 'BAD-SHAPE,G1,Acme Steel,2024-05-02,hexagon,10,50,curves/OK1.csv', expect: { line: 9, column: 5, code: 'unknown_shape' } },
  { row: 'BAD-DATE,G1,Acme Steel,2024-02-30,round,10,50,curves/OK1.csv', expect: { line: 10, column: 4, code: 'invalid_date' } },
  { row: 'BAD-DATE2,G1,Acme Steel,05/02/2024,round,10,50,curves/OK1.csv', expect: { line: 11, column: 4, code: 'invalid_date' } },
  { row: good('NO-FILE', 'curves/none.csv'), expect: { line: 12, column: 8, code: 'missing_curve_file' } },
  { row: good('ESCAPE', '../outside.csv'), expect: { line: 13, column: 8, code: 'path_escapes_folder' } },
  { row: good('ESCAPE2', 'curves/../../outside.csv'), expect: { line: 14, column: 8, code: 'path_escapes_folder' } },
  { row: good('SHORT'), expect: { file: 'curves/SHORT.csv', line: 20, column: 0, code: 'curve_too_short' } },
  { row: good('EMPTY'), expect: { file: 'curves/EMPTY.csv', line: 0, column: 0, code: 'curve_too_short' } },
  { row: good('NOEXT'), expect: { file: 'curves/NOEXT.csv', line: 1, column: 0, code: 'missing_channel' } },
  { row: good('TIME'), expect: { file: 'curves/TIME.csv', line: 12, column: 1, code: 'time_not_monotonic' } },
  { row: good('LATIN1'), expect: { file: 'curves/LATIN1.csv', line: 3, column: 0, code: 'not_utf8' } },
  { row: good('CELL'), expect: { file: 'curves/CELL.csv', line: 7, column: 2, code: 'not_a_number' } },
  { row: good('CELLNAN'), expect: { file: 'curves/CELLNAN.csv', line: 9, column: 3, code: 'not_finite' } },
  { row: good('CUT'), expect: { file: 'curves/CUT.csv', line: 31, column: 3, code: 'missing_value' } },
  { row: good('UNIT'), expect: { file: 'curves/UNIT.csv', line: 1, column: 2, code: 'unknown_unit' } },
  { row: 'NOGAUGE,G1,Acme Steel,2024-05-02,round,10,,curves/OK1.csv', expect: { line: 24, column: 7, code: 'missing_value' } },
  { row: 'NOSHAPE,G1,Acme Steel,2024-05-02,,,50,curves/OK1.csv', expect: { line: 25, column: 5, code: 'missing_value' } },
  { row: 'NOTHING,G1,Acme Steel,2024-05-02,round,10,50,', expect: { line: 26, column: 8, code: 'missing_value' } },
  { row: good('OK2') },
];

function mixedFixture(): string {
  // a Latin-1 byte (0xFC) on line 3 of an otherwise valid curve
  const latin1Line3 = Buffer.concat([Buffer.from('# ok\n' + 'time[s],force[kN],extension[mm]\n' + '0.0,0,0 # Pr'), Buffer.from([0xfc]), Buffer.from('fung\n'), Buffer.from(curve(30).split('\n').slice(1).join('\n'))]);
  const cut = curve(30);
  return fixture({
    'manifest.csv': [HEADER, ...ROWS.map((r) => r.row)].join('\n') + '\n',
    'curves/OK1.csv': curve(30),
    'curves/OK2.csv': '# comment line\n' + curve(25, (i, c) => c.push(String(0.02 * i)), 'time[s],force[N],extension[mm],crosshead[mm]'),
    'curves/SHORT.csv': curve(19),
    'curves/EMPTY.csv': '',
    'curves/NOEXT.csv': curve(30, (_, c) => c.splice(2, 1), 'time[s],force[kN]'),
    'curves/TIME.csv': curve(30, (i, c) => { if (i === 10) c[0] = '0.5'; }),
    'curves/LATIN1.csv': latin1Line3,
    'curves/CELL.csv': curve(30, (i, c) => { if (i === 5) c[1] = '1.2.3'; }),
    'curves/CELLNAN.csv': curve(30, (i, c) => { if (i === 7) c[2] = 'nan'; }),
    'curves/CUT.csv': cut.slice(0, cut.lastIndexOf(',')),
    'curves/UNIT.csv': curve(30, undefined, 'time[s],force[tonf],extension[mm]'),
    '../outside.csv': curve(30),
  });
}

describe.each(testDatabases())('ingest rejections on $name', (tdb) => {
  let store: Store;
  let dir: string;
  let result: IngestSummary;
  beforeAll(async () => {
    store = await tdb.open();
    dir = mixedFixture();
    result = await ingestManifests(store, [{ path: path.join(dir, 'manifest.csv') }], { batchSize: 4 });
  });
  afterAll(async () => {
    await store.close();
  });

  it('loads the good rows of the batch', async () => {
    expect(result.accepted).toBe(2);
    const tests = await listTests(store.db);
    expect(tests.map((t) => t.test_id).sort()).toEqual(['OK1', 'OK2']);
  });

  for (const r of ROWS.filter((x) => x.expect)) {
    const id = r.row.split(',')[0];
    it(`rejects ${id} as ${r.expect!.code} at ${r.expect!.file ?? 'manifest.csv'}:${r.expect!.line}:${r.expect!.column}`, () => {
      const file = path.join(dir, r.expect!.file ?? 'manifest.csv');
      const found = result.rejected.filter((x) => x.file === file && x.line === r.expect!.line);
      expect(found.map(({ file: f, line, column, code }) => ({ file: f, line, column, code }))).toEqual([{ file, line: r.expect!.line, column: r.expect!.column, code: r.expect!.code }]);
      expect(found[0].message.length).toBeGreaterThan(5);
    });
  }

  it('records every rejection in the database under the run', async () => {
    expect(result.rejected).toHaveLength(ROWS.filter((x) => x.expect).length);
    const stored = await store.db.selectFrom('rejections').selectAll().where('run_id', '=', result.run).execute();
    expect(stored.map((s) => `${s.file}:${s.line}:${s.col}:${s.code}`).sort()).toEqual(result.rejected.map((s) => `${s.file}:${s.line}:${s.column}:${s.code}`).sort());
    const runRow = await store.db.selectFrom('ingest_runs').selectAll().where('id', '=', result.run).executeTakeFirstOrThrow();
    expect(runRow).toMatchObject({ status: 'completed', accepted: 2, rejected: result.rejected.length });
  });

  it('rejects a manifest without a required column at its header, and one that is not UTF-8 at the bad line', async () => {
    const d = fixture({
      'a.csv': 'test_id,grade,tested_on,curve\nX1,G1,2024-01-01,\n',
      'b.csv': Buffer.concat([Buffer.from('test_id,grade,supplier,tested_on,yield[MPa],yield_definition\nY1,G1,Acme,2024-01-01,300,rp0.2\nY2,G1,M'), Buffer.from([0xfc]), Buffer.from('ller,2024-01-01,300,rp0.2\n')]),
      'c.csv': 'test_id,grade,supplier,tested_on,diameter[furlong],curve\nX1,G1,Acme,2024-01-01,3,\n',
      'ok.csv': 'test_id,grade,supplier,tested_on,yield[MPa],yield_definition\nZ1,G1,Acme,2024-01-01,300,rp0.2\n',
    });
    const r = await ingestManifests(store, ['a.csv', 'b.csv', 'c.csv', 'ok.csv'].map((f) => ({ path: path.join(d, f) })));
    const got = r.rejected.map((x) => [path.basename(x.file), x.line, x.column, x.code]);
    expect(got).toEqual([
      ['b.csv', 3, 0, 'not_utf8'],
      ['a.csv', 1, 0, 'missing_column'],
      ['c.csv', 1, 5, 'unknown_unit'],
    ]);
    expect(r.rejected.find((x) => x.code === 'missing_column')!.message).toContain('supplier');
    expect(r.accepted).toBe(1);
  });

  it('rejects a bad column map as bad_column_map and loads nothing through it', async () => {
    const d = fixture({
      'bad-map.json': JSON.stringify({ delimiter: ',', decimal: ',', channels: { force: { column: 'F', unit: 'kN' } } }),
      'unit-map.json': JSON.stringify({ delimiter: ';', channels: { force: { column: 'F', unit: 'furlong' } } }),
      'm.csv': `${HEADER}\n${good('MAPPED')}\n`,
      'curves/MAPPED.csv': curve(30),
    });
    const r = await ingestManifests(store, [{ path: path.join(d, 'm.csv'), map: path.join(d, 'bad-map.json') }, { path: path.join(d, 'm.csv'), map: path.join(d, 'unit-map.json') }]);
    expect(r.accepted).toBe(0);
    const maps = r.rejected.filter((x) => x.code === 'bad_column_map' && x.file.endsWith('.json'));
    expect(maps.map((x) => [path.basename(x.file), x.line, x.column])).toEqual([['bad-map.json', 0, 0], ['unit-map.json', 0, 0]]);
    expect(maps[0].message).toMatch(/decimal/);
    expect(maps[1].message).toMatch(/furlong/);
  });
});
