/**
 * Slip detection (our rule): a grip slip shows as a sudden force drop — more than
 * max(1 % Rm, 8× noise) within three samples — before maximum force and outside the yield-point
 * range; a knife-edge slip as the extension going back by more than 0.0005 with no force drop,
 * or jumping forward by more than max(0.005, 30× the mean step) in one sample.
 *
 * In: engineering strain, stress (MPa), the index of maximum force, noise (MPa), Rm, and an index
 * range to ignore (the yield-point plateau; [−1, −1] for none). Out: the number of slip events.
 */
export function countSlips(strain: ArrayLike<number>, stressMpa: ArrayLike<number>, maxIndex: number, noiseMpa: number, rmMpa: number, ignoreFrom: number, ignoreTo: number): number {
  const thr = Math.max(0.01 * rmMpa, 8 * noiseMpa);
  let meanStep = 0;
  for (let i = 1; i <= maxIndex; i++) meanStep += Math.abs(strain[i] - strain[i - 1]);
  meanStep /= Math.max(1, maxIndex);
  const jump = Math.max(0.005, 30 * meanStep);
  let events = 0;
  for (let i = 1; i <= maxIndex; i++) {
    if (ignoreFrom >= 0 && i + 2 >= ignoreFrom && i - 1 <= ignoreTo) continue;
    const de = strain[i] - strain[i - 1];
    let dropped = false;
    for (let k = 1; k <= 3 && i - 1 + k <= maxIndex; k++) {
      if (stressMpa[i - 1] - stressMpa[i - 1 + k] > thr) { dropped = true; break; }
    }
    if (dropped) { events++; i += 3; continue; }
    if ((de < -0.0005 && stressMpa[i] - stressMpa[i - 1] > -thr) || de > jump) events++;
  }
  return events;
}
