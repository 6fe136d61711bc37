/**
 * The invented demo scenario: one fabricator, four mills, three grades with our own labels and
 * specification limits. Every name, label, limit and population parameter here is invented for
 * the demo; none describes a real company or a published material designation.
 *
 * Population model per test (relative effects multiply the grade's mean):
 *   yield = mean · (1 + mill offset) · (1 + heat effect) · (1 + within-heat scatter) + drift
 * with heat effect ~ N(0, covHeat²) shared by the tests of one heat and within-heat scatter
 * ~ N(0, covWithin²); tensile follows through an Rm/yield ratio with its own scatter.
 */

import type { Family as CurvesFamily, YieldDefinition } from '@fractile/curves';

export const FABRICATOR = 'Brackenmoor Fabrication Ltd';
export const WINDOW_START = '2023-01-01';
export const WINDOW_END = '2025-12-31';

/** The families of the demo's grades (the toolkit also knows 'other'). */
export type Family = Exclude<CurvesFamily, 'other'>;
export type { YieldDefinition };

export interface SpecLimits {
  yield_min_mpa: number | null;
  yield_max_mpa: number | null;
  tensile_min_mpa: number | null;
  tensile_max_mpa: number | null;
  yt_max: number | null;
  elongation_min_pct: number | null;
}

export interface GradeDef {
  label: string;
  family: Family;
  yieldDefinition: YieldDefinition;
  law: 'plateau-swift' | 'ramberg-osgood' | 'voce';
  /** share of bar (round specimens); the rest is plate (flat specimens) */
  barShare: number;
  plateThicknessMm: readonly number[];
  barDiameterMm: readonly number[];
  modulusMpa: number;
  modulusCov: number;
  /** mean of the population's defining stress (ReL, σ0 of Ramberg–Osgood, σ0 of Voce), MPa */
  strengthMeanMpa: number;
  covHeat: number;
  covWithin: number;
  spec: SpecLimits;
  /** per-property statistical settings of the catalog (an invented prior V from the fabricator's older records) */
  properties?: Record<string, { prior_v?: number; headline_model?: string }>;
}

export const GRADES: readonly GradeDef[] = [
  {
    label: 'FX-360P',
    family: 'steel',
    yieldDefinition: 'reh',
    law: 'plateau-swift',
    barShare: 0.4,
    plateThicknessMm: [8, 10, 12, 15, 20, 25],
    barDiameterMm: [8, 10, 12.5, 14],
    modulusMpa: 205_000,
    modulusCov: 0.02,
    strengthMeanMpa: 400,
    covHeat: 0.03,
    covWithin: 0.035,
    spec: { yield_min_mpa: 360, yield_max_mpa: null, tensile_min_mpa: 460, tensile_max_mpa: 640, yt_max: 0.87, elongation_min_pct: 20 },
  },
  {
    label: 'FX-690Q',
    family: 'steel',
    yieldDefinition: 'rp0.2',
    law: 'ramberg-osgood',
    barShare: 0,
    plateThicknessMm: [8, 10, 12, 15, 20],
    barDiameterMm: [10],
    modulusMpa: 205_000,
    modulusCov: 0.02,
    strengthMeanMpa: 785,
    covHeat: 0.03,
    covWithin: 0.035,
    spec: { yield_min_mpa: 690, yield_max_mpa: null, tensile_min_mpa: 770, tensile_max_mpa: 1040, yt_max: 0.95, elongation_min_pct: 10 },
    properties: { yield_mpa: { prior_v: 0.05 } },
  },
  {
    label: 'FX-270A',
    family: 'aluminium',
    yieldDefinition: 'rp0.2',
    law: 'voce',
    barShare: 0.5,
    plateThicknessMm: [6, 8, 10, 12],
    barDiameterMm: [8, 10, 12.5],
    modulusMpa: 70_000,
    modulusCov: 0.015,
    strengthMeanMpa: 268,
    covHeat: 0.03,
    covWithin: 0.032,
    spec: { yield_min_mpa: 240, yield_max_mpa: null, tensile_min_mpa: 270, tensile_max_mpa: null, yt_max: null, elongation_min_pct: 8 },
  },
];

export type CurveLayout = 'kn-mm' | 'n-mm' | 'lbf-in' | 'stress-strain' | 'crosshead-only' | 'extensometer-removed' | 'foreign';

export interface MillDef {
  /** folder name */
  key: string;
  name: string;
  /** test-id and heat prefix */
  code: string;
  lab: string;
  /** relative strength offset of the mill */
  strengthOffset: number;
  /** shares of the total number of tests, per grade */
  grades: readonly { grade: string; share: number }[];
  /** force unit of the mill's own curves */
  forceUnit: 'kN' | 'N';
  /** a second lab of the mill writing lbf/in curves with inch geometry: its share of the mill's curve tests */
  imperial: { lab: string; share: number } | null;
  /** an outside lab writing its own curve dialect: its share of the mill's curve tests */
  foreign: { lab: string; code: string; share: number } | null;
}

export const MILLS: readonly MillDef[] = [
  {
    key: 'quarrowdale',
    name: 'Quarrowdale Steel',
    code: 'QDS',
    lab: 'QDS-Works',
    strengthOffset: 0.03,
    grades: [
      { grade: 'FX-360P', share: 0.16 },
      { grade: 'FX-690Q', share: 0.12 },
    ],
    forceUnit: 'kN',
    imperial: { lab: 'QDS-Westgate', share: 0.1 },
    foreign: null,
  },
  {
    key: 'marrisford',
    name: 'Marrisford Rolling',
    code: 'MRF',
    lab: 'MRF-Lab',
    strengthOffset: 0,
    grades: [
      { grade: 'FX-360P', share: 0.22 },
      { grade: 'FX-690Q', share: 0.08 },
    ],
    forceUnit: 'kN',
    imperial: null,
    foreign: null,
  },
  {
    key: 'eskerholm',
    name: 'Eskerholm Plate & Bar',
    code: 'ESK',
    lab: 'ESK-Lab',
    strengthOffset: -0.025,
    grades: [
      { grade: 'FX-360P', share: 0.16 },
      { grade: 'FX-690Q', share: 0.08 },
    ],
    forceUnit: 'kN',
    imperial: null,
    foreign: { lab: 'Fjellmark Provning', code: 'FJP', share: 0.25 },
  },
  {
    key: 'vantrell',
    name: 'Vantrell Light Alloys',
    code: 'VLA',
    lab: 'VLA-Lab',
    strengthOffset: 0.01,
    grades: [{ grade: 'FX-270A', share: 0.18 }],
    forceUnit: 'N',
    imperial: null,
    foreign: null,
  },
];

/** The mill and grade whose yield drifts down over the last 12 months of the window. */
export const DRIFT = {
  supplier: 'Marrisford Rolling',
  grade: 'FX-360P',
  /** the drift starts here and ramps linearly to the end of the window */
  from: '2025-01-01',
  /** yield shift at the end of the window, in units of the population's standard deviation */
  yieldShiftSd: -2.0,
  /** tensile shift over yield shift (MPa over MPa) */
  tensileFraction: 0.5,
} as const;

/** Share of summary-only records (older certificates) by year. */
export const SUMMARY_ONLY_SHARE: Readonly<Record<number, number>> = { 2023: 0.25, 2024: 0.08, 2025: 0.03 };

/**
 * Certificate values beside a curve: from this date, a share of each mill's curve tests also carry
 * the mill's own certificate values (yield, tensile, elongations), measured on a sister specimen
 * of the same heat, so they scatter about the curve's values (CoV `scatter`) and are rounded as
 * certificates are. One mill's certificates read high on yield by `yieldBiasMpa` — what the
 * curve-versus-certificate cross-check is there to show. Drawn from a random stream of their own,
 * so the rest of the scenario is the same as without them.
 */
export const CERTIFICATES = {
  from: '2024-01-01',
  share: 0.3,
  scatter: 0.012,
  yieldBiasMpa: { marrisford: 11 } as Readonly<Record<string, number>>,
  stream: 0x7e57ce87,
} as const;

/** Shares of the special curve layouts among the standard-lab curve tests. */
export const SPECIAL_SHARES = {
  stressStrain: 0.02,
  crossheadOnly: 0.02,
  extensometerRemoved: 0.04,
  unloadReload: 0.03,
} as const;

export function gradeDef(label: string): GradeDef {
  const g = GRADES.find((x) => x.label === label);
  if (!g) throw new Error(`unknown grade ${label}`);
  return g;
}

/** The grade catalog in the pipeline's catalog format. */
export function catalogJson(): { grades: Record<string, unknown> } {
  const grades: Record<string, unknown> = {};
  for (const g of GRADES) {
    grades[g.label] = { family: g.family, yield_definition: g.yieldDefinition, rp_offset_pct: 0.2, rt_total_pct: 0.5, spec: { ...g.spec }, ...(g.properties ? { properties: g.properties } : {}) };
  }
  return { grades };
}
