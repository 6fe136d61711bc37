/**
 * Seeded pseudo-random numbers for the demo scenario, so that the same seed gives byte-identical
 * files.
 *
 * - uniform: xoshiro128** (Blackman & Vigna, "Scrambled linear pseudorandom number generators",
 *   ACM TOMS 47(4), 2021), 32-bit state words seeded through splitmix32;
 * - normal: Box–Muller transform (Box & Muller, Ann. Math. Statist. 29:610–611, 1958), the
 *   second variate of each pair cached.
 *
 * Written by hand: it is a dozen lines, and the generator must never read the clock or
 * `Math.random`. Degenerate input: any seed (including 0 and non-integers, truncated to 32 bits)
 * gives a valid non-zero state.
 */

/** splitmix32 step: a well-mixed 32-bit value from a 32-bit counter. */
function splitmix32(x: number): number {
  x = (x + 0x9e3779b9) | 0;
  let z = x;
  z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
  z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
  return (z ^ (z >>> 16)) >>> 0;
}

/** Mixes a seed with a stream number (for independent per-test streams). */
export function mixSeed(seed: number, stream: number): number {
  return splitmix32((splitmix32(seed >>> 0) ^ Math.imul(stream >>> 0, 0x27d4eb2d)) >>> 0);
}

export class Rng {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;
  private spare: number | null = null;

  constructor(seed: number) {
    let x = seed >>> 0;
    const next = (): number => {
      x = (x + 0x9e3779b9) >>> 0;
      return splitmix32(x);
    };
    this.s0 = next();
    this.s1 = next();
    this.s2 = next();
    this.s3 = next();
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1;
  }

  /** Next raw 32-bit unsigned integer (xoshiro128**). */
  nextUint32(): number {
    const result = Math.imul(rotl(Math.imul(this.s1, 5), 7), 9) >>> 0;
    const t = this.s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
    return result;
  }

  /** Uniform on the open interval (0, 1). */
  next(): number {
    return (this.nextUint32() + 0.5) / 4294967296;
  }

  uniform(lo: number, hi: number): number {
    return lo + (hi - lo) * this.next();
  }

  /** Integer uniform on lo..hi inclusive. */
  int(lo: number, hi: number): number {
    return lo + Math.floor(this.next() * (hi - lo + 1));
  }

  /** Standard normal variate (Box–Muller). */
  normal(): number {
    if (this.spare !== null) {
      const s = this.spare;
      this.spare = null;
      return s;
    }
    const u1 = this.next();
    const u2 = this.next();
    const r = Math.sqrt(-2 * Math.log(u1));
    this.spare = r * Math.sin(2 * Math.PI * u2);
    return r * Math.cos(2 * Math.PI * u2);
  }

  /** Normal with mean and standard deviation. */
  gauss(mean: number, sd: number): number {
    return mean + sd * this.normal();
  }

  pick<T>(items: readonly T[]): T {
    return items[Math.floor(this.next() * items.length)];
  }

  chance(p: number): boolean {
    return this.next() < p;
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}
