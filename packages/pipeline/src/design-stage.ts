/**
 * The design stage: per group, the median and characteristic true stress–plastic strain curves
 * with their idealizations, from each test's true stress on the common grid (reduce stage).
 * Stored per run; the same options on the same inputs reuse the stored curves.
 */
import type { Store } from '@fractile/store';
import { characteristicCurve, DEFAULT_DESIGN_OPTIONS, type DesignCurve, type DesignOptions } from './design/index.ts';
import { groupRows, type GroupField } from './aggregate/grouping.ts';
import { hashOf } from './hash.ts';
import { currentGrid, loadProperties, type PropertyFilter, type PropertyRow } from './properties.ts';
import { exclusiveStage, findDoneRun, finishRun, saveSettings, STAGE_VERSIONS, startRun } from './runs.ts';

export interface CurvesStageOptions {
  by: GroupField[];
  design?: Partial<DesignOptions>;
  filter?: PropertyFilter;
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
  const rows = (await loadProperties(db, opts.filter, { withGrid: true })).filter((r) => r.grid_stress_mpa && r.grid_stress_mpa.length > 0);
  const grids = await currentGrid(db);
  const settings = { algorithm_version: STAGE_VERSIONS.design, by: opts.by, design, filter: opts.filter ?? {}, grids };
  const settingsHash = await saveSettings(db, 'design', settings);
  const inputHash = hashOf(rows.map((r) => `${r.test_pk}:${r.settings_hash}`));
  const done = await findDoneRun(db, 'design', settingsHash, inputHash);
  if (done) {
    const stored = await loadCurves(store, done.id);
    if (stored) return { run: done.id, reused: true, ...stored };
  }
  const run = await startRun(db, 'design', settingsHash, inputHash, opts.codeVersion);
  const result = designCurves(rows, grids, opts.by, design, { code_version: opts.codeVersion, generated_at: opts.generatedAt, extra_settings: { design_settings_hash: settingsHash } });
  await store.copyRows('group_results', ['run_id', 'stage', 'group_key', 'property', 'body'], [
    ...result.curves.map((c) => [run, 'design', JSON.stringify(c.group), '', JSON.stringify(c)]),
    [run, 'design', JSON.stringify({}), '_extras', JSON.stringify({ skipped: result.skipped, samples: result.samples, grid: result.grid })],
  ]);
  await finishRun(db, run, { tests: rows.length, curves: result.curves.length, skipped: result.skipped.length });
  return { run, reused: false, ...result };
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

/** Pure part: group the tests' grid curves and build each group's design curve. */
export function designCurves(
  rows: PropertyRow[],
  grids: Record<string, number[]>,
  by: GroupField[],
  design: DesignOptions,
  provenance: { code_version: string; generated_at: string; extra_settings?: Record<string, string | number | boolean | null> },
): Omit<CurvesStageResult, 'run' | 'reused'> {
  const curves: DesignCurve[] = [];
  const skipped: CurvesStageResult['skipped'] = [];
  const samples: CurvesStageResult['samples'] = [];
  let grid: number[] = [];
  for (const g of groupRows(rows, by, [])) {
    const members = g.rows.map((i) => rows[i]);
    const gridsHere = new Set(members.map((r) => JSON.stringify(grids[r.grade] ?? null)));
    if (gridsHere.size !== 1 || !grids[members[0].grade]) {
      skipped.push({ group: g.key, reason: 'the tests of this group were reduced on different plastic-strain grids' });
      continue;
    }
    grid = grids[members[0].grade];
    const tests = members.map((r) => ({
      test_id: `${r.lab}/${r.test_id}`,
      stress_mpa: r.grid_stress_mpa ?? [],
      uniform_plastic_strain: r.uniform_plastic_strain ?? null,
      modulus_gpa: r.modulus_gpa,
      yield_mpa: curveStartYield(r),
    }));
    try {
      curves.push(characteristicCurve({ group: g.key, grid, tests }, design, provenance));
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
