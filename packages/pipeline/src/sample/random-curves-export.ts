/**
 * Exports of random curves: a long table (one row per curve point: the group's fields, sample,
 * plastic_strain, true_stress_mpa) after `#` header lines with the caution and the provenance,
 * and a JSON document with the caution, per group the provenance, a summary of the curve model
 * and the curves (each its own arrays, valid to its own uniform strain, the last point). The table
 * comes as rows and header lines; the caller writes them through its one CSV cell writer.
 * Units: plastic strain mm/mm (true), stress MPa (true).
 */
import { DESIGN_VALUE_CAUTION } from '@fractile/report/caution';
import type { GroupCurveModel } from './curve-models.ts';
import type { RandomCurveSet } from './random-curves.ts';
import { sampleProvenance, type SampleProvenance } from './sample-provenance.ts';
import type { CurveModelStageResult } from './stage.ts';

export const RANDOM_CURVES_FORMAT = 'fractile-random-curves';
export const RANDOM_CURVES_VERSION = 1;
export const RANDOM_CURVE_COLUMNS = ['sample', 'plastic_strain', 'true_stress_mpa'] as const;

export interface CurveModelSummary {
  method: string;
  n_tests: number;
  components: number;
  variance_explained: number;
  uniform_strain: { family: string; parameters: Record<string, number>; anderson_darling: number; p_value: number | null; data_range: { min: number; max: number } };
  /** Spearman matrix of [uniform plastic strain, score 1 … K] */
  spearman: (number | null)[][];
}

export interface RandomCurvesExport {
  format: typeof RANDOM_CURVES_FORMAT;
  format_version: typeof RANDOM_CURVES_VERSION;
  caution: string;
  code_version: string;
  generated_at: string;
  sample_run: number;
  groups: { group: Record<string, string>; provenance: SampleProvenance; model: CurveModelSummary | null; seed: number; n: number; monotone: boolean; warnings: string[]; curves: RandomCurveSet['curves'] }[];
}

function summary(m: GroupCurveModel): CurveModelSummary | null {
  const c = m.model;
  if (!c) return null;
  return {
    method: c.method,
    n_tests: c.n,
    components: c.components.length,
    variance_explained: c.variance_explained,
    uniform_strain: { family: c.uniform_strain.model, parameters: c.uniform_strain.params, anderson_darling: c.uniform_strain.ad, p_value: c.uniform_strain.p, data_range: { min: c.uniform_strain.min, max: c.uniform_strain.max } },
    spearman: c.spearman,
  };
}

const key = (g: Record<string, string>) => JSON.stringify(g);

export function randomCurvesExport(stage: Pick<CurveModelStageResult, 'run' | 'settings' | 'models'>, sets: readonly RandomCurveSet[], codeVersion: string, generatedAt: string): RandomCurvesExport {
  return {
    format: RANDOM_CURVES_FORMAT,
    format_version: RANDOM_CURVES_VERSION,
    caution: DESIGN_VALUE_CAUTION,
    code_version: codeVersion,
    generated_at: generatedAt,
    sample_run: stage.run,
    groups: sets.map((s) => {
      const m = stage.models.find((x) => key(x.group) === key(s.group))!;
      const settings = { ...stage.settings, seed: s.seed, n: s.n, monotone: s.monotone };
      return { group: s.group, provenance: sampleProvenance(m, settings, codeVersion, generatedAt), model: summary(m), seed: s.seed, n: s.n, monotone: s.monotone, warnings: s.warnings, curves: s.curves };
    }),
  };
}

/** The long table's rows (group fields first) and its `#` header lines (caution, provenance per group). */
export function randomCurvesTable(doc: RandomCurvesExport): { header: string[]; columns: string[]; rows: Record<string, string | number>[] } {
  const fields = [...new Set(doc.groups.flatMap((g) => Object.keys(g.group)))];
  const header = [
    `${RANDOM_CURVES_FORMAT}, csv format ${RANDOM_CURVES_VERSION}`,
    `caution: ${DESIGN_VALUE_CAUTION}`,
    `units: plastic_strain true plastic strain (mm/mm), true_stress_mpa true stress (MPa); each sample ends at its own uniform plastic strain`,
    `code_version: ${doc.code_version}, generated_at: ${doc.generated_at}, sample run ${doc.sample_run}`,
    ...doc.groups.map((g) => `provenance: ${JSON.stringify(g.provenance)}`),
  ];
  const rows: Record<string, string | number>[] = [];
  for (const g of doc.groups) {
    for (const c of g.curves) {
      for (let i = 0; i < c.plastic_strain.length; i++) rows.push({ ...g.group, sample: c.sample, plastic_strain: c.plastic_strain[i], true_stress_mpa: c.true_stress_mpa[i] });
    }
  }
  return { header, columns: [...fields, ...RANDOM_CURVE_COLUMNS], rows };
}
