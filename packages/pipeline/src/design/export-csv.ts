/**
 * Generic CSV exports of a design curve — the curve, its engineering counterparts, its
 * idealizations — and their readers. A commented header (`#` lines: the caution, group, counts,
 * the band kind and what it means, validity, E, provenance) precedes the table. One column-spec
 * table per format drives both the writer and the reader, so the two cannot drift apart:
 *
 *   curve:        plastic_strain (true plastic, mm/mm), median_mpa, characteristic_mpa (true
 *                 stress, MPa), extrapolated (true/false);
 *   engineering:  plastic_strain, median_strain, median_stress_mpa, characteristic_strain,
 *                 characteristic_stress_mpa (engineering, total strain and MPa), extrapolated;
 *   idealized:    rows of (idealization, parameter, value).
 *
 * Every cell is written by `csvCell` of csv-cell.ts (formula-safe text; numbers in JavaScript's
 * shortest round-trip form, so a read gives back the same doubles). Parsing uses csv-parse; errors
 * come back as values with line and column.
 */
import { parse } from 'csv-parse/sync';
import { csvCell } from '../csv-cell.ts';
import { headerLines, parseHeader } from './csv-header.ts';
import type { BandKind, DesignCurve, DesignError, DesignProvenance, DesignResult, IdealizedCurves } from './types.ts';

export const CURVE_CSV_TITLE = 'fractile characteristic curve, csv format 1';
export const IDEALIZED_CSV_TITLE = 'fractile idealized curves, csv format 1';
export const ENGINEERING_CSV_TITLE = 'fractile engineering counterparts, csv format 1';

const fail = (code: string, message: string, line?: number, column?: number): { ok: false; error: DesignError } => ({
  ok: false,
  error: { code, message, location: line !== undefined ? { line, column } : undefined },
});

// ------------------------------------------------------------------------------------------
// header fields shared by the three formats

/** The header fields every design CSV carries. */
export interface CommonFields {
  group: Record<string, string>;
  n: number;
  band: BandKind;
  band_statement: string;
  valid_to_plastic_strain: number | null;
  characteristic_uniform_plastic_strain: number | null;
  extrapolated_from: number | null;
  e_mpa: number | null;
  characteristic_yield_mpa: number | null;
  median_yield_mpa: number | null;
  warnings: string[];
  provenance: DesignProvenance;
}

type HeaderKind = 'group' | 'count' | 'band' | 'string' | 'number-or-null' | 'strings' | 'provenance';

/** Header entries in the order written; `caution` is written first and not read back. */
const HEADER_FIELDS: readonly { key: keyof CommonFields; kind: HeaderKind }[] = [
  { key: 'group', kind: 'group' },
  { key: 'n', kind: 'count' },
  { key: 'band', kind: 'band' },
  { key: 'band_statement', kind: 'string' },
  { key: 'valid_to_plastic_strain', kind: 'number-or-null' },
  { key: 'characteristic_uniform_plastic_strain', kind: 'number-or-null' },
  { key: 'extrapolated_from', kind: 'number-or-null' },
  { key: 'e_mpa', kind: 'number-or-null' },
  { key: 'characteristic_yield_mpa', kind: 'number-or-null' },
  { key: 'median_yield_mpa', kind: 'number-or-null' },
  { key: 'warnings', kind: 'strings' },
  { key: 'provenance', kind: 'provenance' },
];

const HEADER_RULE: Record<HeaderKind, { ok: (v: unknown) => boolean; says: string }> = {
  group: { ok: (v) => !!v && typeof v === 'object' && !Array.isArray(v) && Object.values(v).every((x) => typeof x === 'string'), says: 'an object of strings' },
  count: { ok: (v) => typeof v === 'number' && Number.isInteger(v) && v >= 0, says: 'a count' },
  band: { ok: (v) => v === 'pointwise' || v === 'simultaneous', says: 'pointwise or simultaneous' },
  string: { ok: (v) => typeof v === 'string', says: 'a string' },
  'number-or-null': { ok: (v) => v === null || (typeof v === 'number' && Number.isFinite(v)), says: 'a number or null' },
  strings: { ok: (v) => Array.isArray(v) && v.every((w) => typeof w === 'string'), says: 'a list of strings' },
  provenance: {
    ok: (v) => !!v && typeof v === 'object' && typeof (v as DesignProvenance).test_ids_sha256 === 'string' && typeof (v as DesignProvenance).caution === 'string',
    says: 'a provenance object with test_ids_sha256 and caution',
  },
};

function commonHeader(curve: DesignCurve): [string, unknown][] {
  return [['caution', curve.provenance.caution], ...HEADER_FIELDS.map(({ key }): [string, unknown] => [key, curve[key]])];
}

function readCommon(h: Map<string, unknown>): DesignResult<CommonFields> {
  const out: Record<string, unknown> = {};
  for (const { key, kind } of HEADER_FIELDS) {
    // files written before the band was stated are pointwise (the only kind there was)
    const v = !h.has(key) && key === 'band' ? 'pointwise' : !h.has(key) && key === 'band_statement' ? '' : h.get(key);
    if (!HEADER_RULE[kind].ok(v)) return fail('bad_header', `header "${key}" must be ${HEADER_RULE[kind].says}`);
    out[key] = v;
  }
  return { ok: true, value: out as unknown as CommonFields };
}

function readRows(text: string, bodyLine: number, columns: readonly string[]): DesignResult<string[][]> {
  let rows: string[][];
  try {
    rows = parse(text, { comment: '#', skip_empty_lines: true, relax_column_count: false }) as string[][];
  } catch (e) {
    const err = e as { message: string; lines?: number };
    return fail('bad_csv', err.message, err.lines);
  }
  const head = rows[0];
  if (!head || head.length !== columns.length || head.some((c, i) => c.trim() !== columns[i])) return fail('bad_columns', `expected columns ${columns.join(', ')}`, bodyLine, 1);
  return { ok: true, value: rows.slice(1) };
}

/** Header and rows of a design CSV with the given title and columns. */
function readTable(text: string, title: string, columns: readonly string[]): DesignResult<{ common: CommonFields; rows: string[][]; bodyLine: number }> {
  const header = parseHeader(text);
  if (!header.ok) return header;
  if (header.value.title !== title) return fail('bad_title', `first line must read "# ${title}"`, 1, 1);
  const common = readCommon(header.value.values);
  if (!common.ok) return common;
  const rows = readRows(text, header.value.bodyLine, columns);
  if (!rows.ok) return rows;
  return { ok: true, value: { common: common.value, rows: rows.value, bodyLine: header.value.bodyLine } };
}

// ------------------------------------------------------------------------------------------
// cells by kind

type CellKind = 'number' | 'number-or-empty' | 'boolean';

/** A cell read as its kind, or a message saying what it should have been. */
function readCell(kind: CellKind, raw: string | undefined): { value: number | boolean | null } | { bad: string } {
  const s = (raw ?? '').trim();
  if (kind === 'boolean') return s === 'true' || s === 'false' ? { value: s === 'true' } : { bad: 'is not true or false' };
  if (s === '' && kind === 'number-or-empty') return { value: null };
  const v = Number(s);
  return s !== '' && Number.isFinite(v) ? { value: v } : { bad: 'is not a number' };
}

// ------------------------------------------------------------------------------------------
// the two point tables: curve and engineering counterparts

/** One column of a point table: its name, kind, and where its values live in the row object. */
interface PointColumn<T> {
  name: string;
  kind: 'number' | 'boolean';
  get(curve: DesignCurve, i: number): number | boolean;
  set(table: T, v: number | boolean): void;
}

/** Writes the header and one row per point of `curve` with the given columns. */
function writePointTable<T>(title: string, curve: DesignCurve, columns: readonly PointColumn<T>[], rows: number): string {
  const lines = headerLines(title, commonHeader(curve));
  lines.push(columns.map((c) => csvCell(c.name)).join(','));
  for (let i = 0; i < rows; i++) lines.push(columns.map((c) => csvCell(c.get(curve, i))).join(','));
  return lines.join('\n') + '\n';
}

/** Reads a point table into `table` (made by `empty`), naming the line and column of a bad cell. */
function readPointTable<T>(text: string, title: string, columns: readonly PointColumn<T>[], empty: (common: CommonFields) => T): DesignResult<T> {
  const t = readTable(text, title, columns.map((c) => c.name));
  if (!t.ok) return t;
  const out = empty(t.value.common);
  for (let r = 0; r < t.value.rows.length; r++) {
    const row = t.value.rows[r];
    for (let c = 0; c < columns.length; c++) {
      const got = readCell(columns[c].kind, row[c]);
      if ('bad' in got) return fail(columns[c].kind === 'boolean' ? 'bad_flag' : 'bad_number', `column ${columns[c].name}: "${row[c]}" ${got.bad}`, t.value.bodyLine + 1 + r, c + 1);
      columns[c].set(out, got.value as number | boolean);
    }
  }
  return { ok: true, value: out };
}

/** The fields a curve CSV carries (the engineering counterparts and idealizations are left out). */
export interface DesignCurveTable extends CommonFields {
  plastic_strain: number[];
  median_mpa: number[];
  characteristic_mpa: number[];
  extrapolated: boolean[];
}

const CURVE_COLUMNS: readonly PointColumn<DesignCurveTable>[] = [
  { name: 'plastic_strain', kind: 'number', get: (c, i) => c.plastic_strain[i], set: (t, v) => t.plastic_strain.push(v as number) },
  { name: 'median_mpa', kind: 'number', get: (c, i) => c.median_mpa[i], set: (t, v) => t.median_mpa.push(v as number) },
  { name: 'characteristic_mpa', kind: 'number', get: (c, i) => c.characteristic_mpa[i], set: (t, v) => t.characteristic_mpa.push(v as number) },
  { name: 'extrapolated', kind: 'boolean', get: (c, i) => c.extrapolated[i], set: (t, v) => t.extrapolated.push(v as boolean) },
];
export const CURVE_CSV_COLUMNS = CURVE_COLUMNS.map((c) => c.name) as readonly string[];

export function designCurveToCsv(curve: DesignCurve): string {
  return writePointTable(CURVE_CSV_TITLE, curve, CURVE_COLUMNS, curve.plastic_strain.length);
}

export function parseDesignCurveCsv(text: string): DesignResult<DesignCurveTable> {
  return readPointTable(text, CURVE_CSV_TITLE, CURVE_COLUMNS, (common) => ({ ...common, plastic_strain: [], median_mpa: [], characteristic_mpa: [], extrapolated: [] }));
}

export interface EngineeringTable extends CommonFields {
  plastic_strain: number[];
  engineering: DesignCurve['engineering'];
  extrapolated: boolean[];
}

type Engineering = NonNullable<DesignCurve['engineering']>;
/** While reading: the engineering counterparts are filled in place and dropped if no row came. */
type EngineeringBuild = EngineeringTable & { engineering: Engineering };

const engineeringColumn = (name: string, curve: 'median' | 'characteristic', field: 'strain' | 'stress_mpa'): PointColumn<EngineeringBuild> => ({
  name,
  kind: 'number',
  get: (c, i) => c.engineering![curve][field][i],
  set: (t, v) => t.engineering[curve][field].push(v as number),
});

const ENGINEERING_COLUMNS: readonly PointColumn<EngineeringBuild>[] = [
  { name: 'plastic_strain', kind: 'number', get: (c, i) => c.plastic_strain[i], set: (t, v) => t.plastic_strain.push(v as number) },
  engineeringColumn('median_strain', 'median', 'strain'),
  engineeringColumn('median_stress_mpa', 'median', 'stress_mpa'),
  engineeringColumn('characteristic_strain', 'characteristic', 'strain'),
  engineeringColumn('characteristic_stress_mpa', 'characteristic', 'stress_mpa'),
  { name: 'extrapolated', kind: 'boolean', get: (c, i) => c.extrapolated[i], set: (t, v) => t.extrapolated.push(v as boolean) },
];
export const ENGINEERING_CSV_COLUMNS = ENGINEERING_COLUMNS.map((c) => c.name) as readonly string[];

/**
 * The engineering counterparts (engineering strain, total, and engineering stress in MPa) of the
 * median and characteristic curves, against the true plastic strain they come from. Empty table
 * where E is not known.
 */
export function engineeringToCsv(curve: DesignCurve): string {
  return writePointTable(ENGINEERING_CSV_TITLE, curve, ENGINEERING_COLUMNS, curve.engineering ? curve.plastic_strain.length : 0);
}

export function parseEngineeringCsv(text: string): DesignResult<EngineeringTable> {
  const r = readPointTable(text, ENGINEERING_CSV_TITLE, ENGINEERING_COLUMNS, (common) => ({
    ...common, plastic_strain: [], extrapolated: [],
    engineering: { median: { strain: [], stress_mpa: [] }, characteristic: { strain: [], stress_mpa: [] } },
  }));
  if (!r.ok) return r;
  return { ok: true, value: { ...r.value, engineering: r.value.plastic_strain.length > 0 ? r.value.engineering : null } };
}

// ------------------------------------------------------------------------------------------
// the idealized table: rows of (idealization, parameter, value)

export const IDEALIZED_CSV_COLUMNS = ['idealization', 'parameter', 'value'] as const;

/** One idealization parameter: its row names, its kind of cell, and where it lives in the object. */
interface IdealizedEntry {
  idealization: string;
  parameter: string;
  kind: CellKind;
  get(id: IdealizedCurves): number | boolean | null;
  set(id: IdealizedCurves, v: number | boolean | null): void;
}

const num = (v: number | boolean | null) => v as number;
const numOrNull = (v: number | boolean | null) => v as number | null;

/** The fixed entries; the multilinear points and the Ramberg–Osgood set follow. */
const FIXED_ENTRIES: readonly IdealizedEntry[] = [
  { idealization: 'elastic_perfectly_plastic', parameter: 'e_mpa', kind: 'number-or-empty', get: (d) => d.elastic_perfectly_plastic.e_mpa, set: (d, v) => { d.elastic_perfectly_plastic.e_mpa = numOrNull(v); } },
  { idealization: 'elastic_perfectly_plastic', parameter: 'yield_mpa', kind: 'number', get: (d) => d.elastic_perfectly_plastic.yield_mpa, set: (d, v) => { d.elastic_perfectly_plastic.yield_mpa = num(v); } },
  { idealization: 'bilinear', parameter: 'e_mpa', kind: 'number-or-empty', get: (d) => d.bilinear.e_mpa, set: (d, v) => { d.bilinear.e_mpa = numOrNull(v); } },
  { idealization: 'bilinear', parameter: 'yield_mpa', kind: 'number', get: (d) => d.bilinear.yield_mpa, set: (d, v) => { d.bilinear.yield_mpa = num(v); } },
  { idealization: 'bilinear', parameter: 'hardening_modulus_mpa', kind: 'number', get: (d) => d.bilinear.hardening_modulus_mpa, set: (d, v) => { d.bilinear.hardening_modulus_mpa = num(v); } },
  { idealization: 'bilinear', parameter: 'tangent_modulus_mpa', kind: 'number-or-empty', get: (d) => d.bilinear.tangent_modulus_mpa, set: (d, v) => { d.bilinear.tangent_modulus_mpa = numOrNull(v); } },
  { idealization: 'bilinear', parameter: 'rmse_mpa', kind: 'number', get: (d) => d.bilinear.rmse_mpa, set: (d, v) => { d.bilinear.rmse_mpa = num(v); } },
];

function multilinearEntries(i: number): IdealizedEntry[] {
  return [
    { idealization: 'multilinear', parameter: `p${i + 1}_plastic_strain`, kind: 'number', get: (d) => d.multilinear.plastic_strain[i], set: (d, v) => { d.multilinear.plastic_strain[i] = num(v); } },
    { idealization: 'multilinear', parameter: `p${i + 1}_stress_mpa`, kind: 'number', get: (d) => d.multilinear.stress_mpa[i], set: (d, v) => { d.multilinear.stress_mpa[i] = num(v); } },
    { idealization: 'multilinear', parameter: `p${i + 1}_extrapolated`, kind: 'boolean', get: (d) => d.multilinear.extrapolated[i], set: (d, v) => { d.multilinear.extrapolated[i] = v as boolean; } },
  ];
}

/** The Ramberg–Osgood set (written where it was fitted; `set` creates it). */
const roOf = (d: IdealizedCurves) => (d.ramberg_osgood ??= { e_mpa: null, sigma0_mpa: NaN, m: NaN, rmse_mpa: NaN });
const RAMBERG_OSGOOD_ENTRIES: readonly IdealizedEntry[] = [
  { idealization: 'ramberg_osgood', parameter: 'e_mpa', kind: 'number-or-empty', get: (d) => d.ramberg_osgood!.e_mpa, set: (d, v) => { roOf(d).e_mpa = numOrNull(v); } },
  { idealization: 'ramberg_osgood', parameter: 'sigma0_mpa', kind: 'number', get: (d) => d.ramberg_osgood!.sigma0_mpa, set: (d, v) => { roOf(d).sigma0_mpa = num(v); } },
  { idealization: 'ramberg_osgood', parameter: 'm', kind: 'number', get: (d) => d.ramberg_osgood!.m, set: (d, v) => { roOf(d).m = num(v); } },
  { idealization: 'ramberg_osgood', parameter: 'rmse_mpa', kind: 'number', get: (d) => d.ramberg_osgood!.rmse_mpa, set: (d, v) => { roOf(d).rmse_mpa = num(v); } },
];

/** Every entry of a set of idealizations, in the order written. */
function idealizedEntries(points: number, withRambergOsgood: boolean): IdealizedEntry[] {
  return [...FIXED_ENTRIES, ...Array.from({ length: points }, (_, i) => multilinearEntries(i)).flat(), ...(withRambergOsgood ? RAMBERG_OSGOOD_ENTRIES : [])];
}

/** The idealized curves as rows of (idealization, parameter, value). */
export function idealizedToCsv(curve: DesignCurve): string {
  const lines = headerLines(IDEALIZED_CSV_TITLE, commonHeader(curve));
  lines.push(IDEALIZED_CSV_COLUMNS.map(csvCell).join(','));
  const id = curve.idealized;
  if (id) {
    for (const e of idealizedEntries(id.multilinear.plastic_strain.length, id.ramberg_osgood !== null)) lines.push([e.idealization, e.parameter, e.get(id)].map(csvCell).join(','));
  }
  return lines.join('\n') + '\n';
}

export interface IdealizedTable extends CommonFields {
  idealized: IdealizedCurves | null;
}

export function parseIdealizedCsv(text: string): DesignResult<IdealizedTable> {
  const t = readTable(text, IDEALIZED_CSV_TITLE, IDEALIZED_CSV_COLUMNS);
  if (!t.ok) return t;
  if (t.value.rows.length === 0) return { ok: true, value: { ...t.value.common, idealized: null } };
  const vals = new Map<string, string>();
  for (const [a, b, v] of t.value.rows) vals.set(`${a}.${b}`, v);
  let points = 0;
  while (vals.has(`multilinear.p${points + 1}_plastic_strain`)) points++;
  const id: IdealizedCurves = {
    elastic_perfectly_plastic: { e_mpa: null, yield_mpa: NaN },
    bilinear: { e_mpa: null, yield_mpa: NaN, hardening_modulus_mpa: NaN, tangent_modulus_mpa: null, rmse_mpa: NaN },
    multilinear: { plastic_strain: [], stress_mpa: [], extrapolated: [] },
    ramberg_osgood: null,
  };
  for (const e of idealizedEntries(points, vals.has('ramberg_osgood.sigma0_mpa'))) {
    const key = `${e.idealization}.${e.parameter}`;
    const got = vals.has(key) ? readCell(e.kind, vals.get(key)) : null;
    if (!got || 'bad' in got) return fail('bad_idealized', `missing or bad value for ${key}`);
    e.set(id, got.value);
  }
  return { ok: true, value: { ...t.value.common, idealized: id } };
}
