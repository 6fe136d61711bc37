/** Small helpers shared by the benchmarks: a seeded generator, timing, and peak memory. */
import type { PropertyRow } from '@fractile/pipeline';
import { seededRandom } from '@fractile/curves/testing';

export function normal(u: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
}

export function peakRssMb(): number {
  return process.resourceUsage().maxRSS / 1024;
}

export async function time<T>(label: string, fn: () => Promise<T> | T): Promise<{ value: T; seconds: number }> {
  const t0 = performance.now();
  const value = await fn();
  const seconds = (performance.now() - t0) / 1000;
  console.log(`${label.padEnd(48)} ${seconds.toFixed(3)} s`);
  return { value, seconds };
}

/** Synthetic per-test property rows: `groups` grade × supplier groups, in date order. */
export function syntheticRows(n: number, groups: number, seed = 1): PropertyRow[] {
  const u = seededRandom(seed);
  const z = normal(u);
  const rows: PropertyRow[] = [];
  const start = Date.UTC(2023, 0, 1);
  for (let i = 0; i < n; i++) {
    const g = i % groups;
    const grade = `BX-${(g % 10) + 1}`;
    const supplier = `Mill ${Math.floor(g / 10) + 1}`;
    const day = Math.floor((i / n) * 1095);
    const y = 380 + 10 * (g % 7) + 18 * z();
    const rm = y / 0.78 + 12 * z();
    rows.push({
      lab: 'bench', test_id: `T${i}`, grade, supplier, heat: `H${Math.floor(i / 20)}`, tested_on: new Date(start + day * 86400000).toISOString().slice(0, 10),
      modulus_gpa: 205 + 3 * z(), rp02_mpa: y, rt05_mpa: y + 2, reh_mpa: y + 15, rel_mpa: y, ype_pct: 1.5 + 0.3 * z(), rm_mpa: rm,
      ag_pct: 16 + 1.5 * z(), agt_pct: 16.2 + 1.5 * z(), a_pct: 26 + 2 * z(), yt_ratio: y / rm, n_value: 0.2 + 0.015 * z(), k_mpa: 800 + 30 * z(),
      yield_mpa: y, yield_definition: 'rp0.2', shape_class: 'continuous', flags: [], given: false, failure: null, orientation: null, temperature_c: 20,
      shape: 'round', test_pk: i + 1, settings_hash: 'bench',
    });
  }
  return rows;
}
