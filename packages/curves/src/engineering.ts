/**
 * Engineering stress and strain from the recorded channels (ISO 6892-1: stress = F/S0,
 * strain = ΔL/L0), in MPa and mm/mm.
 *
 * Stress: the given engineering stress if present, else force / S0. Strain: the given strain if
 * present, else extensometer extension / L0, else crosshead travel / L0 (flagged by the caller:
 * a crosshead strain includes the machine's own compliance).
 *
 * Rows where stress or strain is not finite, where the strain is at or below −1, or where one
 * channel has an isolated glitch (a single point far off both neighbours) are dropped (counted in
 * `droppedPoints`, glitches also in `spikes`). When the
 * extension (or given strain) channel stops before the force does — blank or frozen while the
 * specimen is still loaded — the curve is cut where it stopped (`extensometerRemovedAt`), and
 * `fullRecordMaxStressMpa` keeps the maximum of the whole force record for Rm.
 *
 * Degenerate input returns a failure value: `no_channels`, `missing_geometry`,
 * `channel_length_mismatch`, `too_short` (fewer than 20 usable points).
 */
import type { CurveInput } from './types.ts';

export type StrainSource = 'extensometer' | 'crosshead' | 'given';

export interface EngineeringCurve {
  strain: Float64Array;
  stressMpa: Float64Array;
  strainSource: StrainSource;
  /** maximum engineering stress of the whole record, including points after the extensometer stopped */
  fullRecordMaxStressMpa: number;
  /** index in the recorded channels where the strain channel stopped, or −1 */
  extensometerRemovedAt: number;
  /** rows left out: a value not finite, a strain at or below −1, or an isolated glitch */
  droppedPoints: number;
  /** rows left out as isolated glitches (see markSpikes) */
  spikes: number;
}

export type EngineeringOutcome = { ok: true; curve: EngineeringCurve } | { ok: false; code: string; message: string };

export const MIN_POINTS = 20;

const present = (a: Float64Array | null | undefined): a is Float64Array => a != null && a.length > 0;
const positive = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v) && v > 0;

export function engineeringCurve(input: CurveInput): EngineeringOutcome {
  // stress channel
  let stressSrc: Float64Array;
  let stressScale = 1;
  if (present(input.stressMpa)) stressSrc = input.stressMpa;
  else if (present(input.forceN)) {
    if (!positive(input.areaMm2)) return { ok: false, code: 'missing_geometry', message: 'force channel given but the cross-section S0 is missing or not positive' };
    stressSrc = input.forceN;
    stressScale = 1 / input.areaMm2;
  } else return { ok: false, code: 'no_channels', message: 'the record has neither a force nor a stress channel' };

  // strain channel
  let strainSrc: Float64Array;
  let strainScale = 1;
  let strainSource: StrainSource;
  if (present(input.strain)) { strainSrc = input.strain; strainSource = 'given'; }
  else if (present(input.extensionMm) || present(input.crossheadMm)) {
    if (!positive(input.gaugeLengthMm)) return { ok: false, code: 'missing_geometry', message: 'extension channel given but the gauge length L0 is missing or not positive' };
    strainScale = 1 / input.gaugeLengthMm;
    if (present(input.extensionMm)) { strainSrc = input.extensionMm; strainSource = 'extensometer'; }
    else { strainSrc = input.crossheadMm!; strainSource = 'crosshead'; }
  } else return { ok: false, code: 'no_channels', message: 'the record has neither an extension (or crosshead) nor a strain channel' };

  const n = stressSrc.length;
  if (strainSrc.length !== n) return { ok: false, code: 'channel_length_mismatch', message: `stress channel has ${n} values, strain channel ${strainSrc.length}` };

  // glitches in the force channel first, so that the maximum of the record is not one of them
  const spikes = new Uint8Array(n);
  let nSpikes = markSpikes(stressSrc, n, spikes);
  let fullMax = -Infinity;
  for (let i = 0; i < n; i++) {
    const s = stressSrc[i] * stressScale;
    if (spikes[i] === 0 && Number.isFinite(s) && s > fullMax) fullMax = s;
  }

  const removedAt = strainSource === 'crosshead' ? -1 : findStrainChannelStop(strainSrc, stressSrc, fullMax / stressScale);
  const end = removedAt >= 0 ? removedAt : n;
  nSpikes += markSpikes(strainSrc, end, spikes);
  for (let i = end; i < n; i++) if (spikes[i]) nSpikes--;
  const usable = (i: number): boolean => spikes[i] === 0 && Number.isFinite(stressSrc[i]) && Number.isFinite(strainSrc[i]) && strainSrc[i] * strainScale > -1;
  let count = 0;
  for (let i = 0; i < end; i++) if (usable(i)) count++;
  if (count < MIN_POINTS) return { ok: false, code: 'too_short', message: `only ${count} usable points (at least ${MIN_POINTS} needed)` };
  const strain = new Float64Array(count);
  const stressMpa = new Float64Array(count);
  let k = 0;
  for (let i = 0; i < end; i++) {
    if (usable(i)) { stressMpa[k] = stressSrc[i] * stressScale; strain[k] = strainSrc[i] * strainScale; k++; }
  }
  return {
    ok: true,
    curve: { strain, stressMpa, strainSource, fullRecordMaxStressMpa: fullMax, extensometerRemovedAt: removedAt, droppedPoints: end - count, spikes: nSpikes },
  };
}

/** Median of five numbers without allocating (three-level selection). */
function median5(a: number, b: number, c: number, d: number, e: number): number {
  // sort the pairs (a, b), (c, d); the smaller of the two minima has three values above it and is
  // below the median: drop it, pair its partner with e, repeat; the median is then min(c, e)
  let t: number;
  if (a > b) { t = a; a = b; b = t; }
  if (c > d) { t = c; c = d; d = t; }
  if (a > c) { t = a; a = c; c = t; t = b; b = d; d = t; }
  if (b > e) { t = b; b = e; e = t; }
  if (b > c) { t = b; b = c; c = t; t = e; e = d; d = t; }
  return Math.min(c, e);
}

/**
 * Marks isolated glitches: a point further than max(20× the mean step, 25 % of the largest
 * magnitude) from both neighbours, on the same side, and from the median of its five-point
 * neighbourhood. Steps such as the fracture drop or a yield drop have the neighbourhood median on
 * one side and are not marked. The scale is recomputed without the marked points until nothing
 * new is found (at most 4 rounds), so a huge glitch does not hide a smaller one. Returns the
 * number of newly marked points. Our rule.
 */
function markSpikes(v: ArrayLike<number>, end: number, marks: Uint8Array): number {
  if (end < 5) return 0;
  let total = 0;
  for (let round = 0; round < 4; round++) {
    let big = 0, step = 0, m = 0, prev = NaN;
    for (let i = 0; i < end; i++) {
      const x = v[i];
      if (marks[i] || !Number.isFinite(x)) continue;
      const ax = x < 0 ? -x : x;
      if (ax > big) big = ax;
      if (!Number.isNaN(prev)) { step += Math.abs(x - prev); m++; }
      prev = x;
    }
    if (m === 0) return total;
    const thr = Math.max((20 * step) / m, 0.25 * big);
    let found = 0;
    for (let i = 2; i < end - 2; i++) {
      if (marks[i]) continue;
      const x = v[i], da = x - v[i - 1], db = x - v[i + 1];
      if (!(da > thr && db > thr) && !(da < -thr && db < -thr)) continue;
      const med = median5(v[i - 2], v[i - 1], x, v[i + 1], v[i + 2]);
      if (Number.isFinite(med) && Math.abs(x - med) > thr) { marks[i] = 1; found++; }
    }
    total += found;
    if (found === 0) break;
  }
  return total;
}

/**
 * Where the strain channel stops while the specimen is still loaded: the start of a trailing run
 * of blank values, or of at least 5 identical values, that holds at least 5 points loaded above
 * 30 % of the maximum force. −1 when the channel runs to the end (a channel that freezes only
 * after the fracture drop is not "removed").
 */
export function findStrainChannelStop(strainSrc: ArrayLike<number>, stressSrc: ArrayLike<number>, maxStressRaw: number): number {
  const n = strainSrc.length;
  if (n < 2 || !(maxStressRaw > 0)) return -1;
  // trailing blanks
  let i = n;
  while (i > 0 && !Number.isFinite(strainSrc[i - 1])) i--;
  let start = i;
  if (start === n) {
    // trailing frozen run
    const last = strainSrc[n - 1];
    let j = n - 1;
    while (j > 0 && strainSrc[j - 1] === last) j--;
    if (n - j < 5) return -1;
    start = j + 1; // the first repeated value is still a valid reading
  }
  if (start >= n) return -1;
  let loaded = 0;
  for (let j = start; j < n; j++) if (Number.isFinite(stressSrc[j]) && stressSrc[j] >= 0.3 * maxStressRaw) loaded++;
  return loaded >= 5 ? start : -1;
}
