/**
 * The `fractile` command as a user meets it: help on every command, JSON on stdout and nothing
 * else there, the contract keys (docs/architecture.md, README "What is computed"), and bad input named by file, line and column.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Ajv2020 from 'ajv/dist/2020.js';
import addFormats from 'ajv-formats';
import { generateDemo, type DemoManifest } from '@fractile/seed-demo';

const bin = fileURLToPath(new URL('../packages/cli/bin/fractile.js', import.meta.url));
const dir = mkdtempSync(join(tmpdir(), 'fractile-cli-'));
const db = join(dir, 'db');
let demo: DemoManifest;

function fractile(...args: string[]): { status: number | null; stdout: string; stderr: string } {
  const r = spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8', cwd: dir, env: { ...process.env, DATABASE_URL: '' }, maxBuffer: 1 << 27 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

const COMMANDS = ['init', 'ingest', 'tests', 'reduce', 'properties', 'stats', 'curves', 'sample', 'distributions', 'plan', 'drift', 'alerts', 'report', 'run', 'demo'];

beforeAll(() => {
  demo = generateDemo({ outDir: join(dir, 'scenario'), tests: 60, seed: 11, pointsPerCurve: 500 });
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('fractile command line', () => {
  it('lists every command in --help and has --help on each', () => {
    const top = fractile('--help');
    expect(top.status).toBe(0);
    for (const c of COMMANDS) expect(top.stdout).toContain(c);
    for (const c of COMMANDS) {
      const h = fractile(c, '--help');
      expect(h.status, c).toBe(0);
      expect(h.stdout).toMatch(/Usage: fractile/);
    }
  });

  it('ingests with --format json: one JSON document on stdout, rejections with file, line, column; exit 3', () => {
    const good = demo.manifests.filter((m) => m.role === 'data' && !m.map).map((m) => join(dir, 'scenario', m.path));
    const r = fractile('ingest', ...good, '--db', db, '--format', 'json');
    expect(r.status).toBe(0);
    const j = JSON.parse(r.stdout).data;
    expect(Object.keys(j)).toEqual(expect.arrayContaining(['run', 'accepted', 'duplicates', 'rejected']));
    expect(j.accepted).toBeGreaterThan(30);
    const bad = join(dir, 'bad.csv');
    writeFileSync(bad, 'test_id,grade,supplier,tested_on,shape,diameter[mm],gauge_length[mm],curve,yield[MPa],tensile[MPa]\nX1,G,S,2024-13-01,round,10,50,,400,500\n');
    const b = fractile('ingest', bad, '--db', db, '--format', 'json');
    expect(b.status).toBe(3);
    const bj = JSON.parse(b.stdout).data;
    expect(bj.rejected[0]).toMatchObject({ file: expect.stringContaining('bad.csv'), line: 2, column: 4, code: 'invalid_date' });
    expect(b.stderr).toMatch(/bad\.csv:2:4: invalid_date/);
  });

  it('reduces and prints the per-test contract keys', () => {
    const r = fractile('reduce', '--db', db, '--catalog', join(dir, 'scenario', demo.catalog), '--workers', '0');
    expect(r.status, r.stderr).toBe(0);
    const p = fractile('properties', '--db', db, '--format', 'json');
    const rows = JSON.parse(p.stdout).data as Record<string, unknown>[];
    const keys = 'lab, test_id, grade, supplier, heat, tested_on, modulus_gpa, rp02_mpa, rt05_mpa, reh_mpa, rel_mpa, ype_pct, rm_mpa, ag_pct, agt_pct, a_pct, yt_ratio, n_value, k_mpa, yield_mpa, yield_definition, shape_class, flags'.split(', ');
    expect(rows.length).toBeGreaterThan(30);
    for (const k of keys) expect(rows[0]).toHaveProperty(k);
    // a continuous curve has no upper yield point: null, not a number (docs/architecture.md: discontinuous-yield.ts)
    const continuous = rows.find((x) => x.shape_class === 'continuous');
    expect(continuous?.reh_mpa).toBeNull();
    // plain mode: the header is the first line (spreadsheet import); the default has the comment block above it
    const csv = fractile('properties', '--db', db, '--format', 'csv', '--no-comments');
    expect(csv.stdout.split('\n')[0]).toBe([...keys, 'given', 'failure'].join(','));
    const commented = fractile('properties', '--db', db, '--format', 'csv').stdout.split('\n');
    expect(commented[0]).toMatch(/^# fractile per-test properties/);
    expect(commented.find((l) => !l.startsWith('#'))).toBe([...keys, 'given', 'failure'].join(','));
  });

  it('prints stats, curves and drift in their JSON contracts', () => {
    const s = JSON.parse(fractile('stats', '--db', db, '--by', 'grade', '--property', 'yield_mpa', '--format', 'json').stdout).data as Record<string, unknown>[];
    expect(Object.keys(s[0])).toEqual(expect.arrayContaining(['group', 'property', 'n', 'mean', 'sd', 'cov', 'min', 'max', 'median', 'percentiles', 'fits', 'best_fit', 'characteristic', 'compliance', 'warnings']));
    const c = JSON.parse(fractile('curves', '--db', db, '--by', 'grade', '--format', 'json').stdout).data as Record<string, unknown>[];
    expect(Object.keys(c[0])).toEqual(expect.arrayContaining(['group', 'n', 'plastic_strain', 'median_mpa', 'characteristic_mpa', 'valid_to_plastic_strain', 'extrapolated_from', 'idealized', 'provenance']));
    const d = JSON.parse(fractile('drift', '--db', db, '--format', 'json').stdout).data as Record<string, unknown>;
    expect(Object.keys(d).sort()).toEqual(['alerts', 'change_points', 'comparisons']);
    for (const a of d.alerts as Record<string, unknown>[]) {
      for (const k of ['group', 'property', 'rule', 'first_date', 'magnitude', 'tests', 'id', 'detected_on', 'change_date', 'chart', 'state', 'new']) expect(a).toHaveProperty(k);
      expect(a.first_date).toBe(a.detected_on);
    }
    const csv = fractile('curves', '--db', db, '--format', 'csv');
    expect(csv.stdout).toMatch(/^# caution: Statistical estimates from the data given/m);
    // the band kind (issue 9 contract): pointwise by default
    expect(c[0].band).toBe('pointwise');
    expect(csv.stdout).toMatch(/^# band: "pointwise: /m);
  }, 300_000); // five commands in turn: on a busy shared machine more than the default two minutes

  it('lists alerts with their state, acknowledges and closes them by id, and says which are new', () => {
    const first = fractile('drift', '--db', db, '--format', 'json');
    expect(first.status, first.stderr).toBe(0);
    expect(first.stderr).toMatch(/0 new since the last run/);
    const list = JSON.parse(fractile('alerts', '--db', db, '--format', 'json').stdout).data as { run: number; alerts: { id: string; state: string }[] };
    expect(list.run).toBeGreaterThan(0);
    const bad = fractile('alerts', 'ack', '0123456789ab', '--note', 'x', '--db', db);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/no drift alert has the id 0123456789ab/);
    expect(fractile('alerts', 'ack', 'zz', '--note', 'x', '--db', db).stderr).toMatch(/12 hex digits/);
    if (list.alerts.length === 0) return;
    const id = list.alerts[0].id;
    expect(fractile('alerts', 'ack', id, '--db', db).stderr).toMatch(/needs --note/);
    const ack = fractile('alerts', 'ack', id, '--note', 'asked the mill', '--by', 'QA desk', '--db', db);
    expect(ack.status, ack.stderr).toBe(0);
    const acked = JSON.parse(fractile('alerts', '--state', 'acknowledged', '--db', db, '--format', 'json').stdout).data as { alerts: Record<string, unknown>[] };
    expect(acked.alerts.map((a) => a.id)).toEqual([id]);
    expect(acked.alerts[0]).toMatchObject({ state: 'acknowledged', state_by: 'QA desk', state_note: 'asked the mill' });
    expect(fractile('alerts', 'close', id, '--by', 'QA desk', '--db', db).status).toBe(0);
    const d = JSON.parse(fractile('drift', '--db', db, '--format', 'json').stdout).data as { alerts: Record<string, unknown>[] };
    expect(d.alerts.find((a) => a.id === id)).toMatchObject({ state: 'closed', new: false });
  });

  it('gives a simultaneous band on request, saying so', () => {
    const sim = JSON.parse(fractile('curves', '--db', db, '--by', 'grade', '--band', 'simultaneous', '--band-simulations', '300', '--format', 'json').stdout).data as Record<string, unknown>[];
    expect(sim[0].band).toBe('simultaneous');
    expect(sim[0].band_statement).toMatch(/^simultaneous: /);
    expect((sim[0].simultaneous as Record<string, number>).simulations).toBe(300);
  });

  it('feeds probabilistic analyses: the distribution export, random curves, sets with parameter uncertainty, the planning table', () => {
    // the documented export (docs/distribution-export.md) validates against its schema (Ajv)
    const d = fractile('distributions', '--db', db, '--by', 'grade', '--bootstrap', '50', '--format', 'json');
    expect(d.status, d.stderr).toBe(0);
    const doc = JSON.parse(d.stdout);
    const ajv = new Ajv2020({ strict: false });
    addFormats(ajv);
    const validate = ajv.compile(JSON.parse(readFileSync(new URL('../docs/distribution-export.schema.json', import.meta.url), 'utf8')));
    expect(validate(doc), JSON.stringify(validate.errors)).toBe(true);
    expect(doc.groups.length).toBeGreaterThan(0);
    expect(doc.groups[0].bootstrap.replicates.length).toBeGreaterThan(40);
    // the model is a stored run of the sample stage: the same settings on the same tests reuse it
    const again = fractile('distributions', '--db', db, '--by', 'grade', '--bootstrap', '50', '--format', 'json');
    expect(again.stderr).toMatch(/stored model reused/);
    expect(JSON.parse(again.stdout).groups.map((g: { marginals: unknown }) => g.marginals)).toEqual(doc.groups.map((g: { marginals: unknown }) => g.marginals));
    // random curves: a long CSV after # lines with the caution; each sample ends at its uniform strain
    const c = fractile('sample', '--curves', '--db', db, '--by', 'grade', '--n', '5', '--format', 'csv');
    expect(c.status, c.stderr).toBe(0);
    const lines = c.stdout.split('\n');
    expect(lines[0]).toBe('# fractile-random-curves, csv format 1');
    expect(c.stdout).toMatch(/^# caution: Statistical estimates from the data given/m);
    const header = lines.find((l) => !l.startsWith('#'))!;
    expect(header).toBe('grade,sample,plastic_strain,true_stress_mpa');
    const j = JSON.parse(fractile('sample', '--curves', '--db', db, '--by', 'grade', '--n', '5', '--format', 'json').stdout);
    expect(j.caution).toMatch(/licensed engineer/);
    const curve = j.groups.find((g: { n: number }) => g.n > 0).curves[0];
    expect(curve.plastic_strain.at(-1)).toBe(curve.uniform_plastic_strain);
    const rowsOfFirst = lines.filter((l) => /^[^#].*,1,/.test(l) && l.startsWith(j.groups.find((g: { n: number }) => g.n > 0).group.grade + ',1,'));
    expect(rowsOfFirst.length).toBe(curve.plastic_strain.length);
    // property sets drawn with parameter uncertainty carry the model draw they come from
    const u = fractile('sample', '--db', db, '--n', '20', '--parameter-uncertainty', 'bootstrap', '--parameter-draws', '4', '--bootstrap', '50', '--format', 'csv');
    expect(u.status, u.stderr).toBe(0);
    expect(u.stdout).toMatch(/^# parameter_uncertainty: "bootstrap"$/m);
    expect(u.stdout).toMatch(/^# parameter_draws: 4$/m);
    expect(u.stdout.split('\n').find((l) => !l.startsWith('#'))).toMatch(/^grade,set,parameter_draw,/);
    // the planning table: the value now and after 10, 20, 50 more tests
    const p = JSON.parse(fractile('plan', '--db', db, '--property', 'yield_mpa', '--replicates', '200', '--format', 'json').stdout);
    expect(p).toMatchObject({ kind: 'plan', caution: expect.stringMatching(/licensed engineer/) });
    const planned = p.data.plans.find((x: { plan: unknown }) => x.plan);
    expect(planned.plan.rows.map((r: { added: number }) => r.added)).toEqual([0, 10, 20, 50]);
    // bad options are named
    const bad = fractile('sample', '--db', db, '--parameter-uncertainty', 'guess');
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/--parameter-uncertainty must be one of none, asymptotic, bootstrap/);
    expect(fractile('plan', '--db', db, '--add', '10,x').stderr).toMatch(/--add must be a whole number/);
  });

  it('writes the report and the exports, each carrying the caution', () => {
    const out = join(dir, 'out');
    const r = fractile('report', '--db', db, '--out', out);
    expect(r.status, r.stderr).toBe(0);
    const html = readFileSync(join(out, 'report.html'), 'utf8');
    expect(html).toMatch(/licensed engineer/);
    expect(html).toMatch(/The characteristic curve is a pointwise bound/);
    expect(readFileSync(join(out, 'curves', 'curves.json'), 'utf8')).toMatch(/"band": "pointwise"/);
    for (const f of ['properties.csv', 'stats.json', 'drift.json', 'curves/curves.json', 'distributions.json', 'planning.json']) {
      expect(existsSync(join(out, f)), f).toBe(true);
      expect(readFileSync(join(out, f), 'utf8')).toMatch(/licensed engineer/);
    }
  });

  it('names the file, line and column of a bad grade catalog, and rejects bad options clearly', () => {
    const cat = join(dir, 'bad-catalog.json');
    writeFileSync(cat, '{\n  "grades": {\n    "G": { "family": "steel", }\n  }\n}\n');
    const r = fractile('reduce', '--db', db, '--catalog', cat);
    expect(r.status).not.toBe(0);
    expect(r.stderr).toMatch(/bad-catalog\.json:3:\d+: bad_catalog/);
    const b = fractile('stats', '--db', db, '--coverage', '1.5');
    expect(b.status).toBe(2);
    expect(b.stderr).toMatch(/--coverage/);
    const band = fractile('curves', '--db', db, '--band', 'joint');
    expect(band.status).toBe(2);
    expect(band.stderr).toMatch(/--band/);
    const g = fractile('stats', '--db', db, '--by', 'colour');
    expect(g.status).not.toBe(0);
    expect(g.stderr).toMatch(/unknown grouping field "colour"/);
  });
});
