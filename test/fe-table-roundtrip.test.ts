/**
 * The FE material table and the curve exports, read back the way the next tool reads them: with a
 * general CSV library (csv-parse), not with our own readers. Checked against the design curve
 * they came from:
 *   - the FE table: exactly two columns named `true_stress_MPa,true_plastic_strain` (or `_ksi`),
 *     no comment lines, first row at zero plastic strain, strictly increasing strain (common
 *     practice for a finite-element plasticity table), every stress equal to the characteristic
 *     curve's at that strain to the last bit (17 significant digits, ECMA-262 round trip), the
 *     ksi table the MPa one divided by 6.894757293168361 (1 ksi = 1000 lbf/in², with the
 *     international pound and inch: NIST SP 811, appendix B — exact), and a sidecar JSON with the
 *     caution and the provenance;
 *   - the group's curve, engineering and idealization CSVs: the comment block parses as comments,
 *     the header and every row parse, and the curve CSV's values equal the curve's to 6
 *     significant digits.
 */
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse } from 'csv-parse/sync';
import { afterAll, describe, expect, it } from 'vitest';
import { writeCurveFiles } from '@fractile/pipeline';
import { feFileName, writeFeTable } from '../packages/pipeline/src/exports/curve-files.ts';
import { characteristicCurve, DEFAULT_DESIGN_OPTIONS, type DesignCurve } from '../packages/pipeline/src/design/index.ts';
import { grid, lawCurve, normals, PROV } from './design-fixtures.ts';

const KSI = (1000 * 4.4482216152605) / (25.4 * 25.4); // MPa per ksi: lbf = 4.4482216152605 N, in = 25.4 mm (exact)
const dir = mkdtempSync(join(tmpdir(), 'fractile-fe-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function sample(seed: number): DesignCurve {
  const g = grid(0.002, 0.15, 0.001); // grid not starting at zero: the table must add the zero row
  const ks = normals(seed, 20, 780, 30);
  const us = normals(seed + 1, 20, 0.12, 0.008);
  const tests = ks.map((k, i) => lawCurve(`F${seed}-${i}`, g, (e) => k * Math.pow(0.006 + e, 0.18), us[i], k * Math.pow(0.006, 0.18)));
  return characteristicCurve({ group: { grade: 'QX-420', supplier: 'Hollin Works' }, grid: g, tests }, DEFAULT_DESIGN_OPTIONS, PROV);
}

const c = sample(31);

describe('FE table read back with a CSV library', () => {
  it('has two named columns, no comments, zero plastic strain first, strictly increasing strain, and the curve’s stresses exactly', () => {
    const path = join(dir, feFileName(c.group));
    const written = writeFeTable(path, c, 'MPa');
    expect(written).toEqual([path, `${path}.provenance.json`]);
    const text = readFileSync(path, 'utf8');
    expect(text).not.toMatch(/^#/m);
    const rows = parse(text, { columns: true, cast: false }) as Record<string, string>[];
    expect(Object.keys(rows[0])).toEqual(['true_stress_MPa', 'true_plastic_strain']);
    const pts = rows.map((r) => [Number(r.true_stress_MPa), Number(r.true_plastic_strain)]);
    expect(pts.every(([s, e]) => Number.isFinite(s) && Number.isFinite(e))).toBe(true);
    expect(pts.length).toBeGreaterThan(50);
    expect(pts[0][1]).toBe(0);
    for (let i = 1; i < pts.length; i++) expect(pts[i][1]).toBeGreaterThan(pts[i - 1][1]);
    // each row at a grid strain holds the characteristic stress there, to the last bit
    const at = new Map(c.plastic_strain.map((x, i) => [x, c.characteristic_mpa[i]]));
    const first = c.plastic_strain.findIndex((_, i) => Number.isFinite(c.characteristic_mpa[i]));
    expect(pts[0][0]).toBe(c.characteristic_mpa[first]); // the zero row: the curve's first stress
    for (const [s, e] of pts.slice(1)) expect(s).toBe(at.get(e));
    // the valid range is covered, and nothing past it unless extrapolated by a law
    const last = pts[pts.length - 1][1];
    expect(last).toBeGreaterThanOrEqual(c.valid_to_plastic_strain! - 1e-12);
    if (!c.extrapolated.some(Boolean)) expect(last).toBeLessThanOrEqual(c.valid_to_plastic_strain! + 1e-12);

    const side = JSON.parse(readFileSync(`${path}.provenance.json`, 'utf8'));
    expect(side.caution).toMatch(/licensed engineer/);
    expect(side.provenance).toMatchObject({ curve: 'characteristic', valid_to_plastic_strain: c.valid_to_plastic_strain, e_mpa: c.e_mpa });
  });

  it('in ksi: the same rows, stresses divided by 6.894757293168361 MPa/ksi', () => {
    const mpa = parse(readFileSync(join(dir, feFileName(c.group)), 'utf8'), { columns: true }) as Record<string, string>[];
    const path = join(dir, 'ksi.csv');
    writeFeTable(path, c, 'ksi');
    const ksi = parse(readFileSync(path, 'utf8'), { columns: true }) as Record<string, string>[];
    expect(Object.keys(ksi[0])).toEqual(['true_stress_ksi', 'true_plastic_strain']);
    expect(ksi.length).toBe(mpa.length);
    for (let i = 0; i < ksi.length; i++) {
      expect(ksi[i].true_plastic_strain).toBe(mpa[i].true_plastic_strain);
      expect(Number(ksi[i].true_stress_ksi)).toBeCloseTo(Number(mpa[i].true_stress_MPa) / KSI, 10);
    }
  });
});

describe('curve exports read back with a CSV library', () => {
  it('parses every CSV of a group (comments as comments), and the curve CSV holds the curve to 6 digits', () => {
    const out = join(dir, 'all');
    writeCurveFiles(out, [c]);
    const csvs = readdirSync(out).filter((f) => f.endsWith('.csv'));
    expect(csvs.length).toBeGreaterThanOrEqual(4);
    for (const f of csvs) {
      const rows = parse(readFileSync(join(out, f), 'utf8'), { columns: true, comment: '#', skip_empty_lines: true }) as Record<string, string>[];
      expect(rows.length, f).toBeGreaterThan(0);
    }
    const curve = parse(readFileSync(join(out, csvs.find((f) => f.endsWith('.curve.csv'))!), 'utf8'), { columns: true, comment: '#' }) as Record<string, string>[];
    expect(curve.length).toBe(c.plastic_strain.length);
    curve.forEach((r, i) => {
      expect(Number(r.plastic_strain)).toBeCloseTo(c.plastic_strain[i], 12);
      const want = c.characteristic_mpa[i];
      if (Number.isFinite(want)) expect(Math.abs(Number(r.characteristic_mpa) - want) / want).toBeLessThan(5e-6);
    });
  });
});
