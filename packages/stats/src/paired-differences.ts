/**
 * Agreement of two measurements of the same items (a certificate value and the value from the
 * test's curve): the paired differences d = a − b, their mean with its two-sided Student t
 * confidence interval (the bias), their SD, and the 95 % limits of agreement mean ± 1.96·SD
 * (Bland & Altman 1986, "Statistical methods for assessing agreement between two methods of
 * clinical measurement", The Lancet 327(8476), 307–310), plus the mean difference relative to b
 * in percent and the largest |d|. Units: those of the inputs.
 *
 * Degenerate input: pairs with a non-finite member are skipped; n = 0 gives nulls everywhere;
 * n = 1 gives the difference with null SD, interval and limits.
 */
import { studentTQuantile } from './special/student-t.ts';

export interface PairedDifferences {
  n: number;
  mean_difference: number | null;
  sd_difference: number | null;
  /** two-sided confidence interval of the mean difference at `level` */
  ci: [number, number] | null;
  level: number;
  /** mean ± 1.96 SD: where 95 % of the differences of single items are expected */
  limits_of_agreement: [number, number] | null;
  /** mean of (a − b) / b in percent */
  mean_relative_pct: number | null;
  max_abs_difference: number | null;
}

export function pairedDifferences(a: ArrayLike<number>, b: ArrayLike<number>, level = 0.95): PairedDifferences {
  const d: number[] = [];
  const rel: number[] = [];
  for (let i = 0; i < Math.min(a.length, b.length); i++) {
    if (!Number.isFinite(a[i]) || !Number.isFinite(b[i])) continue;
    d.push(a[i] - b[i]);
    if (b[i] !== 0) rel.push((a[i] - b[i]) / b[i]);
  }
  const n = d.length;
  const none: PairedDifferences = { n, mean_difference: null, sd_difference: null, ci: null, level, limits_of_agreement: null, mean_relative_pct: null, max_abs_difference: null };
  if (n === 0) return none;
  const mean = d.reduce((s, x) => s + x, 0) / n;
  const maxAbs = Math.max(...d.map(Math.abs));
  const meanRel = rel.length ? (100 * rel.reduce((s, x) => s + x, 0)) / rel.length : null;
  if (n === 1) return { ...none, mean_difference: mean, mean_relative_pct: meanRel, max_abs_difference: maxAbs };
  const sd = Math.sqrt(d.reduce((s, x) => s + (x - mean) ** 2, 0) / (n - 1));
  const half = studentTQuantile(1 - (1 - level) / 2, n - 1) * (sd / Math.sqrt(n));
  return {
    n,
    mean_difference: mean,
    sd_difference: sd,
    ci: [mean - half, mean + half],
    level,
    limits_of_agreement: [mean - 1.96 * sd, mean + 1.96 * sd],
    mean_relative_pct: meanRel,
    max_abs_difference: maxAbs,
  };
}
