/**
 * docs/input-formats.md against the real readers: every fenced example marked `file=PATH` is
 * written into a temporary folder and read with the code users run — the manifest and its curve
 * are ingested (both rows stored, none rejected), the column map reads the same curve rewritten in
 * its dialect to the same values, the catalog and fractile.json validate. The expected values come
 * from the examples themselves (S0 = π·d²/4 for a round bar, ISO 6892-1).
 */
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { ingestManifests, parseColumnMapText, readCurveFile } from '@fractile/ingest';
import { GRADE_KEYS, loadCatalog, SPEC_KEYS } from '@fractile/pipeline';
import { listTests } from '@fractile/store';
import { loadProject } from '../packages/cli/src/project.ts';
import { testDatabases } from './support/databases.ts';

const docPath = fileURLToPath(new URL('../docs/input-formats.md', import.meta.url));
const doc = readFileSync(docPath, 'utf8');
const examples = new Map<string, string>();
for (const m of doc.matchAll(/^```\w+ file=(\S+)\n([\s\S]*?)^```$/gm)) examples.set(m[1], m[2]);

const dir = mkdtempSync(join(tmpdir(), 'fractile-doc-'));
for (const [rel, text] of examples) {
  mkdirSync(dirname(join(dir, rel)), { recursive: true });
  writeFileSync(join(dir, rel), text);
}
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('docs/input-formats.md examples', () => {
  it('has one example of each input', () => {
    expect([...examples.keys()].sort()).toEqual(['catalog.json', 'data/curves/QL-101.csv', 'data/manifest.csv', 'fractile.json', 'maps/semicolon.json']);
  });

  it.each(testDatabases())('the manifest and its curve ingest without a rejection on $name', async (tdb) => {
    const store = await tdb.open();
    try {
      const r = await ingestManifests(store, [{ path: join(dir, 'data/manifest.csv') }]);
      expect(r.rejected).toEqual([]);
      expect(r.accepted).toBe(2);
      const tests = await listTests(store.db);
      expect(tests.map((t) => t.test_id).sort()).toEqual(['QL-101', 'QL-102']);
    } finally {
      await store.close();
    }
  });

  it('the curve example reads to force in N and extension in mm; the column map reads its dialect to the same values', async () => {
    const plain = await readCurveFile(join(dir, 'data/curves/QL-101.csv'), 'QL-101.csv', null);
    if (!plain.ok) throw new Error(plain.rejection.message);
    const lines = examples.get('data/curves/QL-101.csv')!.split('\n').filter((l) => l && !l.startsWith('#'));
    const firstRow = lines[1].split(',').map(Number);
    const lastRow = lines.at(-1)!.split(',').map(Number);
    expect(plain.channels.nPoints).toBe(lines.length - 1);
    expect(plain.channels.force![plain.channels.nPoints - 1]).toBeCloseTo(lastRow[1] * 1000, 6); // kN → N
    expect(plain.channels.extension![0]).toBe(firstRow[2]);
    // the same points in the dialect the map describes: a title line, ';' and decimal commas
    const map = parseColumnMapText(readFileSync(join(dir, 'maps/semicolon.json'), 'utf8'));
    if (!map.ok) throw new Error(map.message);
    const dialect = ['Versuch QL-101', 'Zeit;Kraft;Weg', ...lines.slice(1).map((l) => l.replaceAll(',', ';').replaceAll('.', ','))].join('\n') + '\n';
    writeFileSync(join(dir, 'dialect.csv'), dialect);
    const mapped = await readCurveFile(join(dir, 'dialect.csv'), 'dialect.csv', map.map);
    if (!mapped.ok) throw new Error(mapped.rejection.message);
    expect(Array.from(mapped.channels.force!)).toEqual(Array.from(plain.channels.force!));
    expect(Array.from(mapped.channels.extension!)).toEqual(Array.from(plain.channels.extension!));
    expect(Array.from(mapped.channels.time!)).toEqual(Array.from(plain.channels.time!));
  });

  it('the catalog example validates with every key it shows', () => {
    const c = loadCatalog(join(dir, 'catalog.json'));
    expect(c.grades['QT-420']).toMatchObject({ family: 'steel', yield_definition: 'rp0.2', spec: { yield_min_mpa: 420, tensile_max_mpa: 680 }, max_fraction_below: 0.05 });
    expect(c.grades['QT-420'].properties).toEqual({ yield_mpa: { prior_v: 0.06 }, rm_mpa: { headline_model: 'lognormal' } });
  });

  it('the fractile.json example validates, paths relative to its folder', () => {
    const p = loadProject(dir)!;
    expect(p.database).toBe(join(dir, 'db'));
    expect(p.catalog).toBe(join(dir, 'catalog.json'));
    expect(p.manifests).toEqual([{ path: join(dir, 'data/manifest.csv'), map: null }]);
    expect(p.out).toBe(join(dir, 'fractile-out'));
  });

  it('lists every map key and catalog key the readers know', () => {
    // the column map's error message lists its allowed keys; each must be documented
    const bad = parseColumnMapText('{"nope": 1}');
    expect(bad.ok).toBe(false);
    const allowed = /allowed: ([^)]*)/.exec((bad as { message: string }).message)![1].split(', ');
    for (const k of allowed) expect(doc, k).toContain(`| \`${k}\` |`);
    for (const k of GRADE_KEYS) expect(doc, k).toContain(`| \`${k}\` |`);
    for (const k of SPEC_KEYS) expect(doc, k).toContain(`\`${k}\``);
  });
});
