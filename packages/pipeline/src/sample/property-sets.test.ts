import { describe, expect, it } from 'vitest';
import { correlationMatrices } from '@fractile/stats';
import { aggregateRows } from '../aggregate/stage.ts';
import type { PropertyKey, PropertyRow } from '../properties.ts';
import { distributionModels } from './distribution-model.ts';
import { sampleGroups } from './property-sets.ts';

function rows(n: number): PropertyRow[] {
  // yield and tensile strength tied by a fixed ratio plus independent scatter: a strong rank correlation
  let s = 12345;
  const u = () => ((s = (Math.imul(s, 1103515245) + 12345) >>> 0) / 4294967296);
  const z = () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
  return Array.from({ length: n }, (_, i) => {
    const y = 400 + 20 * z();
    return {
      lab: 'l', test_id: String(i), grade: 'G', supplier: 'S', heat: null, tested_on: '2024-01-01', modulus_gpa: null, rp02_mpa: y, rt05_mpa: null, reh_mpa: null,
      rel_mpa: null, ype_pct: null, rm_mpa: y / 0.8 + 8 * z(), ag_pct: 15 + z(), agt_pct: null, a_pct: null, yt_ratio: null, n_value: null, k_mpa: null, yield_mpa: y,
      yield_definition: 'rp0.2', shape_class: 'continuous', flags: [], given: false, failure: null, orientation: null, temperature_c: null, shape: null, test_pk: i, settings_hash: 'h',
    };
  });
}

function models(n: number, properties: PropertyKey[], bootstrap = 0) {
  const r = rows(n);
  const agg = aggregateRows(r, { by: ['grade'], catalog: null, properties });
  return distributionModels(agg, r, { by: ['grade'], properties, bootstrap, seed: 1 });
}

describe('correlated property sets', () => {
  it('reproduce the group\'s rank correlations and are the same for the same seed', () => {
    const m400 = models(400, ['yield_mpa', 'rm_mpa', 'ag_pct']);
    const [a] = sampleGroups(m400, 4000, 3);
    const [b] = sampleGroups(m400, 4000, 3);
    expect(a.rows).toEqual(b.rows);
    expect(a.marginals.map((m) => m.property)).toEqual(['yield_mpa', 'rm_mpa', 'ag_pct']);
    const m = correlationMatrices({ y: a.rows.map((r) => r.yield_mpa), t: a.rows.map((r) => r.rm_mpa), g: a.rows.map((r) => r.ag_pct) });
    // the copula keeps Spearman's rho exactly in expectation (rho = 2 sin(pi rho_S / 6), Kruskal 1958);
    // 4000 sets: sampling SD of rho_S about 0.01
    expect(Math.abs((m.spearman[0][1] as number) - (a.spearman[0][1] as number))).toBeLessThan(0.04);
    expect(Math.abs((m.spearman[0][2] as number) - (a.spearman[0][2] as number))).toBeLessThan(0.04);
  });

  it('warns instead of sampling a property the group has no values for', () => {
    const [s] = sampleGroups(models(50, ['yield_mpa', 'rm_mpa', 'n_value']), 10, 1);
    expect(s.properties).toEqual(['yield_mpa', 'rm_mpa']);
    expect(s.warnings.join(' ')).toMatch(/n_value/);
  });
});
