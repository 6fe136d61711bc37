/**
 * The population every statistic is computed on: the current per-test rows without the tests an
 * engineer excluded (with a recorded reason, table `exclusions`) and without the values a
 * reduction flag makes unfit (flag-rules.ts). Every stage reads its rows through here
 * (`loadProperties` by default, or `loadPopulation` where the counts of what was left out are
 * wanted), so aggregate, design curves, drift, sampling and compliance all see the same
 * population. Options bring either back in. The per-test listing (`fractile properties`) reads
 * the values as reduced instead.
 */
import type { ExclusionRecord } from '@fractile/store';
import { withheldByFlags, type WithheldItem } from './flag-rules.ts';
import type { PropertyRow } from './properties.ts';

export interface PopulationOptions {
  /** keep values that a flag withholds (default: left out) */
  includeFlagged?: boolean;
  /** keep tests that are excluded (default: left out) */
  includeExcluded?: boolean;
}

export interface Population {
  /** rows for the statistics; `withheld` names what was left out of each and why */
  rows: PropertyRow[];
  /** current tests left out by an exclusion, values as reduced, `exclusion` set */
  excluded: PropertyRow[];
  /** the exclusions in force (every test, also outside the filter) */
  exclusions: ExclusionRecord[];
  options: Required<PopulationOptions>;
}

const identity = (lab: string, testId: string) => `${lab}\u0000${testId}`;

/** Pure part: applies exclusions and flag rules to rows as reduced. */
export function applyPopulationRules(rows: readonly PropertyRow[], exclusions: readonly ExclusionRecord[], opts: PopulationOptions = {}): Population {
  const options = { includeFlagged: Boolean(opts.includeFlagged), includeExcluded: Boolean(opts.includeExcluded) };
  const byId = new Map(exclusions.map((e) => [identity(e.lab, e.test_id), e]));
  const kept: PropertyRow[] = [];
  const excluded: PropertyRow[] = [];
  for (const r of rows) {
    const ex = byId.get(identity(r.lab, r.test_id));
    const exclusion = ex ? { reason: ex.reason, decided_by: ex.decided_by, decided_at: ex.decided_at } : null;
    if (exclusion && !options.includeExcluded) {
      excluded.push({ ...r, exclusion });
      continue;
    }
    if (options.includeFlagged || r.failure) {
      kept.push({ ...r, exclusion, withheld: {} });
      continue;
    }
    const rules = withheldByFlags(r);
    const out: PropertyRow = { ...r, exclusion, withheld: {} };
    for (const [item, why] of rules) {
      if (item === 'grid_curve') {
        if (out.grid_stress_mpa !== undefined && out.grid_stress_mpa !== null) out.grid_stress_mpa = null;
        out.withheld![item] = why;
        continue;
      }
      if (typeof out[item] === 'number') {
        (out as unknown as Record<WithheldItem, number | null>)[item] = null;
        out.withheld![item] = why;
      }
    }
    kept.push(out);
  }
  return { rows: kept, excluded, exclusions: [...exclusions], options };
}

/** Counts of values left out of one property of a group, by reason (`excluded` or a flag name). */
export interface LeftOut {
  /** values left out (a value with several reasons counts once here) */
  n: number;
  by_reason: Record<string, number>;
  /** true when flagged values were kept on request (then no flag reason is counted) */
  flagged_values_included: boolean;
  /** true when excluded tests were kept on request */
  excluded_tests_included: boolean;
}

/** What was left out of `property` among `kept` and `excluded` rows of one group. */
export function leftOutCounts(kept: readonly PropertyRow[], excluded: readonly PropertyRow[], property: WithheldItem, options: Required<PopulationOptions>): LeftOut {
  const byReason: Record<string, number> = {};
  let n = 0;
  for (const r of kept) {
    const why = r.withheld?.[property];
    if (!why || why.length === 0) continue;
    n++;
    for (const w of why) byReason[w] = (byReason[w] ?? 0) + 1;
  }
  for (const r of excluded) {
    const v = property === 'grid_curve' ? r.grid_stress_mpa : r[property];
    if (property !== 'grid_curve' && !(typeof v === 'number' && Number.isFinite(v))) continue;
    n++;
    byReason.excluded = (byReason.excluded ?? 0) + 1;
  }
  return { n, by_reason: byReason, flagged_values_included: options.includeFlagged, excluded_tests_included: options.includeExcluded };
}
