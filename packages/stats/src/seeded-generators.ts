/**
 * The seeded generators of the stats package: standard normal deviates by @stdlib's Box–Muller
 * transform and uniform deviates on [0, 1) and uniform integers from @stdlib's 32-bit Mersenne
 * Twister (Matsumoto & Nishimura 1998), both seeded from any whole number (folded into
 * 1 … 2³² − 2, as MT19937 takes). The same seed gives the same stream. `streamSeed` derives the
 * seed of a numbered sub-stream (for one parameter draw, one replicate), by the 32-bit
 * finalizer of MurmurHash3 (Appleby), so neighbouring streams do not overlap in their first draws.
 */
import boxMuller from '@stdlib/random-base-box-muller';
import mt19937 from '@stdlib/random-base-mt19937';

const M = 4294967295;

function fold(seed: number): number {
  return ((Math.floor(Math.abs(seed)) % M) + M) % M || 1;
}

export function normalStream(seed: number): () => number {
  return boxMuller.factory({ seed: fold(seed) });
}

export function uniformStream(seed: number): () => number {
  const next = mt19937.factory({ seed: fold(seed) });
  return () => next() / 4294967296;
}

/** Seed of sub-stream `index` of `seed`. */
export function streamSeed(seed: number, index: number): number {
  let h = (fold(seed) ^ Math.imul(index + 1, 0x9e3779b1)) >>> 0;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b) >>> 0;
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35) >>> 0;
  h ^= h >>> 16;
  return h >>> 0 || 1;
}
