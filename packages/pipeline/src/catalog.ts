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
 * A top-level "$comment" string is allowed (JSON has no comments); every other unknown key is an
 * error naming its line and column, so a misspelt key never falls back to a default unseen.
 * docs/input-formats.md documents every key.
 */
import { readFileSync } from 'node:fs';
import { YIELD_DEFINITIONS, type Family, type YieldDefinition } from '@fractile/curves';
import { JsonSyntaxError, parseLocatedJson, type JsonPosition, type LocatedJson } from './json-located.ts';
import { NUMERIC_PROPERTIES, type PropertyKey } from './properties.ts';

export { YIELD_DEFINITIONS, type Family, type YieldDefinition } from '@fractile/curves';

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
    /** where in the document, as a JSON Pointer (RFC 6901); "" for the whole document */
    readonly pointer = '',
  ) {
    super(message);
  }
}

/** The JSON Pointer (RFC 6901 §3–4: "~" → "~0", "/" → "~1") of a key path: /grades/G355/spec. */
export function jsonPointer(path: readonly (string | number)[]): string {
  return path.map((k) => `/${String(k).replaceAll('~', '~0').replaceAll('/', '~1')}`).join('');
}

const FAMILIES: readonly Family[] = ['steel', 'aluminium', 'other'];
export const SPEC_KEYS: readonly (keyof SpecLimits)[] = ['yield_min_mpa', 'yield_max_mpa', 'tensile_min_mpa', 'tensile_max_mpa', 'yt_max', 'elongation_min_pct'];
/** Every key a grade entry may have (a misspelt key is an error, not silently a default). */
export const GRADE_KEYS = ['family', 'yield_definition', 'rp_offset_pct', 'rt_total_pct', 'spec', 'properties', 'max_fraction_below'] as const;
const PROPERTY_STAT_KEYS = ['prior_v', 'headline_model'] as const;

type Path = readonly (string | number)[];

/**
 * Validates a parsed catalog; throws CatalogError naming the grade and key at fault, and its line
 * and column where `at` locates key paths in the file (json-located.ts).
 */
export function parseCatalog(raw: unknown, file = '(catalog)', at?: (path: Path) => JsonPosition): Catalog {
  const fail = (msg: string, path: Path = []): never => {
    const p = at?.(path);
    throw new CatalogError(path.length ? `${msg} (at ${jsonPointer(path)})` : msg, file, p?.line ?? 0, p?.column ?? 0, jsonPointer(path));
  };
  const isObject = (v: unknown): v is Record<string, unknown> => !!v && typeof v === 'object' && !Array.isArray(v);
  if (!isObject(raw) || !('grades' in raw)) fail('the catalog must be an object with a "grades" object: { "grades": { "<grade label>": { … } } }');
  const top = raw as Record<string, unknown>;
  for (const k of Object.keys(top)) if (k !== 'grades' && k !== '$comment') fail(`unknown top-level key "${k}" (known: grades, $comment)`, [k]);
  const grades = top.grades;
  if (!isObject(grades)) fail('"grades" must be an object keyed by grade label', ['grades']);
  const out: Record<string, GradeEntry> = {};
  for (const [label, v] of Object.entries(grades as Record<string, unknown>)) {
    const here = (...rest: (string | number)[]): Path => ['grades', label, ...rest];
    if (!isObject(v)) fail(`grade "${label}" must be an object`, here());
    const g = v as Record<string, unknown>;
    for (const k of Object.keys(g)) if (!(GRADE_KEYS as readonly string[]).includes(k)) fail(`grade "${label}": unknown key "${k}" (known: ${GRADE_KEYS.join(', ')})`, here(k));
    const family = (g.family ?? 'steel') as Family;
    if (!FAMILIES.includes(family)) fail(`grade "${label}": family must be one of ${FAMILIES.join(', ')}, got ${JSON.stringify(g.family)}`, here('family'));
    const yd = (g.yield_definition ?? 'rp0.2') as YieldDefinition;
    if (!YIELD_DEFINITIONS.includes(yd)) fail(`grade "${label}": yield_definition must be one of ${YIELD_DEFINITIONS.join(', ')}, got ${JSON.stringify(g.yield_definition)}`, here('yield_definition'));
    const num = (key: string, dflt: number): number => {
      const x = g[key] ?? dflt;
      if (typeof x !== 'number' || !Number.isFinite(x) || x <= 0) fail(`grade "${label}": ${key} must be a positive number (percent), got ${JSON.stringify(g[key])}`, here(key));
      return x as number;
    };
    if (g.spec !== undefined && !isObject(g.spec)) fail(`grade "${label}": spec must be an object of limits`, here('spec'));
    const specRaw = (g.spec ?? {}) as Record<string, unknown>;
    const spec: SpecLimits = {};
    for (const k of Object.keys(specRaw)) {
      if (!SPEC_KEYS.includes(k as keyof SpecLimits)) fail(`grade "${label}": unknown spec key "${k}" (known: ${SPEC_KEYS.join(', ')})`, here('spec', k));
      const x = specRaw[k];
      if (x !== null && (typeof x !== 'number' || !Number.isFinite(x))) fail(`grade "${label}": spec.${k} must be a number or null, got ${JSON.stringify(x)}`, here('spec', k));
      // strengths and elongations are not negative; Re/Rm lies in (0, 1] since Re ≤ Rm (ISO 6892-1: Rm is the stress at maximum force)
      if (typeof x === 'number' && k === 'yt_max' && !(x > 0 && x <= 1)) fail(`grade "${label}": spec.yt_max must lie in (0, 1] (yield over tensile strength), got ${x}`, here('spec', k));
      if (typeof x === 'number' && x < 0) fail(`grade "${label}": spec.${k} must not be negative, got ${x}`, here('spec', k));
      spec[k as keyof SpecLimits] = x as number | null;
    }
    const pair = (lo: keyof SpecLimits, hi: keyof SpecLimits) => {
      const a = spec[lo];
      const b = spec[hi];
      if (typeof a === 'number' && typeof b === 'number' && a > b) fail(`grade "${label}": spec.${lo} (${a}) is above spec.${hi} (${b})`, here('spec', lo));
    };
    pair('yield_min_mpa', 'yield_max_mpa');
    pair('tensile_min_mpa', 'tensile_max_mpa');
    const share = g.max_fraction_below;
    if (share !== undefined && (typeof share !== 'number' || !(share > 0 && share < 1))) fail(`grade "${label}": max_fraction_below must be a number between 0 and 1`, here('max_fraction_below'));
    const entry: GradeEntry = { family, yield_definition: yd, rp_offset_pct: num('rp_offset_pct', 0.2), rt_total_pct: num('rt_total_pct', 0.5), spec };
    if (share !== undefined) entry.max_fraction_below = share as number;
    if (g.properties !== undefined) entry.properties = parsePropertyStatistics(label, g.properties, (msg, ...rest) => fail(msg, here('properties', ...rest)));
    out[label] = entry;
  }
  return { grades: out };
}

function parsePropertyStatistics(label: string, raw: unknown, fail: (msg: string, ...path: string[]) => never): Partial<Record<PropertyKey, PropertyStatistics>> {
  if (!raw || typeof raw !== 'object' || Array.isArray(raw)) fail(`grade "${label}": properties must be an object keyed by property`);
  const out: Partial<Record<PropertyKey, PropertyStatistics>> = {};
  for (const [key, v] of Object.entries(raw as Record<string, unknown>)) {
    if (!(NUMERIC_PROPERTIES as readonly string[]).includes(key)) fail(`grade "${label}": unknown property "${key}" (known: ${NUMERIC_PROPERTIES.join(', ')})`, key);
    if (!v || typeof v !== 'object' || Array.isArray(v)) fail(`grade "${label}": properties.${key} must be an object`, key);
    const e = v as Record<string, unknown>;
    const stat: PropertyStatistics = {};
    for (const k of Object.keys(e)) if (!(PROPERTY_STAT_KEYS as readonly string[]).includes(k)) fail(`grade "${label}": unknown key properties.${key}.${k} (known: ${PROPERTY_STAT_KEYS.join(', ')})`, key, k);
    if (e.prior_v !== undefined) {
      if (typeof e.prior_v !== 'number' || !(e.prior_v > 0 && e.prior_v < 1)) fail(`grade "${label}": properties.${key}.prior_v must be a number in (0, 1)`, key, 'prior_v');
      stat.prior_v = e.prior_v as number;
    }
    if (e.headline_model !== undefined) {
      if (!HEADLINE_MODELS.includes(e.headline_model as HeadlineModelName)) fail(`grade "${label}": properties.${key}.headline_model must be one of ${HEADLINE_MODELS.join(', ')}`, key, 'headline_model');
      stat.headline_model = e.headline_model as HeadlineModelName;
    }
    out[key as PropertyKey] = stat;
  }
  return out;
}

/** Reads and validates a catalog file; every fault names its line and column (json-located.ts). */
export function loadCatalog(file: string): Catalog {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (e) {
    const code = (e as { code?: string }).code;
    throw new CatalogError(code === 'ENOENT' ? 'no such catalog file' : `cannot read the catalog: ${(e as Error).message}`, file);
  }
  let doc: LocatedJson;
  try {
    doc = parseLocatedJson(text);
  } catch (e) {
    if (e instanceof JsonSyntaxError) throw new CatalogError(e.message, file, e.line, e.column);
    throw e;
  }
  return parseCatalog(doc.value, file, doc.at);
}

export function gradeSettings(catalog: Catalog | null, grade: string): GradeEntry {
  return catalog?.grades[grade] ?? DEFAULT_GRADE;
}
