/**
 * True stress on a common true plastic strain grid, for population curves.
 *
 * The curve is made monotone in plastic strain by keeping only points that advance the running
 * maximum of εp, and starts at εp = 0 with the proof strength at 0.01 % plastic strain
 * (the technical elastic limit, common practice). True stress is interpolated linearly; grid
 * values beyond the last (uniform) plastic strain are null, and so are negative grid values.
 *
 * In: the true curve (εp and σt up to maximum force), the index where εp first reaches 0.0001
 * and the stress there, the grid. Out: one value (MPa) or null per grid point.
 */
export function resampleOnGrid(
  plasticStrain: ArrayLike<number>, trueStressMpa: ArrayLike<number>, onsetIndex: number, onsetStressMpa: number,
  grid: ArrayLike<number>,
): (number | null)[] {
  const out: (number | null)[] = new Array(grid.length).fill(null);
  const n = plasticStrain.length;
  let prevX = 0, prevY = onsetStressMpa;
  let i = onsetIndex;
  for (let g = 0; g < grid.length; g++) {
    const x = grid[g];
    if (!(x >= 0)) continue;
    if (x === 0) { out[g] = onsetStressMpa; continue; }
    // advance to the first monotone point at or beyond x
    while (i < n && plasticStrain[i] < x) {
      if (plasticStrain[i] > prevX) { prevX = plasticStrain[i]; prevY = trueStressMpa[i]; }
      i++;
    }
    if (i >= n) break;
    const xi = plasticStrain[i], yi = trueStressMpa[i];
    out[g] = xi === prevX ? yi : prevY + ((x - prevX) / (xi - prevX)) * (yi - prevY);
  }
  return out;
}
