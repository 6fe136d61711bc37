/**
 * A wrong grade catalog stops every command that takes one with exit 2 before any database is
 * opened: the message names the file, the line and column, and the JSON Pointer (RFC 6901) of the
 * fault; no database folder is created. Strict JSON per RFC 8259 (no trailing comma).
 */
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runFractile } from './support/cli.ts';
import { afterAll, describe, expect, it } from 'vitest';

const dir = mkdtempSync(join(tmpdir(), 'fractile-catalog-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const fractile = runFractile;

writeFileSync(join(dir, 'm.csv'), 'test_id,grade,supplier,tested_on,tensile[MPa]\nK-1,KX-300,Brandholm,2026-01-05,455\n');

const CASES: [string, string, RegExp][] = [
  ['bad JSON', '{\n  "grades": {\n    "KX-300": { "family": "steel", }\n  }\n}\n', /cat\.json:3:36: bad_catalog: .*comma after the last entry/],
  ['unknown key', '{"grades": {"KX-300": {"spek": {}}}}', /cat\.json:1:24: bad_catalog: grade "KX-300": unknown key "spek".*\(at \/grades\/KX-300\/spek\)/],
  ['wrong type', '{"grades": {"KX-300": {"spec": {"tensile_min_mpa": "400"}}}}', /cat\.json:1:33: bad_catalog: .*tensile_min_mpa must be a number or null, got "400" \(at \/grades\/KX-300\/spec\/tensile_min_mpa\)/],
  ['negative minimum', '{"grades": {"KX-300": {"spec": {"yield_min_mpa": -300}}}}', /cat\.json:1:33: bad_catalog: .*yield_min_mpa must not be negative, got -300 \(at \/grades\/KX-300\/spec\/yield_min_mpa\)/],
  ['unknown property', '{"grades": {"KX-300": {"properties": {"rm": {"prior_v": 0.05}}}}}', /cat\.json:1:39: bad_catalog: .*unknown property "rm" \(known: yield_mpa.*\(at \/grades\/KX-300\/properties\/rm\)/],
];

describe('a wrong catalog on the command line', () => {
  it.each(CASES)('%s: exit 2 naming file, line, column and JSON path; no database created', (_name, text, expected) => {
    writeFileSync(join(dir, 'cat.json'), text);
    const db = join(dir, `db-${_name.replace(/\s/g, '-')}`);
    const r = fractile(dir, 'ingest', 'm.csv', '--catalog', 'cat.json', '--db', db);
    expect(r.status, r.stderr).toBe(2);
    expect(r.stderr).toMatch(expected);
    expect(r.stderr).not.toMatch(/\n\s+at /);
    expect(existsSync(db)).toBe(false);
  });

  it('the catalog named by fractile.json is checked the same way, for reading commands too', () => {
    writeFileSync(join(dir, 'cat.json'), '{"grades": {"KX-300": {"spec": {"yield_min_mpa": -1}}}}');
    writeFileSync(join(dir, 'fractile.json'), JSON.stringify({ database: 'projdb', catalog: 'cat.json', manifests: ['m.csv'] }));
    const r = fractile(dir, 'ingest');
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/cat\.json:1:33: bad_catalog: .*\(at \/grades\/KX-300\/spec\/yield_min_mpa\)/);
    expect(existsSync(join(dir, 'projdb'))).toBe(false);
    const s = fractile(dir, 'stats');
    expect(s.status).toBe(2);
    expect(s.stderr).toMatch(/bad_catalog/);
    rmSync(join(dir, 'fractile.json'));
  });
});
