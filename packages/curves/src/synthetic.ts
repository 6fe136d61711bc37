/**
 * Synthetic tensile records for tests and benchmarks (invented curves from exact laws; no real
 * data): Ramberg–Osgood, Hollomon and a mild-steel-like curve with an upper yield point, Lüders
 * plateau and Voce hardening. Each has an optional toe (slack at the start: the recorded strain
 * starts at 0 and joins the straight line, which meets zero stress at `toeStrain`), normal
 * noise on stress and strain from a seeded generator, a necking descent after maximum force and
 * a fracture drop. Sampling is dense in the elastic part (`elasticPoints`) and uniform in strain
 * after it.
 *
 * Out: a `CurveInput` with force (N) and extension (mm) for the given S0 and L0, or with stress
 * and strain when `asStress` is set; and the exact values it was built from.
 */
import type { CurveInput } from './types.ts';

/** Mulberry32 (a small, well-known 32-bit generator), uniform on [0, 1). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviates by the Box–Muller transform. */
export function seededNormal(seed: number): () => number {
  const u = seededRandom(seed);
  let spare: number | null = null;
  return () => {
    if (spare !== null) { const s = spare; spare = null; return s; }
    let a = u();
    while (a <= 1e-300) a = u();
    const b = u();
    const r = Math.sqrt(-2 * Math.log(a));
    spare = r * Math.sin(2 * Math.PI * b);
    return r * Math.cos(2 * Math.PI * b);
  };
}

export interface SyntheticCommon {
  eMpa?: number;
  points?: number;
  /** points used for the elastic part */
  elasticPoints?: number;
  noiseMpa?: number;
  strainNoise?: number;
  toeStrain?: number;
  /** stress up to which the toe lasts, MPa */
  toeStressMpa?: number;
  seed?: number;
  areaMm2?: number;
  gaugeLengthMm?: number;
  asStress?: boolean;
  /** engineering strain of the necking descent after maximum force */
  neckStrain?: number;
  /** fraction of Rm at fracture */
  fractureFraction?: number;
  /** engineering strains (before maximum force) at which an unload–reload loop is inserted:
   * elastic unloading to 10 % of the stress and reloading along the same line, 20 points each way */
  loopsAt?: number[];
}

export interface SyntheticCurve {
  input: CurveInput;
  /** exact (noise-free) engineering curve */
  strain: Float64Array;
  stressMpa: Float64Array;
  exact: Record<string, number>;
}

const DEF = { eMpa: 205_000, points: 2000, elasticPoints: 300, noiseMpa: 0, strainNoise: 0, toeStrain: 0, toeStressMpa: 30, seed: 1, areaMm2: 78.54, gaugeLengthMm: 50, neckStrain: 0.05, fractureFraction: 0.8 };

/**
 * Builds the record from an engineering curve given as stress of strain on [0, eMax] (the
 * monotone part up to maximum force at eU ≤ eMax), appends necking and fracture, adds toe and
 * noise.
 */
function build(c: SyntheticCommon, yieldStrain: number, eU: number, stressAt: (e: number) => number, exact: Record<string, number>, lawTail: boolean): SyntheticCurve {
  const o = { ...DEF, ...c };
  const rm = stressAt(eU);
  const strain: number[] = [];
  const stress: number[] = [];
  const nEl = o.elasticPoints;
  for (let i = 0; i < nEl; i++) { const e = (yieldStrain * i) / nEl; strain.push(e); stress.push(stressAt(e)); }
  const nPl = o.points - nEl - 3 - 40 * (o.loopsAt?.length ?? 0);
  const eEnd = eU + o.neckStrain;
  const loops = [...(o.loopsAt ?? [])].sort((a, b) => a - b);
  for (let i = 0; i <= nPl; i++) {
    const e = yieldStrain + ((eEnd - yieldStrain) * i) / nPl;
    if (loops.length > 0 && e >= loops[0] && e <= eU && strain.length > 0) {
      loops.shift();
      const e1 = strain[strain.length - 1], s1 = stress[stress.length - 1];
      for (let k = 1; k <= 40; k++) {
        const f = k <= 20 ? 1 - (0.9 * k) / 20 : 0.1 + (0.9 * (k - 20)) / 20;
        strain.push(e1 - ((1 - f) * s1) / o.eMpa);
        stress.push(f * s1);
      }
    }
    strain.push(e);
    if (e <= eU) stress.push(stressAt(e));
    else {
      // necking: a smooth descent from Rm (zero slope at eU) to fractureFraction·Rm; where the law
      // has its own maximum it continues, with a cubic necking term that starts gently
      const u = (e - eU) / o.neckStrain;
      stress.push(lawTail ? stressAt(e) * (1 - (1 - o.fractureFraction) * u * u * u) : rm * (1 - (1 - o.fractureFraction) * u * u));
    }
  }
  // fracture: the force falls to almost nothing in two samples
  const ef = strain[strain.length - 1];
  strain.push(ef + 1e-4, ef + 2e-4);
  stress.push(0.3 * o.fractureFraction * rm, 0.01 * rm);
  const n = strain.length;
  const exStrain = Float64Array.from(strain);
  const exStress = Float64Array.from(stress);
  const nrm = seededNormal(o.seed);
  const recStrain = new Float64Array(n);
  const recStress = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let e = strain[i];
    const s = stress[i];
    if (o.toeStrain > 0) {
      const u = Math.min(1, Math.max(0, s / o.toeStressMpa));
      e += o.toeStrain * (2 * u - u * u);
    }
    recStrain[i] = e + (o.strainNoise > 0 ? o.strainNoise * nrm() : 0);
    recStress[i] = s + (o.noiseMpa > 0 ? o.noiseMpa * nrm() : 0);
  }
  const input: CurveInput = o.asStress
    ? { stressMpa: recStress, strain: recStrain }
    : {
      forceN: recStress.map((s) => s * o.areaMm2),
      extensionMm: recStrain.map((e) => e * o.gaugeLengthMm),
      areaMm2: o.areaMm2,
      gaugeLengthMm: o.gaugeLengthMm,
    };
  return { input, strain: exStrain, stressMpa: exStress, exact: { ...exact, rm_mpa: rm, agt_strain: eU, fracture_strain: ef, e_mpa: o.eMpa, toe_strain: o.toeStrain } };
}

/** Solves a strictly increasing g(s) = target for s in [lo, hi] by bisection. */
function invert(g: (s: number) => number, target: number, lo: number, hi: number): number {
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (g(mid) < target) lo = mid; else hi = mid;
    if (hi - lo <= 1e-13 * Math.max(1, hi)) break;
  }
  return (lo + hi) / 2;
}

/**
 * Ramberg–Osgood e = σ/E + 0.002(σ/σ0)^m up to maximum force at strain `uniformStrain`
 * (Rp0.2 = σ0 exactly).
 */
export function rambergOsgoodCurve(o: SyntheticCommon & { sigma0Mpa: number; m: number; uniformStrain?: number }): SyntheticCurve {
  const e = o.eMpa ?? DEF.eMpa;
  const eU = o.uniformStrain ?? 0.12;
  const g = (s: number) => s / e + 0.002 * Math.pow(s / o.sigma0Mpa, o.m);
  const sMax = invert(g, eU, 0, eU * e);
  const stressAt = (x: number) => (x <= 0 ? x * e : invert(g, x, 0, Math.min(x * e, sMax * 1.0000001)));
  const yieldStrain = o.sigma0Mpa / e + 0.002 * 0.5;
  return build(o, Math.min(yieldStrain, (0.8 * o.sigma0Mpa) / e), eU, stressAt, { rp02_mpa: o.sigma0Mpa, m: o.m }, false);
}

/**
 * Hollomon σt = K·εt^n, elastic σt = E·εt below the intersection, as an engineering record
 * (σe = σt·e^(−εt), e = e^εt − 1). Maximum force at εt = n (Considère): Rm = K·n^n·e^(−n),
 * Agt = e^n − 1.
 */
export function hollomonCurve(o: SyntheticCommon & { kMpa: number; n: number }): SyntheticCurve {
  const E = o.eMpa ?? DEF.eMpa;
  const epsY = Math.pow(o.kMpa / E, 1 / (1 - o.n));
  const trueAt = (et: number) => (et <= epsY ? E * et : o.kMpa * Math.pow(et, o.n));
  const stressAt = (x: number) => { const et = Math.log1p(x); return trueAt(et) * Math.exp(-et); };
  const eU = Math.expm1(o.n);
  return build(o, Math.expm1(epsY) * 0.9, eU, stressAt, {
    k_mpa: o.kMpa, n: o.n, rm_exact_mpa: o.kMpa * Math.pow(o.n, o.n) * Math.exp(-o.n), agt_exact_pct: 100 * Math.expm1(o.n),
  }, true);
}

/**
 * Mild-steel-like curve: linear to ReH, a sharp drop to ReL − undershoot (the initial
 * transient), a Lüders plateau of length `ypeStrain` with saw-tooth serrations between ReL and
 * ReL + serration, then Voce hardening in true stress from the plateau end, σt = σL + Q(1 −
 * exp(−b(εt − εL))), whose maximum force follows from the law.
 */
export function plateauCurve(o: SyntheticCommon & { rehMpa: number; relMpa: number; ypeStrain: number; undershootMpa?: number; serrationMpa?: number; qMpa?: number; b?: number }): SyntheticCurve {
  const E = o.eMpa ?? DEF.eMpa;
  const eH = o.rehMpa / E;
  const under = o.undershootMpa ?? 0;
  const serr = o.serrationMpa ?? 0;
  const dropStrain = 0.0004;
  const eL = eH + o.ypeStrain;
  const q = o.qMpa ?? 250;
  const b = o.b ?? 12;
  const etL = Math.log1p(eL);
  const sigL = o.relMpa * (1 + eL);
  const trueHard = (et: number) => sigL + q * (1 - Math.exp(-b * (et - etL)));
  const stressAt = (x: number): number => {
    if (x <= eH) return E * x;
    if (x <= eH + dropStrain) { // drop to the undershoot and back to ReL
      const u = (x - eH) / dropStrain;
      return u < 0.5 ? o.rehMpa + (o.relMpa - under - o.rehMpa) * (u / 0.5) : o.relMpa - under + under * ((u - 0.5) / 0.5);
    }
    if (x <= eL) { // Lüders plateau; ReH is reached exactly at the first plastic sample
      if (serr <= 0) return o.relMpa;
      const period = 0.002;
      const ph = ((x - eH - dropStrain) / period) % 1;
      return o.relMpa + serr * (ph < 0.5 ? 2 * ph : 2 - 2 * ph);
    }
    const et = Math.log1p(x);
    return trueHard(et) / (1 + x);
  };
  // maximum force: dσt/dεt = σt → Q·b·exp(−b(εt−εL)) = σL + Q(1 − exp(−b(εt−εL)))
  const ex = (sigL + q) / (q * b + q);
  const etU = etL - Math.log(ex) / b;
  const eU = Math.expm1(etU);
  return build(o, eH, eU, stressAt, { reh_mpa: o.rehMpa, rel_mpa: o.relMpa, ype_strain: o.ypeStrain, plateau_end_strain: eL }, true);
}

/**
 * Bilinear curve: linear elastic to σy, then linear hardening with slope H (engineering) up to
 * maximum force at `uniformStrain`, then necking and fracture.
 */
export function bilinearCurve(o: SyntheticCommon & { yieldMpa: number; hardeningMpa: number; uniformStrain?: number }): SyntheticCurve {
  const E = o.eMpa ?? DEF.eMpa;
  const ey = o.yieldMpa / E;
  const eU = o.uniformStrain ?? 0.1;
  const stressAt = (x: number) => (x <= ey ? E * x : o.yieldMpa + o.hardeningMpa * (x - ey));
  return build(o, ey, eU, stressAt, { yield_mpa: o.yieldMpa, hardening_mpa: o.hardeningMpa }, false);
}
