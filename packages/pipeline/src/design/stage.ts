/**
 * The design stage: per group, the median and characteristic true stress–plastic strain curves
 * with their idealizations, from each test's true stress on the common grid (reduce stage), on the
 * same population as the statistics (population.ts). The characteristic curve starts from the
 * group's design value of its yield — the headline of the stats stage (`yieldHeadline`), the same
 * number the `stats` table and the report show. Stored per run; the same options on the same
 * inputs reuse the stored curves.
 */
import type { Store } from '@fractile/store';
import { summarizeProperty } from '@fractile/stats';
import { characteristicCurve, DEFAULT_DESIGN_OPTIONS, type DesignCurve, type DesignOptions } from './index.ts';
import { gradeOfGroup, propertySummaryOptions } from '../aggregate/stage.ts';
import { groupRows, type GroupField } from '../aggregate/grouping.ts';
import type { Catalog } from '../catalog.ts';
import { commonGrid } from '../common-grid.ts';
import type { PopulationOptions } from '../population.ts';
import { populationHash } from '../population-hash.ts';
import { currentGrid, loadPopulation, type PropertyFilter, type PropertyKey, type PropertyRow } from '../properties.ts';
import { exclusiveStage, runStage, STAGE_VERSIONS } from '../runs.ts';

export interface CurvesStageOptions {
  by: GroupField[];
  design?: Partial<DesignOptions>;
  filter?: PropertyFilter;
  /** grade catalog: per-property headline settings of the characteristic yield */
  catalog?: Catalog | null;
  /** which tests and values enter (default: excluded tests and flagged values left out) */
  population?: PopulationOptions;
  codeVersion: string;
  /** ISO timestamp recorded in the provenance (the stage never reads the clock) */
  generatedAt: string;
}

export interface CurvesStageResult {
  run: number;
  reused: boolean;
  curves: DesignCurve[];
  /** groups left out, with the reason */
  skipped: { group: Record<string, string>; reason: string }[];
  /** thinned individual curves per group, for plots */
  samples: { group: Record<string, string>; tests: { test_id: string; stress_mpa: (number | null)[] }[] }[];
  grid: number[];
}

const SAMPLE_CURVES = 60;

function sampleEvenly<T>(xs: T[], n: number): T[] {
  if (xs.length <= n) return xs;
  const out: T[] = [];
  for (let i = 0; i < n; i++) out.push(xs[Math.floor((i * xs.length) / n)]);
  return out;
}

/** Runs the stage alone on the database (see `exclusiveStage`). */
export function runCurves(store: Store, opts: CurvesStageOptions): Promise<CurvesStageResult> {
  return exclusiveStage(store, 'design', () => curvesAlone(store, opts));
}

async function curvesAlone(store: Store, opts: CurvesStageOptions): Promise<CurvesStageResult> {
  const db = store.db;
  const design: DesignOptions = { ...DEFAULT_DESIGN_OPTIONS, ...opts.design };
  const pop = await loadPopulation(db, opts.filter, { ...opts.population, withGrid: true });
  const rows = pop.rows;
  const grids = await currentGrid(db);
  const catalog = opts.catalog ?? null;
  const settings = {
    algorithm_version: STAGE_VERSIONS.design, by: opts.by, design, filter: opts.filter ?? {}, grids, population: pop.options,
    property_settings: catalog ? Object.fromEntries(Object.entries(catalog.grades).map(([g, e]) => [g, e.properties ?? {}])) : null,
  };
  const r = await runStage<Omit<CurvesStageResult, 'run' | 'reused'>>(db, {
    stage: 'design', settings, inputHash: populationHash(pop), codeVersion: opts.codeVersion,
    reuse: async (id) => (await loadCurves(store, id)) ?? null,
    compute: async (run, settingsHash) => {
      const result = designCurves(rows, grids, opts.by, design, { code_version: opts.codeVersion, generated_at: opts.generatedAt, extra_settings: { design_settings_hash: settingsHash, excluded_tests: pop.excluded.length } }, catalog);
      await store.copyRows('group_results', ['run_id', 'stage', 'group_key', 'property', 'body'], [
        ...result.curves.map((c) => [run, 'design', JSON.stringify(c.group), '', JSON.stringify(c)]),
        [run, 'design', JSON.stringify({}), '_extras', JSON.stringify({ skipped: result.skipped, samples: result.samples, grid: result.grid })],
      ]);
      return { result, counts: { tests: rows.length, curves: result.curves.length, skipped: result.skipped.length, excluded_tests: pop.excluded.length } };
    },
  });
  return { run: r.run, reused: r.reused, ...r.result };
}

/**
 * The yield a test's curve starts from. Where the grade's yield is the upper yield point, the
 * curve starts at the lower yield (the plateau the material flows at): ReH is a transient peak,
 * and holding the whole plateau up to it would put the curve above the data.
 */
function curveStartYield(r: PropertyRow): number | null {
  if (r.yield_definition === 'reh' && r.rel_mpa !== null) return r.rel_mpa;
  return r.yield_mpa;
}

/**
 * The property a group's curves start from — the grade's yield, or ReL where the grade's yield is
 * the upper yield point (see `curveStartYield`) — and its design value: the stats headline of that
 * property for the group (the same rule, catalog settings and population), at the design level.
 */
export function yieldHeadline(
  members: PropertyRow[],
  grade: string | null,
  design: Pick<DesignOptions, 'coverage' | 'confidence'>,
  catalog: Catalog | null,
): { property: PropertyKey; value: number | null; method: string | null; basis: string | null } {
  const property: PropertyKey = members.length > 0 && members.every((r) => r.yield_definition === 'reh') ? 'rel_mpa' : 'yield_mpa';
  const values = members.map((r) => r[property]).filter((v): v is number => typeof v === 'number' && Number.isFinite(v));
  const opts = propertySummaryOptions(property, grade, { catalog, levels: [{ coverage: design.coverage, confidence: design.confidence }] });
  const h = summarizeProperty(values, { ...opts, lower: null, upper: null });
  return { property, value: h.headline?.value ?? null, method: h.headline?.method ?? null, basis: h.headline_basis };
}

const hasGrid = (r: PropertyRow) => Boolean(r.grid_stress_mpa && r.grid_stress_mpa.length > 0);

/** Pure part: group the tests' grid curves and build each group's design curve. */
export function designCurves(
  allRows: PropertyRow[],
  grids: Record<string, number[]>,
  by: GroupField[],
  design: DesignOptions,
  provenance: { code_version: string; generated_at: string; extra_settings?: Record<string, string | number | boolean | null> },
  catalog: Catalog | null = null,
): Omit<CurvesStageResult, 'run' | 'reused'> {
  const curves: DesignCurve[] = [];
  const skipped: CurvesStageResult['skipped'] = [];
  const samples: CurvesStageResult['samples'] = [];
  let grid: number[] = [];
  for (const g of groupRows(allRows, by, [])) {
    const all = g.rows.map((i) => allRows[i]);
    const members = all.filter(hasGrid);
    if (members.length === 0) continue;
    const shared = commonGrid(members, grids);
    if (!shared) {
      skipped.push({ group: g.key, reason: 'the tests of this group were reduced on different plastic-strain grids' });
      continue;
    }
    grid = shared;
    const tests = members.map((r) => ({
      test_id: `${r.lab}/${r.test_id}`,
      stress_mpa: r.grid_stress_mpa ?? [],
      uniform_plastic_strain: r.uniform_plastic_strain ?? null,
      modulus_gpa: r.modulus_gpa,
      yield_mpa: curveStartYield(r),
    }));
    const y = yieldHeadline(all, gradeOfGroup(g.key, allRows, g.rows), design, catalog);
    const prov = { ...provenance, extra_settings: { ...provenance.extra_settings, characteristic_yield_from: y.value === null ? 'the tests of the curves (no headline)' : `stats headline of ${y.property} (${y.method}, ${y.basis})` } };
    try {
      curves.push(characteristicCurve({ group: g.key, grid, tests, characteristicYieldMpa: y.value }, design, prov));
      samples.push({ group: g.key, tests: sampleEvenly(tests, SAMPLE_CURVES).map((t) => ({ test_id: t.test_id, stress_mpa: t.stress_mpa })) });
    } catch (e) {
      skipped.push({ group: g.key, reason: (e as Error).message });
    }
  }
  return { curves, skipped, samples, grid };
}

export async function loadCurves(store: Store, run: number): Promise<Omit<CurvesStageResult, 'run' | 'reused'> | null> {
  const rows = await store.db.selectFrom('group_results').select(['property', 'body']).where('run_id', '=', run).where('stage', '=', 'design').execute();
  const parse = (b: unknown) => (typeof b === 'string' ? JSON.parse(b) : b);
  const extras = rows.find((r) => r.property === '_extras');
  if (!extras) return null;
  const curves = rows.filter((r) => r.property === '').map((r) => parse(r.body) as DesignCurve);
  curves.sort((a, b) => JSON.stringify(a.group).localeCompare(JSON.stringify(b.group)));
  return { curves, ...(parse(extras.body) as Pick<CurvesStageResult, 'skipped' | 'samples' | 'grid'>) };
}
