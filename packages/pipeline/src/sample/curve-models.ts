/**
 * Per group, the random-curve model of its tests' true stress–plastic strain curves on the common
 * grid (@fractile/stats fitCurveModel: functional principal components of the log-stress curves on
 * the normalized strain εp/εp,u, with the uniform strain, joined by a Gaussian copula). The tests
 * are those of the population (population.ts: a curve withheld by a flag, e.g. slip, and excluded
 * tests are left out); tests without a curve or a uniform strain are left out of the model with
 * the reason. Pure: rows (read with their grid curves) and the grids in, one model per group out.
 */
import { fitCurveModel, type CurveModel, type CurveModelOptions } from '@fractile/stats';
import { groupRows, type GroupField } from '../aggregate/grouping.ts';
import { commonGrid } from '../common-grid.ts';
import { testIdsSha256 } from '../design/provenance.ts';
import type { PropertyRow } from '../properties.ts';

export interface GroupCurveModel {
  group: Record<string, string>;
  /** tests whose curves the model was fitted on */
  n_tests: number;
  test_ids_sha256: string;
  grid: number[];
  model: CurveModel | null;
  warnings: string[];
}

const hasGrid = (r: PropertyRow) => Boolean(r.grid_stress_mpa?.some((v) => v !== null));

export function groupCurveModels(rows: PropertyRow[], grids: Record<string, number[]>, by: GroupField[], opts: CurveModelOptions = {}): GroupCurveModel[] {
  const out: GroupCurveModel[] = [];
  for (const g of groupRows(rows, by, [])) {
    const members = g.rows.map((i) => rows[i]).filter(hasGrid);
    if (members.length === 0) continue;
    const warnings: string[] = [];
    const grid = commonGrid(members, grids);
    if (!grid) {
      out.push({ group: g.key, n_tests: 0, test_ids_sha256: testIdsSha256([]), grid: [], model: null, warnings: ['the tests of this group were reduced on different plastic-strain grids: no curve model'] });
      continue;
    }
    const tests = members.map((r) => ({ id: `${r.lab}/${r.test_id}`, stress_mpa: r.grid_stress_mpa ?? [], uniform_plastic_strain: r.uniform_plastic_strain ?? null }));
    const m = fitCurveModel(grid, tests, opts);
    const leftOut = m.left_out;
    if (leftOut.length > 0) {
      const reasons = new Map<string, number>();
      for (const l of leftOut) reasons.set(l.reason, (reasons.get(l.reason) ?? 0) + 1);
      warnings.push(`${leftOut.length} test curve(s) left out of the model: ${[...reasons].map(([r, c]) => `${c} ${r}`).join('; ')}`);
    }
    if ('code' in m) {
      warnings.push(`${m.code}: ${m.message}`);
      out.push({ group: g.key, n_tests: 0, test_ids_sha256: testIdsSha256([]), grid, model: null, warnings });
      continue;
    }
    if (m.extended.count > 0) {
      warnings.push(`${m.extended.count} test(s) reach maximum force past their last grid stress by more than one grid step (largest ${m.extended.largest_gap.toPrecision(3)}): their curves are continued there along the slope of their last grid step`);
    }
    out.push({ group: g.key, n_tests: m.n, test_ids_sha256: testIdsSha256(m.test_ids), grid, model: m, warnings });
  }
  return out;
}
