import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { Rng, mixSeed } from './random.ts';

describe('seeded random numbers', () => {
  it('repeats for a seed, differs across seeds and streams', () => {
    const a = new Rng(123);
    const b = new Rng(123);
    const c = new Rng(124);
    const xa = Array.from({ length: 100 }, () => a.nextUint32());
    expect(Array.from({ length: 100 }, () => b.nextUint32())).toEqual(xa);
    expect(Array.from({ length: 100 }, () => c.nextUint32())).not.toEqual(xa);
    expect(mixSeed(1, 1)).not.toBe(mixSeed(1, 2));
    const z = new Rng(0);
    expect(new Set(Array.from({ length: 100 }, () => z.nextUint32())).size).toBe(100);
  });

  it('passes Kolmogorov–Smirnov tests against U(0,1) and N(0,1) (scipy.stats.kstest)', () => {
    const r = new Rng(2024);
    const u = Array.from({ length: 20000 }, () => r.next());
    const n = Array.from({ length: 20000 }, () => r.normal());
    expect(Math.min(...u)).toBeGreaterThan(0);
    expect(Math.max(...u)).toBeLessThan(1);
    const script = `
import json, sys
from scipy import stats
d = json.loads(sys.stdin.read())
print(json.dumps([stats.kstest(d['u'], 'uniform').pvalue, stats.kstest(d['n'], 'norm').pvalue]))
`;
    const [pu, pn] = JSON.parse(execFileSync('/usr/bin/python3', ['-c', script], { input: JSON.stringify({ u, n }) }).toString()) as number[];
    // a fixed seed: these p-values are fixed numbers; a broken generator gives p ≈ 0
    expect(pu).toBeGreaterThan(0.01);
    expect(pn).toBeGreaterThan(0.01);
  });
});
