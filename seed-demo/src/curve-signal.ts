/**
 * The recorded channels of one simulated test: time, force, extensometer extension and
 * crosshead displacement, sampled at a constant crosshead rate from a noise-free engineering
 * curve (see engineering-curve.ts).
 *
 * What a real record carries and this adds (all invented magnitudes, common practice):
 * - crosshead = slack·(1 − exp(−F/Fs)) + compliance·F + e·Lc (machine slack gives the toe of the
 *   force–crosshead curve; Lc is the parallel length);
 * - extensometer seating: extension = e·L0 + δ0·(1 − exp(−F/Ft)), a small toe that has died out
 *   well below 10 % of the yield force;
 * - noise: force Gaussian with a standard deviation of a fraction of Fmax; extension Gaussian
 *   then quantized to the extensometer resolution;
 * - optional unload–reload loop along the initial elastic slope (with a thin hysteresis);
 * - optional extensometer removal: from a strain on, the extension channel holds its last value
 *   while force and crosshead go on;
 * - optional anchor: the sample nearest a given strain (the upper yield point) moves onto it,
 *   so that a sharp peak is recorded rather than missed between samples;
 * - fracture: two last points with the force fallen to a few percent.
 *
 * Units in and out: N, mm, s, MPa. Time rises strictly (the crosshead never stops).
 */
import type { EngineeringCurve } from './engineering-curve.ts';
import type { Rng } from './random.ts';

export interface SpecimenSetup {
  areaMm2: number;
  gaugeLengthMm: number;
  parallelLengthMm: number;
}

export interface MachineSetup {
  complianceMmPerKn: number;
  crossheadRateMmPerS: number;
  slackMm: number;
  seatingMm: number;
  /** standard deviation of the force noise over Fmax */
  forceNoiseFraction: number;
  extensionResolutionMm: number;
  extensionNoiseMm: number;
}

export interface SignalOptions {
  points: number;
  /** engineering strain at which to unload to 10 % and reload, or null */
  loopAtStrain: number | null;
  /** engineering strain from which the extension channel holds its value, or null */
  extensometerRemovedAtStrain: number | null;
  /** engineering strain of a point that must be sampled exactly (the upper yield point), or null */
  anchorStrain: number | null;
}

export interface Signal {
  timeS: Float64Array;
  forceN: Float64Array;
  extensionMm: Float64Array;
  crossheadMm: Float64Array;
  length: number;
}

const LOOP_STEPS = 40;

export function synthesizeSignal(curve: EngineeringCurve, spec: SpecimenSetup, mach: MachineSetup, opts: SignalOptions, rng: Rng): Signal {
  const { strain, stressMpa } = curve;
  const nd = strain.length;
  const S0 = spec.areaMm2;
  const L0 = spec.gaugeLengthMm;
  const Lc = spec.parallelLengthMm;
  const E = curve.truth.modulusMpa;
  const fMaxN = curve.truth.rmMpa * S0;
  const fSlack = 0.02 * fMaxN;
  const fSeat = 0.012 * fMaxN;
  const cmPerN = mach.complianceMmPerKn / 1000;
  // crosshead position along the dense curve, made non-decreasing (a force drop faster than the
  // machine can follow is skipped between samples, as on a real frame)
  const xd = new Float64Array(nd);
  let xMax = 0;
  for (let i = 0; i < nd; i++) {
    const F = stressMpa[i] * S0;
    const x = mach.slackMm * (1 - Math.exp(-F / fSlack)) + cmPerN * F + strain[i] * Lc;
    xMax = Math.max(xMax, x);
    xd[i] = xMax;
  }
  const nMain = Math.max(20, opts.points - (opts.loopAtStrain !== null ? 2 * LOOP_STEPS : 0) - 2);
  const cap = nMain + 2 * LOOP_STEPS + 2;
  const timeS = new Float64Array(cap);
  const forceN = new Float64Array(cap);
  const extensionMm = new Float64Array(cap);
  const crossheadMm = new Float64Array(cap);
  const xTotal = xd[nd - 1];
  const v = mach.crossheadRateMmPerS;
  const q = mach.extensionResolutionMm;
  const sdF = mach.forceNoiseFraction * fMaxN;
  const measureExt = (eTrue: number, F: number): number => {
    const raw = eTrue * L0 + mach.seatingMm * (1 - Math.exp(-Math.max(F, 0) / fSeat)) + mach.extensionNoiseMm * rng.normal();
    return Math.round(raw / q) * q;
  };
  const dxMain = xTotal / (nMain - 1);
  let kAnchor = -1;
  let xAnchor = 0;
  if (opts.anchorStrain !== null) {
    let ia = 0;
    while (ia < nd - 1 && strain[ia] < opts.anchorStrain) ia++;
    xAnchor = xd[ia];
    kAnchor = Math.round(xAnchor / dxMain);
  }
  let j = 0;
  let tOffset = 0;
  const xOffset = 0;
  let loopDone = opts.loopAtStrain === null;
  let frozenExt: number | null = null;
  let lastExt = 0;
  for (let k = 0; k < nMain; k++) {
    // the sample nearest the anchor moves onto it (by at most half a step: order is kept)
    const x = k === kAnchor ? xAnchor : (k * xTotal) / (nMain - 1);
    while (j < nd - 2 && xd[j + 1] < x) j++;
    const span = xd[j + 1] - xd[j];
    const f = span > 0 ? Math.min(1, Math.max(0, (x - xd[j]) / span)) : 1;
    const e = strain[j] + f * (strain[j + 1] - strain[j]);
    const F = (stressMpa[j] + f * (stressMpa[j + 1] - stressMpa[j])) * S0;
    let i = k + (loopDone && opts.loopAtStrain !== null ? 2 * LOOP_STEPS : 0);
    if (!loopDone && opts.loopAtStrain !== null && e >= opts.loopAtStrain) {
      // unload to 10 % of the force and reload along the elastic slope of the first loading
      const ext0 = measureExt(e, F);
      const fLow = 0.1 * F;
      const width = 0.004 * ((F - fLow) * L0) / (E * S0);
      let xPrev = x + xOffset;
      for (let s = 1; s <= 2 * LOOP_STEPS; s++) {
        const down = s <= LOOP_STEPS;
        // the reload ends just short of the loop's start so that time and crosshead keep moving
        const t = down ? s / LOOP_STEPS : (2 * LOOP_STEPS - s + 0.5) / LOOP_STEPS;
        const Fs = F - t * (F - fLow);
        const dF = F - Fs;
        const hyst = (down ? 1 : -1) * width * Math.sin(Math.PI * t);
        const xs = x + xOffset - dF * (cmPerN + Lc / (E * S0));
        tOffset += Math.abs(xs - xPrev) / v;
        xPrev = xs;
        const idx = k + s - 1;
        timeS[idx] = (x + xOffset) / v + tOffset;
        forceN[idx] = Fs + sdF * rng.normal();
        extensionMm[idx] = Math.round((ext0 - (dF * L0) / (E * S0) + hyst + mach.extensionNoiseMm * rng.normal()) / q) * q;
        crossheadMm[idx] = xs;
      }
      // the closing point of the loop
      tOffset += Math.abs(x + xOffset - xPrev) / v;
      loopDone = true;
      i = k + 2 * LOOP_STEPS;
    }
    timeS[i] = (x + xOffset) / v + tOffset;
    forceN[i] = F + sdF * rng.normal();
    let ext = measureExt(e, F);
    if (opts.extensometerRemovedAtStrain !== null && e >= opts.extensometerRemovedAtStrain) {
      if (frozenExt === null) frozenExt = lastExt;
      ext = frozenExt;
    }
    extensionMm[i] = ext;
    lastExt = ext;
    crossheadMm[i] = x + xOffset;
  }
  let len = nMain + (opts.loopAtStrain !== null && loopDone ? 2 * LOOP_STEPS : 0);
  // fracture: the force falls within two samples; the extension springs back elastically
  const dx = xTotal / (nMain - 1);
  const fLast = forceN[len - 1];
  const xLast = crossheadMm[len - 1];
  for (const [m, frac] of [
    [1, 0.06],
    [2, 0.004],
  ] as const) {
    const Fm = frac * fLast + 0.2 * sdF * rng.normal();
    timeS[len] = timeS[len - 1] + (0.25 * dx) / v;
    forceN[len] = Fm;
    const ext = frozenExt !== null ? frozenExt : extensionMm[len - 1] - ((forceN[len - 1] - Fm) * L0) / (E * S0);
    extensionMm[len] = Math.round(ext / q) * q;
    crossheadMm[len] = xLast + 0.25 * dx * m;
    len++;
  }
  return { timeS, forceN, extensionMm, crossheadMm, length: len };
}
