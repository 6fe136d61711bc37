/**
 * Compliance of a group with the grade's limits, judged on individual tests (a specified minimum
 * applies to each test, not to a mean of heats or lots — common practice of material
 * specifications):
 * `n_below` tests below the minimum, `n_above` above the maximum, `fraction_outside` their share
 * of the n tests; `tail_below` / `tail_above` the fitted model's P(X < lower) / P(X > upper) for one
 * test, from `tail_model` (the model the headline value came from, else the best fit); `cpk` =
 * min((x̄ − lower)/3s, (upper − x̄)/3s) over the limits given, with the mean and SD of the tests.
 *
 * Units: limits in the property's unit. Degenerate input: no limits → null; no values → counts 0.
 */
import type { Sample } from './characteristic-types.ts';
import type { FitResult, ModelName } from './fit-types.ts';
import { modelCdf } from './model-cdf.ts';

export interface Compliance {
  lower: number | null;
  upper: number | null;
  n_below: number | null;
  n_above: number | null;
  fraction_outside: number;
  tail_below: number | null;
  tail_above: number | null;
  cpk: number | null;
  /** what the counts and tails are of: always individual tests */
  basis: 'individual tests';
  n_tests: number;
  tail_model: ModelName | null;
}

export function complianceOf(s: Sample, lower: number | null, upper: number | null, tailFit: FitResult | null): Compliance | null {
  if (lower === null && upper === null) return null;
  let nBelow = 0;
  let nAbove = 0;
  for (let i = 0; i < s.n; i++) {
    if (lower !== null && s.sorted[i] < lower) nBelow++;
    if (upper !== null && s.sorted[i] > upper) nAbove++;
  }
  const cdf = tailFit ? modelCdf(tailFit) : null;
  let cpk: number | null = null;
  if (s.mean !== null && s.sd !== null && s.sd > 0) {
    const parts: number[] = [];
    if (lower !== null) parts.push((s.mean - lower) / (3 * s.sd));
    if (upper !== null) parts.push((upper - s.mean) / (3 * s.sd));
    cpk = Math.min(...parts);
  }
  return {
    lower,
    upper,
    n_below: lower !== null ? nBelow : null,
    n_above: upper !== null ? nAbove : null,
    fraction_outside: s.n > 0 ? (nBelow + nAbove) / s.n : 0,
    tail_below: lower !== null && cdf ? cdf(lower) : null,
    tail_above: upper !== null && cdf ? 1 - cdf(upper) : null,
    cpk,
    basis: 'individual tests',
    n_tests: s.n,
    tail_model: tailFit ? tailFit.model : null,
  };
}
