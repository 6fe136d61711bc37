/**
 * Writes a synthetic input set in our own formats (a manifest plus one curve file per test) for
 * the ingest benchmark and the crash test. The curves are invented: linear elastic at E = 205 GPa
 * (common practice for steel) up to a proportional limit, then Hollomon hardening
 * σ = K·ε^n (K, n drawn per test), sampled in time at a constant extension rate. Round specimens
 * d = 10 mm, L0 = 50 mm. Deterministic for a given seed (mulberry32 generator, written here
 * because it is four lines).
 */
import { seededRandom } from '@fractile/curves/testing';
import { mkdirSync, writeFileSync } from 'node:fs';
import { open } from 'node:fs/promises';
import path from 'node:path';

export interface BenchDataOptions {
  tests: number;
  points: number;
  seed?: number;
  /** first test number (to write several disjoint sets) */
  offset?: number;
}


/** The CSV text of one synthetic curve (time[s], force[kN], extension[mm]). */
export function syntheticCurveCsv(points: number, rand: () => number): string {
  const E = 205_000; // MPa
  const K = 700 + 200 * rand();
  const n = 0.12 + 0.1 * rand();
  const d = 10;
  const s0 = (Math.PI * d * d) / 4;
  const l0 = 50;
  const eMax = 0.25;
  const lines = ['# synthetic tensile curve', 'time[s],force[kN],extension[mm]'];
  for (let i = 0; i < points; i++) {
    const e = (eMax * i) / (points - 1);
    // elastic line meets the hardening law where E·e = K·e^n
    const eCross = Math.pow(K / E, 1 / (1 - n));
    const stress = e <= eCross ? E * e : K * Math.pow(e, n);
    const noise = 1 + 0.001 * (rand() - 0.5);
    lines.push(`${(i * 0.05).toFixed(2)},${((stress * s0 * noise) / 1000).toFixed(4)},${(e * l0).toFixed(5)}`);
  }
  return lines.join('\n') + '\n';
}

/** Writes `dir/manifest.csv` and `dir/curves/T*.csv`; returns the manifest path. */
export async function writeBenchData(dir: string, opts: BenchDataOptions): Promise<string> {
  const rand = seededRandom(opts.seed ?? 1);
  const offset = opts.offset ?? 0;
  mkdirSync(path.join(dir, 'curves'), { recursive: true });
  const manifestPath = path.join(dir, 'manifest.csv');
  const fh = await open(manifestPath, 'w');
  try {
    await fh.write('test_id,lab,grade,supplier,heat,tested_on,shape,diameter[mm],gauge_length[mm],curve\n');
    let rows = '';
    for (let i = 0; i < opts.tests; i++) {
      const k = offset + i;
      const id = `T${String(k).padStart(6, '0')}`;
      const curve = `curves/${id}.csv`;
      writeFileSync(path.join(dir, curve), syntheticCurveCsv(opts.points, rand));
      const day = 1 + (k % 28);
      rows += `${id},bench,G${k % 3},Supplier ${String.fromCharCode(65 + (k % 4))},H${Math.floor(k / 50)},2024-0${1 + (k % 9)}-${String(day).padStart(2, '0')},round,10,50,${curve}\n`;
      if (rows.length > 1 << 16) {
        await fh.write(rows);
        rows = '';
      }
    }
    await fh.write(rows);
  } finally {
    await fh.close();
  }
  return manifestPath;
}
