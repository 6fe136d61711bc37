/**
 * A plain benchmark set for the ingest: N tests in one manifest, every curve in kN/mm
 * (time[s], force[kN], extension[mm]), drawn from the demo's grade populations without special
 * layouts, summary-only records or bad files. Curves are written one by one as simulated, so
 * 10,000 tests × 2,000 points never sit in memory.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { CsvFileWriter } from './csv-writer.ts';
import { formatCurveCsv } from './curve-format.ts';
import { AsciiBuffer } from './ascii-buffer.ts';
import { dayOf, isoOf } from './dates.ts';
import { Rng, mixSeed } from './random.ts';
import { GRADES, MILLS, WINDOW_END, WINDOW_START } from './scenario.ts';
import { simulateTest } from './simulate-test.ts';
import { METRIC_HEADER } from './problem-files.ts';

export interface BenchmarkOptions {
  outDir: string;
  tests: number;
  points?: number;
  seed?: number;
}

export interface BenchmarkSet {
  outDir: string;
  /** relative to outDir */
  manifest: string;
  tests: number;
  points: number;
}

export function generateBenchmarkSet(opts: BenchmarkOptions): BenchmarkSet {
  const outDir = resolve(opts.outDir);
  const points = Math.max(50, Math.floor(opts.points ?? 2000));
  const seed = (opts.seed ?? 1) >>> 0;
  mkdirSync(join(outDir, 'curves'), { recursive: true });
  const w = new CsvFileWriter(join(outDir, 'manifest.csv'), METRIC_HEADER);
  const start = dayOf(WINDOW_START);
  const end = dayOf(WINDOW_END);
  const steel = GRADES.filter((g) => g.family === 'steel');
  const mills = MILLS.filter((m) => m.grades.some((g) => steel.some((s) => s.label === g.grade)));
  const buffer = new AsciiBuffer();
  for (let i = 0; i < opts.tests; i++) {
    const rng = new Rng(mixSeed(seed, i + 1));
    const grade = steel[i % steel.length];
    const mill = mills[i % mills.length];
    const t = roundTo(rng.pick([10, 12, 15]) * (1 + 0.003 * rng.normal()), 0.01);
    const b = roundTo(25 * (1 + 0.002 * rng.normal()), 0.01);
    const s0 = t * b;
    const l0 = roundTo(5.65 * Math.sqrt(s0), 5);
    const strength = grade.strengthMeanMpa * (1 + Math.hypot(grade.covHeat, grade.covWithin) * rng.normal());
    const sim = simulateTest(grade, strength, 0, 0, { areaMm2: s0, gaugeLengthMm: l0, parallelLengthMm: l0 + 1.5 * Math.sqrt(s0) }, { withSignal: true, points, loop: false, removeExtensometer: false }, rng);
    const id = `BEN-${String(i + 1).padStart(6, '0')}`;
    const day = start + Math.floor(((end - start) * i) / Math.max(1, opts.tests));
    writeFileSync(join(outDir, 'curves', `${id}.csv`), formatCurveCsv(sim.signal!, 'kn-mm', { testId: id, comments: [`benchmark record ${id} (invented data)`], areaMm2: s0, gaugeLengthMm: l0, labName: '', testedOn: '' }, buffer));
    w.write([id, 'BENCH', grade.label, mill.name, `B-${Math.floor(i / 4)}`, isoOf(day), 'flat', null, t.toFixed(2), b.toFixed(2), null, l0, 'transverse', 21, `curves/${id}.csv`, null, null, null, null, null]);
  }
  w.close();
  return { outDir, manifest: 'manifest.csv', tests: opts.tests, points };
}

function roundTo(x: number, step: number): number {
  return Math.round(x / step) * step;
}
