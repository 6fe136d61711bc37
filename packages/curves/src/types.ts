/**
 * Types of the per-test reduction: inputs in canonical units (N, mm, s, MPa, mm/mm, mm²), the
 * reduction settings, and the results. Percentages in `TestProperties` are percent; strains
 * elsewhere are mm/mm.
 */
export type Family = 'steel' | 'aluminium' | 'other';
/** The yield definitions a grade may name (ISO 6892-1: Rp, Rt, ReH, ReL); the single list of them. */
export const YIELD_DEFINITIONS = ['rp0.2', 'rt0.5', 'reh', 'rel'] as const;
export type YieldDefinition = (typeof YIELD_DEFINITIONS)[number];
export type ShapeClass = 'plateau' | 'continuous' | 'bilinear';

/** One test's channels in canonical units. A curve has force and extension (or crosshead), or stress and strain. */
export interface CurveInput {
  timeS?: Float64Array | null;
  forceN?: Float64Array | null;
  /** extensometer extension over the gauge length L0 */
  extensionMm?: Float64Array | null;
  crossheadMm?: Float64Array | null;
  /** engineering stress, when given instead of force */
  stressMpa?: Float64Array | null;
  /** engineering strain (mm/mm), when given instead of extension */
  strain?: Float64Array | null;
  areaMm2?: number | null;
  gaugeLengthMm?: number | null;
}

export interface ReduceSettings {
  family: Family;
  yieldDefinition: YieldDefinition;
  /** plastic extension for Rp, percent (0.2) */
  rpOffsetPct: number;
  /** total extension for Rt, percent (0.5) */
  rtTotalPct: number;
  /** modulus window as fractions of the first yield stress, [0.1, 0.4] */
  modulusWindow: [number, number];
  /** n-value window in engineering strain, percent, [10, 20] */
  nWindowPct: [number, number];
  /** common true plastic strain grid (mm/mm), increasing */
  gridPlasticStrain: number[];
  /** run the Hollomon / Swift / Voce / Ramberg–Osgood fits */
  fitLaws: boolean;
}

/**
 * Per-test property keys of the contract (percentages are percent); null where a value does not
 * apply. `rp02_mpa` is Rp at settings.rpOffsetPct and `rt05_mpa` Rt at settings.rtTotalPct
 * (0.2 % and 0.5 % by default); `yield_mpa` follows settings.yieldDefinition and is null (flag
 * `yield_definition_not_applicable`) when that definition does not exist on the curve.
 */
export interface TestProperties {
  modulus_gpa: number | null;
  rp02_mpa: number | null;
  rt05_mpa: number | null;
  reh_mpa: number | null;
  rel_mpa: number | null;
  ype_pct: number | null;
  rm_mpa: number | null;
  ag_pct: number | null;
  agt_pct: number | null;
  a_pct: number | null;
  yt_ratio: number | null;
  n_value: number | null;
  k_mpa: number | null;
  yield_mpa: number | null;
  yield_definition: YieldDefinition | null;
  shape_class: ShapeClass | null;
  /** names from FLAGS (flags.ts) */
  flags: string[];
}

export interface LawFit<P> {
  params: P;
  /** root-mean-square stress residual over the fitted points, MPa */
  rmseMpa: number;
  points: number;
}

export interface HollomonParams { k_mpa: number; n: number }
export interface SwiftParams { k_mpa: number; eps0: number; n: number }
export interface VoceParams { sigma0_mpa: number; q_mpa: number; b: number }
export interface RambergOsgoodParams { e_mpa: number; sigma0_mpa: number; m: number }

export interface LawFits {
  /** σt = K·εt^n (true stress on true strain) */
  hollomon: LawFit<HollomonParams> | null;
  /** σt = K·(ε0 + εp)^n (true stress on true plastic strain) */
  swift: LawFit<SwiftParams> | null;
  /** σt = σ0 + Q·(1 − exp(−b·εp)) */
  voce: LawFit<VoceParams> | null;
  /** e = σ/E + 0.002·(σ/σ0)^m (engineering) */
  ramberg_osgood: LawFit<RambergOsgoodParams> | null;
}

export interface TrueCurve {
  trueStrain: Float64Array;
  trueStressMpa: Float64Array;
  plasticStrain: Float64Array;
}

export interface ReduceResult {
  properties: TestProperties;
  /** JSON-serialisable detail of how the values were found (see reduce.ts for the keys) */
  details: Record<string, unknown>;
  /** true curve up to maximum force only */
  trueCurve: TrueCurve;
  /** true stress (MPa) on settings.gridPlasticStrain; null beyond the test's uniform plastic strain */
  grid: (number | null)[];
  /** null when settings.fitLaws is false */
  fits: LawFits | null;
}

export type ReduceOutcome = { ok: true; result: ReduceResult } | { ok: false; code: string; message: string };
