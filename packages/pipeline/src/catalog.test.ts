/**
 * Catalog validation: every fault named by file, line and column (RFC 8259 strict JSON: no
 * trailing commas, no comments), a misspelt key an error rather than a silent default.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { CatalogError, loadCatalog } from './catalog.ts';
import { positionOf } from './json-located.ts';

const dir = mkdtempSync(join(tmpdir(), 'fractile-catalog-'));
function faultOf(text: string): { line: number; column: number; message: string } {
  const f = join(dir, 'grades.json');
  writeFileSync(f, text);
  try {
    loadCatalog(f);
  } catch (e) {
    expect(e).toBeInstanceOf(CatalogError);
    const c = e as CatalogError;
    return { line: c.line, column: c.column, message: c.message };
  }
  throw new Error('no fault found');
}

describe('grade catalog validation', () => {
  it('counts lines and columns from 1', () => {
    expect(positionOf('ab\ncd', 0)).toEqual({ line: 1, column: 1 });
    expect(positionOf('ab\ncd', 4)).toEqual({ line: 2, column: 2 });
  });

  it('names the line and column of a syntax fault (a trailing comma)', () => {
    // RFC 8259 §4: no comma after the last member
    const f = faultOf('{\n  "grades": {\n    "G": { "family": "steel", }\n  }\n}\n');
    expect(f).toMatchObject({ line: 3, column: 31 });
    expect(f.message).toMatch(/comma after the last entry/);
  });

  it('names a misspelt grade key at its line and column', () => {
    const f = faultOf('{\n  "grades": {\n    "G": {\n      "family": "steel",\n      "yeild_definition": "reh"\n    }\n  }\n}\n');
    expect(f).toMatchObject({ line: 5, column: 7 });
    expect(f.message).toMatch(/unknown key "yeild_definition".*yield_definition/);
  });

  it('names wrong values: a limit given as text, a minimum above the maximum, a bad model', () => {
    expect(faultOf('{"grades": {"G": {"spec": {"yield_min_mpa": "355"}}}}')).toMatchObject({ line: 1, column: 28, message: expect.stringMatching(/spec.yield_min_mpa must be a number or null, got "355"/) });
    expect(faultOf('{"grades": {"G": {"spec": {"tensile_min_mpa": 700, "tensile_max_mpa": 500}}}}').message).toMatch(/tensile_min_mpa \(700\) is above spec.tensile_max_mpa \(500\)/);
    expect(faultOf('{"grades": {"G": {"properties": {"yield_mpa": {"headline_model": "gamma"}}}}}').message).toMatch(/headline_model must be one of normal, lognormal, weibull, order-statistic/);
    expect(faultOf('{"grade": {}}').message).toMatch(/"grades"/);
    expect(faultOf('{"grades": {}, "units": "MPa"}')).toMatchObject({ line: 1, column: 16, message: expect.stringMatching(/unknown top-level key "units"/) });
  });

  it('refuses negative limits and a yield-to-tensile ratio outside (0, 1], naming the JSON Pointer (RFC 6901)', () => {
    expect(faultOf('{"grades": {"G": {"spec": {"yield_min_mpa": -355}}}}')).toMatchObject({ line: 1, column: 28, message: 'grade "G": spec.yield_min_mpa must not be negative, got -355 (at /grades/G/spec/yield_min_mpa)' });
    expect(faultOf('{"grades": {"G": {"spec": {"elongation_min_pct": -1}}}}').message).toMatch(/elongation_min_pct must not be negative/);
    // Re ≤ Rm (Rm is the stress at maximum force, ISO 6892-1), so Re/Rm ≤ 1
    expect(faultOf('{"grades": {"G": {"spec": {"yt_max": 1.2}}}}').message).toMatch(/yt_max must lie in \(0, 1\]/);
    expect(faultOf('{"grades": {"G": {"spec": {"yt_max": 0}}}}').message).toMatch(/yt_max must lie in \(0, 1\]/);
    // RFC 6901 §3: "~" is written "~0" and "/" is written "~1" in a reference token
    expect(faultOf('{"grades": {"S/1~a": {"family": "wood"}}}').message).toMatch(/\(at \/grades\/S~11~0a\/family\)$/);
    expect(faultOf('{"grades": {"G": {"properties": {"yeild_mpa": {}}}}}')).toMatchObject({ message: expect.stringMatching(/unknown property "yeild_mpa".*\(at \/grades\/G\/properties\/yeild_mpa\)$/) });
    expect(faultOf('{"grades": {"G": {"rp_offset_pct": "0.2"}}}').message).toMatch(/rp_offset_pct must be a positive number.*\(at \/grades\/G\/rp_offset_pct\)$/);
  });

  it('reads a valid catalog with a $comment', () => {
    const f = join(dir, 'ok.json');
    writeFileSync(f, JSON.stringify({ $comment: 'invented grades', grades: { G: { yield_definition: 'reh', spec: { yield_min_mpa: 355 }, properties: { yield_mpa: { prior_v: 0.07 } } } } }));
    expect(loadCatalog(f).grades.G).toMatchObject({ family: 'steel', yield_definition: 'reh', spec: { yield_min_mpa: 355 }, properties: { yield_mpa: { prior_v: 0.07 } } });
  });
});
