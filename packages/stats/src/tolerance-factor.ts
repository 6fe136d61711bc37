/**
 * One-sided normal tolerance factor k: with probability `confidence` (γ), at least a proportion
 * `coverage` (p) of a normal population lies above mean − k·s (and, by symmetry, below mean + k·s).
 *
 * Exact method of ISO 16269-6 (statistical tolerance intervals, one-sided, σ unknown) and the
 * NIST/SEMATECH e-Handbook of Statistical Methods, section 7.2.6.3:
 *
 *   k = t'_{γ}(ν = n − 1, δ = z_p·√n) / √n,
 *
 * with t' the noncentral t quantile (computed here, not read from a table). Factors are cached per
 * (n, p, γ), since the aggregate stage asks for the same few sizes many times.
 *
 * Dimensionless. Degenerate input: n < 2, or p, γ outside (0, 1) → NaN.
 */
import { normalQuantile } from './special/normal.ts';
import { noncentralTQuantile } from './special/noncentral-t.ts';

const cache = new Map<string, number>();

export function normalToleranceFactor(n: number, coverage: number, confidence: number): number {
  if (!Number.isInteger(n) || n < 2) return NaN;
  if (!(coverage > 0 && coverage < 1 && confidence > 0 && confidence < 1)) return NaN;
  const key = `${n}|${coverage}|${confidence}`;
  const hit = cache.get(key);
  if (hit !== undefined) return hit;
  const sqrtN = Math.sqrt(n);
  const k = noncentralTQuantile(confidence, n - 1, normalQuantile(coverage) * sqrtN) / sqrtN;
  if (cache.size > 10_000) cache.clear();
  cache.set(key, k);
  return k;
}
