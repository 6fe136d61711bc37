/**
 * Which points a series is charted on: heat means when the heats differ (the between-heat
 * variance component is real), every test otherwise. The baseline's tests (see baseline.ts) are
 * grouped by heat and the one-way random-effects F test (variance-components.ts, ISO 5725-2
 * layout) is run at level α (default 0.05); p < α charts heat means. Without heats, or with no
 * heat of two or more tests, the series is charted by test. Tests per point and the SD of a test
 * and of a point come from the same baseline, for the chart's design.
 * Units: SDs in the property's units.
 */
import type { SeriesPoint } from './types.ts';
import type { ChartUnit } from './self-starting.ts';
import { summarizeGroup, varianceComponents, type VarianceComponents } from './variance-components.ts';

export const DEFAULT_HEAT_EFFECT_ALPHA = 0.05;

export interface ChartStructure {
  unit: ChartUnit;
  /** Why, in words. */
  reason: string;
  /** 'auto' when decided from the baseline, 'given' when the caller chose. */
  decided: 'auto' | 'given';
  alpha: number;
  baseline: { tests: number; from: string; to: string };
  /** Variance components on the baseline, or null where they cannot be estimated. */
  components: VarianceComponents | null;
  /** Mean tests per charted point in the baseline. */
  tests_per_point: number;
  /** SD of one test (s_r² + s_L², or the baseline's sample SD) and of one charted point. */
  test_sd: number;
  point_sd: number;
}

export function chartStructure(tests: readonly SeriesPoint[], range: { start: number; end: number }, given: ChartUnit | 'auto' = 'auto', alpha = DEFAULT_HEAT_EFFECT_ALPHA): ChartStructure {
  const base = tests.slice(range.start, range.end + 1);
  const byHeat = new Map<string, number[]>();
  const groups: number[][] = [];
  for (const t of base) {
    if (!t.heat) groups.push([t.value]);
    else {
      const g = byHeat.get(t.heat);
      if (g) g.push(t.value);
      else {
        const fresh = [t.value];
        byHeat.set(t.heat, fresh);
        groups.push(fresh);
      }
    }
  }
  const vc = varianceComponents(groups.map(summarizeGroup));
  const components = 'code' in vc ? null : vc;
  const all = summarizeGroup(base.map((t) => t.value));
  const sampleSd = all.n > 1 ? Math.sqrt(all.ss / (all.n - 1)) : 0;
  let unit: ChartUnit;
  let reason: string;
  if (given !== 'auto') {
    unit = given;
    reason = `chart unit given: ${given}`;
  } else if (!components) {
    unit = 'tests';
    reason = byHeat.size === 0 ? 'no heats recorded: every test charted' : `heat effect not estimable (${(vc as { message: string }).message}): every test charted`;
  } else if (components.p < alpha) {
    unit = 'heat-means';
    reason = `heats differ (one-way random-effects F = ${components.f.toPrecision(3)}, p = ${components.p.toPrecision(2)} < ${alpha}): heat means charted`;
  } else {
    unit = 'tests';
    reason = `no heat effect shown (F = ${components.f.toPrecision(3)}, p = ${components.p.toPrecision(2)} ≥ ${alpha}): every test charted`;
  }
  const points = unit === 'tests' ? base.length : groups.length;
  const perPoint = points > 0 ? base.length / points : 1;
  const testSd = components ? Math.sqrt(components.var_total) : sampleSd;
  const pointSd = unit === 'tests' || !components ? testSd : Math.sqrt(components.var_between + components.var_within / perPoint);
  return {
    unit,
    reason,
    decided: given === 'auto' ? 'auto' : 'given',
    alpha,
    baseline: { tests: base.length, from: base[0]?.date ?? '', to: base[base.length - 1]?.date ?? '' },
    components,
    tests_per_point: perPoint,
    test_sd: testSd,
    point_sd: pointSd,
  };
}
