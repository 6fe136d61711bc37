/**
 * Tensile strength and elongations (ISO 6892-1): Rm = maximum force / S0; Agt = total extension
 * at maximum force; Ag = Agt − Rm/E (plastic extension at maximum force); A (from the curve) =
 * plastic extension at fracture = e_f − σ_f/E; At = total extension at fracture.
 *
 * The strain at maximum force is the vertex of a least-squares parabola through the contiguous
 * points within 3× the noise of the maximum, trimmed to be symmetric in strain (a flat top makes the single highest point a poor
 * estimate with noise); the highest point's strain when the noise is below 0.01 % of Rm, when
 * fewer than 5 points qualify or the parabola is not concave with its vertex inside them. The parabola is solved by hand
 * (3×3 normal equations).
 *
 * Fracture is the last point before the final drop: the last point after maximum force that
 * stands more than 10 % of Rm above everything after it, stepped back over a drop spread across a
 * few samples. Without such a drop the last point is taken (flag `fracture_not_detected`).
 *
 * In: engineering strain (mm/mm, toe-compensated) and stress (MPa), E (MPa), noise (MPa).
 * Out: indices and values in mm/mm and MPa.
 */
export interface TensileResult {
  maxIndex: number;
  rmMpa: number;
  /** total strain at maximum force, mm/mm */
  uniformStrain: number;
  fractureIndex: number;
  fractureDetected: boolean;
  fractureStrain: number;
  fractureStressMpa: number;
}

export function indexOfMax(stressMpa: ArrayLike<number>, from = 0, to = stressMpa.length): number {
  let im = from;
  for (let i = from + 1; i < to; i++) if (stressMpa[i] > stressMpa[im]) im = i;
  return im;
}

/** Strain at the vertex of a parabola through the top of the curve around `imax`. */
export function strainAtMaximum(strain: ArrayLike<number>, stressMpa: ArrayLike<number>, imax: number, noiseMpa: number, to = stressMpa.length): number {
  const rm = stressMpa[imax];
  if (3 * noiseMpa <= 1e-4 * rm) return strain[imax]; // noise below resolution: the highest point is best
  // the top of a 15-point moving average (noise / √15), then the points within 2× noise of it
  const W = 7;
  const mean = (j: number): number => {
    const lo = Math.max(0, j - W), hi = Math.min(to - 1, j + W);
    let s = 0;
    for (let k = lo; k <= hi; k++) s += stressMpa[k];
    return s / (hi - lo + 1);
  };
  let jm = imax, best = -Infinity;
  const from = Math.max(0, imax - 20 * W), until = Math.min(to - 1, imax + 20 * W);
  for (let j = from; j <= until; j++) { const m = mean(j); if (m > best) { best = m; jm = j; } }
  let a = jm, b = jm;
  while (a > 0 && mean(a - 1) >= best - 2 * noiseMpa) a--;
  while (b < to - 1 && mean(b + 1) >= best - 2 * noiseMpa) b++;
  // symmetric in strain about the top, so that a steeper side does not pull the vertex
  const x0 = strain[jm];
  const w = Math.min(x0 - strain[a], strain[b] - x0);
  while (a < jm && strain[a] < x0 - w) a++;
  while (b > jm && strain[b] > x0 + w) b--;
  if (b - a + 1 < 5) return strain[imax];
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0, t0 = 0, t1 = 0, t2 = 0;
  for (let i = a; i <= b; i++) {
    const x = strain[i] - x0, y = stressMpa[i] - rm, x2 = x * x;
    s0 += 1; s1 += x; s2 += x2; s3 += x2 * x; s4 += x2 * x2; t0 += y; t1 += x * y; t2 += x2 * y;
  }
  // solve [s0 s1 s2; s1 s2 s3; s2 s3 s4]·[c0 c1 c2] = [t0 t1 t2] by Cramer's rule
  const det = s0 * (s2 * s4 - s3 * s3) - s1 * (s1 * s4 - s3 * s2) + s2 * (s1 * s3 - s2 * s2);
  if (!(Math.abs(det) > 0)) return strain[imax];
  const c1 = (s0 * (t1 * s4 - s3 * t2) - t0 * (s1 * s4 - s3 * s2) + s2 * (s1 * t2 - t1 * s2)) / det;
  const c2 = (s0 * (s2 * t2 - t1 * s3) - s1 * (s1 * t2 - t1 * s2) + t0 * (s1 * s3 - s2 * s2)) / det;
  if (!(c2 < 0)) return x0;
  const xv = x0 - c1 / (2 * c2);
  return xv >= strain[a] && xv <= strain[b] ? xv : x0;
}

export function findFracture(stressMpa: ArrayLike<number>, imax: number): { index: number; detected: boolean } {
  const n = stressMpa.length;
  const rm = stressMpa[imax];
  let sufMax = -Infinity;
  let f = -1;
  for (let i = n - 2; i >= imax; i--) {
    if (stressMpa[i + 1] > sufMax) sufMax = stressMpa[i + 1];
    if (stressMpa[i] - sufMax > 0.1 * rm) { f = i; break; }
  }
  if (f < 0) return { index: n - 1, detected: false };
  while (f - 1 >= imax && stressMpa[f - 1] - stressMpa[f] > 0.05 * rm) f--;
  return { index: f, detected: true };
}

export function tensileValues(strain: ArrayLike<number>, stressMpa: ArrayLike<number>, noiseMpa: number): TensileResult {
  const maxIndex = indexOfMax(stressMpa);
  const fr = findFracture(stressMpa, maxIndex);
  const ef = strain[fr.index];
  const eu = Math.min(strainAtMaximum(strain, stressMpa, maxIndex, noiseMpa, fr.index + 1), ef);
  return {
    maxIndex, rmMpa: stressMpa[maxIndex], uniformStrain: eu,
    fractureIndex: fr.index, fractureDetected: fr.detected, fractureStrain: ef, fractureStressMpa: stressMpa[fr.index],
  };
}
