/**
 * Engineering stress and strain from the recorded channels (ISO 6892-1: stress = F/S0,
 * strain = ΔL/L0), in MPa and mm/mm.
 *
 * Stress: the given engineering stress if present, else force / S0. Strain: the given strain if
 * present, else extensometer extension / L0, else crosshead travel / L0 (flagged by the caller:
 * a crosshead strain includes the machine's own compliance).
 *
 * Rows where stress or strain is not finite are dropped (counted in `droppedPoints`). When the
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
  /** rows left out because a value was not finite */
  droppedPoints: number;
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

  let fullMax = -Infinity;
  for (let i = 0; i < n; i++) {
    const s = stressSrc[i] * stressScale;
    if (Number.isFinite(s) && s > fullMax) fullMax = s;
  }

  const removedAt = strainSource === 'crosshead' ? -1 : findStrainChannelStop(strainSrc, stressSrc, fullMax / stressScale);
  const end = removedAt >= 0 ? removedAt : n;

  let count = 0;
  for (let i = 0; i < end; i++) if (Number.isFinite(stressSrc[i]) && Number.isFinite(strainSrc[i])) count++;
  if (count < MIN_POINTS) return { ok: false, code: 'too_short', message: `only ${count} usable points (at least ${MIN_POINTS} needed)` };
  const strain = new Float64Array(count);
  const stressMpa = new Float64Array(count);
  let k = 0;
  for (let i = 0; i < end; i++) {
    const s = stressSrc[i], e = strainSrc[i];
    if (Number.isFinite(s) && Number.isFinite(e)) { stressMpa[k] = s * stressScale; strain[k] = e * strainScale; k++; }
  }
  return {
    ok: true,
    curve: { strain, stressMpa, strainSource, fullRecordMaxStressMpa: fullMax, extensometerRemovedAt: removedAt, droppedPoints: end - count },
  };
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
