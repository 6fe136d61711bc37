/**
 * Seeded fuzzing of ingest: valid manifests and curve files, each mutated one to three times by
 * the kinds of damage met in practice (a decimal comma in a comma-delimited file, an exponent
 * that overflows after unit scaling, units in the wrong case, NUL bytes, stray and unclosed
 * quotes, over-long ids and labels, byte-order marks, CRLF and CR line ends, bytes that are not
 * UTF-8, UTF-16 text, NaN and Infinity, zero geometry, 2 MB lines, paths out of the folder,
 * formula-like text, characters and lines deleted, inserted, repeated, swapped or cut), plus
 * mutations that leave the file valid with other numbers. All of it goes through one ingest,
 * which reduces every test as it stores it (the reduction reads the channels, and must leave
 * them as the file says), and must not throw or hang. Then for every case:
 *   - a test that was stored holds exactly what the file says, read independently
 *     (support/fuzz-oracle.ts): every curve value (bit for bit), n, metadata, geometry, S0 and
 *     summary values;
 *   - a rejection has a known code, a message, and a location inside the file it names, and is
 *     stored under the run;
 *   - nothing is dropped: every row of a manifest is stored, rejected (at its line, at its
 *     curve file, or with its whole file), or repeats an identity of an earlier row.
 */
import { createHash } from 'node:crypto';
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'kysely';
import { ingestManifests, REJECTION_CODES, type IngestSummary } from '@fractile/ingest';
import { channelFromBytes, type Store } from '@fractile/store';
import { startIngestReduction } from '@fractile/pipeline';
import { testDatabases } from './support/databases.ts';
import { expectedTest, readCurve, readManifestRows } from './support/fuzz-oracle.ts';
import { mulberry32 } from './support/random.ts';

const CURVE_CASES = 1200;
const MANIFEST_CASES = 600;
const rand = mulberry32(20260314);
const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rand() * xs.length)];
const int = (n: number) => Math.floor(rand() * n);

/** A valid curve in our format: 30 points of time[s], force[kN], extension[mm]. */
function baseCurve(): string {
  const lines = ['# fuzz base curve', 'time[s],force[kN],extension[mm]'];
  for (let i = 0; i < 30; i++) lines.push(`${(0.1 * i).toFixed(1)},${(0.5 * i + rand()).toFixed(3)},${(0.01 * i).toFixed(4)}`);
  return lines.join('\n') + '\n';
}

const HEADER = 'test_id,lab,grade,supplier,heat,tested_on,shape,diameter[mm],gauge_length[mm],curve,yield[MPa],yield_definition,tensile[MPa]';

/** Text mutations common to both kinds of file. */
const TEXT_MUTATIONS: ((s: string) => string)[] = [
  (s) => s.replace(/(\d)\.(\d)/, '$1,$2'), // decimal comma
  (s) => insertAt(s, int(s.length), '\u0000'),
  (s) => insertAt(s, int(s.length), '"'),
  (s) => s.replace(/\n([^\n#])/, '\n"$1'), // unclosed quote at a row start
  (s) => '\uFEFF' + s,
  (s) => s.replace(/\n/g, '\r\n'),
  (s) => s.replace(/\n/g, '\r'),
  (s) => s.slice(0, int(s.length)),
  (s) => s.slice(0, Math.max(0, int(s.length) - 1)) + s.slice(int(s.length)),
  (s) => insertAt(s, int(s.length), pick(['0', '9', ',', '.', '-', '+', 'e', 'E', ' ', '\t', '#', 'x', '=', '@', '\n', '[', ']'])),
  (s) => lines(s, (ls) => ls.splice(1 + int(ls.length - 1), 0, ls[1 + int(ls.length - 1)] ?? '')),
  (s) => lines(s, (ls) => ls.splice(1 + int(ls.length - 1), 1)),
  (s) => lines(s, (ls) => {
    const a = 1 + int(ls.length - 1);
    const b = 1 + int(ls.length - 1);
    [ls[a], ls[b]] = [ls[b], ls[a]];
  }),
  (s) => lines(s, (ls) => ls.splice(1 + int(ls.length - 1), 0, '# ' + 'y'.repeat(2 * 1024 * 1024))),
  (s) => s.replace(/,(?=[^,\n]*\n)/, ',,'), // an extra cell
  (s) => replaceCell(s, () => pick(['NaN', 'Infinity', '-inf', '', ' ', '1e306', '-1e400', '1e-400', '0x10', '1_000', '١٢'])),
  (s) => replaceCell(s, () => String((rand() - 0.3) * 10 ** (int(8) - 2))), // valid, other number
];

const CURVE_MUTATIONS: ((s: string) => string)[] = [
  ...TEXT_MUTATIONS,
  (s) => s.replace('force[kN]', `force[${pick(['KN', 'kn', 'mN', 'N', 'lbf', 'kN '])}]`),
  (s) => s.replace('extension[mm]', `extension[${pick(['Mm', 'MM', 'in', 'm', 'mm'])}]`),
  (s) => s.replace('time[s]', `time[${pick(['S', 'ms', 'sec', 's'])}]`),
  (s) => replaceCell(s, () => '1e306', 1), // force overflows once in N
  (s) => s.replace('time[s],', 'time[s],comment,').replace(/\n(\d[^\n]*)/g, (_, r: string) => `\n${r.replace(',', ',x,')}`),
  (s) => lines(s, (ls) => {
    const i = 3 + int(ls.length - 5);
    ls[i] = ls[i].replace(/^[^,]*/, '0');
  }), // time goes back
];

const MANIFEST_MUTATIONS: ((s: string) => string)[] = [
  ...TEXT_MUTATIONS,
  (s) => s.replace('diameter[mm]', `diameter[${pick(['MM', 'Mm', 'in', 'm'])}]`),
  (s) => s.replace('yield[MPa]', `yield[${pick(['mPa', 'MPA', 'GPa', 'ksi'])}]`),
  (s) => replaceField(s, 'grade', () => pick(['G\u0000X', '=1+1', '+SUM(A1)', '-2+3', '@cmd', 'x'.repeat(3000), '\t=tab', 'y'.repeat(2 * 1024 * 1024)])),
  (s) => replaceField(s, 'test_id', () => pick(['T'.repeat(2800), 'a"b', '', 'dup'])),
  (s) => replaceField(s, 'supplier', () => pick(['S'.repeat(3000), 'Acme, Inc', '"Acme, Inc"', 'Mill\u0000'])),
  (s) => replaceField(s, 'heat', () => pick(['H'.repeat(3000), '', '=HYPERLINK("x")'])),
  (s) => replaceField(s, 'diameter[mm]', () => pick(['0', '-1', '1e306', 'NaN', '10,5', '"10,5"', '1e-400'])),
  (s) => replaceField(s, 'yield[MPa]', () => pick(['1e306', '0', '-5', '1e5', '99999', '355.5'])),
  (s) => replaceField(s, 'tested_on', () => pick(['2024-02-30', '2024-5-2', '02/05/2024', '2024-12-31'])),
  (s) => replaceField(s, 'curve', () => pick(['../outside.csv', '/etc/hostname', 'c/none.csv', 'c/../c/base.csv', 'c/base.csv'])),
  (s) => replaceField(s, 'shape', () => pick(['ROUND', 'hexagon', ''])),
];

function insertAt(s: string, i: number, t: string): string {
  return s.slice(0, i) + t + s.slice(i);
}
function lines(s: string, f: (ls: string[]) => void): string {
  const ls = s.split('\n');
  if (ls.length > 2) f(ls);
  return ls.join('\n');
}
/** Replaces one cell of a random data row (column `col`, else a random one). */
function replaceCell(s: string, value: () => string, col?: number): string {
  return lines(s, (ls) => {
    const data = ls.map((_l, i) => i).filter((i) => /^[\d-]/.test(ls[i]));
    if (!data.length) return;
    const i = pick(data);
    const cells = ls[i].split(',');
    cells[col ?? int(cells.length)] = value();
    ls[i] = cells.join(',');
  });
}
/** Replaces the value of a named manifest column in one random row. */
function replaceField(s: string, name: string, value: () => string): string {
  return lines(s, (ls) => {
    const idx = ls[0].split(',').indexOf(name);
    if (idx < 0) return;
    const i = 1 + int(ls.length - 2);
    const cells = ls[i].split(',');
    if (cells.length > idx) cells[idx] = value();
    ls[i] = cells.join(',');
  });
}
function mutate(s: string, kinds: ((s: string) => string)[]): string {
  let out = s;
  for (let k = 1 + int(3); k > 0; k--) out = pick(kinds)(out);
  return out;
}
/** Sometimes a whole file in another encoding or with a byte that is not UTF-8. */
function encode(s: string): Buffer {
  const r = rand();
  if (r < 0.02) return Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(s, 'utf16le')]);
  if (r < 0.05) {
    const b = Buffer.from(s);
    b[int(b.length)] = 0xff;
    return b;
  }
  return Buffer.from(s);
}

describe.each(testDatabases().filter((d) => d.name === 'pglite'))('ingest fuzzing on $name', (tdb) => {
  let store: Store;
  let dir: string;
  let summary: IngestSummary;
  let reduced: { reduced: number; failed: number; given: number };
  const files = new Map<string, Buffer>(); // absolute path → content
  const manifests: string[] = [];

  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'fractile-fuzz-'));
    mkdirSync(path.join(dir, 'c'));
    mkdirSync(path.join(dir, 'm', 'c'), { recursive: true });
    const put = (rel: string, content: Buffer) => {
      const p = path.join(dir, rel);
      writeFileSync(p, content);
      files.set(p, content);
      return p;
    };
    put('outside.csv', Buffer.from(baseCurve()));
    put('m/c/base.csv', Buffer.from(baseCurve()));
    // curve cases: one manifest row each, on a mutated curve file
    const rows = [HEADER];
    for (let i = 0; i < CURVE_CASES; i++) {
      put(`c/${i}.csv`, encode(mutate(baseCurve(), CURVE_MUTATIONS)));
      rows.push(`F${i},fuzz,G1,Mill A,H${i % 7},2024-05-02,round,10,50,c/${i}.csv,,,`);
    }
    manifests.push(put('curves.csv', Buffer.from(rows.join('\n') + '\n')));
    // manifest cases: a mutated manifest of three rows each (two with a curve, one summary-only)
    for (let j = 0; j < MANIFEST_CASES; j++) {
      const base = [HEADER, `M${j}a,lab${j},G2,Mill B,H1,2024-06-0${1 + (j % 9)},round,8,40,c/base.csv,,,`, `M${j}b,lab${j},G2,Mill B,,2024-06-10,round,12.5,60,c/base.csv,,,`, `M${j}c,lab${j},G3,Mill C,H2,2023-01-15,,,,,${300 + j},rp0.2,${450 + j}`].join('\n') + '\n';
      manifests.push(put(`m/${j}.csv`, encode(mutate(base, MANIFEST_MUTATIONS))));
    }
    store = await tdb.open();
    const reduction = await startIngestReduction(store, { catalog: null, codeVersion: 'fuzz' });
    summary = await ingestManifests(store, manifests.map((p) => ({ path: p })), { batchSize: 50, workers: 0, reducer: reduction.reducer });
    reduced = (await reduction.finish()).atIngest;
  }, 300_000);
  afterAll(async () => {
    await store?.close();
  });

  it('reduced every test it stored, at ingest', async () => {
    expect(reduced.reduced + reduced.failed + reduced.given).toBe(summary.accepted);
    const n = await sql<{ n: number }>`select count(*)::int as n from test_results`.execute(store.db);
    expect(n.rows[0].n).toBe(summary.accepted);
  });

  it('stores exactly what each file says, for every test it accepted', async () => {
    const sha = new Map([...files].map(([p, b]) => [createHash('sha256').update(b).digest('hex'), p]));
    const stored = await sql<Record<string, unknown>>`
      select t.lab, t.test_id, t.manifest_sha256, t.manifest_line, g.code as grade, s.name as supplier, h.code as heat, t.tested_on::text as tested_on,
             t.shape, t.diameter_mm, t.gauge_length_mm, t.area_mm2, c.n_points, c.time_s, c.force_n, c.extension_mm, c.crosshead_mm, c.stress_mpa, c.strain, c.source_path,
             r.yield_mpa, r.yield_definition, r.tensile_mpa
      from tests t join grades g on g.id = t.grade_id join suppliers s on s.id = t.supplier_id left join heats h on h.id = t.heat_id
      left join curves c on c.test_row_id = t.id left join summary_records r on r.test_row_id = t.id`.execute(store.db);
    expect(stored.rows.length).toBe(summary.accepted);
    const bad: string[] = [];
    for (const t of stored.rows) {
      const manifest = sha.get(t.manifest_sha256 as string)!;
      const row = readManifestRows(files.get(manifest)!)?.rows.find((r) => r.line === t.manifest_line);
      const want = row ? expectedTest(row) : null;
      const where = `${path.relative(dir, manifest)}:${t.manifest_line}`;
      if (!want) {
        bad.push(`${where}: stored, but the row does not read clearly`);
        continue;
      }
      for (const [k, v] of Object.entries(want)) {
        const got = t[k];
        const same = k === 'area_mm2' ? Math.abs((got as number) - (v as number)) <= 1e-12 * (v as number) : Object.is(got, v);
        if (!same) bad.push(`${where}: ${k} stored ${JSON.stringify(got)}, the file says ${JSON.stringify(v)}`);
      }
      if (t.source_path !== null) {
        const abs = path.resolve(path.dirname(manifest), t.source_path as string);
        if (path.relative(path.dirname(manifest), abs).startsWith('..')) bad.push(`${where}: curve read from outside the manifest's folder`);
        const curve = readCurve(files.get(abs) ?? Buffer.alloc(0));
        if (!curve) {
          bad.push(`${where}: curve ${t.source_path} stored, but it does not read clearly`);
          continue;
        }
        if (t.n_points !== curve.n) bad.push(`${where}: ${t.n_points} points stored, the file has ${curve.n}`);
        const col: Record<string, string> = { time: 'time_s', force: 'force_n', extension: 'extension_mm', crosshead: 'crosshead_mm', stress: 'stress_mpa', strain: 'strain' };
        for (const [ch, values] of Object.entries(curve.channels)) {
          const bytes = t[col[ch]] as Uint8Array | null;
          const got = bytes === null ? null : channelFromBytes(bytes);
          if (!got || got.length !== values.length || values.some((v, i) => !Object.is(got[i], v))) bad.push(`${where}: ${ch} stored differs from the file`);
        }
      }
    }
    expect(bad).toEqual([]);
  });

  it('rejects with a known code, a message and a location inside the named file, and stores each rejection', async () => {
    const codes = new Set<string>(REJECTION_CODES);
    const bad: string[] = [];
    for (const r of summary.rejected) {
      const content = files.get(r.file) ?? files.get(path.resolve(r.file));
      const nLines = content ? content.toString('latin1').split(/\r\n|\r|\n/).length : -1;
      if (!codes.has(r.code)) bad.push(`unknown code ${r.code}`);
      if (!(r.message.length > 5 && r.message.length < 2000)) bad.push(`${r.file}: message of ${r.message.length} characters`);
      if (!content) bad.push(`${r.file}: not one of the inputs`);
      else if (!(Number.isInteger(r.line) && r.line >= 0 && r.line <= nLines)) bad.push(`${r.file}:${r.line}: line outside the file (${nLines} lines)`);
      if (!(Number.isInteger(r.column) && r.column >= 0 && r.column <= 64)) bad.push(`${r.file}:${r.line}:${r.column}: column out of range`);
    }
    expect(bad).toEqual([]);
    const n = await store.db.selectFrom('rejections').select((eb) => eb.fn.countAll<number>().as('n')).where('run_id', '=', summary.run).executeTakeFirstOrThrow();
    expect(Number(n.n)).toBe(summary.rejected.length);
    const kinds = new Set(summary.rejected.map((r) => r.code));
    // the fuzzer reaches the new rejections (and the old ones)
    for (const c of ['wrong_cell_count', 'out_of_range', 'unknown_unit', 'invalid_text', 'value_too_long', 'malformed_csv', 'not_utf8', 'not_a_number', 'path_escapes_folder']) expect(kinds, c).toContain(c);
  });

  it('drops nothing: every manifest row is stored, rejected or a repeat of an earlier identity', async () => {
    const storedLines = new Set((await store.db.selectFrom('tests').select(['manifest_sha256', 'manifest_line']).execute()).map((t) => `${t.manifest_sha256}:${t.manifest_line}`));
    const byFile = new Map<string, { line: number; code: string }[]>();
    for (const r of summary.rejected) byFile.set(r.file, [...(byFile.get(r.file) ?? []), { line: r.line, code: r.code }]);
    const bad: string[] = [];
    for (const m of manifests) {
      const own = byFile.get(m) ?? [];
      const content = files.get(m)!;
      const shaHex = createHash('sha256').update(content).digest('hex');
      if (own.some((r) => r.line === 0 || ['missing_column', 'unknown_unit', 'not_utf8'].includes(r.code))) continue; // the whole file is rejected
      const read = readManifestRows(content);
      if (!read) {
        bad.push(`${path.relative(dir, m)}: not rejected as a whole, but it does not read`);
        continue;
      }
      const firstQuoteError = Math.min(...own.filter((r) => r.code === 'malformed_csv').map((r) => r.line), Infinity);
      const seen = new Set<string>();
      for (const row of read.rows) {
        const id = `${row.cells.lab || 'default'}\u0000${row.cells.test_id}`;
        const curveFile = row.cells.curve ? path.join(path.dirname(m), row.cells.curve) : null;
        const explained =
          storedLines.has(`${shaHex}:${row.line}`) || own.some((r) => r.line === row.line) || row.line >= firstQuoteError || seen.has(id) || (curveFile !== null && byFile.has(curveFile));
        if (!explained) bad.push(`${path.relative(dir, m)}:${row.line}: neither stored nor rejected`);
        seen.add(id);
      }
    }
    expect(bad).toEqual([]);
    expect(summary.accepted + summary.rejected.length).toBeGreaterThan(0);
    process.stdout.write(`fuzz: ${CURVE_CASES + MANIFEST_CASES} cases (${CURVE_CASES} curve files, ${MANIFEST_CASES} manifests): ${summary.accepted} tests stored, ${summary.duplicates} duplicates, ${summary.rejected.length} rejections\n`);
  });
});
