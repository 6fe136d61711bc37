/**
 * Generic CSV export of a design curve and of its idealizations, and their readers. A commented
 * header (`#` lines: the caution, group, counts, validity, E, provenance) precedes the table.
 * Curve columns: plastic_strain (true plastic, mm/mm), median_mpa, characteristic_mpa (true
 * stress, MPa), extrapolated (true/false). Idealization columns: idealization, parameter, value.
 * Numbers are written in JavaScript's shortest round-trip form, so a read gives back the same
 * doubles. Parsing uses csv-parse; errors come back as values with line and column.
 */
import { parse } from 'csv-parse/sync';
import { csvLine } from '../csv-cell.ts';
import { headerLines, parseHeader } from './csv-header.ts';
import type { DesignCurve, DesignError, DesignProvenance, DesignResult, IdealizedCurves } from './types.ts';

export const CURVE_CSV_TITLE = 'fractile characteristic curve, csv format 1';
export const IDEALIZED_CSV_TITLE = 'fractile idealized curves, csv format 1';
export const CURVE_CSV_COLUMNS = ['plastic_strain', 'median_mpa', 'characteristic_mpa', 'extrapolated'] as const;

/** The fields a curve CSV carries (the engineering counterparts and idealizations are left out). */
export interface DesignCurveTable {
  group: Record<string, string>;
  n: number;
  valid_to_plastic_strain: number | null;
  characteristic_uniform_plastic_strain: number | null;
  extrapolated_from: number | null;
  e_mpa: number | null;
  characteristic_yield_mpa: number | null;
  median_yield_mpa: number | null;
  warnings: string[];
  provenance: DesignProvenance;
  plastic_strain: number[];
  median_mpa: number[];
  characteristic_mpa: number[];
  extrapolated: boolean[];
}

function commonHeader(curve: DesignCurve): [string, unknown][] {
  return [
    ['caution', curve.provenance.caution],
    ['group', curve.group],
    ['n', curve.n],
    ['valid_to_plastic_strain', curve.valid_to_plastic_strain],
    ['characteristic_uniform_plastic_strain', curve.characteristic_uniform_plastic_strain],
    ['extrapolated_from', curve.extrapolated_from],
    ['e_mpa', curve.e_mpa],
    ['characteristic_yield_mpa', curve.characteristic_yield_mpa],
    ['median_yield_mpa', curve.median_yield_mpa],
    ['warnings', curve.warnings],
    ['provenance', curve.provenance],
  ];
}

export function designCurveToCsv(curve: DesignCurve): string {
  const lines = headerLines(CURVE_CSV_TITLE, commonHeader(curve));
  lines.push(CURVE_CSV_COLUMNS.join(','));
  for (let i = 0; i < curve.plastic_strain.length; i++) {
    lines.push(`${curve.plastic_strain[i]},${curve.median_mpa[i]},${curve.characteristic_mpa[i]},${curve.extrapolated[i] ? 'true' : 'false'}`);
  }
  return lines.join('\n') + '\n';
}

const fail = (code: string, message: string, line?: number, column?: number): { ok: false; error: DesignError } => ({
  ok: false,
  error: { code, message, location: line !== undefined ? { line, column } : undefined },
});

type Header = Map<string, unknown>;

function numOrNull(h: Header, key: string): number | null | undefined {
  const v = h.get(key);
  if (v === null) return null;
  return typeof v === 'number' && Number.isFinite(v) ? v : undefined;
}

interface CommonFields {
  group: Record<string, string>;
  n: number;
  valid_to_plastic_strain: number | null;
  characteristic_uniform_plastic_strain: number | null;
  extrapolated_from: number | null;
  e_mpa: number | null;
  characteristic_yield_mpa: number | null;
  median_yield_mpa: number | null;
  warnings: string[];
  provenance: DesignProvenance;
}

function readCommon(h: Header): DesignResult<CommonFields> {
  const group = h.get('group');
  if (!group || typeof group !== 'object' || Array.isArray(group) || !Object.values(group).every((v) => typeof v === 'string')) return fail('bad_header', 'header "group" must be an object of strings');
  const n = h.get('n');
  if (typeof n !== 'number' || !Number.isInteger(n) || n < 0) return fail('bad_header', 'header "n" must be a count');
  const nullable: Record<string, number | null> = {};
  for (const key of ['valid_to_plastic_strain', 'characteristic_uniform_plastic_strain', 'extrapolated_from', 'e_mpa', 'characteristic_yield_mpa', 'median_yield_mpa']) {
    const v = numOrNull(h, key);
    if (v === undefined) return fail('bad_header', `header "${key}" must be a number or null`);
    nullable[key] = v;
  }
  const warnings = h.get('warnings');
  if (!Array.isArray(warnings) || !warnings.every((w) => typeof w === 'string')) return fail('bad_header', 'header "warnings" must be a list of strings');
  const prov = h.get('provenance');
  if (!prov || typeof prov !== 'object' || typeof (prov as DesignProvenance).test_ids_sha256 !== 'string' || typeof (prov as DesignProvenance).caution !== 'string')
    return fail('bad_header', 'header "provenance" must be a provenance object with test_ids_sha256 and caution');
  return {
    ok: true,
    value: {
      group: group as Record<string, string>,
      n,
      valid_to_plastic_strain: nullable.valid_to_plastic_strain,
      characteristic_uniform_plastic_strain: nullable.characteristic_uniform_plastic_strain,
      extrapolated_from: nullable.extrapolated_from,
      e_mpa: nullable.e_mpa,
      characteristic_yield_mpa: nullable.characteristic_yield_mpa,
      median_yield_mpa: nullable.median_yield_mpa,
      warnings: warnings as string[],
      provenance: prov as DesignProvenance,
    },
  };
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

export function parseDesignCurveCsv(text: string): DesignResult<DesignCurveTable> {
  const header = parseHeader(text);
  if (!header.ok) return header;
  if (header.value.title !== CURVE_CSV_TITLE) return fail('bad_title', `first line must read "# ${CURVE_CSV_TITLE}"`, 1, 1);
  const common = readCommon(header.value.values);
  if (!common.ok) return common;
  const rows = readRows(text, header.value.bodyLine, CURVE_CSV_COLUMNS);
  if (!rows.ok) return rows;
  const out: DesignCurveTable = { ...common.value, plastic_strain: [], median_mpa: [], characteristic_mpa: [], extrapolated: [] };
  for (let r = 0; r < rows.value.length; r++) {
    const row = rows.value[r];
    const line = header.value.bodyLine + 1 + r;
    const nums: number[] = [];
    for (let c = 0; c < 3; c++) {
      const v = Number(row[c]);
      if (row[c].trim() === '' || !Number.isFinite(v)) return fail('bad_number', `column ${CURVE_CSV_COLUMNS[c]}: "${row[c]}" is not a number`, line, c + 1);
      nums.push(v);
    }
    const flag = row[3].trim();
    if (flag !== 'true' && flag !== 'false') return fail('bad_flag', `column extrapolated: "${row[3]}" is not true or false`, line, 4);
    out.plastic_strain.push(nums[0]);
    out.median_mpa.push(nums[1]);
    out.characteristic_mpa.push(nums[2]);
    out.extrapolated.push(flag === 'true');
  }
  return { ok: true, value: out };
}

/** The idealized curves as rows of (idealization, parameter, value). */
export function idealizedToCsv(curve: DesignCurve): string {
  const lines = headerLines(IDEALIZED_CSV_TITLE, commonHeader(curve));
  lines.push('idealization,parameter,value');
  const id = curve.idealized;
  if (id) {
    const row = (a: string, b: string, v: number | boolean | null) => lines.push(csvLine([a, b, v]));
    row('elastic_perfectly_plastic', 'e_mpa', id.elastic_perfectly_plastic.e_mpa);
    row('elastic_perfectly_plastic', 'yield_mpa', id.elastic_perfectly_plastic.yield_mpa);
    row('bilinear', 'e_mpa', id.bilinear.e_mpa);
    row('bilinear', 'yield_mpa', id.bilinear.yield_mpa);
    row('bilinear', 'hardening_modulus_mpa', id.bilinear.hardening_modulus_mpa);
    row('bilinear', 'tangent_modulus_mpa', id.bilinear.tangent_modulus_mpa);
    row('bilinear', 'rmse_mpa', id.bilinear.rmse_mpa);
    id.multilinear.plastic_strain.forEach((e, i) => {
      row('multilinear', `p${i + 1}_plastic_strain`, e);
      row('multilinear', `p${i + 1}_stress_mpa`, id.multilinear.stress_mpa[i]);
      row('multilinear', `p${i + 1}_extrapolated`, id.multilinear.extrapolated[i]);
    });
    if (id.ramberg_osgood) {
      row('ramberg_osgood', 'e_mpa', id.ramberg_osgood.e_mpa);
      row('ramberg_osgood', 'sigma0_mpa', id.ramberg_osgood.sigma0_mpa);
      row('ramberg_osgood', 'm', id.ramberg_osgood.m);
      row('ramberg_osgood', 'rmse_mpa', id.ramberg_osgood.rmse_mpa);
    }
  }
  return lines.join('\n') + '\n';
}

export interface IdealizedTable extends CommonFields {
  idealized: IdealizedCurves | null;
}

export function parseIdealizedCsv(text: string): DesignResult<IdealizedTable> {
  const header = parseHeader(text);
  if (!header.ok) return header;
  if (header.value.title !== IDEALIZED_CSV_TITLE) return fail('bad_title', `first line must read "# ${IDEALIZED_CSV_TITLE}"`, 1, 1);
  const common = readCommon(header.value.values);
  if (!common.ok) return common;
  const rows = readRows(text, header.value.bodyLine, ['idealization', 'parameter', 'value']);
  if (!rows.ok) return rows;
  if (rows.value.length === 0) return { ok: true, value: { ...common.value, idealized: null } };
  const vals = new Map<string, string>();
  for (const [a, b, v] of rows.value) vals.set(`${a}.${b}`, v);
  const num = (key: string): number | null | undefined => {
    const s = vals.get(key);
    if (s === undefined) return undefined;
    if (s.trim() === '') return null;
    const v = Number(s);
    return Number.isFinite(v) ? v : undefined;
  };
  const need = (key: string): number | { bad: string } => {
    const v = num(key);
    return typeof v === 'number' ? v : { bad: key };
  };
  const nullableNum = (key: string): number | null | { bad: string } => {
    const v = num(key);
    return v === undefined ? { bad: key } : v;
  };
  const bad = (...xs: unknown[]) => xs.find((x) => typeof x === 'object' && x !== null) as { bad: string } | undefined;
  const eppE = nullableNum('elastic_perfectly_plastic.e_mpa');
  const eppY = need('elastic_perfectly_plastic.yield_mpa');
  const bE = nullableNum('bilinear.e_mpa');
  const bY = need('bilinear.yield_mpa');
  const bH = need('bilinear.hardening_modulus_mpa');
  const bT = nullableNum('bilinear.tangent_modulus_mpa');
  const bR = need('bilinear.rmse_mpa');
  const b1 = bad(eppE, eppY, bE, bY, bH, bT, bR);
  if (b1) return fail('bad_idealized', `missing or bad value for ${b1.bad}`);
  const ml: IdealizedCurves['multilinear'] = { plastic_strain: [], stress_mpa: [], extrapolated: [] };
  for (let i = 1; vals.has(`multilinear.p${i}_plastic_strain`); i++) {
    const e = need(`multilinear.p${i}_plastic_strain`);
    const s = need(`multilinear.p${i}_stress_mpa`);
    const f = vals.get(`multilinear.p${i}_extrapolated`);
    const b2 = bad(e, s);
    if (b2) return fail('bad_idealized', `missing or bad value for ${b2.bad}`);
    if (f !== 'true' && f !== 'false') return fail('bad_idealized', `missing or bad value for multilinear.p${i}_extrapolated`);
    ml.plastic_strain.push(e as number);
    ml.stress_mpa.push(s as number);
    ml.extrapolated.push(f === 'true');
  }
  let ro: IdealizedCurves['ramberg_osgood'] = null;
  if (vals.has('ramberg_osgood.sigma0_mpa')) {
    const e = nullableNum('ramberg_osgood.e_mpa');
    const s0 = need('ramberg_osgood.sigma0_mpa');
    const m = need('ramberg_osgood.m');
    const r = need('ramberg_osgood.rmse_mpa');
    const b3 = bad(e, s0, m, r);
    if (b3) return fail('bad_idealized', `missing or bad value for ${b3.bad}`);
    ro = { e_mpa: e as number | null, sigma0_mpa: s0 as number, m: m as number, rmse_mpa: r as number };
  }
  return {
    ok: true,
    value: {
      ...common.value,
      idealized: {
        elastic_perfectly_plastic: { e_mpa: eppE as number | null, yield_mpa: eppY as number },
        bilinear: { e_mpa: bE as number | null, yield_mpa: bY as number, hardening_modulus_mpa: bH as number, tangent_modulus_mpa: bT as number | null, rmse_mpa: bR as number },
        multilinear: ml,
        ramberg_osgood: ro,
      },
    },
  };
}

export const ENGINEERING_CSV_TITLE = 'fractile engineering counterparts, csv format 1';
export const ENGINEERING_CSV_COLUMNS = ['plastic_strain', 'median_strain', 'median_stress_mpa', 'characteristic_strain', 'characteristic_stress_mpa', 'extrapolated'] as const;

/**
 * The engineering counterparts (engineering strain, total, and engineering stress in MPa) of the
 * median and characteristic curves, against the true plastic strain they come from. Empty table
 * where E is not known.
 */
export function engineeringToCsv(curve: DesignCurve): string {
  const lines = headerLines(ENGINEERING_CSV_TITLE, commonHeader(curve));
  lines.push(ENGINEERING_CSV_COLUMNS.join(','));
  const eng = curve.engineering;
  if (eng) {
    for (let i = 0; i < curve.plastic_strain.length; i++) {
      lines.push(
        `${curve.plastic_strain[i]},${eng.median.strain[i]},${eng.median.stress_mpa[i]},${eng.characteristic.strain[i]},${eng.characteristic.stress_mpa[i]},${curve.extrapolated[i] ? 'true' : 'false'}`,
      );
    }
  }
  return lines.join('\n') + '\n';
}

export interface EngineeringTable extends CommonFields {
  plastic_strain: number[];
  engineering: DesignCurve['engineering'];
  extrapolated: boolean[];
}

export function parseEngineeringCsv(text: string): DesignResult<EngineeringTable> {
  const header = parseHeader(text);
  if (!header.ok) return header;
  if (header.value.title !== ENGINEERING_CSV_TITLE) return fail('bad_title', `first line must read "# ${ENGINEERING_CSV_TITLE}"`, 1, 1);
  const common = readCommon(header.value.values);
  if (!common.ok) return common;
  const rows = readRows(text, header.value.bodyLine, ENGINEERING_CSV_COLUMNS);
  if (!rows.ok) return rows;
  const cols: number[][] = [[], [], [], [], []];
  const flags: boolean[] = [];
  for (let r = 0; r < rows.value.length; r++) {
    const row = rows.value[r];
    const line = header.value.bodyLine + 1 + r;
    for (let c = 0; c < 5; c++) {
      const v = Number(row[c]);
      if (row[c].trim() === '' || !Number.isFinite(v)) return fail('bad_number', `column ${ENGINEERING_CSV_COLUMNS[c]}: "${row[c]}" is not a number`, line, c + 1);
      cols[c].push(v);
    }
    const flag = row[5].trim();
    if (flag !== 'true' && flag !== 'false') return fail('bad_flag', `column extrapolated: "${row[5]}" is not true or false`, line, 6);
    flags.push(flag === 'true');
  }
  const engineering =
    rows.value.length > 0 ? { median: { strain: cols[1], stress_mpa: cols[2] }, characteristic: { strain: cols[3], stress_mpa: cols[4] } } : null;
  return { ok: true, value: { ...common.value, plastic_strain: cols[0], engineering, extrapolated: flags } };
}
