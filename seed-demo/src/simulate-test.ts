/**
 * One simulated tensile test: the hardening law of one specimen drawn from its grade's
 * population (given the strength the population model assigned it), the noise-free engineering
 * curve with its exact properties, and — on request — the recorded channels.
 *
 * Per-test scatter (invented magnitudes, chosen to look like mill data): modulus normal with the
 * grade's CoV; for the plateau steel ReH/ReL uniform 1.03–1.07, Lüders extension 1–2.5 %,
 * Swift n ≈ N(0.18, 0.008²), Rm/ReL ≈ N(1.33, 0.02²); for the high-strength steel the
 * Ramberg–Osgood exponent m ≈ N(15, 1) (n = 1/m ≈ 0.067); for the aluminium alloy Voce
 * Q ≈ N(85, 6²) MPa, b ≈ N(18, 1.2²).
 */
import type { HardeningLaw } from './hardening-laws.ts';
import { swiftEps0ForRatio } from './hardening-laws.ts';
import type { EngineeringCurve, NeckingSpec } from './engineering-curve.ts';
import { buildEngineeringCurve } from './engineering-curve.ts';
import type { MachineSetup, Signal, SpecimenSetup } from './curve-signal.ts';
import { synthesizeSignal } from './curve-signal.ts';
import type { GradeDef } from './scenario.ts';
import type { Rng } from './random.ts';

export interface LawDraw {
  law: HardeningLaw;
  necking: NeckingSpec;
}

/**
 * Draws a specimen's law. `strengthMpa` is the population model's defining stress (ReL for the
 * plateau steel, σ0 otherwise) before drift; `yieldShiftMpa` is added to it. For the plateau
 * steel Rm = strength·(Rm/ReL ratio) + `tensileShiftMpa`, so a drift can move tensile less than
 * yield; for the other laws tensile follows the law.
 */
export function drawLaw(grade: GradeDef, strengthMpa: number, yieldShiftMpa: number, tensileShiftMpa: number, rng: Rng): LawDraw {
  const E = grade.modulusMpa * (1 + grade.modulusCov * rng.normal());
  switch (grade.law) {
    case 'plateau-swift': {
      const rel = strengthMpa + yieldShiftMpa;
      const reh = rel * rng.uniform(1.03, 1.07);
      const luders = rng.uniform(0.01, 0.025);
      const serration = rng.uniform(0.003, 0.006);
      const n = rng.gauss(0.18, 0.008);
      const rmTarget = strengthMpa * rng.gauss(1.33, 0.02) + tensileShiftMpa;
      const eEnd = reh / E + luders;
      const sigTL = rel * (1 + eEnd);
      const epsPL = Math.log1p(eEnd) - sigTL / E;
      const eps0 = swiftEps0ForRatio(n, rmTarget / rel, eEnd, epsPL) ?? 0.05;
      const k = sigTL / Math.pow(eps0, n);
      return {
        law: { kind: 'plateau-swift', modulusMpa: E, rehMpa: reh, relMpa: rel, ludersStrain: luders, serrationAmplitude: serration, kMpa: k, n, eps0, epsPlateauEnd: epsPL },
        necking: { fractureStressRatio: rng.uniform(0.68, 0.8), totalElongationRatio: rng.uniform(1.35, 1.9), exponent: rng.uniform(1.8, 2.6) },
      };
    }
    case 'ramberg-osgood':
      return {
        law: { kind: 'ramberg-osgood', modulusMpa: E, sigma0Mpa: strengthMpa + yieldShiftMpa, m: rng.gauss(15, 1) },
        necking: { fractureStressRatio: rng.uniform(0.75, 0.88), totalElongationRatio: rng.uniform(1.7, 2.1), exponent: rng.uniform(1.6, 2.2) },
      };
    case 'voce':
      return {
        law: { kind: 'voce', modulusMpa: E, sigma0Mpa: strengthMpa + yieldShiftMpa, qMpa: rng.gauss(85, 6), b: rng.gauss(18, 1.2) },
        necking: { fractureStressRatio: rng.uniform(0.8, 0.9), totalElongationRatio: rng.uniform(1.4, 1.8), exponent: rng.uniform(1.8, 2.4) },
      };
  }
}

/** Engineering strain for an unload–reload loop early in the plastic range. */
export function loopStrain(draw: LawDraw, curve: EngineeringCurve): number {
  const law = draw.law;
  if (law.kind === 'plateau-swift') return law.rehMpa / law.modulusMpa + law.ludersStrain + 0.01;
  return curve.truth.rp02Mpa / law.modulusMpa + 0.002 + 0.008;
}

/** Draws a machine and extensometer setup for a specimen of parallel length Lc. */
export function drawMachine(parallelLengthMm: number, rng: Rng): MachineSetup {
  return {
    complianceMmPerKn: rng.uniform(0.004, 0.009),
    crossheadRateMmPerS: parallelLengthMm * rng.uniform(0.002, 0.004),
    slackMm: rng.uniform(0.1, 0.4),
    seatingMm: rng.uniform(0.002, 0.008),
    forceNoiseFraction: rng.uniform(0.0005, 0.0012),
    extensionResolutionMm: 0.0005,
    extensionNoiseMm: 0.0003,
  };
}

export interface SimulatedTest {
  draw: LawDraw;
  curve: EngineeringCurve;
  signal: Signal | null;
  loopAtStrain: number | null;
  extensometerRemovedAtStrain: number | null;
}

export function simulateTest(
  grade: GradeDef,
  strengthMpa: number,
  yieldShiftMpa: number,
  tensileShiftMpa: number,
  specimen: SpecimenSetup,
  opts: { withSignal: boolean; points: number; loop: boolean; removeExtensometer: boolean },
  rng: Rng,
): SimulatedTest {
  const draw = drawLaw(grade, strengthMpa, yieldShiftMpa, tensileShiftMpa, rng);
  const curve = buildEngineeringCurve(draw.law, draw.necking);
  if (!opts.withSignal) return { draw, curve, signal: null, loopAtStrain: null, extensometerRemovedAtStrain: null };
  const loopAt = opts.loop ? loopStrain(draw, curve) : null;
  const removedAt = opts.removeExtensometer ? rng.uniform(0.6, 0.95) * (curve.truth.agtPct / 100) : null;
  const machine = drawMachine(specimen.parallelLengthMm, rng);
  const signal = synthesizeSignal(curve, specimen, machine, { points: opts.points, loopAtStrain: loopAt, extensometerRemovedAtStrain: removedAt, anchorStrain: curve.truth.rehStrain }, rng);
  return { draw, curve, signal, loopAtStrain: loopAt, extensometerRemovedAtStrain: removedAt };
}
