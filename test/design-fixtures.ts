/**
 * Shared fixtures of the design-stage checks: a seeded random source (mulberry32 with Box–Muller
 * normals), grids, populations built from exact hardening laws, and independent reference values
 * computed with SciPy (Debian's /usr/bin/python3, scipy.stats.nct for the tolerance factor).
 */
import { execFileSync } from 'node:child_process';
import type { TestGridCurve } from '../packages/pipeline/src/design/index.ts';

export { seededRandom as rng } from '@fractile/curves/testing';
import { seededRandom as rng } from '@fractile/curves/testing';

/** Hollomon in total true strain, σ = K(εp + σ/E)^n, solved for σ by bisection (law, exact). */
export function hollomonAtPlastic(k: number, n: number, eMpa: number, ep: number): number {
  let lo = 0;
  let hi = k * Math.pow(ep + 1, n);
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (k * Math.pow(ep + mid / eMpa, n) > mid) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

export function normals(seed: number, count: number, mean: number, sd: number): number[] {
  const u = rng(seed);
  const out: number[] = [];
  while (out.length < count) {
    const r = Math.sqrt(-2 * Math.log(1 - u()));
    const th = 2 * Math.PI * u();
    out.push(mean + sd * r * Math.cos(th));
    if (out.length < count) out.push(mean + sd * r * Math.sin(th));
  }
  return out;
}

/** Grid from `start` to `end` by `step`, each point computed by multiplication (no drift). */
export function grid(start: number, end: number, step: number): number[] {
  const n = Math.round((end - start) / step);
  return Array.from({ length: n + 1 }, (_, i) => Number((start + i * step).toPrecision(12)));
}

/** One test curve on the grid from a law, `null` past its uniform plastic strain. */
export function lawCurve(id: string, g: readonly number[], law: (ep: number) => number, uniform: number | null, yieldMpa: number | null, modulusGpa: number | null = 205): TestGridCurve {
  return {
    test_id: id,
    stress_mpa: g.map((e) => (uniform === null || e <= uniform + 1e-12 ? law(e) : null)),
    uniform_plastic_strain: uniform,
    modulus_gpa: modulusGpa,
    yield_mpa: yieldMpa,
  };
}

const PY = '/usr/bin/python3';

/**
 * Lower tolerance bound by SciPy: mean − k·s with k = nct.ppf(γ, n−1, z_p·√n)/√n
 * (ISO 16269-6; NIST/SEMATECH 7.2.6.3), on logarithms for the lognormal model.
 */
export function scipyLowerBound(values: readonly number[], coverage: number, confidence: number, model: 'normal' | 'lognormal' = 'normal'): { bound: number; k: number } {
  const script = `
import json, sys, numpy as np
from scipy import stats
d = json.load(sys.stdin)
x = np.array(d['x'], dtype=float)
if d['model'] == 'lognormal':
    x = np.log(x)
n = len(x)
k = stats.nct.ppf(d['g'], n - 1, stats.norm.ppf(d['p']) * np.sqrt(n)) / np.sqrt(n)
b = x.mean() - k * x.std(ddof=1)
if d['model'] == 'lognormal':
    b = np.exp(b)
print(json.dumps({'bound': float(b), 'k': float(k)}))
`;
  const out = execFileSync(PY, ['-c', script], { input: JSON.stringify({ x: values, p: coverage, g: confidence, model }), encoding: 'utf8' });
  return JSON.parse(out) as { bound: number; k: number };
}

/** SHA-256 by Python's hashlib of the sorted ids joined by "\n". */
export function pythonIdsSha256(ids: readonly string[]): string {
  const script = `
import json, sys, hashlib
ids = sorted(json.load(sys.stdin))
print(hashlib.sha256('\\n'.join(ids).encode('utf-8')).hexdigest())
`;
  return execFileSync(PY, ['-c', script], { input: JSON.stringify(ids), encoding: 'utf8' }).trim();
}

export const PROV = { code_version: '0.1.0-test', generated_at: '2026-03-14T09:30:00Z' };
