/**
 * Time order of a series as the monitor expects it: test date, then heat, then test id (so ties
 * are broken reproducibly). ISO dates compare correctly as strings; a missing heat sorts first.
 * Returns a new array; the input is not changed.
 */
import type { SeriesPoint } from './types.ts';

export function orderSeriesPoints<T extends SeriesPoint>(points: readonly T[]): T[] {
  const key = (p: SeriesPoint): [string, string, string] => [p.date, p.heat ?? '', p.testId];
  return [...points].sort((a, b) => {
    const ka = key(a);
    const kb = key(b);
    for (let i = 0; i < 3; i++) if (ka[i] !== kb[i]) return ka[i] < kb[i] ? -1 : 1;
    return 0;
  });
}
