/**
 * Seeded pseudorandom numbers for simulations (average run lengths) and bootstraps: the 32-bit
 * Mersenne Twister (Matsumoto & Nishimura 1998) for uniforms and the Box–Muller transform (Box &
 * Muller 1958) for standard normals, both from @stdlib. The same seed gives the same stream.
 */
import mt19937 from '@stdlib/random-base-mt19937';
import boxMuller from '@stdlib/random-base-box-muller';

export interface MonitorRandom {
  /** Uniform on [0, 1). */
  uniform(): number;
  /** Standard normal N(0, 1). */
  normal(): number;
  /** Integer uniform on 0 … n−1 (n < 2^32). */
  index(n: number): number;
}

/** A generator from an integer seed in 1 … 2^32−1 (other values are folded into that range). */
export function createMonitorRandom(seed: number): MonitorRandom {
  const s = ((Math.floor(Math.abs(seed)) % 4294967295) + 4294967295) % 4294967295 || 1;
  const u = mt19937.factory({ seed: s });
  // The factory's generator also has `normalized()` (53-bit doubles on [0, 1)), which its type
  // declarations omit; fall back to the 32-bit integers / 2^32 if it is ever absent.
  const normalized = (u as unknown as { normalized?: () => number }).normalized;
  const uniform = typeof normalized === 'function' ? (): number => normalized() : (): number => u() / 4294967296;
  const normal = boxMuller.factory({ prng: uniform });
  return {
    uniform,
    normal: () => normal(),
    // One 32-bit draw per index (the 53-bit uniform takes two); bias ≤ n/2^32, negligible.
    index: (n: number) => Math.min(n - 1, Math.floor((u() / 4294967296) * n)),
  };
}
