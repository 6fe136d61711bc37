/**
 * Per-test properties as the rest of the pipeline and the `properties` command see them: the
 * contract keys of the per-test table (percentages in percent, `null` where a value does not
 * apply), for every current test, from the results of the settings of the latest reduce run.
 *
 * `loadProperties` gives the statistics' population by default — excluded tests left out and
 * flagged values withheld (population.ts); `asReduced` gives every test's values as reduced (the
 * per-test listing and its export). `loadPopulation` also returns what was left out.
 */
import { sql, type Kysely } from 'kysely';
import { activeExclusions, type Database } from '@fractile/store';
import type { WithheldItem } from './flag-rules.ts';
import { applyPopulationRules, type Population, type PopulationOptions } from './population.ts';
import type { TestProperties } from '@fractile/curves';
import type { Catalog } from './catalog.ts';
import { ALGORITHM_VERSION } from './runs.ts';

export const NUMERIC_PROPERTIES = [
  'yield_mpa', 'rp02_mpa', 'rt05_mpa', 'reh_mpa', 'rel_mpa', 'rm_mpa', 'yt_ratio', 'ag_pct', 'agt_pct', 'a_pct', 'n_value', 'modulus_gpa',
] as const satisfies readonly (keyof TestProperties)[];
export type PropertyKey = (typeof NUMERIC_PROPERTIES)[number];

/** Contract key order of `fractile properties`. */
export const PROPERTY_ROW_KEYS = [
  'lab', 'test_id', 'grade', 'supplier', 'heat', 'tested_on', 'modulus_gpa', 'rp02_mpa', 'rt05_mpa', 'reh_mpa', 'rel_mpa', 'ype_pct', 'rm_mpa',
  'ag_pct', 'agt_pct', 'a_pct', 'yt_ratio', 'n_value', 'k_mpa', 'yield_mpa', 'yield_definition', 'shape_class', 'flags',
] as const satisfies readonly (keyof PropertyRow)[];

/** A test's identity and metadata with its properties (the contract keys of TestProperties). */
export interface PropertyRow extends TestProperties {
  lab: string;
  test_id: string;
  grade: string;
  supplier: string;
  heat: string | null;
  tested_on: string;
  /** given values of a summary-only record, not computed from a curve */
  given: boolean;
  failure: { code: string; message: string } | null;
  orientation: string | null;
  temperature_c: number | null;
  shape: string | null;
  test_pk: number;
  settings_hash: string;
  /** the exclusion in force for this test, if any (population rows only) */
  exclusion?: { reason: string; decided_by: string; decided_at: string } | null;
  /** values left out of the statistics, each with the flags that withhold it (population rows only) */
  withheld?: Partial<Record<WithheldItem, string[]>>;
  /** true stress on the reduce grid (null beyond the test's uniform strain); only with `withGrid` */
  grid_stress_mpa?: (number | null)[] | null;
  uniform_plastic_strain?: number | null;
}

export interface PropertyFilter {
  grade?: string[];
  supplier?: string[];
  from?: string;
  to?: string;
  orientation?: string[];
  temperatureMinC?: number;
  temperatureMaxC?: number;
  /** include tests whose reduction failed (their values are all null) */
  includeFailed?: boolean;
}

export interface LoadOptions extends PopulationOptions {
  /** also read each test's true stress on the common plastic-strain grid */
  withGrid?: boolean;
  /** every test with its values as reduced: no exclusions, no flag rules (the per-test listing) */
  asReduced?: boolean;
}

/** The grade → settings hash map of the latest reduce run, or null when nothing was reduced. */
async function latestReduceBody(db: Kysely<Database>): Promise<Record<string, unknown> | null> {
  const row = await db
    .selectFrom('stage_runs as r')
    .innerJoin('stage_settings as s', 's.hash', 'r.settings_hash')
    .select(['s.body'])
    .where('r.stage', '=', 'reduce')
    .where('r.status', '=', 'done')
    .orderBy('r.id', 'desc')
    .limit(1)
    .executeTakeFirst();
  if (!row) return null;
  return (typeof row.body === 'string' ? JSON.parse(row.body) : row.body) as Record<string, unknown>;
}

/** The grade → settings hash map of the latest reduce run, or null when nothing was reduced. */
export async function currentReduceHashes(db: Kysely<Database>): Promise<Record<string, string> | null> {
  const body = (await latestReduceBody(db)) as { grades: Record<string, { hash: string }> } | null;
  if (!body) return null;
  return Object.fromEntries(Object.entries(body.grades).map(([g, v]) => [g, v.hash]));
}

const num = (x: unknown): number | null => (x === null || x === undefined ? null : Number(x));

/** The statistics' population (default) or, with `asReduced`, every test as reduced. */
export async function loadProperties(db: Kysely<Database>, filter: PropertyFilter = {}, load: LoadOptions = {}): Promise<PropertyRow[]> {
  if (load.asReduced) return loadReducedRows(db, filter, load);
  return (await loadPopulation(db, filter, load)).rows;
}

/** The population with what was left out of it (excluded tests, withheld values). */
export async function loadPopulation(db: Kysely<Database>, filter: PropertyFilter = {}, load: LoadOptions = {}): Promise<Population> {
  const rows = await loadReducedRows(db, filter, load);
  return applyPopulationRules(rows, await activeExclusions(db), load);
}

async function loadReducedRows(db: Kysely<Database>, filter: PropertyFilter, load: LoadOptions): Promise<PropertyRow[]> {
  const hashes = await currentReduceHashes(db);
  if (!hashes) return [];
  const grades = Object.keys(hashes);
  if (grades.length === 0) return [];
  const hashList = grades.map((g) => hashes[g]);
  const where = [sql`t.is_current`];
  if (filter.grade?.length) where.push(sql`g.code in (${sql.join(filter.grade)})`);
  if (filter.supplier?.length) where.push(sql`s.name in (${sql.join(filter.supplier)})`);
  if (filter.from) where.push(sql`t.tested_on >= ${filter.from}::date`);
  if (filter.to) where.push(sql`t.tested_on <= ${filter.to}::date`);
  if (filter.orientation?.length) where.push(sql`t.orientation in (${sql.join(filter.orientation)})`);
  if (filter.temperatureMinC !== undefined) where.push(sql`t.temperature_c >= ${filter.temperatureMinC}`);
  if (filter.temperatureMaxC !== undefined) where.push(sql`t.temperature_c <= ${filter.temperatureMaxC}`);
  if (!filter.includeFailed) where.push(sql`r.ok`);
  const result = await sql<Record<string, unknown>>`
    with m as (select * from unnest(${sql.val(grades)}::text[], ${sql.val(hashList)}::text[]) as m(grade, hash))
    select t.id as test_pk, t.lab, t.test_id, g.code as grade, s.name as supplier, h.code as heat, t.tested_on::text as tested_on,
           t.orientation, t.temperature_c, t.shape,
           r.settings_hash, r.ok, r.given, r.failure_code, r.failure_message,
           r.modulus_gpa, r.rp02_mpa, r.rt05_mpa, r.reh_mpa, r.rel_mpa, r.ype_pct, r.rm_mpa, r.ag_pct, r.agt_pct, r.a_pct,
           r.yt_ratio, r.n_value, r.k_mpa, r.yield_mpa, r.yield_definition, r.shape_class, r.flags
           ${load.withGrid ? sql`, r.grid_stress_mpa, r.uniform_plastic_strain` : sql``}
    from tests t
    join grades g on g.id = t.grade_id
    join suppliers s on s.id = t.supplier_id
    left join heats h on h.id = t.heat_id
    join m on m.grade = g.code
    join test_results r on r.test_pk = t.id and r.settings_hash = m.hash and r.algorithm_version = ${ALGORITHM_VERSION}
    where ${sql.join(where, sql` and `)}
    order by t.tested_on, h.code nulls first, t.lab, t.test_id`.execute(db);
  return result.rows.map((r) => ({
    ...(load.withGrid ? { grid_stress_mpa: (r.grid_stress_mpa as (number | null)[] | null) ?? null, uniform_plastic_strain: num(r.uniform_plastic_strain) } : {}),
    lab: String(r.lab),
    test_id: String(r.test_id),
    grade: String(r.grade),
    supplier: String(r.supplier),
    heat: r.heat === null ? null : String(r.heat),
    tested_on: String(r.tested_on),
    modulus_gpa: num(r.modulus_gpa),
    rp02_mpa: num(r.rp02_mpa),
    rt05_mpa: num(r.rt05_mpa),
    reh_mpa: num(r.reh_mpa),
    rel_mpa: num(r.rel_mpa),
    ype_pct: num(r.ype_pct),
    rm_mpa: num(r.rm_mpa),
    ag_pct: num(r.ag_pct),
    agt_pct: num(r.agt_pct),
    a_pct: num(r.a_pct),
    yt_ratio: num(r.yt_ratio),
    n_value: num(r.n_value),
    k_mpa: num(r.k_mpa),
    yield_mpa: num(r.yield_mpa),
    yield_definition: (r.yield_definition as TestProperties['yield_definition']) ?? null,
    shape_class: (r.shape_class as TestProperties['shape_class']) ?? null,
    flags: Array.isArray(r.flags) ? (r.flags as string[]) : [],
    given: Boolean(r.given),
    failure: r.ok ? null : { code: String(r.failure_code), message: String(r.failure_message) },
    orientation: (r.orientation as string | null) ?? null,
    temperature_c: num(r.temperature_c),
    shape: (r.shape as string | null) ?? null,
    test_pk: Number(r.test_pk),
    settings_hash: String(r.settings_hash),
  }));
}

/** The contract view of a row (the contract keys, PROPERTY_ROW_KEYS, plus the failure reason, if any; docs/architecture.md). */
export function contractView(r: PropertyRow): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const k of PROPERTY_ROW_KEYS) out[k] = r[k];
  out.given = r.given;
  out.failure = r.failure;
  return out;
}

/** The grade catalog the latest reduce run used (kept in its settings), or null. */
export async function currentCatalog(db: Kysely<Database>): Promise<Catalog | null> {
  const body = (await latestReduceBody(db)) as { catalog?: Catalog | null } | null;
  return body?.catalog ?? null;
}

/** The common plastic-strain grid of the latest reduce run, per grade (the same for all by default). */
export async function currentGrid(db: Kysely<Database>): Promise<Record<string, number[]>> {
  const body = (await latestReduceBody(db)) as { grades: Record<string, { settings: { gridPlasticStrain: number[] } }> } | null;
  if (!body) return {};
  return Object.fromEntries(Object.entries(body.grades).map(([g, v]) => [g, v.settings.gridPlasticStrain]));
}
