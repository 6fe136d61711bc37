/**
 * Reduction settings per grade: the global defaults of the curves package, with the grade's yield
 * definition, offsets and material family from the catalog. The settings hash keys the results,
 * so editing one grade's entry recomputes that grade's tests only.
 */
import { DEFAULT_REDUCE_SETTINGS, type ReduceSettings } from '@fractile/curves';
import { gradeSettings, type Catalog } from '../catalog.ts';
import { hashOf } from '../hash.ts';

export interface ReduceOverrides {
  fitLaws?: boolean;
  gridPlasticStrain?: number[];
  modulusWindow?: [number, number];
  nWindowPct?: [number, number];
}

export function reduceSettingsFor(catalog: Catalog | null, grade: string, overrides: ReduceOverrides = {}): ReduceSettings {
  const entry = gradeSettings(catalog, grade);
  return {
    ...DEFAULT_REDUCE_SETTINGS,
    ...overrides,
    family: entry.family,
    yieldDefinition: entry.yield_definition,
    rpOffsetPct: entry.rp_offset_pct,
    rtTotalPct: entry.rt_total_pct,
  };
}

export function reduceSettingsHash(settings: ReduceSettings): string {
  return hashOf({ stage: 'reduce', settings });
}
