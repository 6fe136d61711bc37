/**
 * The grade catalog: a JSON file the user edits, giving per grade the yield definition, the
 * reduction settings and the specification limits that compliance and drift are judged against.
 *
 * {
 *   "grades": {
 *     "<grade label>": {
 *       "family": "steel" | "aluminium" | "other",
 *       "yield_definition": "rp0.2" | "rt0.5" | "reh" | "rel",
 *       "rp_offset_pct": 0.2,          // plastic extension for Rp (optional, default 0.2)
 *       "rt_total_pct": 0.5,           // total extension for Rt (optional, default 0.5)
 *       "spec": {                      // every limit optional; MPa and percent
 *         "yield_min_mpa": 355, "yield_max_mpa": null,
 *         "tensile_min_mpa": 470, "tensile_max_mpa": 630,
 *         "yt_max": 0.87, "elongation_min_pct": 20
 *       },
 *       "properties": {                // optional, per property key of `fractile properties`
 *         "yield_mpa": {
 *           "prior_v": 0.07,           // coefficient of variation known from prior data: offers
 *                                      // the EN 1990 "V known" value (never assumed otherwise)
 *           "headline_model": "lognormal"  // normal | lognormal | weibull | order-statistic:
 *                                      // the design value is that method's value (default: the
 *                                      // lowest of the exact normal, lognormal, Weibull limits)
 *         }
 *       },
 *       "max_fraction_below": 0.05     // drift: share of tests below a minimum that alarms (optional, default 0.05)
 *     }
 *   }
 * }
 *
 * A grade missing from the catalog is reduced with the defaults (steel, rp0.2) and has no limits.
 */
import { readFileSync } from 'node:fs';
import { NUMERIC_PROPERTIES, type PropertyKey } from './properties.ts';

export type Family = 'steel' | 'aluminium' | 'other';
export type YieldDefinition = 'rp0.2' | 'rt0.5' | 'reh' | 'rel';
export const YIELD_DEFINITIONS: readonly YieldDefinition[] = ['rp0.2', 'rt0.5', 'reh', 'rel'];

export interface SpecLimits {
  yield_min_mpa?: number | null;
  yield_max_mpa?: number | null;
  tensile_min_mpa?: number | null;
  tensile_max_mpa?: number | null;
  yt_max?: number | null;
  elongation_min_pct?: number | null;
}

export type HeadlineModelName = 'normal' | 'lognormal' | 'weibull' | 'order-statistic';
export const HEADLINE_MODELS: readonly HeadlineModelName[] = ['normal', 'lognormal', 'weibull', 'order-statistic'];

/** Statistical settings of one property of a grade, fixed before its data are seen. */
export interface PropertyStatistics {
  /** prior coefficient of variation for the EN 1990 "V known" value, in (0, 1) */
  prior_v?: number;
  /** the method the headline (design) value is taken from */
  headline_model?: HeadlineModelName;
}

export interface GradeEntry {
  family: Family;
  yield_definition: YieldDefinition;
  rp_offset_pct: number;
  rt_total_pct: number;
  spec: SpecLimits;
  /** per-property statistical settings (absent: none) */
  properties?: Partial<Record<PropertyKey, PropertyStatistics>>;
  /** Share of tests below a specified minimum above which drift raises the capability alert. */
  max_fraction_below?: number;
}

export interface Catalog {
  grades: Record<string, GradeEntry>;
}

export const DEFAULT_GRADE: GradeEntry = { family: 'steel', yield_definition: 'rp0.2', rp_offset_pct: 0.2, rt_total_pct: 0.5, spec: {} };

export class CatalogError extends Error {
  readonly code = 'bad_catalog';
  constructor(
    message: string,
    readonly file: string,
    readonly line = 0,
    readonly column = 0,
  ) {
    super(message);
  }
}

const FAMILIES: readonly Family[] = ['steel', 'aluminium', 'other'];
const LIMIT_KEYS: readonly (keyof SpecLimits)[] = ['yield_min_mpa', 'yield_max_mpa', 'tensile_min_mpa', 'tensile_max_mpa', 'yt_max', 'elongation_min_pct'];

/** Validates a parsed catalog; throws CatalogError naming the grade and key at fault. */
export function parseCatalog(raw: unknown, file = '(catalog)'): Catalog {
  const fail = (msg: string): never => {
    throw new CatalogError(msg, file);
  };
  if (!raw || typeof raw !== 'object' || !('grades' in raw)) fail('catalog must be an object with a "grades" object');
  const grades = (raw as { grades: unknown }).grades;
  if (!grades || typeof grades !== 'object' || Array.isArray(grades)) fail('"grades" must be an object keyed by grade label');
  const out: Record<string, GradeEntry> = {};
  for (const [label, v] of Object.entries(grades as Record<string, unknown>)) {
    if (!v || typeof v !== 'object') fail(`grade "${label}" must be an object`);
    const g = v as Record<string, unknown>;
    const family = (g.family ?? 'steel') as Family;
    if (!FAMILIES.includes(family)) fail(`grade "${label}": family must be one of ${FAMILIES.join(', ')}`);
    const yd = (g.yield_definition ?? 'rp0.2') as YieldDefinition;
    if (!YIELD_DEFINITIONS.includes(yd)) fail(`grade "${label}": yield_definition must be one of ${YIELD_DEFINITIONS.join(', ')}`);
    const num = (key: string, dflt: number): number => {
      const x = g[key] ?? dflt;
      if (typeof x !== 'number' || !Number.isFinite(x) || x <= 0) fail(`grade "${label}": ${key} must be a positive number`);
      return x as number;
    };
    const specRaw = (g.spec ?? {}) as Record<string, unknown>;
    const spec: SpecLimits = {};
    for (const k of Object.keys(specRaw)) {
      if (!LIMIT_KEYS.includes(k as keyof SpecLimits)) fail(`grade "${label}": unknown spec key "${k}" (known: ${LIMIT_KEYS.join(', ')})`);
      const x = specRaw[k];
      if (x !== null && (typeof x !== 'number' || !Number.isFinite(x))) fail(`grade "${label}": spec.${k} must be a number or null`);
      spec[k as keyof SpecLimits] = x as number | null;
    }
    const share = g.max_fraction_below;
    if (share !== undefined && (typeof share !== 'number' || !(share > 0 && share < 1))) fail(`grade "${label}": max_fraction_below must be a number between 0 and 1`);
    const entry: GradeEntry = { family, yield_definition: yd, rp_offset_pct: num('rp_offset_pct', 0.2), rt_total_pct: num('rt_total_pct', 0.5), spec };
    if (share !== undefined) entry.max_fraction_below = share as number;
    if (g.properties !== undefined) entry.properties = parsePropertyStatistics(label, g.properties, fail);
    out[label] = entry;
  }
  return { grades: out };
}

function parsePropertyStatistics(label: string, raw: unknown, fail: (msg: string) => never): Partial<Record<PropertyKey, PropertyStatistics>> {
  if (!raw || typeof raw !== 'object' || Array.isArray(raw)) fail(`grade "${label}": properties must be an object keyed by property`);
  const out: Partial<Record<PropertyKey, PropertyStatistics>> = {};
  for (const [key, v] of Object.entries(raw as Record<string, unknown>)) {
    if (!(NUMERIC_PROPERTIES as readonly string[]).includes(key)) fail(`grade "${label}": unknown property "${key}" (known: ${NUMERIC_PROPERTIES.join(', ')})`);
    if (!v || typeof v !== 'object' || Array.isArray(v)) fail(`grade "${label}": properties.${key} must be an object`);
    const e = v as Record<string, unknown>;
    const stat: PropertyStatistics = {};
    for (const k of Object.keys(e)) if (k !== 'prior_v' && k !== 'headline_model') fail(`grade "${label}": unknown key properties.${key}.${k} (known: prior_v, headline_model)`);
    if (e.prior_v !== undefined) {
      if (typeof e.prior_v !== 'number' || !(e.prior_v > 0 && e.prior_v < 1)) fail(`grade "${label}": properties.${key}.prior_v must be a number in (0, 1)`);
      stat.prior_v = e.prior_v as number;
    }
    if (e.headline_model !== undefined) {
      if (!HEADLINE_MODELS.includes(e.headline_model as HeadlineModelName)) fail(`grade "${label}": properties.${key}.headline_model must be one of ${HEADLINE_MODELS.join(', ')}`);
      stat.headline_model = e.headline_model as HeadlineModelName;
    }
    out[key as PropertyKey] = stat;
  }
  return out;
}

/** Reads and validates a catalog file; a JSON syntax error names its line and column. */
export function loadCatalog(file: string): Catalog {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (e) {
    throw new CatalogError(`cannot read catalog: ${(e as Error).message}`, file);
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    const m = /position (\d+)/.exec((e as Error).message);
    let line = 0;
    let column = 0;
    if (m) {
      const pos = Number(m[1]);
      const before = text.slice(0, pos).split('\n');
      line = before.length;
      column = before[before.length - 1].length + 1;
    }
    throw new CatalogError(`invalid JSON: ${(e as Error).message}`, file, line, column);
  }
  return parseCatalog(raw, file);
}

export function gradeSettings(catalog: Catalog | null, grade: string): GradeEntry {
  return catalog?.grades[grade] ?? DEFAULT_GRADE;
}
