/**
 * Moving ranges of span 2 and their constants, Montgomery, "Introduction to Statistical Quality
 * Control", control charts for individual measurements: σ̂ = MR̄/d2 with d2 = 1.128, and the
 * moving-range chart's upper limit D4·MR̄ with D4 = 3.267 (both for ranges of 2 values).
 * Values in any unit; the first moving range is null.
 */
export const MR_D2 = 1.128;
export const MR_D4 = 3.267;

/** Moving ranges |x_i − x_{i−1}|; the first is null. */
export function movingRanges(values: ArrayLike<number>): (number | null)[] {
  const out: (number | null)[] = new Array(values.length);
  for (let i = 0; i < values.length; i++) out[i] = i === 0 ? null : Math.abs(values[i] - values[i - 1]);
  return out;
}
