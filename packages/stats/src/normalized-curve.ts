/**
 * A test's true stress–plastic strain curve on its own normalized strain s = εp / εp,u ∈ [0, 1],
 * where εp,u is the test's uniform plastic strain (maximum force): the curve in log true stress at
 * `points` equally spaced values of s (s_j = j / (points − 1)), so that curves ending at different
 * uniform strains become vectors of one length (the registration of the curve model,
 * curve-model.ts; Ramsay & Silverman 2005, *Functional Data Analysis*, ch. 7, on putting curves of
 * different extent on one domain).
 *
 * ln σ is interpolated linearly between grid points. Between the last grid point with a stress
 * and εp,u (less than one grid step when εp,u lies inside the grid; more where the uniform strain
 * lies past the end of the grid) ln σ is continued along the slope of the last grid step; `gap`
 * says how far.
 *
 * In: the plastic-strain grid (strictly increasing, mm/mm), true stress on it (MPa; null beyond
 * the uniform strain), εp,u (mm/mm). Out: ln σ (σ in MPa) at each s and the gap (mm/mm).
 * Degenerate input → null: fewer than two leading finite stresses, a missing stress before the
 * last finite one, a stress ≤ 0, or εp,u not past the first grid point.
 */
export interface NormalizedCurve {
  logStress: Float64Array;
  /** plastic strain between the last grid point with a stress and the uniform strain (mm/mm) */
  gap: number;
}

export function normalizedLogCurve(grid: ArrayLike<number>, stressMpa: ArrayLike<number | null>, uniformPlasticStrain: number, points: number): NormalizedCurve | null {
  if (!(Number.isInteger(points) && points >= 2)) return null;
  let last = -1;
  for (let i = 0; i < Math.min(grid.length, stressMpa.length); i++) {
    const v = stressMpa[i];
    if (v === null || !Number.isFinite(v)) break;
    if (!(v > 0)) return null;
    last = i;
  }
  if (last < 1) return null;
  for (let i = last + 1; i < stressMpa.length; i++) {
    const v = stressMpa[i];
    if (v !== null && Number.isFinite(v)) return null;
  }
  const end = uniformPlasticStrain;
  if (!(Number.isFinite(end) && end > grid[0])) return null;
  const out = new Float64Array(points);
  let i = 0;
  for (let j = 0; j < points; j++) {
    const x = (j / (points - 1)) * end;
    while (i < last - 1 && grid[i + 1] < x) i++;
    // bracket [grid[i], grid[i+1]] (the last step when x lies beyond the last stress)
    const x0 = grid[i];
    const x1 = grid[i + 1];
    const y0 = Math.log(stressMpa[i] as number);
    const y1 = Math.log(stressMpa[i + 1] as number);
    out[j] = x <= x0 ? y0 : y0 + ((x - x0) / (x1 - x0)) * (y1 - y0);
  }
  return { logStress: out, gap: Math.max(0, end - grid[last]) };
}
