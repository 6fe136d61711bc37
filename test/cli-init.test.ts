/**
 * `fractile init`: the starter files it writes ingest as they are (`cd FOLDER && fractile ingest
 * && fractile stats` on the embedded database), it never overwrites a file without --force (exit
 * 2 naming the files), and the example curve follows the law it states: a round bar of
 * d = 10 mm (S0 = π·d²/4, ISO 6892-1), E = 205 GPa on the linear part.
 */
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runFractile } from './support/cli.ts';
import { afterAll, describe, expect, it } from 'vitest';

const dir = mkdtempSync(join(tmpdir(), 'fractile-init-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const fractile = runFractile;

const FILES = ['fractile.json', 'manifest.csv', 'curves/HF-0001.csv', 'catalog.json', 'maps/semicolon.json'];

describe('fractile init', () => {
  it('writes the starter files, says what to do next, and they ingest and give statistics', () => {
    const r = fractile(dir, 'init', 'proj');
    expect(r.status, r.stderr).toBe(0);
    for (const f of FILES) {
      expect(existsSync(join(dir, 'proj', f)), f).toBe(true);
      expect(r.stderr).toContain(`init: wrote ${join('proj', f)}`);
    }
    expect(r.stderr).toContain('next: cd proj && fractile ingest && fractile stats');
    const proj = join(dir, 'proj');
    const ing = fractile(proj, 'ingest', '--format', 'json');
    expect(ing.status, ing.stderr).toBe(0);
    const data = JSON.parse(ing.stdout).data;
    expect(data.accepted).toBe(2);
    expect(data.rejected).toEqual([]);
    expect(existsSync(join(proj, 'db'))).toBe(true);
    const props = JSON.parse(fractile(proj, 'properties', '--format', 'json').stdout).data;
    const curveTest = props.find((p: { test_id: string }) => p.test_id === 'HF-0001');
    const summaryTest = props.find((p: { test_id: string }) => p.test_id === 'HF-0002');
    // the modulus of the example curve's linear part: 205 GPa by construction (starter-files.ts)
    expect(curveTest.modulus_gpa).toBeCloseTo(205, 0);
    // Rm = max force / S0 with S0 = π·(10 mm)²/4; the curve's top is 380 + 160·(1 − e^−4) MPa
    expect(curveTest.rm_mpa).toBeCloseTo(380 + 160 * (1 - Math.exp(-4)), 0);
    // Rp0.2 (ISO 6892-1: the stress at 0.2 % plastic extension): 380 + 160·(1 − e^(−0.002/0.04)) MPa
    // by the stated law; the curve samples plastic strain every 0.004, so within 0.5 MPa
    expect(Math.abs(curveTest.rp02_mpa - (380 + 160 * (1 - Math.exp(-0.002 / 0.04))))).toBeLessThan(0.5);
    expect(curveTest.flags).not.toContain('modulus_poor_fit');
    expect(summaryTest).toMatchObject({ rm_mpa: 528, yield_mpa: 391, given: true });
    const st = fractile(proj, 'stats', '--format', 'json');
    expect(st.status, st.stderr).toBe(0);
    const rm = JSON.parse(st.stdout).data.find((s: { property: string }) => s.property === 'rm_mpa');
    expect(rm.n).toBe(2);
  }, 120_000);

  it('refuses to overwrite (exit 2, naming each file, writing nothing) unless --force', () => {
    const folder = join(dir, 'mine');
    mkdirSync(folder);
    writeFileSync(join(folder, 'manifest.csv'), 'my own rows\n');
    writeFileSync(join(folder, 'catalog.json'), '{"grades": {}}\n');
    const r = fractile(dir, 'init', 'mine');
    expect(r.status).toBe(2);
    expect(r.stderr).toContain(join('mine', 'manifest.csv'));
    expect(r.stderr).toContain(join('mine', 'catalog.json'));
    expect(r.stderr).toMatch(/nothing was written/);
    expect(r.stderr).not.toMatch(/\n\s+at /);
    expect(readFileSync(join(folder, 'manifest.csv'), 'utf8')).toBe('my own rows\n');
    expect(existsSync(join(folder, 'fractile.json'))).toBe(false);
    expect(existsSync(join(folder, 'curves'))).toBe(false);
    const f = fractile(dir, 'init', 'mine', '--force');
    expect(f.status, f.stderr).toBe(0);
    expect(f.stderr).toContain(`init: wrote ${join('mine', 'manifest.csv')} (overwritten)`);
    expect(readFileSync(join(folder, 'manifest.csv'), 'utf8')).toMatch(/^# one row per test/);
  });

  it('writes a new project beside a broken fractile.json in the working folder', () => {
    const here = join(dir, 'broken-here');
    mkdirSync(here);
    writeFileSync(join(here, 'fractile.json'), '{ "database": ');
    // other commands refuse the broken file; init does not read it
    expect(fractile(here, 'tests').status).toBe(2);
    const r = fractile(here, 'init', 'fresh');
    expect(r.status, r.stderr).toBe(0);
    expect(existsSync(join(here, 'fresh', 'fractile.json'))).toBe(true);
    expect(readFileSync(join(here, 'fractile.json'), 'utf8')).toBe('{ "database": ');
  });

  it('refuses a path that is a file', () => {
    writeFileSync(join(dir, 'plain.txt'), 'x');
    const r = fractile(dir, 'init', 'plain.txt');
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/plain\.txt is not a folder/);
  });
});
