/**
 * The population rules: which values a reduction flag withholds (flag-rules.ts, reasons from
 * ISO 6892-1 / ASTM E111 in its doc comment) and how exclusions leave whole tests out; counted per
 * reason. Pure functions on hand-made rows.
 */
import { describe, expect, it } from 'vitest';
import { applyPopulationRules, leftOutCounts, withheldByFlags, type PropertyRow } from '@fractile/pipeline';

function row(test_id: string, flags: string[], extra: Partial<PropertyRow> = {}): PropertyRow {
  return {
    lab: 'L', test_id, grade: 'G', supplier: 'S', heat: null, tested_on: '2025-01-01', modulus_gpa: 205, rp02_mpa: 400, rt05_mpa: 402, reh_mpa: null, rel_mpa: null,
    ype_pct: null, rm_mpa: 520, ag_pct: 12, agt_pct: 12.3, a_pct: 24, yt_ratio: 400 / 520, n_value: 0.15, k_mpa: 800, yield_mpa: 400, yield_definition: 'rp0.2',
    shape_class: 'continuous', flags, given: false, failure: null, orientation: null, temperature_c: null, shape: 'round', test_pk: Number(test_id.replace(/\D/g, '')) || 1,
    settings_hash: 'h', grid_stress_mpa: [410, 430], ...extra,
  };
}

describe('flag rules', () => {
  it('a crosshead-only modulus withholds E and the Rp read with it, and so the yield and Y/T (ISO 6892-1 needs an extensometer)', () => {
    const w = withheldByFlags(row('1', ['crosshead_only_modulus']));
    expect([...w.keys()].sort()).toEqual(['modulus_gpa', 'rp02_mpa', 'yield_mpa', 'yt_ratio'].sort());
    expect(w.get('yield_mpa')).toEqual(['crosshead_only_modulus']);
  });
  it('an Rt0.5 grade keeps its yield under a crosshead modulus (total extension needs no slope)', () => {
    const w = withheldByFlags(row('1', ['crosshead_only_modulus'], { yield_definition: 'rt0.5' }));
    expect(w.has('yield_mpa')).toBe(false);
    expect(w.has('modulus_gpa')).toBe(true);
  });
  it('slipping withholds every strain-based value and the grid curve, not the force-based Rm', () => {
    const w = withheldByFlags(row('1', ['slipping']));
    for (const k of ['modulus_gpa', 'rp02_mpa', 'rt05_mpa', 'ag_pct', 'agt_pct', 'a_pct', 'n_value', 'k_mpa', 'grid_curve', 'yield_mpa', 'yt_ratio']) expect(w.has(k as never), k).toBe(true);
    expect(w.has('rm_mpa')).toBe(false);
  });
  it('noise withholds the peak ReH (and ReL-based yield is kept); informational flags withhold nothing', () => {
    const w = withheldByFlags(row('1', ['noisy'], { yield_definition: 'reh', reh_mpa: 410, yield_mpa: 410 }));
    expect(w.has('reh_mpa') && w.has('yield_mpa') && w.has('yt_ratio') && w.has('modulus_gpa')).toBe(true);
    expect(w.has('rm_mpa')).toBe(false);
    expect(withheldByFlags(row('1', ['given', 'unload_reload', 'spikes_removed', 'past_max_force_ignored', 'n_window_reduced'])).size).toBe(0);
  });
  it('early extensometer removal withholds A, and n/K only where maximum force came after the removal', () => {
    expect([...withheldByFlags(row('1', ['extensometer_removed_early'])).keys()]).toEqual(['a_pct']);
    expect([...withheldByFlags(row('1', ['extensometer_removed_early'], { ag_pct: null })).keys()].sort()).toEqual(['a_pct', 'k_mpa', 'n_value']);
  });
});

describe('population', () => {
  const rows = [row('1', []), row('2', ['crosshead_only_modulus']), row('3', ['noisy', 'modulus_poor_fit']), row('4', [])];
  const exclusions = [{ id: 1, lab: 'L', test_id: '4', test_row_id: 4, action: 'exclude' as const, reason: 'bad specimen', decided_by: 'qa', decided_at: '2025-02-01T00:00:00.000Z' }];
  it('leaves excluded tests out and nulls withheld values, counting each reason', () => {
    const pop = applyPopulationRules(rows, exclusions);
    expect(pop.rows.map((r) => r.test_id)).toEqual(['1', '2', '3']);
    expect(pop.excluded.map((r) => r.test_id)).toEqual(['4']);
    expect(pop.excluded[0].exclusion).toEqual({ reason: 'bad specimen', decided_by: 'qa', decided_at: '2025-02-01T00:00:00.000Z' });
    expect(pop.rows[1].modulus_gpa).toBeNull();
    expect(pop.rows[1].rm_mpa).toBe(520);
    const lo = leftOutCounts(pop.rows, pop.excluded, 'modulus_gpa', pop.options);
    // test 2 (crosshead), test 3 (noisy and poor fit: counted once in n, under both reasons), test 4 (excluded)
    expect(lo).toEqual({ n: 3, by_reason: { crosshead_only_modulus: 1, noisy: 1, modulus_poor_fit: 1, excluded: 1 }, flagged_values_included: false, excluded_tests_included: false });
    expect(leftOutCounts(pop.rows, pop.excluded, 'rm_mpa', pop.options)).toMatchObject({ n: 1, by_reason: { excluded: 1 } });
    // the input rows are not changed
    expect(rows[1].modulus_gpa).toBe(205);
  });
  it('keeps flagged values and excluded tests on request', () => {
    const pop = applyPopulationRules(rows, exclusions, { includeFlagged: true, includeExcluded: true });
    expect(pop.rows.length).toBe(4);
    expect(pop.rows[1].modulus_gpa).toBe(205);
    expect(pop.rows[3].exclusion?.reason).toBe('bad specimen');
    expect(leftOutCounts(pop.rows, pop.excluded, 'modulus_gpa', pop.options)).toEqual({ n: 0, by_reason: {}, flagged_values_included: true, excluded_tests_included: true });
  });
});
