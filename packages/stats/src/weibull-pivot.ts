/**
 * The pivotal quantities of the smallest-extreme-value maximum-likelihood estimates, simulated:
 * the basis of the exact Weibull tolerance limit (Thoman, Bain & Antle 1969, "Inferences on the
 * parameters of the Weibull distribution", Technometrics 11:445–460; Lawless 2003, *Statistical
 * Models and Methods for Lifetime Data*, §5.2.2).
 *
 * With y = ln x, a Weibull sample is a smallest-extreme-value sample with location u = ln λ and
 * scale b = 1/k. For the MLEs (û, b̂) of a complete sample of size n,
 *   Z₁ = (û − u)/b   and   Z₂ = b̂/b
 * have a joint distribution that depends on n only (not on u, b), so it is simulated once from the
 * standard law (u = 0, b = 1: ln of unit exponential draws) and serves every sample of that size.
 *
 * Random numbers: the 32-bit Mersenne Twister of @stdlib (`createMonitorRandom`), seeded with
 * `pivotSeed(n)`, so every run draws the same pivots. Output: `samples` pairs (Z₁, Z₂), in the order
 * drawn. Degenerate input: n < 2 or samples < 1 → empty arrays.
 */
import { createMonitorRandom } from './monitor/random.ts';
import { weibullMleFromLogs } from './weibull-mle.ts';

export interface WeibullPivots {
  n: number;
  /** (û − u)/b per simulated sample */
  z1: Float64Array;
  /** b̂/b per simulated sample */
  z2: Float64Array;
  seed: number;
}

/** The seed of the pivot simulation for samples of size n (one fixed stream per n). */
export function pivotSeed(n: number): number {
  return 20_260_000 + n;
}

export function simulateWeibullPivots(n: number, samples: number, seed = pivotSeed(n)): WeibullPivots {
  if (!(Number.isInteger(n) && n >= 2 && Number.isInteger(samples) && samples >= 1)) return { n, z1: new Float64Array(0), z2: new Float64Array(0), seed };
  const rng = createMonitorRandom(seed);
  const z1 = new Float64Array(samples);
  const z2 = new Float64Array(samples);
  const logs = new Float64Array(n);
  const work = new Float64Array(n);
  for (let s = 0; s < samples; s++) {
    let mle = null;
    while (mle === null) {
      for (let i = 0; i < n; i++) {
        let u = rng.uniform();
        while (u === 0) u = rng.uniform();
        // ln of a unit exponential draw: a standard smallest-extreme-value variate
        logs[i] = Math.log(-Math.log1p(-u));
      }
      mle = weibullMleFromLogs(logs, work);
    }
    z1[s] = mle.logScale;
    z2[s] = 1 / mle.shape;
  }
  return { n, z1, z2, seed };
}
