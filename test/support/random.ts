/**
 * Seeded uniform generator for the simulations in the checks: the curves package's mulberry32
 * moved half a step onto the open interval (0, 1), so that logarithms and quantiles of its draws
 * stay finite. (k + 0.5)/2³² is exact in double precision.
 */
import { seededRandom } from '@fractile/curves/testing';

export function mulberry32(seed: number): () => number {
  const u = seededRandom(seed);
  return () => u() + 2 ** -33;
}
