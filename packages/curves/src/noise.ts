/**
 * Stress noise estimate from second differences (common practice for white measurement noise:
 * for y_i = s_i + ε_i with a smooth s, the second difference has standard deviation √6·σ, and
 * E|N(0,1)| = √(2/π)). A second pass drops second differences above 5× the first mean, so that a
 * few sharp features (yield drop, loops, fracture) do not count as noise.
 *
 * In: stress (MPa), index range [from, to). Out: σ estimate in MPa; 0 for fewer than 3 points.
 */
const SCALE = Math.sqrt(6) * Math.sqrt(2 / Math.PI);

export function noiseSdMpa(stressMpa: ArrayLike<number>, from: number, to: number): number {
  if (to - from < 3) return 0;
  let sum = 0, n = 0;
  for (let i = from + 1; i < to - 1; i++) { sum += Math.abs(stressMpa[i + 1] - 2 * stressMpa[i] + stressMpa[i - 1]); n++; }
  const m1 = sum / n;
  if (m1 === 0) return 0;
  const cap = 5 * m1;
  sum = 0; n = 0;
  for (let i = from + 1; i < to - 1; i++) {
    const d = Math.abs(stressMpa[i + 1] - 2 * stressMpa[i] + stressMpa[i - 1]);
    if (d <= cap) { sum += d; n++; }
  }
  return n > 0 ? sum / n / SCALE : 0;
}
