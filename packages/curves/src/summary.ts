/**
 * Summary-only records (older certificates): the given values carried into the same property
 * keys, flagged `given`. The given yield fills the field of its definition; `yield_mpa` is set
 * only when that definition is the grade's (else null, flag `yield_definition_differs`); a yield
 * given without a definition is taken as the grade's (flag `yield_definition_assumed`). Uniform
 * elongation goes to Ag, elongation after fracture to A; quantities a certificate does not give
 * (E, Agt, n, K, the shape) are null.
 *
 * In: values in MPa and percent. Out: TestProperties; non-finite inputs count as missing.
 */
import type { FlagName } from './flags.ts';
import type { ReduceSettings, TestProperties, YieldDefinition } from './types.ts';

export interface SummaryInput {
  yieldMpa?: number | null;
  yieldDefinition?: YieldDefinition | null;
  tensileMpa?: number | null;
  uniformElongationPct?: number | null;
  elongationPct?: number | null;
}

const val = (v: number | null | undefined): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

export function propertiesFromSummary(sum: SummaryInput, settings: ReduceSettings): TestProperties {
  const flags: FlagName[] = ['given'];
  const y = val(sum.yieldMpa);
  const rm = val(sum.tensileMpa);
  let def: YieldDefinition | null = sum.yieldDefinition ?? null;
  if (y !== null && def === null) { def = settings.yieldDefinition; flags.push('yield_definition_assumed'); }
  const at = (d: YieldDefinition) => (y !== null && def === d ? y : null);
  let yieldMpa: number | null = null;
  if (y !== null) {
    if (def === settings.yieldDefinition) yieldMpa = y;
    else flags.push('yield_definition_differs');
  }
  return {
    modulus_gpa: null,
    rp02_mpa: at('rp0.2'),
    rt05_mpa: at('rt0.5'),
    reh_mpa: at('reh'),
    rel_mpa: at('rel'),
    ype_pct: null,
    rm_mpa: rm,
    ag_pct: val(sum.uniformElongationPct),
    agt_pct: null,
    a_pct: val(sum.elongationPct),
    yt_ratio: yieldMpa !== null && rm !== null && rm > 0 ? yieldMpa / rm : null,
    n_value: null,
    k_mpa: null,
    yield_mpa: yieldMpa,
    yield_definition: y !== null ? def : null,
    shape_class: null,
    flags,
  };
}
