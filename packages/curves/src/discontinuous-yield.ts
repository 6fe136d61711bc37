/**
 * Discontinuous yielding (ISO 6892-1): upper yield strength ReH (the stress at the first peak
 * before the first decrease in force), lower yield strength ReL (the lowest stress during
 * plastic yielding, ignoring any initial transient effect) and the yield-point extension (from
 * the start of yielding to the start of uniform work hardening).
 *
 * Detection (our own rule, O(points)): a running-maximum point p is the yield point when, over
 * the next 0.3 % strain, the stress never rises more than a tolerance (0.3 % of σp or 4× the
 * noise) above σp, and either (a) its 5-point average falls at least max(0.5 % σp, 8× noise)
 * below σp, with the mean over the span at least half that below — an upper yield point — or
 * (b) stays flat for at least 0.5 % strain and afterwards rises again (5-point averages) at least twice the tolerance over
 * 0.3 % strain, with a slope at least twice the slope across the flat part — which a
 * continuously (concavely) hardening curve cannot do. The search stops at
 * maximum force, so a curve whose upper yield is its maximum force counts as continuous.
 *
 * Plateau band (ours): from the lower quantiles of the stress after the first minimum, which the
 * rising end does not reach — base = 25 % quantile, width = 3.75 × (25 % − 5 % quantile), at
 * least the tolerance — with three rounds of trimming the rising end. The plateau ends at the
 * last point inside the band; uniform work hardening starts where a line through the first
 * rising points meets the band's middle level (a tangent construction).
 *
 * Transient: the descent from ReH to the first minimum and the recovery up to the band base (the
 * first minimum is ignored unless it is the only one, as ISO 6892-1 says of the initial
 * transient; the recovery rule is ours). ReL is the lowest value of a 5-point moving average
 * (raw values for noise below 0.1 % of ReH) between the transient and the end of the plateau.
 *
 * With noise above 0.01 % of Rm the search runs on a 7-point moving average (thresholds scaled
 * to its noise); ReH is then the highest recorded stress within 7 points of the found peak.
 *
 * In: engineering strain (mm/mm), stress (MPa), the index of maximum force, the noise (MPa).
 * Out: indices and values, or null when the curve yields continuously.
 */
export interface DiscontinuousYield {
  rehIndex: number;
  rehMpa: number;
  relIndex: number;
  relMpa: number;
  /** index of the last point of the yield-point plateau */
  plateauEndIndex: number;
  /** strain where uniform work hardening starts (same origin as the input strain) */
  plateauEndStrain: number;
  /** yield-point extension, mm/mm */
  ypeStrain: number;
  kind: 'upper_yield_point' | 'flat_plateau';
}

const SPAN = 0.003;
/** least length of a plateau without an upper yield point */
const FLAT_SPAN = 0.005;

/** sorts in place; returns the 5 % and 25 % quantiles (lower order statistics) */
function lowerQuantiles(values: Float64Array): [number, number] {
  values.sort();
  const at = (q: number) => values[Math.floor((values.length - 1) * q)];
  return [at(0.05), at(0.25)];
}

/** mean of the five points around j, clipped to [lo, hi] */
function avg5(stressMpa: ArrayLike<number>, j: number, lo: number, hi: number): number {
  const a = Math.max(lo, j - 2), b = Math.min(hi, j + 2);
  let s = 0;
  for (let k = a; k <= b; k++) s += stressMpa[k];
  return s / (b - a + 1);
}

const SMOOTH = 7;

export function findDiscontinuousYield(strain: ArrayLike<number>, rawStressMpa: ArrayLike<number>, imax: number, rawNoiseMpa: number): DiscontinuousYield | null {
  const rm = rawStressMpa[imax];
  // with noise, the search runs on a 7-point moving average (noise / √7)
  let stressMpa: ArrayLike<number> = rawStressMpa;
  let noiseMpa = rawNoiseMpa;
  if (rawNoiseMpa > 1e-4 * rm) {
    const sm = new Float64Array(imax + 1);
    const h = SMOOTH >> 1;
    for (let i = 0; i <= imax; i++) {
      const a = Math.max(0, i - h), b = Math.min(imax, i + h);
      let sum = 0;
      for (let k = a; k <= b; k++) sum += rawStressMpa[k];
      sm[i] = sum / (b - a + 1);
    }
    stressMpa = sm;
    noiseMpa = rawNoiseMpa / Math.sqrt(SMOOTH);
  }
  const found = searchYieldPoint(strain, stressMpa, imax, noiseMpa);
  if (!found || stressMpa === rawStressMpa) return found;
  // ReH is the highest recorded stress at the peak
  let top = found.rehIndex;
  for (let k = Math.max(0, found.rehIndex - SMOOTH); k <= Math.min(imax, found.rehIndex + SMOOTH); k++) if (rawStressMpa[k] > rawStressMpa[top]) top = k;
  return { ...found, rehIndex: top, rehMpa: rawStressMpa[top], relMpa: Math.min(found.relMpa, rawStressMpa[top]), ypeStrain: Math.max(0, found.plateauEndStrain - strain[top]) };
}

function searchYieldPoint(strain: ArrayLike<number>, stressMpa: ArrayLike<number>, imax: number, noiseMpa: number): DiscontinuousYield | null {
  const rm = stressMpa[imax];
  let runMax = -Infinity;
  for (let p = 0; p < imax; p++) {
    const sp = stressMpa[p];
    if (sp <= runMax) continue;
    runMax = sp;
    if (sp < 0.2 * rm) continue;
    const tol = Math.max(0.003 * sp, 4 * noiseMpa);
    const drop = Math.max(0.005 * sp, 8 * noiseMpa);
    let j = p + 1;
    let sum = 0;
    let failed = false;
    while (j <= imax && strain[j] <= strain[p] + SPAN) {
      if (stressMpa[j] > sp + tol) { failed = true; break; }
      sum += stressMpa[j];
      j++;
    }
    if (failed || j > imax || j === p + 1) continue;
    const mean = sum / (j - p - 1);
    let minAvg = sp;
    for (let k = p + 1; k < j; k++) { const a = avg5(stressMpa, k, p + 1, imax); if (a < minAvg) minAvg = a; }
    let kind: DiscontinuousYield['kind'];
    if (minAvg <= sp - drop && mean <= sp - drop / 2) kind = 'upper_yield_point';
    else {
      let q = j;
      while (q <= imax && stressMpa[q] <= sp + tol) q++;
      if (q > imax || strain[q] - strain[p] < FLAT_SPAN) continue;
      let r = q;
      while (r <= imax && strain[r] < strain[q] + SPAN) r++;
      if (r > imax) continue;
      // concavity check: the slope after the flat part must be at least twice the slope across it
      const sq = avg5(stressMpa, q, p, imax);
      const rise = avg5(stressMpa, r, p, imax) - sq;
      const slopeFlat = (sq - avg5(stressMpa, Math.min(p + 2, q), p, imax)) / Math.max(strain[q] - strain[p], 1e-12);
      const slopeAfter = rise / Math.max(strain[r] - strain[q], 1e-12);
      if (rise < 2 * tol || slopeAfter < 2 * Math.max(0, slopeFlat)) continue;
      kind = 'flat_plateau';
    }
    // ReH: the top of the peak, before the stress first falls by the drop threshold
    let top = p;
    for (let k = p + 1; k < j && stressMpa[k] >= sp - drop; k++) if (stressMpa[k] > stressMpa[top]) top = k;
    return describePlateau(strain, stressMpa, top, imax, Math.max(0.003 * stressMpa[top], 4 * noiseMpa), noiseMpa, kind);
  }
  return null;
}

function describePlateau(strain: ArrayLike<number>, stressMpa: ArrayLike<number>, p: number, imax: number, tol: number, noiseMpa: number, kind: DiscontinuousYield['kind']): DiscontinuousYield {
  const sp = stressMpa[p];
  let q = p + 1;
  while (q < imax && stressMpa[q] <= sp + tol) q++;
  // first local minimum after the peak (hysteresis against noise)
  const h = Math.max(3 * noiseMpa, 0.002 * sp);
  let t = p + 1;
  for (let j = p + 1; j < q; j++) {
    if (stressMpa[j] < stressMpa[t]) t = j;
    else if (stressMpa[j] > stressMpa[t] + h) break;
  }
  // plateau band from the lower quantiles of (t, end), which the rising end does not reach:
  // base = 25 % quantile, band width = 3.75 × (25 % − 5 % quantile) (the full width of a uniform
  // serration, about ±3σ of normal noise), at least the tolerance; three rounds of trimming the
  // rising end at one band above the band
  let end = q;
  let base = stressMpa[t];
  let spread = tol;
  for (let round = 0; round < 3 && end - t > 2; round++) {
    const vals = Float64Array.from({ length: end - t - 1 }, (_, k) => stressMpa[t + 1 + k]);
    const [q05, q25] = lowerQuantiles(vals);
    base = q25;
    spread = Math.max(tol, 3.75 * (q25 - q05));
    let e = t + 1;
    while (e < end && stressMpa[e] <= base + 2 * spread) e++;
    if (e === end) break;
    end = e;
  }
  const top = base + spread;
  const level = base + spread / 3;
  let plateauEnd = t;
  for (let j = end - 1; j > t; j--) if (stressMpa[j] <= top) { plateauEnd = j; break; }
  // start of work hardening: the line through the first rising points (above the plateau band, up
  // to 4 bands higher) meets the plateau level; without such points, the last plateau point
  let endStrain = strain[plateauEnd];
  {
    let k = plateauEnd + 1;
    while (k < imax && stressMpa[k] <= top) k++;
    let m = 0, sx = 0, sy = 0, sxx = 0, sxy = 0;
    for (let j = k; j <= imax && stressMpa[j] <= top + 4 * spread; j++) {
      const x = strain[j], y = stressMpa[j];
      m++; sx += x; sy += y; sxx += x * x; sxy += x * y;
    }
    const v = sxx - (sx * sx) / m;
    if (m >= 3 && v > 0) {
      const a = (sxy - (sx * sy) / m) / v;
      const b = (sy - a * sx) / m;
      if (a > 0) endStrain = Math.min(strain[plateauEnd], Math.max(strain[p], (level - b) / a));
    }
  }
  // end of the transient: recovery up to the plateau level
  let trEnd = t + 1;
  while (trEnd <= plateauEnd && stressMpa[trEnd] < base) trEnd++;
  const smooth = noiseMpa > 1e-3 * sp;
  const at = (j: number): number => {
    if (!smooth) return stressMpa[j];
    const a = Math.max(p + 1, j - 2), b = Math.min(imax, j + 2);
    let s = 0;
    for (let k = a; k <= b; k++) s += stressMpa[k];
    return s / (b - a + 1);
  };
  let relIndex = t;
  let rel = at(t);
  if (trEnd <= plateauEnd) {
    rel = Infinity;
    for (let j = trEnd; j <= plateauEnd; j++) { const v = at(j); if (v < rel) { rel = v; relIndex = j; } }
  }
  if (rel > sp) { rel = sp; relIndex = p; } // a flat plateau sampled by a few points: ReL = ReH
  return {
    rehIndex: p, rehMpa: sp, relIndex, relMpa: rel, plateauEndIndex: plateauEnd, plateauEndStrain: endStrain,
    ypeStrain: Math.max(0, endStrain - strain[p]), kind,
  };
}
