/**
 * The valid part of a group's median and characteristic curves (grid points 0 … L), made
 * non-decreasing and started at their yields:
 *
 *  - median: least-squares isotonic regression of the pointwise medians (pool-adjacent-violators,
 *    weights = curves per point). The median is a central estimate, not a bound: the least-squares
 *    non-decreasing fit stays central, where a running minimum would pull it low;
 *  - characteristic: the largest non-decreasing curve at or below the lower band (running minimum
 *    from the right, `non-decreasing-below.ts`), so that no point is lifted above the band;
 *  - each curve starts at its yield (common practice for nonlinear analysis input: the first
 *    point of a plastic curve is the yield) and, for the median and a pointwise band, is held at or
 *    above it — the only rule that can put the characteristic curve above its band, reported as
 *    `yield_above_curve` where it reaches past 0.5 % plastic strain. A simultaneous band is not
 *    lifted: it starts at the smaller of the yield and its own first value (`yield_above_band`).
 *  - the characteristic curve is then held at or below the median (`above_median`).
 * Min/max of non-decreasing sequences stay non-decreasing, so the order of the rules keeps it.
 *
 * Units: MPa, mm/mm. In: the grid's valid part, curves per point, pointwise medians, the band, the
 * yields (`null`: no start rule for that curve). Out: both curves, the characteristic curve's start,
 * warnings.
 */
import { isotonicNonDecreasing } from '@fractile/stats';
import { largestNonDecreasingBelow } from './non-decreasing-below.ts';
import type { BandKind } from './types.ts';

/** Plastic strain beyond which holding the curve at the characteristic yield is reported (mm/mm). */
const YIELD_LIFT_WARN = 0.005;
/** Relative gap by which a characteristic yield below the curve's own start is reported. */
const YIELD_BELOW_WARN = 0.02;

export interface ValidPart {
  median: number[];
  characteristic: number[];
  warnings: string[];
}

/** First point at the yield, every later point at or above it. */
function startAt(curve: number[], y: number | null): number[] {
  return y === null ? curve : curve.map((v, i) => (i === 0 ? y : Math.max(v, y)));
}

export function validPart(x: readonly number[], counts: readonly number[], medians: readonly number[], band: readonly number[], kind: BandKind, charYield: number, medYield: number | null): ValidPart {
  const warnings: string[] = [];
  const med = startAt(Array.from(isotonicNonDecreasing(medians, counts)), medYield);
  const below = largestNonDecreasingBelow([...band]);
  let started: number[];
  if (kind === 'pointwise') {
    started = startAt(below, charYield);
    let liftedTo = -1;
    for (let i = 1; i < below.length; i++) if (below[i] < charYield) liftedTo = i;
    if (liftedTo >= 0 && x[liftedTo] - x[0] > YIELD_LIFT_WARN) {
      warnings.push(`yield_above_curve: the characteristic yield ${charYield.toFixed(1)} MPa lies above the curves’ own bound up to plastic strain ${x[liftedTo]}; the curve is held at the yield there`);
    }
  } else {
    started = [...below];
    if (charYield < started[0]) started[0] = charYield;
    else if (charYield > started[0]) {
      warnings.push(`yield_above_band: the characteristic yield ${charYield.toFixed(1)} MPa lies above the simultaneous band’s start (${started[0].toFixed(1)} MPa); the curve starts at the band`);
    }
  }
  if (charYield < band[0] * (1 - YIELD_BELOW_WARN)) {
    warnings.push(`yield_below_curve: the characteristic yield ${charYield.toFixed(1)} MPa lies more than ${YIELD_BELOW_WARN * 100} % below the curves’ own bound at the start (${band[0].toFixed(1)} MPa)`);
  }
  let clamped = false;
  const characteristic = started.map((v, i) => {
    if (v > med[i]) {
      clamped = true;
      return med[i];
    }
    return v;
  });
  if (clamped) warnings.push('above_median: the bound came out above the median at some points and was held at the median');
  return { median: med, characteristic, warnings };
}
