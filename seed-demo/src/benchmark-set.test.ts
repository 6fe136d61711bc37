import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { generateBenchmarkSet } from './benchmark-set.ts';
import { generateCurveCsv } from './generate-curve-csv.ts';

const root = mkdtempSync(join(tmpdir(), 'fractile-bench-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe('benchmark set and single curves', () => {
  it('writes N plain kN/mm tests in one manifest', () => {
    const b = generateBenchmarkSet({ outDir: join(root, 'b'), tests: 25, points: 400, seed: 3 });
    const lines = readFileSync(join(b.outDir, b.manifest), 'utf8').trimEnd().split('\n');
    expect(lines).toHaveLength(26);
    expect(readdirSync(join(b.outDir, 'curves'))).toHaveLength(25);
    for (const l of lines.slice(1)) {
      const curve = l.split(',')[14];
      const text = readFileSync(join(b.outDir, curve), 'utf8').trimEnd().split('\n');
      const header = text.find((x) => !x.startsWith('#'))!;
      expect(header).toBe('time[s],force[kN],extension[mm]');
      // 400 points asked: the main samples plus two fracture points
      expect(text.filter((x) => /^\d/.test(x))).toHaveLength(400);
    }
  });

  it('gives one curve with its truth, the maximum force matching Rm·S0', () => {
    const { text, truth } = generateCurveCsv({ grade: 'FX-690Q', areaMm2: 250, gaugeLengthMm: 80, points: 1000, seed: 5 });
    const rows = text
      .trimEnd()
      .split('\n')
      .filter((l) => /^\d/.test(l))
      .map((l) => l.split(',').map(Number));
    const fMax = Math.max(...rows.map((r) => r[1] * 1000));
    expect(fMax / (truth.rmMpa * 250)).toBeCloseTo(1, 2);
  });

  it('runs as a command: summary on stderr, the demo-manifest path on stdout', () => {
    const out = join(root, 'cli');
    const cli = join(import.meta.dirname, 'cli.ts');
    const stdout = execFileSync(process.execPath, ['--import', 'tsx', cli, '--out', out, '--tests', '40', '--seed', '5', '--points', '100'], { stdio: ['ignore', 'pipe', 'pipe'] }).toString();
    expect(stdout.trim()).toBe(join(out, 'demo-manifest.json'));
    expect(existsSync(stdout.trim())).toBe(true);
    const m = JSON.parse(readFileSync(stdout.trim(), 'utf8')) as { counts: { tests: number }; seed: number };
    expect(m.counts.tests).toBe(40);
    expect(m.seed).toBe(5);
    expect(() => execFileSync(process.execPath, ['--import', 'tsx', cli, '--out', out, '--tests', 'many'], { stdio: 'pipe' })).toThrow();
  });
});
