// CSV and JSON exports of characteristic curves: round trips, provenance, caution; sources beside each check.
import { describe, expect, it } from 'vitest';
import { csvCell } from '../packages/pipeline/src/csv-cell.ts';
import {
  characteristicCurve,
  CURVE_CSV_COLUMNS,
  DEFAULT_DESIGN_OPTIONS,
  designCurvesToJson,
  designCurveToCsv,
  designCurveToJson,
  engineeringToCsv,
  idealizedToCsv,
  parseDesignCurveCsv,
  parseEngineeringCsv,
  parseDesignCurveJson,
  parseDesignCurvesJson,
  parseIdealizedCsv,
  type DesignCurve,
  type DesignOptions,
} from '../packages/pipeline/src/design/index.ts';
import { DESIGN_VALUE_CAUTION } from '../packages/report/src/caution.ts';
import { parse } from 'csv-parse/sync';
import { grid, lawCurve, normals, PROV, pythonIdsSha256 } from './design-fixtures.ts';

const opts = (o: Partial<DesignOptions> = {}): DesignOptions => ({ ...DEFAULT_DESIGN_OPTIONS, ...o });

function sample(seed: number, o: Partial<DesignOptions> = {}): DesignCurve {
  const g = grid(0, 0.15, 0.001);
  const ks = normals(seed, 18, 790, 35);
  const us = normals(seed + 1, 18, 0.12, 0.01);
  const tests = ks.map((k, i) => lawCurve(`H${seed}-${i}`, g, (e) => k * Math.pow(0.006 + e, 0.19) + 3 * Math.sin(400 * e + i), us[i], k * Math.pow(0.006, 0.19)));
  return characteristicCurve({ group: { grade: 'TG-460', supplier: 'Northmoor Rolling, "Works 2"' }, grid: g, tests }, opts(o), PROV);
}

describe('curve CSV', () => {
  const c = sample(7);

  it('round-trips every value and the provenance exactly', () => {
    // Source: exact — JavaScript's shortest round-trip number text (ECMA-262 Number::toString).
    const text = designCurveToCsv(c);
    const back = parseDesignCurveCsv(text);
    expect(back.ok).toBe(true);
    if (!back.ok) return;
    expect(back.value.plastic_strain).toEqual(c.plastic_strain);
    expect(back.value.median_mpa).toEqual(c.median_mpa);
    expect(back.value.characteristic_mpa).toEqual(c.characteristic_mpa);
    expect(back.value.extrapolated).toEqual(c.extrapolated);
    expect(back.value.provenance).toEqual(c.provenance);
    expect(back.value.group).toEqual(c.group);
    expect(back.value.e_mpa).toBe(c.e_mpa);
    expect(back.value.valid_to_plastic_strain).toBe(c.valid_to_plastic_strain);
    expect(back.value.warnings).toEqual(c.warnings);
  });

  it('carries the caution in its header and the contract columns', () => {
    const text = designCurveToCsv(c);
    const lines = text.split('\n');
    expect(lines.some((l) => l.startsWith('#') && l.includes(DESIGN_VALUE_CAUTION))).toBe(true);
    expect(lines.find((l) => !l.startsWith('#'))).toBe(CURVE_CSV_COLUMNS.join(','));
    expect(CURVE_CSV_COLUMNS).toEqual(['plastic_strain', 'median_mpa', 'characteristic_mpa', 'extrapolated']);
  });

  it('reports a bad number with its line and column', () => {
    const lines = designCurveToCsv(c).split('\n');
    const head = lines.findIndex((l) => !l.startsWith('#'));
    const parts = lines[head + 3].split(',');
    parts[2] = '4x1';
    lines[head + 3] = parts.join(',');
    const r = parseDesignCurveCsv(lines.join('\n'));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.error.code).toBe('bad_number');
    expect(r.error.location).toEqual({ line: head + 4, column: 3 });
  });
});

describe('idealized CSV', () => {
  it('round-trips the idealizations', () => {
    const c = sample(8);
    const back = parseIdealizedCsv(idealizedToCsv(c));
    expect(back.ok).toBe(true);
    if (!back.ok) return;
    expect(back.value.idealized).toEqual(c.idealized);
    expect(back.value.provenance).toEqual(c.provenance);
    expect(idealizedToCsv(c)).toContain(DESIGN_VALUE_CAUTION);
  });
});

describe('engineering CSV', () => {
  it('round-trips the engineering counterparts', () => {
    const c = sample(14);
    const back = parseEngineeringCsv(engineeringToCsv(c));
    expect(back.ok).toBe(true);
    if (!back.ok) return;
    expect(back.value.engineering).toEqual(c.engineering);
    expect(back.value.plastic_strain).toEqual(c.plastic_strain);
    expect(back.value.extrapolated).toEqual(c.extrapolated);
    expect(engineeringToCsv(c)).toContain(DESIGN_VALUE_CAUTION);
  });
});

describe('JSON', () => {
  it('round-trips a curve and the contract array, keys included', () => {
    const c = sample(9);
    const back = parseDesignCurveJson(designCurveToJson(c));
    expect(back).toEqual({ ok: true, value: c });
    const arr = parseDesignCurvesJson(designCurvesToJson([c, sample(10)]));
    expect(arr.ok).toBe(true);
    if (!arr.ok) return;
    expect(arr.value[0]).toEqual(c);
    // contract keys of `fractile curves --format json`
    for (const k of ['group', 'n', 'plastic_strain', 'median_mpa', 'characteristic_mpa', 'valid_to_plastic_strain', 'extrapolated_from', 'idealized', 'provenance']) {
      expect(Object.keys(JSON.parse(designCurveToJson(c)))).toContain(k);
    }
  });

  it('round-trips a group without a valid range (empty arrays, no idealizations)', () => {
    const g = grid(0, 0.05, 0.005);
    const few = [0, 1, 2].map((i) => lawCurve(`F${i}`, g, (e) => 400 + 1000 * e, 0.05, 400));
    const c = characteristicCurve({ group: { grade: 'TG-1' }, grid: g, tests: few }, opts(), PROV);
    expect(c.plastic_strain).toEqual([]);
    expect(parseDesignCurveJson(designCurveToJson(c))).toEqual({ ok: true, value: c });
    const csv = parseDesignCurveCsv(designCurveToCsv(c));
    expect(csv.ok && csv.value.plastic_strain).toEqual([]);
    expect(csv.ok && csv.value.warnings).toEqual(c.warnings);
    const id = parseIdealizedCsv(idealizedToCsv(c));
    expect(id.ok && id.value.idealized).toBeNull();
  });

  it('names the path of a shape fault', () => {
    const c = JSON.parse(designCurveToJson(sample(11))) as Record<string, unknown>;
    (c.characteristic_mpa as unknown[]).pop();
    const r = parseDesignCurveJson(JSON.stringify(c));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.error.code).toBe('bad_shape');
    expect(r.error.location?.path).toBe('$.characteristic_mpa');
  });
});

describe('provenance', () => {
  it('hashes the sorted test ids as Python’s hashlib does', () => {
    // Source: SHA-256 (FIPS 180-4) by Python's hashlib of the sorted ids joined by "\n".
    const c = sample(12);
    const ids = Array.from({ length: 18 }, (_, i) => `H12-${i}`);
    expect(c.provenance.test_ids_sha256).toBe(pythonIdsSha256(ids));
    expect(c.provenance.n_tests).toBe(18);
    expect(c.provenance.code_version).toBe(PROV.code_version);
    expect(c.provenance.generated_at).toBe(PROV.generated_at);
    expect(c.provenance.caution).toBe(DESIGN_VALUE_CAUTION);
  });

  it('changes the settings hash with the settings, not with their order', () => {
    const a = sample(13);
    const b = sample(13, { coverage: 0.9 });
    expect(a.provenance.settings_hash).not.toBe(b.provenance.settings_hash);
    const reordered = characteristicCurve(
      { group: a.group, grid: [0, 0.001], tests: [] },
      { minTestsPerPoint: 5, multilinearPoints: 6, extrapolate: null, model: 'normal', confidence: 0.75, coverage: 0.95 },
      PROV,
    );
    expect(reordered.provenance.settings_hash).toBe(a.provenance.settings_hash);
  });
});

describe('band kind in every export', () => {
  // Source: the contract of issue 9 — every curve export says "pointwise" (or "simultaneous").
  it('the pointwise curve says so in the JSON, the three CSVs and their headers', () => {
    const c = sample(15);
    expect(c.band).toBe('pointwise');
    const json = JSON.parse(designCurveToJson(c)) as Record<string, unknown>;
    expect(json.band).toBe('pointwise');
    expect(json.band_statement).toMatch(/^pointwise: at each plastic strain separately/);
    expect(json.simultaneous).toBeNull();
    for (const text of [designCurveToCsv(c), idealizedToCsv(c), engineeringToCsv(c)]) {
      const head = text.split('\n').filter((l) => l.startsWith('#'));
      expect(head).toContain('# band: "pointwise"');
      expect(head.some((l) => l.startsWith('# band_statement: "pointwise: '))).toBe(true);
    }
    const back = parseDesignCurveCsv(designCurveToCsv(c));
    expect(back.ok && back.value.band).toBe('pointwise');
  });

  it('a simultaneous curve round-trips with its kind and critical value', () => {
    const c = sample(16, { band: 'simultaneous', bandSimulations: 500 });
    expect(c.band).toBe('simultaneous');
    expect(parseDesignCurveJson(designCurveToJson(c))).toEqual({ ok: true, value: c });
    const csv = parseDesignCurveCsv(designCurveToCsv(c));
    expect(csv.ok && csv.value.band).toBe('simultaneous');
    expect(csv.ok && csv.value.characteristic_mpa).toEqual(c.characteristic_mpa);
    expect(designCurveToCsv(c)).toContain('# band: "simultaneous"');
  });

  it('reads documents written before the band was stated as pointwise, and rejects an unknown kind by path', () => {
    const c = JSON.parse(designCurveToJson(sample(17))) as Record<string, unknown>;
    delete c.band;
    delete c.band_statement;
    delete c.simultaneous;
    const old = parseDesignCurveJson(JSON.stringify(c));
    expect(old.ok && old.value.band).toBe('pointwise');
    const bad = parseDesignCurveJson(JSON.stringify({ ...c, band: 'joint' }));
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.error.location?.path).toBe('$.band');
    const text = designCurveToCsv(sample(17)).split('\n').filter((l) => !l.startsWith('# band')).join('\n');
    const csv = parseDesignCurveCsv(text);
    expect(csv.ok && csv.value.band).toBe('pointwise');
  });
});

describe('CSV cells', () => {
  // Source: RFC 4180 quoting, read back by csv-parse (the library the readers use).
  it('quotes text that needs it and reads back the same', () => {
    const cells = ['plain', 'with, comma', 'with "quotes"', 'line\nbreak', 12.5, -0, true, null];
    const line = cells.map(csvCell).join(',');
    const [row] = parse(line + '\n') as string[][];
    expect(row).toEqual(['plain', 'with, comma', 'with "quotes"', 'line\nbreak', '12.5', '0', 'true', '']);
  });
});
