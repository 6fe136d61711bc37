/**
 * The second runtime the toolkit is meant for: the CLI's TypeScript sources run unchanged under
 * Deno 2 (the `deno` package of the npm registry ships its binary). On a few generated tests,
 * `ingest`, `reduce` and `stats` under Deno give what the same commands give under Node on a
 * second folder — the per-test properties and the statistics agree to 1e-9 relative (both
 * runtimes are V8; the last digit may differ where a math function's implementation does).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateDemo, type DemoManifest } from '@fractile/seed-demo';

const root = fileURLToPath(new URL('..', import.meta.url));
const denoBin = join(createRequire(import.meta.url).resolve('deno/package.json'), '..', 'bin.cjs');
const nodeBin = join(root, 'packages/cli/bin/fractile.js');
const dir = mkdtempSync(join(tmpdir(), 'fractile-deno-'));
let demo: DemoManifest;

type Run = { status: number | null; stdout: string; stderr: string };
function run(runtime: 'deno' | 'node', args: string[]): Run {
  const argv = runtime === 'deno'
    ? [denoBin, 'run', '-A', '--no-lock', join(root, 'packages/cli/src/main.ts'), ...args]
    : [nodeBin, ...args];
  const r = spawnSync(process.execPath, argv, {
    encoding: 'utf8', cwd: dir, maxBuffer: 1 << 26,
    env: { ...process.env, DATABASE_URL: '', DENO_NO_UPDATE_CHECK: '1', DENO_DIR: join(dir, 'deno-cache') },
  });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** Values that name the run rather than the result: ids, times, paths, versions of the runtime. */
const VOLATILE = /^(run|run_id|runs|created_at|started_at|finished_at|generated_at|at|database|db|path|file|source_file|elapsed|seconds|runtime|node|provenance)$/;

let compared = 0;
function expectSame(a: unknown, b: unknown, where: string): void {
  if (typeof a === 'number' && typeof b === 'number') {
    compared++;
    const tol = 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
    if (!(Math.abs(a - b) <= tol || (Number.isNaN(a) && Number.isNaN(b)))) expect(b, where).toBe(a);
    return;
  }
  if (Array.isArray(a) && Array.isArray(b)) {
    expect(b.length, where).toBe(a.length);
    a.forEach((x, i) => expectSame(x, b[i], `${where}[${i}]`));
    return;
  }
  if (a && b && typeof a === 'object' && typeof b === 'object') {
    const ka = Object.keys(a).filter((k) => !VOLATILE.test(k)).sort();
    const kb = Object.keys(b).filter((k) => !VOLATILE.test(k)).sort();
    expect(kb, where).toEqual(ka);
    for (const k of ka) expectSame((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${where}.${k}`);
    return;
  }
  expect(b, where).toEqual(a);
}

beforeAll(() => {
  demo = generateDemo({ outDir: join(dir, 'scenario'), tests: 24, seed: 5, pointsPerCurve: 400 });
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('the CLI under Deno 2', () => {
  it('ingests, reduces and summarizes as under Node', () => {
    const manifests = demo.manifests.filter((m) => m.role === 'data' && !m.map).map((m) => join(dir, 'scenario', m.path));
    const out: Record<string, { properties: unknown; stats: unknown }> = {};
    for (const runtime of ['deno', 'node'] as const) {
      const db = join(dir, `db-${runtime}`);
      const ingest = run(runtime, ['ingest', ...manifests, '--db', db]);
      expect(ingest.status, `${runtime} ingest: ${ingest.stderr}`).toBe(0);
      const reduce = run(runtime, ['reduce', '--db', db]);
      expect(reduce.status, `${runtime} reduce: ${reduce.stderr}`).toBe(0);
      const properties = run(runtime, ['properties', '--db', db, '--format', 'json']);
      expect(properties.status, `${runtime} properties: ${properties.stderr}`).toBe(0);
      const stats = run(runtime, ['stats', '--db', db, '--format', 'json']);
      expect(stats.status, `${runtime} stats: ${stats.stderr}`).toBe(0);
      out[runtime] = { properties: JSON.parse(properties.stdout), stats: JSON.parse(stats.stdout) };
    }
    expect(JSON.stringify(out.node.properties).length).toBeGreaterThan(1000);
    expectSame(out.node.properties, out.deno.properties, 'properties');
    const perTest = compared;
    expectSame(out.node.stats, out.deno.stats, 'stats');
    // not a comparison of empty shells: every test's properties and every group's statistics
    expect(perTest).toBeGreaterThan(24 * 10);
    expect(compared - perTest).toBeGreaterThan(100);
    console.log(`Deno and Node agree on ${perTest} per-test numbers and ${compared - perTest} statistics`);
  }, 600_000);
});
