/**
 * Every CSV the tool writes is safe to open in a spreadsheet (CSV injection, OWASP "CSV
 * Injection"; common practice): no text cell begins with `=`, `+`, `-`, `@`, a tab or a carriage
 * return (numbers may be negative), and no comma-separated piece of a `#` comment line does either.
 * The data are made to try: lab, test ids, grades, suppliers and heats that begin with formula
 * characters (some after spaces or a tab, which the reader trims). Each CSV — the exports of
 * `run` (properties.csv and the design curve files) and `--format csv` of every command — is
 * opened with csv-parse.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { beforeAll, describe, expect, it } from 'vitest';
import { generateDemo } from '@fractile/seed-demo';

const bin = fileURLToPath(new URL('../packages/cli/bin/fractile.js', import.meta.url));
const dir = mkdtempSync(path.join(tmpdir(), 'fractile-formula-'));
const db = path.join(dir, 'db');
const out = path.join(dir, 'out');
const FORMULA = /^[=+\-@\t\r\uFF1D\uFF0B\uFF0D\uFF20]/;
const NUMBER = /^-?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

const fractile = (...args: string[]) => spawnSync(process.execPath, [bin, ...args, '--db', db], { encoding: 'utf8', cwd: dir, env: { ...process.env, DATABASE_URL: '' }, maxBuffer: 1 << 28 });

/** The CSVs: every file under the run's output folder, and each command's --format csv output. */
const csvs = new Map<string, string>();

beforeAll(() => {
  return (async () => {
    // the invented demo scenario, its labels replaced by hostile ones (consistently, so groups stay)
    const demo = generateDemo({ outDir: path.join(dir, 'scenario'), tests: 60, seed: 17, pointsPerCurve: 500 });
    const hostile = ['=1+1', '+SUM(A1:A9)', '-2+3', '@cmd', ' =HYPERLINK("http://x","y")', '\t=tab', '＝fullwidth'];
    const relabel = new Map<string, string>();
    const label = (v: string) => (v === '' ? v : (relabel.get(v) ?? relabel.set(v, hostile[relabel.size % hostile.length] + (relabel.size >= hostile.length ? relabel.size : '')).get(v)!));
    const manifests = demo.manifests.filter((m) => m.role === 'data' && !m.map).map((m) => path.join(dir, 'scenario', m.path));
    manifests.forEach((manifest) => {
      const [head, ...rows] = parse(readFileSync(manifest, 'utf8'), { comment: '#', relax_column_count: true }) as string[][];
      const col = (name: string) => head.indexOf(name);
      const edited = rows.map((r, i) => {
        for (const name of ['grade', 'supplier', 'heat']) if (col(name) >= 0) r[col(name)] = label(r[col(name)]);
        if (i % 3 === 0) r[col('test_id')] = `=${r[col('test_id')]}`;
        if (col('lab') >= 0 && i % 5 === 0) r[col('lab')] = '@lab';
        return r;
      });
      writeFileSync(manifest, stringify([head, ...edited]));
    });
    const ingest = fractile('ingest', ...manifests, '--progress', 'none');
    expect(ingest.status, ingest.stderr).toBe(0);
    const run = fractile('run', '--out', out, '--workers', '0', '--by', 'grade');
    expect(run.status, run.stderr).toBe(0);
    const walk = (d: string): string[] => readdirSync(d).flatMap((f) => (statSync(path.join(d, f)).isDirectory() ? walk(path.join(d, f)) : [path.join(d, f)]));
    for (const f of walk(out).filter((f) => f.endsWith('.csv'))) csvs.set(path.relative(dir, f), readFileSync(f, 'utf8'));
    for (const args of [['tests'], ['properties'], ['stats', '--by', 'grade,supplier'], ['curves'], ['drift', '--by', 'supplier'], ['sample', '--n', '20']]) {
      const r = fractile(...args, '--format', 'csv');
      expect(r.status, `${args[0]}: ${r.stderr}`).toBe(0);
      csvs.set(`${args[0]} --format csv`, r.stdout);
    }
  })();
}, 600_000);

describe('CSV exports in a spreadsheet', () => {
  it('write every file and output that the checks open', () => {
    expect([...csvs.keys()].filter((k) => k.startsWith('out/curves/')).length).toBeGreaterThanOrEqual(2);
    expect(csvs.get('out/properties.csv')).toBeDefined();
  });

  it('have no text cell that begins with a formula character', () => {
    const bad: string[] = [];
    let textCells = 0;
    for (const [name, text] of csvs) {
      const rows = parse(text, { comment: '#', relax_column_count: true, skip_empty_lines: true }) as string[][];
      rows.forEach((row, r) =>
        row.forEach((cell, c) => {
          if (NUMBER.test(cell)) return;
          textCells++;
          if (FORMULA.test(cell) || FORMULA.test(cell.trimStart())) bad.push(`${name} row ${r + 1} col ${c + 1}: ${JSON.stringify(cell.slice(0, 40))}`);
        }),
      );
    }
    expect(bad).toEqual([]);
    expect(textCells).toBeGreaterThan(100);
    // the hostile labels are there, neutralized: shown as text, not dropped
    const props = csvs.get('out/properties.csv')!;
    for (const text of ["'=1+1", "'+SUM(A1:A9)", "'-2+3", "'@cmd", "'@lab", ",'="]) expect(props).toContain(text);
  });

  it('have no comment-line piece (split at every comma) that begins with a formula character', () => {
    const bad: string[] = [];
    for (const [name, text] of csvs) {
      for (const line of text.split('\n').filter((l) => l.startsWith('#'))) {
        for (const piece of line.split(',').slice(1)) {
          const p = piece.trimStart().replace(/^"/, '').trimStart();
          if (FORMULA.test(p) && !/^-\d/.test(p)) bad.push(`${name}: ${JSON.stringify(piece.slice(0, 40))}`);
        }
      }
    }
    expect(bad).toEqual([]);
  });
});
