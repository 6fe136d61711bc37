/**
 * Exclusions and flagged values end to end through the `fractile` command, on each test database
 * (embedded, and the server of TEST_DATABASE_URL): flagged values out of the statistics by
 * default and counted per flag, back in with --include-flagged; `exclude` with a recorded reason,
 * honoured by stats, curves and the report, undone by `include` (the history keeps both, and the
 * statistics return to exactly the first run's); unknown ids refused. Also: one design value —
 * the curves start from the stats headline of the group's yield.
 * Checks against the invented demo scenario's own record of its special files (crosshead-only
 * records, issue 9: "a crosshead-only modulus … sits in the modulus population").
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateDemo, type DemoManifest } from '@fractile/seed-demo';
import { testTargets } from './support/databases.ts';

const bin = fileURLToPath(new URL('../packages/cli/bin/fractile.js', import.meta.url));
const dir = mkdtempSync(join(tmpdir(), 'fractile-excl-'));
let demo: DemoManifest;

beforeAll(() => {
  demo = generateDemo({ outDir: join(dir, 'scenario'), tests: 150, seed: 5, pointsPerCurve: 300 });
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

type Stats = { group: Record<string, string>; property: string; n: number; headline: { value: number; method: string } | null; left_out: { n: number; by_reason: Record<string, number> } }[];

describe.each(testTargets())('exclusions and flagged values through the CLI on $name', (tt) => {
  let target = '';
  let before: Stats = [];
  let dispose: () => Promise<void> = async () => {};
  const fractile = (...args: string[]) => {
    const r = spawnSync(process.execPath, [bin, ...args, '--db', target], { encoding: 'utf8', cwd: dir, env: { ...process.env, DATABASE_URL: '', USER: 'qa-engineer' }, maxBuffer: 1 << 27 });
    return { status: r.status, stdout: r.stdout, stderr: r.stderr };
  };
  const json = <T>(...args: string[]): T => {
    const r = fractile(...args, '--format', 'json');
    expect(r.status, r.stderr).toBe(0);
    return JSON.parse(r.stdout).data as T;
  };
  beforeAll(async () => {
    const t = await tt.create();
    target = t.target;
    dispose = t.dispose;
    const manifests = demo.manifests.filter((m) => m.role === 'data' && !m.map).map((m) => join(dir, 'scenario', m.path));
    expect(fractile('ingest', ...manifests).status).toBe(0);
    const r = fractile('reduce', '--catalog', join(dir, 'scenario', demo.catalog), '--workers', '0');
    expect(r.status, r.stderr).toBe(0);
  }, 900_000);
  afterAll(async () => dispose());

  it('leaves flagged values out by default, counted per flag, and takes them back with --include-flagged', () => {
    const props = json<{ lab: string; test_id: string; grade: string; modulus_gpa: number | null; flags: string[] }[]>('properties');
    const crosshead = props.filter((p) => p.flags.includes('crosshead_only_modulus') && p.modulus_gpa !== null);
    expect(crosshead.length).toBeGreaterThan(0); // the scenario has crosshead-only records
    // a crosshead slope includes the machine: far below a steel's 190–220 GPa (common practice)
    expect(Math.min(...crosshead.map((p) => p.modulus_gpa!))).toBeLessThan(150);
    before = json<Stats>('stats', '--by', 'grade', '--property', 'modulus_gpa,rm_mpa');
    const plain = json<Stats>('stats', '--by', 'grade', '--property', 'modulus_gpa,rm_mpa', '--include-flagged');
    for (const s of before.filter((x) => x.property === 'modulus_gpa')) {
      const inGrade = crosshead.filter((p) => p.grade === s.group.grade).length;
      expect(s.left_out.by_reason.crosshead_only_modulus ?? 0, s.group.grade).toBe(inGrade);
      const with_ = plain.find((x) => x.group.grade === s.group.grade && x.property === 'modulus_gpa')!;
      expect(with_.n).toBe(s.n + s.left_out.n);
      expect(with_.left_out.n).toBe(0);
    }
  }, 900_000);

  it('excludes a test with a recorded reason, everywhere, and includes it back to the same results; the curves start from the stats headline', () => {
    const rm = (st: Stats, grade: string) => st.find((s) => s.group.grade === grade && s.property === 'rm_mpa')!;
    const victim = { ...before.find((s) => s.property === 'rm_mpa')!.group };
    const props = json<{ lab: string; test_id: string; grade: string; rm_mpa: number | null }[]>('properties', '--grade', victim.grade);
    const t = props.find((p) => p.rm_mpa !== null)!;
    const ref = `${t.lab}/${t.test_id}`;

    const unknown = fractile('exclude', 'no-such-test', ref, '--reason', 'bad specimen');
    expect(unknown.status).toBe(2);
    expect(unknown.stderr).toContain('unknown test "no-such-test"');
    const rec = json<{ recorded: { test: string; reason: string; by: string }[] }>('exclude', ref, '--reason', 'grip failure at 3 % strain');
    // only the second call wrote, and exactly one decision
    expect(rec.recorded).toEqual([expect.objectContaining({ test: ref, reason: 'grip failure at 3 % strain', by: 'qa-engineer' })]);

    // the report and its exports, after the exclusion
    const out = join(dir, `report-${tt.name}`);
    const r = fractile('report', '--out', out);
    expect(r.status, r.stderr).toBe(0);
    const html = readFileSync(join(out, 'report.html'), 'utf8');
    const quality = html.slice(html.indexOf('id="quality"'));
    expect(quality).toContain('grip failure at 3 % strain');
    expect(quality).toContain(t.test_id);
    expect(quality).toContain('qa-engineer');
    const after = (JSON.parse(readFileSync(join(out, 'stats.json'), 'utf8')) as { data: Stats }).data;
    expect(rm(after, victim.grade).n).toBe(rm(before, victim.grade).n - 1);
    expect(rm(after, victim.grade).left_out.by_reason.excluded).toBe(1);
    // one design value: each group's characteristic curve starts from the stats headline of its yield
    // (ReL where the grade's yield is the upper yield point)
    const curves = (JSON.parse(readFileSync(join(out, 'curves', 'curves.json'), 'utf8')) as { curves?: unknown[]; rows?: unknown[] });
    const list = (curves.curves ?? curves.rows ?? curves) as { group: Record<string, string>; characteristic_yield_mpa: number | null; provenance: { settings: Record<string, unknown> } }[];
    const catalog = JSON.parse(readFileSync(join(dir, 'scenario', demo.catalog), 'utf8')) as { grades: Record<string, { yield_definition: string }> };
    expect(list.length).toBeGreaterThan(0);
    for (const c of list) {
      const prop = catalog.grades[c.group.grade].yield_definition === 'reh' ? 'rel_mpa' : 'yield_mpa';
      const s = after.find((x) => x.group.grade === c.group.grade && x.property === prop)!;
      expect(c.characteristic_yield_mpa, c.group.grade).toBe(s.headline!.value);
      expect(String(c.provenance.settings.characteristic_yield_from)).toContain(`stats headline of ${prop}`);
    }

    // a bare test id works where it is unique over labs
    expect(json<{ recorded: unknown[] }>('include', t.test_id, '--reason', 'retested, specimen fine').recorded.length).toBe(1);
    const history = json<{ lab: string; test_id: string; action: string; reason: string; decided_by: string; decided_at: string }[]>('exclusions', '--history');
    expect(history.map((h) => [h.action, h.reason])).toEqual([['exclude', 'grip failure at 3 % strain'], ['include', 'retested, specimen fine']]);
    expect(history.every((h) => h.lab === t.lab && h.test_id === t.test_id && h.decided_by === 'qa-engineer' && !Number.isNaN(Date.parse(h.decided_at)))).toBe(true);
    const back = fractile('stats', '--by', 'grade', '--property', 'modulus_gpa,rm_mpa', '--format', 'json');
    expect(back.stderr).toMatch(/stored results reused/);
    expect(JSON.parse(back.stdout).data).toEqual(before);
  }, 900_000);
});
