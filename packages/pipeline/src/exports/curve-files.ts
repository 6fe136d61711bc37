/**
 * Writes the design-curve exports of a curves run into a folder: per group a curve CSV, an
 * engineering-counterparts CSV, an idealizations CSV and a JSON document (design/export-*.ts,
 * each with provenance, the caution and the band kind), the FE table of the characteristic curve
 * (design/fe-table.ts: two columns, true stress and true plastic strain from zero, no comment
 * lines, its provenance in a sidecar), plus one JSON array of all groups. File names from the
 * group's values (`G355_Northmill.curve.csv`; `all` for the whole population).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { designCurvesToJson, designCurveToJson } from '../design/export-json.ts';
import { designCurveToCsv, engineeringToCsv, idealizedToCsv } from '../design/export-csv.ts';
import { feTable, type StressUnit } from '../design/fe-table.ts';
import type { DesignCurve } from '../design/types.ts';
import { writeCsvFile } from './csv-file.ts';

export function groupSlug(group: Readonly<Record<string, string>>): string {
  const s = Object.values(group).join('_').replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '');
  return s || 'all';
}

/** The FE table's file name of a group. */
export function feFileName(group: Readonly<Record<string, string>>): string {
  return `${groupSlug(group)}.true-stress-plastic-strain.csv`;
}

export interface CurveFileOptions {
  /** stress unit of the FE tables (default MPa) */
  feUnit?: StressUnit;
}

export function writeCurveFiles(dir: string, curves: readonly DesignCurve[], opts: CurveFileOptions = {}): string[] {
  mkdirSync(dir, { recursive: true });
  const written: string[] = [];
  const put = (name: string, text: string) => {
    const p = join(dir, name);
    writeFileSync(p, text);
    written.push(p);
  };
  for (const c of curves) {
    const slug = groupSlug(c.group);
    put(`${slug}.curve.csv`, designCurveToCsv(c));
    put(`${slug}.engineering.csv`, engineeringToCsv(c));
    put(`${slug}.idealized.csv`, idealizedToCsv(c));
    put(`${slug}.curve.json`, designCurveToJson(c));
    written.push(...writeFeTable(join(dir, feFileName(c.group)), c, opts.feUnit ?? 'MPa'));
  }
  put('curves.json', designCurvesToJson(curves));
  return written;
}

/** One FE table and its sidecar; full precision (it feeds a solver). */
export function writeFeTable(path: string, c: DesignCurve, unit: StressUnit, which: 'characteristic' | 'median' = 'characteristic'): string[] {
  const t = feTable(c, { unit, curve: which });
  const { caution: _said, ...provenance } = c.provenance;
  return writeCsvFile(path, {
    kind: 'fe-table',
    title: `fractile FE table: ${which} true stress [${unit}] against true plastic strain [–], from zero plastic strain`,
    rows: t.rows.map(([s, e]) => ({ [t.columns[0]]: s, [t.columns[1]]: e })),
    columns: t.columns,
    notes: {
      [t.columns[0]]: `${which} true stress [${unit}]${unit === 'ksi' ? ' (1 ksi = 6.894757293168 MPa)' : ''}`,
      [t.columns[1]]: 'true plastic strain [–], 0 on the first row; strictly increasing',
    },
    provenance: {
      ...provenance,
      curve: which,
      band: c.band,
      band_statement: c.band_statement,
      valid_to_plastic_strain: c.valid_to_plastic_strain,
      extrapolated_from: t.extrapolated_from,
      extrapolation_law: c.extrapolation?.law ?? null,
      e_mpa: c.e_mpa,
    },
    comments: false,
    digits: 17,
  });
}
