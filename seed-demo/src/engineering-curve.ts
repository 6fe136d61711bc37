/**
 * A noise-free engineering stress–strain curve (loading to fracture) built from a true-stress
 * hardening law, and the exact properties of that curve (the "truth" a reduction should recover).
 *
 * Up to maximum force the curve follows the law through the exact conversion of
 * ISO 6892-1 quantities under constant volume: e = exp(εt) − 1, σe = σt/(1 + e), with
 * εt = εp + σt/E. Maximum force is located on the curve (golden-section refinement between grid
 * points). After maximum force the specimen necks and the engineering stress falls, as an
 * invented but smooth form σe = Rm − (Rm − σf)·s^p, s = (e − eu)/(ef − eu), to fracture at the
 * total strain ef; true stress from this part is not valid (common practice).
 *
 * Units: stress MPa, strain mm/mm; returned percentages are percent. Degenerate laws (no maximum
 * force within εp ≤ 0.6) throw an Error with code `no_max_force` — the scenario never builds one.
 */
import type { HardeningLaw } from './hardening-laws.ts';
import { lawTrueStress } from './hardening-laws.ts';

export interface NeckingSpec {
  /** engineering stress at fracture over Rm */
  fractureStressRatio: number;
  /** total strain at fracture over total strain at maximum force (Agt) */
  totalElongationRatio: number;
  /** shape exponent p > 1 of the post-necking fall */
  exponent: number;
}

export interface CurveTruth {
  modulusMpa: number;
  rmMpa: number;
  /** total strain at maximum force, % (ISO 6892-1 Agt) */
  agtPct: number;
  /** plastic strain at maximum force, % (ISO 6892-1 Ag) */
  agPct: number;
  /** total strain at fracture, % (ISO 6892-1 At) */
  atPct: number;
  /** plastic elongation after fracture, % (ISO 6892-1 A) */
  aPct: number;
  rp02Mpa: number;
  rt05Mpa: number;
  rehMpa: number | null;
  /** the plateau level of the law (the mean of its serrations) */
  relMpa: number | null;
  /** the lowest stress on the plateau (ISO 6892-1 ReL: lowest stress during plastic yielding,
   *  the initial transient disregarded) */
  relMinMpa: number | null;
  /** engineering strain at the upper yield point */
  rehStrain: number | null;
  /** yield-point extension, % (ISO 6892-1 Ae) */
  ypePct: number | null;
  fractureStressMpa: number;
}

export interface EngineeringCurve {
  strain: Float64Array;
  stressMpa: Float64Array;
  /** index of the maximum-force point */
  iMax: number;
  truth: CurveTruth;
}

class Growable {
  e: number[] = [];
  s: number[] = [];
  push(e: number, s: number): void {
    this.e.push(e);
    this.s.push(s);
  }
}

function engFromTrue(epsP: number, sigT: number, modulusMpa: number): [number, number] {
  const epsT = epsP + sigT / modulusMpa;
  const e = Math.expm1(epsT);
  return [e, sigT / (1 + e)];
}

/** Appends the hardening branch from plastic strain p0 on, up to and including maximum force. */
function hardeningToMax(out: Growable, law: HardeningLaw, p0: number): void {
  const E = law.modulusMpa;
  const eng = (u: number): [number, number] => {
    const p = p0 + u;
    return engFromTrue(p, lawTrueStress(law, p), E);
  };
  const steps = 1200;
  const uMin = 1e-6;
  const uMax = 0.6;
  const ratio = Math.pow(uMax / uMin, 1 / (steps - 1));
  let prevU = 0;
  let prevS = -Infinity;
  let u = uMin;
  let prevPrevU = 0;
  for (let i = 0; i < steps; i++, u *= ratio) {
    const [e, s] = eng(u);
    if (s < prevS) {
      // the maximum lies in (prevPrevU, u): golden-section refinement on σe(u)
      let a = prevPrevU;
      let b = u;
      const g = (Math.sqrt(5) - 1) / 2;
      let c = b - g * (b - a);
      let d = a + g * (b - a);
      for (let k = 0; k < 60; k++) {
        if (eng(c)[1] > eng(d)[1]) b = d;
        else a = c;
        c = b - g * (b - a);
        d = a + g * (b - a);
      }
      const uStar = 0.5 * (a + b);
      if (uStar > prevU) {
        const [em, sm] = eng(uStar);
        out.push(em, sm);
      } else {
        // the refined maximum lies before the last pushed point: replace it
        const [em, sm] = eng(uStar);
        out.e[out.e.length - 1] = em;
        out.s[out.s.length - 1] = sm;
      }
      return;
    }
    out.push(e, s);
    prevPrevU = prevU;
    prevU = u;
    prevS = s;
  }
  throw Object.assign(new Error('no maximum force within the strain range of the law'), { code: 'no_max_force' });
}

/** Interpolates the stress where `key(e, s)` first reaches `target` on the loading branch. */
function crossing(strain: ArrayLike<number>, stress: ArrayLike<number>, upTo: number, key: (e: number, s: number) => number, target: number): number {
  let prev = key(strain[0], stress[0]);
  for (let i = 1; i <= upTo; i++) {
    const k = key(strain[i], stress[i]);
    if (k >= target) {
      const f = k === prev ? 1 : (target - prev) / (k - prev);
      return stress[i - 1] + f * (stress[i] - stress[i - 1]);
    }
    prev = k;
  }
  return NaN;
}

export function buildEngineeringCurve(law: HardeningLaw, necking: NeckingSpec): EngineeringCurve {
  const E = law.modulusMpa;
  const g = new Growable();
  let reh: number | null = null;
  let rel: number | null = null;
  let relMin: number | null = null;
  let rehStrain: number | null = null;
  let ype: number | null = null;
  if (law.kind === 'plateau-swift') {
    const nEl = 600;
    for (let i = 0; i <= nEl; i++) {
      const s = (law.rehMpa * i) / nEl;
      g.push(s / E, s);
    }
    const eH = law.rehMpa / E;
    const drop = 0.0015;
    for (let i = 1; i <= 40; i++) {
      const t = i / 40;
      g.push(eH + t * drop, law.relMpa + (law.rehMpa - law.relMpa) * (1 - t) * (1 - t));
    }
    const eEnd = eH + law.ludersStrain;
    const nPl = 400;
    relMin = law.relMpa;
    for (let i = 1; i <= nPl; i++) {
      const t = i / nPl;
      const e = eH + drop + t * (law.ludersStrain - drop);
      const serr = 0.7 * Math.sin(2 * Math.PI * 7 * t) + 0.3 * Math.sin(2 * Math.PI * 17 * t);
      const s = law.relMpa * (1 + law.serrationAmplitude * serr);
      relMin = Math.min(relMin, s);
      g.push(e, s);
    }
    hardeningToMax(g, law, law.epsPlateauEnd);
    reh = law.rehMpa;
    rel = law.relMpa;
    rehStrain = eH;
    ype = 100 * (eEnd - eH);
  } else {
    const sigStart = law.kind === 'voce' ? law.sigma0Mpa : law.sigma0Mpa * Math.pow(1e-6 / 0.002, 1 / law.m);
    const nEl = 600;
    // Ramberg–Osgood: the last elastic-range point would repeat the first hardening point
    const last = law.kind === 'voce' ? nEl : nEl - 1;
    for (let i = 0; i <= last; i++) {
      const s = (sigStart * i) / nEl;
      const epsP = law.kind === 'voce' ? 0 : 0.002 * Math.pow(s / law.sigma0Mpa, law.m);
      const [e, se] = engFromTrue(epsP, s, E);
      g.push(e, se);
    }
    hardeningToMax(g, law, 0);
  }
  const iMax = g.e.length - 1;
  const eu = g.e[iMax];
  const rm = g.s[iMax];
  const ef = necking.totalElongationRatio * eu;
  const sf = necking.fractureStressRatio * rm;
  const nNeck = 300;
  for (let i = 1; i <= nNeck; i++) {
    const t = i / nNeck;
    g.push(eu + t * (ef - eu), rm - (rm - sf) * Math.pow(t, necking.exponent));
  }
  const strain = Float64Array.from(g.e);
  const stressMpa = Float64Array.from(g.s);
  const rp02 = crossing(strain, stressMpa, iMax, (e, s) => e - s / E, 0.002);
  const rt05 = crossing(strain, stressMpa, iMax, (e) => e, 0.005);
  return {
    strain,
    stressMpa,
    iMax,
    truth: {
      modulusMpa: E,
      rmMpa: rm,
      agtPct: 100 * eu,
      agPct: 100 * (eu - rm / E),
      atPct: 100 * ef,
      aPct: 100 * (ef - sf / E),
      rp02Mpa: rp02,
      rt05Mpa: rt05,
      rehMpa: reh,
      relMpa: rel,
      relMinMpa: relMin,
      rehStrain,
      ypePct: ype,
      fractureStressMpa: sf,
    },
  };
}
