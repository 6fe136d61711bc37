/**
 * Which per-test values a reduction flag (packages/curves/src/flags.ts) makes unfit for the
 * population statistics. A flag that says how a value was obtained, or that the reduction already
 * answered by giving no value, withholds nothing; a flag that says a definition of ISO 6892-1 was
 * not met withholds the values that rest on it. `grid_curve` is the test's true stress on the
 * common grid (the design curves' input).
 *
 * - crosshead_only_modulus: the slope includes the machine's compliance (ISO 6892-1 and ASTM E111
 *   ask for an extensometer), so E is not the material's; Rp is read off an offset line drawn with
 *   that slope → modulus_gpa, rp02_mpa.
 * - elongation_from_crosshead: crosshead travel is not the extension over L0 → ag_pct, agt_pct,
 *   a_pct, rt05_mpa, ype_pct and the grid curve (the reduction gives none of them already; listed so
 *   that a stored value from elsewhere would still be held out).
 * - modulus_implausible: E outside the family's range means the extension channel is wrong (gauge
 *   length, knife edges) or the fit is → modulus_gpa and Rp from that slope, rp02_mpa.
 * - modulus_poor_fit: the elastic line does not describe the window → modulus_gpa.
 * - noisy: noise above 0.5 % of Rm biases what is read from a single peak or a short window:
 *   the upper yield point (a maximum, raised by the noise), the end of the yield plateau (ype) and
 *   the modulus (slope of a short elastic window) → reh_mpa, ype_pct, modulus_gpa.
 * - slipping: a grip or knife-edge slip shifts every strain read after it, at an unknown point of
 *   the record → every strain-based value: modulus_gpa, rp02_mpa, rt05_mpa, ype_pct, ag_pct,
 *   agt_pct, a_pct, n_value, k_mpa and the grid curve (force-only Rm, ReH, ReL stay).
 * - extensometer_removed_early: no extension to fracture → a_pct; where maximum force came after
 *   the removal (no Ag), the hardening window may reach past it → n_value, k_mpa as well.
 * - fracture_not_detected: the last point is taken as fracture → a_pct.
 * Derived values follow their sources: yield_mpa with the property of its definition (rp0.2 →
 * rp02_mpa, rt0.5 → rt05_mpa, reh → reh_mpa, rel → rel_mpa), yt_ratio with yield_mpa or rm_mpa,
 * k_mpa with n_value.
 * Withholding nothing: given, unload_reload (loops are cut out first), spikes_removed (removed
 * before any value is read), past_max_force_ignored, n_window_reduced, n_window_short,
 * rp_not_reached, rt_not_reached and the yield_definition_* flags (the value is already null).
 */
import type { FlagName, TestProperties } from '@fractile/curves';
import type { PropertyKey } from './properties.ts';

/** A per-test value a flag can withhold: a numeric property (including ype and K) or the grid curve. */
export type WithheldItem = PropertyKey | 'ype_pct' | 'k_mpa' | 'grid_curve';

type Rule = (r: Pick<TestProperties, 'ag_pct'>) => readonly WithheldItem[];

const STRAIN_BASED: readonly WithheldItem[] = ['modulus_gpa', 'rp02_mpa', 'rt05_mpa', 'ype_pct', 'ag_pct', 'agt_pct', 'a_pct', 'n_value', 'k_mpa', 'grid_curve'];

export const FLAG_RULES: Partial<Record<FlagName, Rule>> = {
  crosshead_only_modulus: () => ['modulus_gpa', 'rp02_mpa'],
  elongation_from_crosshead: () => ['ag_pct', 'agt_pct', 'a_pct', 'rt05_mpa', 'ype_pct', 'grid_curve'],
  modulus_implausible: () => ['modulus_gpa', 'rp02_mpa'],
  modulus_poor_fit: () => ['modulus_gpa'],
  noisy: () => ['reh_mpa', 'ype_pct', 'modulus_gpa'],
  slipping: () => STRAIN_BASED,
  extensometer_removed_early: (r) => (r.ag_pct === null ? ['a_pct', 'n_value', 'k_mpa'] : ['a_pct']),
  fracture_not_detected: () => ['a_pct'],
};

const YIELD_SOURCE: Record<string, PropertyKey> = { 'rp0.2': 'rp02_mpa', 'rt0.5': 'rt05_mpa', reh: 'reh_mpa', rel: 'rel_mpa' };

/** The values a test's flags withhold, each with the flags that withhold it (in flag order). */
export function withheldByFlags(r: Pick<TestProperties, 'flags' | 'ag_pct' | 'yield_definition'>): Map<WithheldItem, string[]> {
  const out = new Map<WithheldItem, string[]>();
  const add = (item: WithheldItem, why: string[]) => {
    const cur = out.get(item) ?? [];
    for (const w of why) if (!cur.includes(w)) cur.push(w);
    out.set(item, cur);
  };
  for (const f of r.flags) {
    const rule = FLAG_RULES[f as FlagName];
    if (rule) for (const item of rule(r)) add(item, [f]);
  }
  const src = r.yield_definition ? YIELD_SOURCE[r.yield_definition] : undefined;
  if (src && out.has(src)) add('yield_mpa', out.get(src)!);
  for (const from of ['yield_mpa', 'rm_mpa'] as const) if (out.has(from)) add('yt_ratio', out.get(from)!);
  if (out.has('n_value')) add('k_mpa', out.get('n_value')!);
  return out;
}
